package filter

import "math"

// Run writes into dst the output of the filter b(B)/a(B) applied to x,
// with pre-sample x and y taken as zero:
//
//	y_t = (sum_{k=0..q} b_k x_{t-k} - sum_{k=p..1} a_k y_{t-k}) / a_0
//
// The sums are formed in the order written (numerator terms by rising k,
// then denominator terms by falling k), the same order Stream uses, so
// that batch and streaming outputs agree to the last bit. dst and x must
// have the same length and may be the same slice (but must not overlap
// otherwise). b may be empty (output zero). a must be non-empty with
// a[0] != 0; Run panics otherwise (a programmer error: callers validate
// polynomials before filtering).
func Run(dst, b, a, x []float64) {
	runInit(dst, b, a, x, nil, nil)
}

// RunChecked is Run that also reports whether every sample of x is finite
// (neither NaN nor infinite), checked inside the filter loop at almost no
// cost. When it returns false, dst holds the (non-finite) filter output
// and the caller should locate the bad sample with FirstNonFinite.
func RunChecked(dst, b, a, x []float64) bool {
	return runInit(dst, b, a, x, nil, nil)>>63 == 0
}

// RunInit is Run with initial conditions: xHist and yHist hold the input
// and output values before x, oldest first, so that the last element of
// each is the value at t = -1. Values older than the histories supply are
// taken as zero; longer histories are fine (only the last len(b)-1 inputs
// and len(a)-1 outputs are used). RunInit reads the histories and never
// modifies them. Its panics are those of Run.
func RunInit(dst, b, a, x, xHist, yHist []float64) {
	runInit(dst, b, a, x, xHist, yHist)
}

// runInit filters and returns the OR over samples of finiteBits(x_t),
// whose top bit is set when some x_t is NaN or infinite.
func runInit(dst, b, a, x, xHist, yHist []float64) uint64 {
	if len(a) == 0 || a[0] == 0 {
		panic("filter: a[0] must be non-zero")
	}
	if len(dst) != len(x) {
		panic("filter: dst and x lengths differ")
	}
	if len(x) == 0 {
		return 0
	}
	q, p := len(b)-1, len(a)-1
	if a[0] == 1 {
		switch {
		case q <= 1 && p <= 1:
			var c [2]float64
			var d [2]float64
			copy(c[:], b)
			copy(d[:], a)
			return run11(dst, x, c[0], c[1], d[1], hist(xHist, 1), hist(yHist, 1))
		case q <= 2 && p <= 2:
			var c [3]float64
			var d [3]float64
			copy(c[:], b)
			copy(d[:], a)
			return run22(dst, x, c, d, hist(xHist, 1), hist(xHist, 2), hist(yHist, 1), hist(yHist, 2))
		case q <= 4 && p <= 4:
			var c [5]float64
			var d [5]float64
			copy(c[:], b)
			copy(d[:], a)
			var xh, yh [4]float64
			for k := range xh {
				xh[k] = hist(xHist, k+1)
				yh[k] = hist(yHist, k+1)
			}
			return run44(dst, x, &c, &d, xh, yh)
		}
	}
	if q > 0 && &dst[0] == &x[0] {
		// In place with a numerator: past inputs are overwritten, so keep
		// them in the stream's ring.
		s := NewStream(b, a, 0)
		s.SetHistory(xHist, yHist)
		return s.run(dst, x)
	}
	return runSparse(dst, b, a, x, xHist, yHist)
}

// runSparse is the general loop for dst not aliasing x (or q = 0): it
// visits only the non-zero coefficients, which makes seasonal polynomials
// such as (1 - 0.5 B)(1 - 0.4 B^12) cost 4 terms instead of 14, and reads
// past values straight from x and dst once the histories are passed.
// Skipping a zero coefficient leaves the sum bit for bit unchanged (it
// adds an exact zero), so the result equals the dense loops' for finite
// data.
//
// Over 60 lines: the inner kernel of every simulation and fit; the warm-up
// and the two steady loops share the non-zero coefficient lists built on
// the stack at its top, which stay there as one function.
func runSparse(dst, b, a, x, xHist, yHist []float64) uint64 {
	var kb, ka [16]int
	var cb, ca [16]float64
	bk, bc := kb[:0], cb[:0]
	ak, ac := ka[:0], ca[:0]
	for k, v := range b {
		if v != 0 {
			bk, bc = append(bk, k), append(bc, v)
		}
	}
	for k := len(a) - 1; k >= 1; k-- {
		if a[k] != 0 {
			ak, ac = append(ak, k), append(ac, a[k])
		}
	}
	a0 := a[0]
	n := len(x)
	m := min(max(len(b)-1, len(a)-1), n)
	acc := uint64(0)
	// Warm-up: values before t = 0 come from the histories.
	for t := 0; t < m; t++ {
		s := 0.0
		for j, k := range bk {
			if i := t - k; i >= 0 {
				s += bc[j] * x[i]
			} else {
				s += bc[j] * hist(xHist, -i)
			}
		}
		for j, k := range ak {
			if i := t - k; i >= 0 {
				s -= ac[j] * dst[i]
			} else {
				s -= ac[j] * hist(yHist, -i)
			}
		}
		if a0 != 1 {
			s /= a0
		}
		dst[t] = s
		acc |= finiteBits(x[t])
	}
	x = x[:len(dst)]
	if len(ak) > 0 && ak[len(ak)-1] == 1 && m >= 1 && m < n {
		// The y_{t-1} term comes last: keep y_{t-1} in a register rather
		// than reading back the value just stored (a store-to-load delay
		// on the recursion).
		c1 := ac[len(ac)-1]
		ak, ac = ak[:len(ak)-1], ac[:len(ac)-1]
		y1 := dst[m-1]
		for t := m; t < n; t++ {
			s := 0.0
			for j, k := range bk {
				s += bc[j] * x[t-k]
			}
			for j, k := range ak {
				s -= ac[j] * dst[t-k]
			}
			s -= c1 * y1
			if a0 != 1 {
				s /= a0
			}
			dst[t] = s
			y1 = s
			acc |= finiteBits(x[t])
		}
		return acc
	}
	for t := m; t < n; t++ {
		s := 0.0
		for j, k := range bk {
			s += bc[j] * x[t-k]
		}
		for j, k := range ak {
			s -= ac[j] * dst[t-k]
		}
		if a0 != 1 {
			s /= a0
		}
		dst[t] = s
		acc |= finiteBits(x[t])
	}
	return acc
}

