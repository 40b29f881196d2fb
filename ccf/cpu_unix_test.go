//go:build unix

package ccf

import (
	"syscall"
	"time"
)

// cpuTime returns the process's user plus system CPU time. On a shared
// machine the CPU time per operation is a steadier figure than the wall
// time, which includes waiting for a core; the peer script compares
// both.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}
