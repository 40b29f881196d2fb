//go:build !linux

package predict_test

import "time"

// threadCPU is not available off Linux: benchmarks report wall time only.
func threadCPU() (time.Duration, bool) { return 0, false }
