package fleet

import (
	"context"
	"fmt"
	"runtime"
	"runtime/debug"
	"strconv"
	"sync"

	"github.com/backshift/backshift/internal/errs"
)

// SettingError reports a setting or argument that breaks its rule (the
// shared shape of internal/errs); it matches ErrSetting.
type SettingError = errs.SettingError

// InternalError carries a panic of a job, recovered on the worker
// goroutine (the shared shape of internal/errs); it matches ErrInternal.
// A loop's Err wraps it in an error whose message says that the
// caller's job panicked (not the library): use errors.As to reach the
// panic's Value and Stack.
type InternalError = errs.InternalError

// The kinds of error of this package, for errors.Is.
var (
	ErrSetting  = errs.ErrSetting
	ErrInternal = errs.ErrInternal
)

// Settings configure Run. The zero value of every field means its
// documented default.
type Settings struct {
	// Workers is the largest number of jobs running at a time. 0 means
	// runtime.GOMAXPROCS(0), one per core the process may use.
	Workers int
	// OnProgress, when not nil, is called after each loop finishes, on
	// the goroutine that called Run, one call at a time, in the order
	// the loops finish (which depends on scheduling; the results do
	// not). If it panics, Run stops starting loops and calls it no
	// more, waits for the running jobs (their ctx is not cancelled),
	// and then panics again with the same value on the calling
	// goroutine: a caller that recovers is left with no goroutine of
	// Run running.
	OnProgress func(Progress)
}

// Validate reports a setting that breaks its rule as a *SettingError
// naming the field; nil means the settings are usable. A nil *Settings
// is the default and valid.
func (s *Settings) Validate() error {
	if s == nil {
		return nil
	}
	return errs.Count("fleet.Settings.Validate", "Settings.Workers", s.Workers, "0 means one per core, runtime.GOMAXPROCS(0)")
}

// Progress reports how far Run has come.
type Progress struct {
	// Loop is the index of the loop that just finished, Err its error.
	Loop int
	Err  error
	// Done counts the loops finished so far (Failed of them with an
	// error), of Total.
	Done, Failed, Total int
}

// Result is the outcome of one loop: the job's value, or its error.
type Result[T any] struct {
	Value T
	Err   error
}

// MaxLoops is the largest number of loops one Run takes, 10^7: far more
// than the loops of any site, and few enough that the results, held in
// memory one per loop, fit (a count beyond it is most often a slip).
const MaxLoops = 10_000_000

// Run calls job(ctx, loop) for every loop in [0, loops) on at most
// Settings.Workers goroutines (never more than loops) and returns the
// results indexed by loop. A loop's failure is its Result.Err and does
// not stop the others; a panic in job is recovered into that loop's
// Err, whose message says that the job of that loop panicked (a fault
// of the caller's function) and which wraps an *InternalError with the
// panic's value and stack (errors.As; errors.Is(err, ErrInternal)). A
// panic in Settings.OnProgress is raised again on the calling goroutine
// after every goroutine of Run has ended (see Settings.OnProgress). When ctx is done, loops not yet started
// are not started (their Err is ctx's error), running jobs see ctx
// cancelled, Run waits for them, and it returns the results with an
// error that wraps ctx's (errors.Is(err, context.Canceled)). Bad
// settings, a loops outside 0..MaxLoops, a nil job or a nil ctx are a
// *SettingError, with no job run. Run returns only after every
// goroutine it started has ended.
func Run[T any](ctx context.Context, loops int, job func(ctx context.Context, loop int) (T, error), s *Settings) ([]Result[T], error) {
	const op = "fleet.Run"
	if err := s.Validate(); err != nil {
		errs.SetOp(op, err)
		return nil, err
	}
	if loops < 0 {
		return nil, &SettingError{Op: op, Setting: "loops", Value: strconv.Itoa(loops), Rule: "the number of loops must be zero or positive"}
	}
	if loops > MaxLoops {
		return nil, &SettingError{Op: op, Setting: "loops", Value: strconv.Itoa(loops), Rule: "must be at most MaxLoops = " + strconv.Itoa(MaxLoops) + ": Run holds one result per loop in memory (split the fleet into batches)"}
	}
	if job == nil {
		return nil, &SettingError{Op: op, Setting: "job", Value: "nil", Rule: "pass the function to run for each loop"}
	}
	if ctx == nil {
		return nil, &SettingError{Op: op, Setting: "ctx", Value: "nil", Rule: "pass a context (context.Background() when nothing cancels the run)"}
	}
	var d Settings
	if s != nil {
		d = *s
	}
	workers := d.Workers
	if workers == 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	out := make([]Result[T], loops)
	if loops == 0 {
		return out, ctx.Err()
	}
	p := Progress{Total: loops}
	feedCtx, stopFeed := context.WithCancel(ctx)
	defer stopFeed()
	var cb callback
	started := pool(feedCtx, loops, max(1, min(workers, loops)),
		func(loop int) { out[loop] = runOne(ctx, loop, job) },
		func(loop int) {
			p.Loop, p.Err = loop, out[loop].Err
			p.Done++
			if p.Err != nil {
				p.Failed++
			}
			if d.OnProgress != nil && !cb.panicked {
				cb.call(d.OnProgress, p, stopFeed)
			}
		})
	if cb.panicked {
		panic(cb.value)
	}
	if started < loops {
		err := ctx.Err()
		for i := started; i < loops; i++ {
			out[i].Err = err
		}
		return out, fmt.Errorf("%s: stopped after starting %d of %d loops: %w", op, started, loops, err)
	}
	return out, nil
}

