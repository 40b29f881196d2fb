package testutil

import (
	"syscall"
	"time"
)

// ThreadCPU returns the CPU time the calling OS thread has used
// (getrusage RUSAGE_THREAD) and true, for benchmarks that report CPU time
// per operation besides wall time: on a machine shared with other work
// the wall time includes the time the thread waits for a core. It
// returns 0 and false when the call fails.
func ThreadCPU() (time.Duration, bool) {
	const rusageThread = 1 // RUSAGE_THREAD, Linux
	var ru syscall.Rusage
	if err := syscall.Getrusage(rusageThread, &ru); err != nil {
		return 0, false
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano()), true
}
