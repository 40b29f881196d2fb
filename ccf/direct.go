package ccf

// directChunk is the number of samples per cache block of the direct
// path: the centred blocks of x and y (8 bytes per sample each, plus K
// lags) stay in the first-level cache for small K.
const directChunk = 2048

// crossDirect writes the unnormalised lag sums n*c_xy(k) into r
// (r[K+k], k = -K..K) and returns the sums of squares of the centred x and
// y.
//
// The series are processed in blocks of C samples of t: each block of x
// and of y, extended by K+8 samples (zero past the end), is centred into a
// small buffer, and the block's contributions sum_t x_t y_{t+k} (k >= 0)
// and sum_t y_t x_{t+k} (c_xy(-k) = c_yx(k)) are added for every lag.
// The series are read once; nothing of their length is allocated.
func crossDirect(r, x, y []float64, mx, my float64, K int) (sxx, syy float64) {
	n := len(x)
	C := max(directChunk, K)
	pad := K + 8
	bx := make([]float64, C+pad)
	by := make([]float64, C+pad)
	pos := make([]float64, K+8)
	neg := make([]float64, K+8)
	for t0 := 0; t0 < n; t0 += C {
		m := min(C, n-t0)
		e := min(t0+m+pad, n)
		sxx += center(bx[:m+pad], x[t0:e], mx, m)
		syy += center(by[:m+pad], y[t0:e], my, m)
		lagBlock(pos, bx[:m], by[:m+pad])
		lagBlock(neg, by[:m], bx[:m+pad])
	}
	copy(r[K:], pos[:K+1])
	for j := 1; j <= K; j++ {
		r[K-j] = neg[j]
	}
	return sxx, syy
}

// center writes src - mu into dst (zero past len(src)) and returns the
// sum of squares of the first m centred values.
func center(dst, src []float64, mu float64, m int) float64 {
	var s0, s1 float64
	d := dst[:len(src)]
	i := 0
	for ; i+2 <= len(d); i += 2 {
		a, b := src[i]-mu, src[i+1]-mu
		d[i], d[i+1] = a, b
	}
	for ; i < len(d); i++ {
		d[i] = src[i] - mu
	}
	clear(dst[len(src):])
	c := dst[:m]
	i = 0
	for ; i+2 <= m; i += 2 {
		s0 += c[i] * c[i]
		s1 += c[i+1] * c[i+1]
	}
	for ; i < m; i++ {
		s0 += c[i] * c[i]
	}
	return s0 + s1
}

// lagBlock adds sum_{i<len(a)} a[i] b[i+j] to out[j] for j = 0..len(out)-1,
// where len(out) is a multiple of 8 at least the lags wanted and b holds
// at least len(a)+len(out)-1 values. It uses the AVX2/FMA kernel for
// groups of eight lags where the processor has it (dot_amd64.s), and
// groups of four lags in Go otherwise (four independent accumulators keep
// the adder busy).
func lagBlock(out, a, b []float64) {
	m := len(a)
	if m == 0 {
		return
	}
	L := len(out)
	j := 0
	if hasFMA {
		for ; j+8 <= L; j += 8 {
			s := dot8(a, b[j:j+m+7])
			for q, v := range s {
				out[j+q] += v
			}
		}
		return
	}
	for ; j+4 <= L; j += 4 {
		s := dot4(a, b[j:j+m+3])
		for q, v := range s {
			out[j+q] += v
		}
	}
	for ; j < L; j++ {
		out[j] += dot1(a, b[j:j+m])
	}
}

// dot4 returns sum_i a[i] b[i+q] for q = 0..3; len(b) >= len(a)+3.
func dot4(a, b []float64) [4]float64 {
	var s0, s1, s2, s3 float64
	m := len(a)
	b0, b1, b2, b3 := b[0:m], b[1:m+1], b[2:m+2], b[3:m+3]
	for i, av := range a {
		s0 += av * b0[i]
		s1 += av * b1[i]
		s2 += av * b2[i]
		s3 += av * b3[i]
	}
	return [4]float64{s0, s1, s2, s3}
}

// dot1 returns sum_i a[i] b[i]; len(b) = len(a).
func dot1(a, b []float64) float64 {
	var s0, s1, s2, s3 float64
	b = b[:len(a)]
	i := 0
	for ; i+4 <= len(a); i += 4 {
		s0 += a[i] * b[i]
		s1 += a[i+1] * b[i+1]
		s2 += a[i+2] * b[i+2]
		s3 += a[i+3] * b[i+3]
	}
	for ; i < len(a); i++ {
		s0 += a[i] * b[i]
	}
	return (s0 + s1) + (s2 + s3)
}