// expMask selects the exponent bits of a float64.
const expMask = 0x7ff0000000000000

// finiteBits returns a value whose top bit is set exactly when v is NaN
// or infinite: the exponent field plus one in its lowest bit carries into
// bit 63 only when the field is all ones.
func finiteBits(v float64) uint64 {
	return math.Float64bits(v)&expMask + 1<<52
}

// FirstNonFinite returns the index of the first NaN or infinite value in
// x, or -1 when all are finite.
func FirstNonFinite(x []float64) int {
	const block = 256
	for i := 0; i < len(x); i += block {
		end := min(i+block, len(x))
		acc := uint64(0)
		for _, v := range x[i:end] {
			acc |= finiteBits(v)
		}
		if acc>>63 != 0 {
			for j := i; j < end; j++ {
				if finiteBits(x[j])>>63 != 0 {
					return j
				}
			}
		}
	}
	return -1
}

// hist returns the value k steps before t = 0 from a history whose last
// element is t = -1, or 0 when the history is shorter.
func hist(h []float64, k int) float64 {
	if k <= len(h) {
		return h[len(h)-k]
	}
	return 0
}

// run11 is the kernel for q <= 1, p <= 1, a_0 = 1. x1 and y1 are x_{-1}
// and y_{-1}. The previous input and output live in registers, which also
// makes dst == x safe.
func run11(dst, x []float64, b0, b1, a1, x1, y1 float64) uint64 {
	x = x[:len(dst)]
	acc := uint64(0)
	for i, x0 := range x {
		y := b0*x0 + b1*x1 - a1*y1
		dst[i] = y
		acc |= finiteBits(x0)
		x1, y1 = x0, y
	}
	return acc
}

// run22 is the kernel for q <= 2, p <= 2, a_0 = 1 (zero-padded
// coefficients add exact zeros and leave the sums unchanged).
func run22(dst, x []float64, b, a [3]float64, x1, x2, y1, y2 float64) uint64 {
	b0, b1, b2 := b[0], b[1], b[2]
	a1, a2 := a[1], a[2]
	x = x[:len(dst)]
	acc := uint64(0)
	for i, x0 := range x {
		y := b0*x0 + b1*x1 + b2*x2 - a2*y2 - a1*y1
		dst[i] = y
		acc |= finiteBits(x0)
		x2, x1 = x1, x0
		y2, y1 = y1, y
	}
	return acc
}

// run44 is the kernel for q <= 4, p <= 4, a_0 = 1. The coefficients are
// read from the arrays inside the loop (L1 loads off the critical path)
// so that the eight state values keep their registers: with all of them
// in locals the compiler spills y_{t-1} to the stack, which puts a
// store-to-load delay on the recursion.
func run44(dst, x []float64, b, a *[5]float64, xh, yh [4]float64) uint64 {
	x1, x2, x3, x4 := xh[0], xh[1], xh[2], xh[3]
	y1, y2, y3, y4 := yh[0], yh[1], yh[2], yh[3]
	x = x[:len(dst)]
	acc := uint64(0)
	for i, x0 := range x {
		y := b[0]*x0 + b[1]*x1 + b[2]*x2 + b[3]*x3 + b[4]*x4 - a[4]*y4 - a[3]*y3 - a[2]*y2 - a[1]*y1
		dst[i] = y
		acc |= finiteBits(x0)
		x4, x3, x2, x1 = x3, x2, x1, x0
		y4, y3, y2, y1 = y3, y2, y1, y
	}
	return acc
}
