package main

import (
	"syscall"
	"time"
)

// threadCPU returns the CPU time the calling OS thread has used
// (getrusage RUSAGE_THREAD), so that a benchmark on a shared machine can
// report CPU time per sample besides wall time.
func threadCPU() (time.Duration, bool) {
	const rusageThread = 1 // RUSAGE_THREAD, Linux
	var ru syscall.Rusage
	if err := syscall.Getrusage(rusageThread, &ru); err != nil {
		return 0, false
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano()), true
}
