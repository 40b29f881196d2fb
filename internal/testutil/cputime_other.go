//go:build !linux

package testutil

import "time"

// ThreadCPU is not available off Linux: it returns 0 and false, and
// benchmarks report wall time only.
func ThreadCPU() (time.Duration, bool) { return 0, false }
