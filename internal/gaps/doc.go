// Package gaps finds the runs of missing samples (NaN) in a series and
// writes them for messages: the one helper behind the gap lists of
// tf/fit (missing outputs skipped, input gaps filled), tf/identify
// (identification needs a gap-free stretch) and examples/identify (the
// gaps report).
package gaps
