//go:build !amd64 || purego

package vec

// useFMA is false without the amd64 kernel: LagSums runs LagSumsGo's loops.
const useFMA = false

// lagSums8 is never called without the amd64 kernel (useFMA is false).
func lagSums8(out, a, b []float64) int { return 0 }
