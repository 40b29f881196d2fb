package filter

// Run writes into dst the output of the filter b(B)/a(B) applied to x,
// with pre-sample x and y taken as zero:
//
//	y_t = (sum_{k=0..q} b_k x_{t-k} - sum_{k=1..p} a_k y_{t-k}) / a_0
//
// dst and x must have the same length and may be the same slice. a must
// be non-empty with a[0] != 0; Run panics otherwise (a programmer error:
// callers validate polynomials before filtering).
func Run(dst, b, a, x []float64) {
	if len(a) == 0 || a[0] == 0 {
		panic("filter: a[0] must be non-zero")
	}
	if len(dst) != len(x) {
		panic("filter: dst and x lengths differ")
	}
	n := len(x)
	if n == 0 {
		return
	}
	inv := 1 / a[0]
	if inv != 1 || len(b) > 0 && &dst[0] == &x[0] {
		// General path for a[0] != 1 or in-place filtering with a numerator:
		// keep the input history in a small ring so x may alias dst.
		runGeneral(dst, b, a, x)
		return
	}
	q, p := len(b)-1, len(a)-1
	for t := 0; t < n; t++ {
		s := 0.0
		m := min(q, t)
		for k := 0; k <= m; k++ {
			s += b[k] * x[t-k]
		}
		m = min(p, t)
		for k := 1; k <= m; k++ {
			s -= a[k] * dst[t-k]
		}
		dst[t] = s
	}
}

func runGeneral(dst, b, a, x []float64) {
	q, p := len(b)-1, len(a)-1
	inv := 1 / a[0]
	// hist holds x_{t}, x_{t-1}, ..., x_{t-q} (q is small: model degree).
	var small [65]float64
	hist := small[:0]
	if q+1 <= len(small) {
		hist = small[:q+1]
	} else {
		hist = make([]float64, q+1)
	}
	for t := range x {
		copy(hist[1:], hist[:len(hist)-1])
		if len(hist) > 0 {
			hist[0] = x[t]
		}
		s := 0.0
		for k := 0; k <= q; k++ {
			s += b[k] * hist[k]
		}
		m := min(p, t)
		for k := 1; k <= m; k++ {
			s -= a[k] * dst[t-k]
		}
		dst[t] = s * inv
	}
}
