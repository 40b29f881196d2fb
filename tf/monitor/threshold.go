package monitor

import (
	"math"
	"strconv"
	"sync"
	"sync/atomic"
)

// overshoot is Siegmund's correction for the excess of a normal random
// walk over a barrier, 2 * 0.583 (Siegmund 1985, Sequential Analysis,
// the corrected diffusion approximation; the constant 0.583 is
// -zeta(1/2)/sqrt(2*pi)).
const overshoot = 1.166

// CusumARL returns Siegmund's corrected diffusion approximation to the
// average run length, in samples, of the one-sided CUSUM
//
//	S_t = max(0, S_{t-1} + x_t - k),  alarm when S_t > h,  S_0 = 0,
//
// on independent normal x_t with the given mean and unit variance:
//
//	ARL ~ (exp(-2 d b) + 2 d b - 1) / (2 d^2),  d = mean - k,  b = h + 1.166,
//
// and b^2 when d = 0. The in-control run length is CusumARL(k, h, 0);
// the delay to detect a shift of s standard deviations is
// CusumARL(k, h, s). It returns +Inf when the value leaves the range of
// float64 and NaN for a NaN argument.
//
// References: Siegmund, D. (1985), Sequential Analysis: Tests and
// Confidence Intervals, Springer, the chapter on corrected Brownian
// approximations (chapter X, from memory); Page, E. S. (1954),
// Continuous inspection schemes, Biometrika 41:100-115.
func CusumARL(k, h, mean float64) float64 {
	d := mean - k
	b := h + overshoot
	if math.Abs(d) < 1e-9 {
		return b * b
	}
	x := 2 * d * b
	return (math.Expm1(-x) + x) / (2 * d * d)
}

// CusumThreshold returns the threshold h at which the one-sided CUSUM
// with reference k > 0 on N(0, 1) samples has the in-control average run
// length arl by CusumARL: it solves exp(x) - x - 1 = 2 k^2 arl for
// x = 2 k (h + 1.166) by Newton's method, started above the root so that
// the iterates fall monotonically to it. The result may be negative for
// a small arl (a threshold below zero alarms at once; Settings refuses
// such targets). It returns NaN when k or arl is not a positive finite
// number.
//
// For a two-sided CUSUM made of two such sides, the in-control run
// length is about half that of one side (the two sides' alarm rates add:
// 1/ARL = 1/ARL_up + 1/ARL_down, from memory: van Dobben de Bruyn 1968,
// Cumulative Sum Tests, Griffin), so ask for twice the target.
func CusumThreshold(k, arl float64) float64 {
	if !(k > 0) || !(arl > 0) || math.IsInf(k, 0) || math.IsInf(arl, 0) {
		return math.NaN()
	}
	c := 2 * k * k * arl
	// e^x - x - 1 >= x^2/2 and >= c at x = log(2c + 2), so the root lies
	// below both.
	x := math.Min(math.Sqrt(2*c), math.Log(2*c+2))
	for i := 0; i < 200; i++ {
		f := math.Expm1(x) - x - c
		d := math.Expm1(x)
		if d <= 0 {
			break
		}
		step := f / d
		x -= step
		if math.Abs(step) <= 1e-14*math.Max(1, x) {
			break
		}
	}
	return x/(2*k) - overshoot
}

// chainStates is the number of states of the Markov chain that computes
// the variance test's run lengths. Against the 3000-state chains of
// testdata/monitor/arl.json the relative error at 200 states is below
// 0.1 % for run lengths up to 10^3 and below 1 % at the default
// thresholds (in-control run lengths near 2 * 10^4, where it is 0.3 and
// 0.7 %; TestVarianceChainReference): a shift of h by about 0.03, well
// inside the Monte Carlo agreement the simulations check. A calibration
// takes about 20 ms.
const chainStates = 200

