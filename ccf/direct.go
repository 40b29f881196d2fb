package ccf

import "github.com/backshift/backshift/internal/vec"

// directChunk is the number of samples per cache block of the direct
// path: the centred blocks of x and y (8 bytes per sample each, plus K
// lags) stay in the first-level cache for small K.
const directChunk = 2048

// crossDirect writes the unnormalised lag sums n*c_xy(k) into r
// (r[K+k], k = -K..K) and returns the sums of squares of the centred x and
// y and their means.
//
// The series are read once, in blocks of C samples of t: each block of x
// and of y, extended by K+8 samples (zero past the end), is centred on a
// provisional level p (the mean of the first 4096 samples) into a small
// buffer, and the block's contributions sum_t x'_t y'_{t+k} (k >= 0) and
// sum_t y'_t x'_{t+k} (c_xy(-k) = c_yx(k)) are added for every lag, along
// with the sums and sums of squares of x' = x - p_x and y' = y - p_y.
// The exact centring follows from the identity, for k >= 0 and
// d = mean(x'), e = mean(y'),
//
//	sum_{t=0}^{n-1-k} (x'_t - d)(y'_{t+k} - e)
//	    = S_k - e sum_{t<n-k} x'_t - d sum_{t>=k} y'_t + (n-k) d e
//
// (and its mirror for negative lags), whose corrections need only the
// first and last K samples. Since p is close to the mean, d and e are of
// the order of the standard deviations and the corrections lose no
// accuracy. Nothing of the series' length is allocated.
func crossDirect(r, x, y []float64, K int) (sxx, syy, mx, my float64) {
	n := len(x)
	px, py := headMean(x), headMean(y)
	C := max(directChunk, K)
	pad := K + 8
	bx := make([]float64, C+pad)
	by := make([]float64, C+pad)
	// Lags 0..K forward and 1..K backward, in groups of eight.
	pos := make([]float64, (K+8)/8*8)
	neg := make([]float64, (K+7)/8*8)
	var sx, sy float64
	for t0 := 0; t0 < n; t0 += C {
		m := min(C, n-t0)
		e := min(t0+m+pad, n)
		s1, s2 := center(bx[:m+pad], x[t0:e], px, m)
		sx, sxx = sx+s1, sxx+s2
		s1, s2 = center(by[:m+pad], y[t0:e], py, m)
		sy, syy = sy+s1, syy+s2
		lagSums(pos, bx[:m], by[:m+pad])
		lagSums(neg, by[:m], bx[1:m+pad])
	}
	fn := float64(n)
	d, e := sx/fn, sy/fn
	// Head and tail sums of x' and y' over the first and last k samples.
	var hx, hy, tx, ty float64
	for k := 0; k <= K; k++ {
		if k > 0 {
			hx += x[k-1] - px
			hy += y[k-1] - py
			tx += x[n-k] - px
			ty += y[n-k] - py
		}
		nk := float64(n - k)
		// k >= 0: x'_t for t < n-k (sx - tx), y'_{t+k} for t+k >= k (sy - hy).
		r[K+k] = pos[k] - e*(sx-tx) - d*(sy-hy) + nk*d*e
		if k > 0 {
			// -k: x'_t for t >= k (sx - hx), y'_{t-k} for t-k < n-k (sy - ty).
			r[K-k] = neg[k-1] - e*(sx-hx) - d*(sy-ty) + nk*d*e
		}
	}
	sxx -= fn * d * d
	syy -= fn * e * e
	return sxx, syy, px + d, py + e
}

// headMean returns the mean of the first 4096 samples of x (all of them
// for shorter series), the provisional level of crossDirect.
func headMean(x []float64) float64 {
	h := x[:min(len(x), 4096)]
	return accurateSum(h) / float64(len(h))
}

// center writes src - mu into dst (zero past len(src)) and returns the
// sum and the sum of squares of the first m centred values.
func center(dst, src []float64, mu float64, m int) (sum, sumsq float64) {
	var s0, s1, q0, q1 float64
	d := dst[:m]
	sm := src[:m]
	i := 0
	for ; i+2 <= m; i += 2 {
		a, b := sm[i]-mu, sm[i+1]-mu
		d[i], d[i+1] = a, b
		s0 += a
		s1 += b
		q0 += a * a
		q1 += b * b
	}
	for ; i < m; i++ {
		a := sm[i] - mu
		d[i] = a
		s0 += a
		q0 += a * a
	}
	for k := m; k < len(src); k++ {
		dst[k] = src[k] - mu
	}
	clear(dst[len(src):])
	return s0 + s1, q0 + q1
}

// lagSums adds the lag products of one block of crossDirect: out[j] +=
// sum_{i<len(a)} a[i] b[i+j] (vec.LagSums, with its AVX2/FMA kernel
// where the processor has it). Tests set it to vec.LagSumsGo to run the
// pure-Go loops through the whole direct path.
var lagSums = vec.LagSums
