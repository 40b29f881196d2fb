package fit

// fir writes (or, with add, adds) into dst the moving-average filter
// c(B) applied to x at t = t0 .. t0+len(dst)-1:
//
//	dst[t-t0] (+)= sum_{k} c[k] x[t-k],  x[t-k] = 0 for t-k < 0,
//
// reading the history x[t0-deg .. t0-1] from x itself. Every output is
// independent of the others, so the loop runs at memory throughput
// rather than at the latency of a recursion; it allocates nothing.
func fir(dst, c, x []float64, t0 int, add bool) {
	// Leading zero coefficients are a pure delay: filter x at t0-l by
	// the rest. Trailing zeros add nothing.
	l := 0
	for l < len(c) && c[l] == 0 {
		l++
	}
	e := len(c)
	for e > l && c[e-1] == 0 {
		e--
	}
	c = c[l:e]
	t0 -= l
	if len(c) == 0 {
		if !add {
			clear(dst)
		}
		return
	}
	if t0 < 0 {
		// Outputs whose every sample lies before index 0 are zero.
		k := min(-t0, len(dst))
		if !add {
			clear(dst[:k])
		}
		dst = dst[k:]
		t0 = 0
	}
	n := t0 + len(dst)
	deg := len(c) - 1
	start := t0
	for ; start < n && start-deg < 0; start++ {
		s := 0.0
		for k := 0; k <= min(deg, start); k++ {
			s += c[k] * x[start-k]
		}
		if add {
			dst[start-t0] += s
		} else {
			dst[start-t0] = s
		}
	}
	if start >= n {
		return
	}
	firRun(dst[start-t0:n-t0], c, x, start, add)
}

// firRun is the steady part of fir, where every x[t-k] lies in x:
// d[i] (+)= sum_k c[k] x[start+i-k], with the sums of up to three
// coefficients unrolled (the common orders) and longer filters handed to
// firRunLong.
func firRun(d, c, x []float64, start int, add bool) {
	m := len(d)
	switch len(c) {
	case 1:
		c0 := c[0]
		x0 := x[start : start+m]
		if !add && c0 == 1 {
			copy(d, x0)
			return
		}
		if add {
			for i := range d {
				d[i] += c0 * x0[i]
			}
		} else {
			for i := range d {
				d[i] = c0 * x0[i]
			}
		}
	case 2:
		c0, c1 := c[0], c[1]
		x0, x1 := x[start:start+m], x[start-1:start-1+m]
		if add {
			for i := range d {
				d[i] += c0*x0[i] + c1*x1[i]
			}
		} else {
			for i := range d {
				d[i] = c0*x0[i] + c1*x1[i]
			}
		}
	case 3:
		c0, c1, c2 := c[0], c[1], c[2]
		x0, x1, x2 := x[start:start+m], x[start-1:start-1+m], x[start-2:start-2+m]
		if add {
			for i := range d {
				d[i] += c0*x0[i] + c1*x1[i] + c2*x2[i]
			}
		} else {
			for i := range d {
				d[i] = c0*x0[i] + c1*x1[i] + c2*x2[i]
			}
		}
	default:
		firRunLong(d, c, x, start, add)
	}
}

// firRunLong is firRun for four or more coefficients: four and five
// unrolled, higher orders (seasonal lags) one pass per non-zero
// coefficient.
func firRunLong(d, c, x []float64, start int, add bool) {
	m := len(d)
	switch len(c) {
	case 4:
		c0, c1, c2, c3 := c[0], c[1], c[2], c[3]
		x0, x1, x2, x3 := x[start:start+m], x[start-1:start-1+m], x[start-2:start-2+m], x[start-3:start-3+m]
		if add {
			for i := range d {
				d[i] += c0*x0[i] + c1*x1[i] + c2*x2[i] + c3*x3[i]
			}
		} else {
			for i := range d {
				d[i] = c0*x0[i] + c1*x1[i] + c2*x2[i] + c3*x3[i]
			}
		}
	case 5:
		c0, c1, c2, c3, c4 := c[0], c[1], c[2], c[3], c[4]
		x0, x1, x2 := x[start:start+m], x[start-1:start-1+m], x[start-2:start-2+m]
		x3, x4 := x[start-3:start-3+m], x[start-4:start-4+m]
		if add {
			for i := range d {
				d[i] += c0*x0[i] + c1*x1[i] + c2*x2[i] + c3*x3[i] + c4*x4[i]
			}
		} else {
			for i := range d {
				d[i] = c0*x0[i] + c1*x1[i] + c2*x2[i] + c3*x3[i] + c4*x4[i]
			}
		}
	default:
		// Higher orders (seasonal lags): one pass per non-zero coefficient.
		if !add {
			clear(d)
		}
		for k, ck := range c {
			if ck == 0 {
				continue
			}
			xk := x[start-k : start-k+m]
			for i := range d {
				d[i] += ck * xk[i]
			}
		}
	}
}

// isOne reports whether c is the constant polynomial 1.
func isOne(c []float64) bool {
	if len(c) == 0 || c[0] != 1 {
		return false
	}
	for _, v := range c[1:] {
		if v != 0 {
			return false
		}
	}
	return true
}