// chainARL returns the average run length from S = 0 of the CUSUM
// S' = max(0, S + X), alarm when S' > h, with X distributed by cdf, by
// the Markov chain of Brook and Evans (1972, Biometrika 59:539-549):
// m states of width w = 2h/(2m - 1), state 0 the interval [0, w/2) and
// state j the interval [(j - 1/2) w, (j + 1/2) w). State 0 stands for
// S = 0 (where the statistic sits most of the time); within the others
// the statistic is taken as uniform, so that a transition probability is
// a second difference of icdf, the integral of cdf:
//
//	P(i -> j) = (I((j-i+1) w) - 2 I((j-i) w) + I((j-i-1) w)) / w,  i, j >= 1.
//
// Averaging over the state, rather than taking its centre as Brook and
// Evans do, smooths the unbounded density of a squared normal sample,
// whose centre-point chain converges slowly and unevenly in m. The run
// length solves (I - P) L = 1; the matrix is an M-matrix (rows of P sum
// to at most 1), so elimination needs no pivoting. It returns +Inf when
// the chain has no way out (a singular system).
func chainARL(cdf, icdf func(float64) float64, h float64, m int) float64 {
	w := 2 * h / float64(2*m-1)
	a := make([]float64, m*m)
	// iv[d+m] = I(d w) for d = -m .. m.
	iv := make([]float64, 2*m+1)
	for d := -m; d <= m; d++ {
		iv[d+m] = icdf(float64(d) * w)
	}
	second := func(d int) float64 { return (iv[d+1+m] - 2*iv[d+m] + iv[d-1+m]) / w }
	a[0] = 1 - cdf(w/2)
	for j := 1; j < m; j++ {
		a[j] = -(cdf((float64(j)+0.5)*w) - cdf((float64(j)-0.5)*w))
	}
	for i := 1; i < m; i++ {
		row := a[i*m : (i+1)*m]
		row[0] = -(iv[1-i+m] - iv[-i+m]) / w
		for j := 1; j < m; j++ {
			row[j] = -second(j - i)
		}
		row[i]++
	}
	return solveM(a, m)
}

// solveM solves a L = 1 for the m-by-m M-matrix a (row-major, overwritten)
// by elimination without pivoting and returns L[0], or +Inf when a
// pivot is not positive.
func solveM(a []float64, m int) float64 {
	b := make([]float64, m)
	for i := range b {
		b[i] = 1
	}
	for p := 0; p < m; p++ {
		piv := a[p*m+p]
		if !(piv > 0) {
			return math.Inf(1)
		}
		rp := a[p*m : (p+1)*m]
		for i := p + 1; i < m; i++ {
			f := a[i*m+p] / piv
			if f == 0 {
				continue
			}
			ri := a[i*m : (i+1)*m]
			for j := p; j < m; j++ {
				ri[j] -= f * rp[j]
			}
			b[i] -= f * b[p]
		}
	}
	for i := m - 1; i >= 0; i-- {
		s := b[i]
		for j := i + 1; j < m; j++ {
			s -= a[i*m+j] * b[j]
		}
		b[i] = s / a[i*m+i]
	}
	return b[0]
}

// chiSquare1 returns P(z^2 <= x) for z ~ N(0, ratio).
func chiSquare1(x, ratio float64) float64 {
	if x <= 0 {
		return 0
	}
	return math.Erf(math.Sqrt(x / (2 * ratio)))
}

// chiSquare1Integral returns the integral of chiSquare1 from 0 to x:
// (x - ratio) erf(sqrt(x/(2 ratio))) + sqrt(2 ratio x / pi) exp(-x/(2 ratio))
// (its derivative is chiSquare1), 0 for x <= 0.
func chiSquare1Integral(x, ratio float64) float64 {
	if x <= 0 {
		return 0
	}
	return (x-ratio)*math.Erf(math.Sqrt(x/(2*ratio))) + math.Sqrt(2*ratio*x/math.Pi)*math.Exp(-x/(2*ratio))
}

