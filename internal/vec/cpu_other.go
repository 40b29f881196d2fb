//go:build !amd64 || purego

package vec

// HasAVX is false without the amd64 kernels: Dot4 runs in Go.
const HasAVX = false

// HasAVX2FMA is false without the amd64 kernels: LagSums runs in Go.
const HasAVX2FMA = false

var useAVX = false

func dot4Lanes(a, b0, b1, b2, b3 []float64, out *[16]float64) {
	dot4Go(a, b0, b1, b2, b3, out)
}