// pool runs run(loop) for the loops in [0, loops) on the given number of
// goroutines, in order, until all are started or ctx is done; it calls
// finished(loop) on the calling goroutine as each loop ends (after run's
// writes, through a channel), waits for every goroutine, and returns the
// number of loops started.
func pool(ctx context.Context, loops, workers int, run, finished func(int)) int {
	next := make(chan int)
	done := make(chan int, workers)
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for loop := range next {
				run(loop)
				done <- loop
			}
		}()
	}
	started := feed(ctx, next, done, loops, finished)
	close(next)
	// Drain the loops still running after the feed stopped.
	go func() { wg.Wait(); close(done) }()
	for loop := range done {
		finished(loop)
	}
	return started
}

// feed hands the loops to the workers in order until all are handed out
// or ctx is done, reporting each finished loop through finished as it
// comes back, and returns the number handed out.
func feed(ctx context.Context, next chan<- int, done <-chan int, loops int, finished func(int)) int {
	i := 0
	for i < loops {
		if ctx.Err() != nil {
			return i
		}
		select {
		case next <- i:
			i++
		case loop := <-done:
			finished(loop)
		case <-ctx.Done():
			return i
		}
	}
	return i
}

// callback runs Settings.OnProgress, keeping a panic of it for Run to
// raise again once its goroutines have ended.
type callback struct {
	panicked bool
	value    any
}

// call calls f(p); on a panic it keeps the value and calls stop (which
// ends the feeding of loops).
func (c *callback) call(f func(Progress), p Progress, stop func()) {
	defer func() {
		if v := recover(); v != nil {
			c.panicked, c.value = true, v
			stop()
		}
	}()
	f(p)
}

// runOne runs one loop's job, turning a panic into a *jobPanic (an
// *InternalError with the stack of the panic, under a message that
// names the caller's job).
func runOne[T any](ctx context.Context, loop int, job func(context.Context, int) (T, error)) (r Result[T]) {
	defer func() {
		if v := recover(); v != nil {
			r.Err = &jobPanic{loop: loop, ie: &InternalError{Op: jobOp, Value: v, Stack: debug.Stack()}}
		}
	}()
	r.Value, r.Err = job(ctx, loop)
	return r
}

// jobOp is the Op of the *InternalError of a job's panic.
const jobOp = "fleet.Run (the caller's job)"

// jobPanic is a loop's error when its job panicked: the fault is the
// caller's function, not the library's. It unwraps to the
// *InternalError that carries the panic's value and stack.
type jobPanic struct {
	loop int
	ie   *InternalError
}

// Error says which loop's job panicked, and with what.
func (e *jobPanic) Error() string {
	return fmt.Sprintf("fleet.Run: the job of loop %d panicked: %v (a panic in the caller's job function, not in the library; the stack is in the wrapped *InternalError)", e.loop, e.ie.Value)
}

// Unwrap returns the *InternalError with the panic's value and stack.
func (e *jobPanic) Unwrap() error { return e.ie }

// Seed returns a seed for loop derived from base by the SplitMix64
// mixer (Steele, Lea and Flood 2014, "Fast splittable pseudorandom
// number generators", OOPSLA), so that a job that draws random numbers
// gets the same numbers for a loop whatever the pool size, and distinct
// loops get unrelated streams: rand.New(rand.NewPCG(fleet.Seed(base, loop), 0)).
func Seed(base uint64, loop int) uint64 {
	z := base + uint64(loop+1)*0x9e3779b97f4a7c15
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}