// varianceARL returns the average run length of one side of the
// variance test: the CUSUM on z_t^2 with z_t ~ N(0, ratio) (ratio the
// variance over its in-control value), increments X = z^2 - k (up) or
// X = k - z^2 (down), threshold h, by chainARL. For the down side the
// integral of P(X <= x) = 1 - P(z^2 < k - x) is
// E[(z^2 - (k - x))^+] = ratio - (k - x) + chiSquare1Integral(k - x).
func varianceARL(up bool, k, h, ratio float64) float64 {
	if up {
		return chainARL(func(x float64) float64 { return chiSquare1(x+k, ratio) },
			func(x float64) float64 { return chiSquare1Integral(x+k, ratio) }, h, chainStates)
	}
	return chainARL(func(x float64) float64 { return 1 - chiSquare1(k-x, ratio) },
		func(x float64) float64 { return ratio - (k - x) + chiSquare1Integral(k-x, ratio) }, h, chainStates)
}

// varianceReference returns the reference values of the two sides of the
// variance test tuned to a variance ratio r > 1 (up) and 1/r (down): the
// likelihood-ratio increments of N(0, r) against N(0, 1), scaled to
// z^2 - r ln r / (r - 1) and ln r / (r - 1) - z^2.
func varianceReference(r float64) (up, down float64) {
	l := math.Log(r)
	return r * l / (r - 1), l / (r - 1)
}

// varianceKey and varianceCache keep the calibrated thresholds, which
// depend only on the ratio and the target, for up to maxCached pairs (a
// fleet of loops usually shares a few settings; beyond that each New
// calibrates afresh, about 20 ms).
type varianceKey struct{ ratio, arl float64 }

const maxCached = 256

var (
	varianceCache sync.Map // varianceKey -> [2]float64
	cached        atomic.Int32
)

// varianceThresholds returns the thresholds of the up and down sides of
// the variance test at which each side's in-control run length is arl
// (twice the two-sided target), found by regula falsi (the Illinois
// variant) on log ARL(h), which is close to linear in h.
func varianceThresholds(r, arl float64) (up, down float64) {
	key := varianceKey{r, arl}
	if v, ok := varianceCache.Load(key); ok {
		t := v.([2]float64)
		return t[0], t[1]
	}
	ku, kd := varianceReference(r)
	up = solveThreshold(func(h float64) float64 { return varianceARL(true, ku, h, 1) }, arl)
	down = solveThreshold(func(h float64) float64 { return varianceARL(false, kd, h, 1) }, arl)
	if cached.Add(1) <= maxCached {
		varianceCache.Store(key, [2]float64{up, down})
	}
	return up, down
}

// solveThreshold returns h with arlOf(h) = target to a relative 1e-6,
// arlOf increasing in h.
func solveThreshold(arlOf func(float64) float64, target float64) float64 {
	lt := math.Log(target)
	f := func(h float64) float64 { return math.Log(arlOf(h)) - lt }
	lo, hi := 0.0, 1.0
	flo, fhi := f(lo), f(hi)
	for fhi < 0 && hi < 1e6 {
		lo, flo = hi, fhi
		hi *= 2
		fhi = f(hi)
	}
	if flo >= 0 {
		return lo
	}
	side := 0
	for i := 0; i < 100 && hi-lo > 1e-9*hi; i++ {
		h := (lo*fhi - hi*flo) / (fhi - flo)
		fh := f(h)
		if math.Abs(fh) < 1e-6 {
			return h
		}
		if fh < 0 {
			lo, flo = h, fh
			if side == -1 {
				fhi /= 2
			}
			side = -1
		} else {
			hi, fhi = h, fh
			if side == 1 {
				flo /= 2
			}
			side = 1
		}
	}
	return (lo + hi) / 2
}

// formatFloat formats v for a message.
func formatFloat(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
