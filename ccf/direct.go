package ccf

import "sync"

// directChunk is the number of samples per cache block of the direct
// path: two blocks of 8 bytes per sample stay in the first-level cache.
const directChunk = 2048

// crossDirect writes the unnormalised lag sums n*c_xy(k) into r
// (r[K+k], k = -K..K) and returns the sums of squares of the centred x and
// y.
func crossDirect(r, x, y []float64, mx, my float64, K int) (sxx, syy float64) {
	n := len(x)
	// Centred copies, zero padded by K so that every lag sums over t < n
	// without a tail case.
	buf := getBuf(2 * (n + K))
	defer putBuf(buf)
	xc := (*buf)[: n+K : n+K]
	yc := (*buf)[n+K:]
	sxx = center(xc, x, mx)
	syy = center(yc, y, my)
	lagSums(r[K:], xc, yc, n) // k = 0..K
	if K > 0 {
		var small [64]float64
		neg := small[:0]
		if K+1 <= len(small) {
			neg = small[:K+1]
		} else {
			neg = make([]float64, K+1)
		}
		lagSums(neg, yc, xc, n) // c_yx(j) = c_xy(-j)
		for j := 1; j <= K; j++ {
			r[K-j] = neg[j]
		}
	}
	return sxx, syy
}

// lagSums sets out[j] = sum_{t=0..n-1} a[t] b[t+j] for j = 0..len(out)-1.
// b must hold at least n+len(out)-1 samples. The loop runs over cache
// blocks of t and, within a block, over groups of eight lags that share
// each load of a[t] with the AVX2/FMA kernel where the processor has it
// (dot_amd64.s), and groups of four lags in Go otherwise or for the rest
// (four independent accumulators keep the adder busy).
func lagSums(out, a, b []float64, n int) {
	for j := range out {
		out[j] = 0
	}
	L := len(out)
	for t0 := 0; t0 < n; t0 += directChunk {
		t1 := min(t0+directChunk, n)
		aa := a[t0:t1]
		m := len(aa)
		j := 0
		if hasFMA {
			for ; j+8 <= L; j += 8 {
				s := dot8(aa, b[t0+j:t0+j+m+7])
				for q, v := range s {
					out[j+q] += v
				}
			}
		}
		for ; j+4 <= L; j += 4 {
			bb := b[t0+j : t0+j+m+3]
			s := dot4(aa, bb)
			for q, v := range s {
				out[j+q] += v
			}
		}
		for ; j < L; j++ {
			out[j] += dot1(aa, b[t0+j:t0+j+m])
		}
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

// center writes x - m into dst[:len(x)], zeroes the rest of dst, and
// returns the sum of squares of the centred values.
func center(dst, x []float64, m float64) float64 {
	dst = dst[:len(dst)]
	var s0, s1 float64
	n := len(x)
	d := dst[:n]
	i := 0
	for ; i+2 <= n; i += 2 {
		a, b := x[i]-m, x[i+1]-m
		d[i], d[i+1] = a, b
		s0 += a * a
		s1 += b * b
	}
	for ; i < n; i++ {
		a := x[i] - m
		d[i] = a
		s0 += a * a
	}
	clear(dst[n:])
	return s0 + s1
}

// bufPool recycles the centred copies of the direct path, so that
// repeated calls do not clear megabytes of fresh memory each time.
var bufPool sync.Pool

func getBuf(n int) *[]float64 {
	if p, ok := bufPool.Get().(*[]float64); ok && cap(*p) >= n {
		*p = (*p)[:n]
		return p
	}
	b := make([]float64, n)
	return &b
}

func putBuf(p *[]float64) { bufPool.Put(p) }
