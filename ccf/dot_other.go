//go:build !amd64 || purego

package ccf

// hasFMA is false without the amd64 kernel: lagSums runs in Go.
const hasFMA = false

// dot8 is not used without the amd64 kernel.
func dot8(a, b []float64) [8]float64 { panic("ccf: dot8 without the amd64 kernel") }
