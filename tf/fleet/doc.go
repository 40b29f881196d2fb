// Package fleet runs one job per loop over many loops of a site on a
// bounded pool of goroutines: fitting, identifying or replaying
// hundreds of control loops in one process.
//
// Run calls a caller-supplied function once for each loop index, with
// at most Settings.Workers calls at a time, and returns the results in
// loop order. The result of a loop depends only on the loop (its index
// and what the job reads for it), never on the pool size or on which
// goroutine ran it, as long as the job keeps no state shared between
// loops: derive any random seed from the loop index (Seed does that).
// A context cancels the loops not yet started; a panic in a job becomes
// that loop's error (an *InternalError) instead of ending the process;
// a progress callback reports each finished loop on the caller's
// goroutine.
//
// When one machine is not enough, run the same per-loop function in the
// users' own batch or stream-processing engine, one loop per task: the
// package holds no cluster code of its own.
//
// Results about a plant (models, tunings, alarms) are advice: an
// identified model is an approximation, and an alarm is advice to an
// operator, not an interlock.
package fleet
