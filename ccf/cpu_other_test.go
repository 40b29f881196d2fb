//go:build !unix

package ccf

import "time"

// cpuTime is not measured on this platform: zero.
func cpuTime() time.Duration { return 0 }
