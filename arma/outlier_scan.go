package arma

import (
	"math"
	"math/bits"

	"gonum.org/v1/gonum/dsp/fourier"
)

// The search of Outliers: each kind's pattern in the residuals, the
// sums over present residuals for every time by cross-correlation, and
// the passes that find and remove one outlier each.

// patternTol is the relative size below which the tail of a kind's
// pattern in the residuals is cut: every later value is below patternTol
// times the largest, so the sums lose at most that fraction of a size.
const patternTol = 1e-10

// directMax is the pattern length up to which cross-correlations are
// summed directly (O(n L)) instead of through FFTs (O(n log n)).
const directMax = 64

// kindPattern is the effect of a unit outlier of one kind on the
// residuals at lags j = 0, 1, ...: h_j = g_j + tail for j < len(g), tail
// beyond (tail = pi(1) for a level shift, 0 otherwise).
type kindPattern struct {
	kind OutlierKind
	g    []float64
	tail float64
	gs   []complex128 // FFT of g, for a long pattern
	den  []float64    // sum of h_(t-T)^2 over present residuals t >= T, per T
	num  []float64    // sum of h_(t-T) e_t, per T, of the current pass
}

// at returns h_j.
func (p *kindPattern) at(j int) float64 {
	if j < len(p.g) {
		return p.g[j] + p.tail
	}
	return p.tail
}

// end returns the first index at which the pattern of an outlier at T
// is zero for good, or n.
func (p *kindPattern) end(T, n int) int {
	if p.tail != 0 {
		return n
	}
	return min(n, T+len(p.g))
}

// scanner holds the residuals and the patterns of one search.
type scanner struct {
	n     int
	orig  []float64 // the residuals, 0 where missing
	cur   []float64 // the residuals less the effects removed so far
	mask  []float64 // 1 where a residual is present, 0 where missing
	pats  []kindPattern
	trunc int
	floor float64 // the smallest scale used (see scale)
	fft   *fourier.FFT
	pad   []float64
	spec  []complex128
	buf   []float64
}

// newScanner builds the patterns of the kinds from the pi weights and
// the denominators of their sizes.
func newScanner(resid, pi []float64, kinds []OutlierKind, decay float64) *scanner {
	n := len(resid)
	sc := &scanner{n: n, orig: make([]float64, n), mask: make([]float64, n), buf: make([]float64, n)}
	for t, v := range resid {
		if !math.IsNaN(v) {
			sc.orig[t], sc.mask[t] = v, 1
		}
	}
	sc.cur = append([]float64(nil), sc.orig...)
	ss := 0.0
	for _, v := range sc.orig {
		ss += v * v
	}
	sc.floor = scaleFloor * math.Sqrt(ss/float64(n))
	pi = pi[:min(len(pi), n)]
	for _, k := range kinds {
		g, tail := pattern(k, pi, decay, n)
		sc.pats = append(sc.pats, kindPattern{kind: k, g: cut(g), tail: tail})
		sc.trunc = max(sc.trunc, len(sc.pats[len(sc.pats)-1].g))
	}
	if sc.trunc > directMax {
		size := 1 << bits.Len(uint(n+sc.trunc-2))
		sc.fft = fourier.NewFFT(size)
		sc.pad = make([]float64, size)
		sc.spec = make([]complex128, size/2+1)
	}
	msk := sc.transform(sc.mask)
	mSuffix := suffixSums(sc.mask)
	for i := range sc.pats {
		p := &sc.pats[i]
		p.num = make([]float64, n)
		p.den = make([]float64, n)
		sq := make([]float64, len(p.g))
		for j, v := range p.g {
			sq[j] = v * v
		}
		sc.correlate(p.den, sc.mask, msk, sq, nil)
		if p.tail != 0 {
			gm := make([]float64, n)
			sc.correlate(gm, sc.mask, msk, p.g, nil)
			for t := range p.den {
				p.den[t] += 2*p.tail*gm[t] + p.tail*p.tail*mSuffix[t]
			}
		}
		if len(p.g) > directMax {
			p.gs = sc.fft.Coefficients(nil, sc.padded(p.g))
		}
	}
	return sc
}

// pattern returns the residual pattern h of a unit outlier of kind k as
// g and its tail value, h_j = g_j + tail, over n lags (see Outliers).
func pattern(k OutlierKind, pi []float64, decay float64, n int) ([]float64, float64) {
	switch k {
	case Additive:
		return append([]float64(nil), pi...), 0
	case LevelShift:
		g := make([]float64, len(pi))
		s := 0.0
		for j, v := range pi {
			s += v
			g[j] = s
		}
		for j := range g {
			g[j] -= s
		}
		return g, s
	case TemporaryChange:
		g := make([]float64, n)
		prev := 0.0
		for j := range g {
			v := decay * prev
			if j < len(pi) {
				v += pi[j]
			}
			g[j], prev = v, v
		}
		return g, 0
	}
	return []float64{1}, 0
}

// cut returns g without its tail below patternTol times its largest
// magnitude (at least one value).
func cut(g []float64) []float64 {
	big := 0.0
	for _, v := range g {
		big = math.Max(big, math.Abs(v))
	}
	L := len(g)
	for L > 1 && !(math.Abs(g[L-1]) > patternTol*big) {
		L--
	}
	return g[:L:L]
}

// suffixSums returns s_t = sum_{u >= t} x_u.
func suffixSums(x []float64) []float64 {
	s := make([]float64, len(x))
	acc := 0.0
	for t := len(x) - 1; t >= 0; t-- {
		acc += x[t]
		s[t] = acc
	}
	return s
}

// padded copies x into the zero-padded FFT buffer.
func (sc *scanner) padded(x []float64) []float64 {
	copy(sc.pad, x)
	clear(sc.pad[len(x):])
	return sc.pad
}

// transform returns the FFT of x zero-padded, or nil when no pattern
// needs FFTs.
func (sc *scanner) transform(x []float64) []complex128 {
	if sc.fft == nil {
		return nil
	}
	return sc.fft.Coefficients(nil, sc.padded(x))
}

// correlate writes dst[T] = sum_{j < len(g), T+j < n} g_j x_(T+j): directly
// for a short g, else through the FFT xs of x and gs of g (computed here
// when nil). The FFT size is at least n + len(g) - 1, so that the
// circular correlation has no wrap-around.
func (sc *scanner) correlate(dst, x []float64, xs []complex128, g []float64, gs []complex128) {
	n := sc.n
	if len(g) <= directMax {
		for T := range dst {
			s := 0.0
			for j, w := range g[:min(len(g), n-T)] {
				s += w * x[T+j]
			}
			dst[T] = s
		}
		return
	}
	if gs == nil {
		gs = sc.fft.Coefficients(nil, sc.padded(g))
	}
	prod := sc.spec
	for f := range prod {
		prod[f] = xs[f] * complex(real(gs[f]), -imag(gs[f]))
	}
	out := sc.fft.Sequence(sc.pad, prod)
	scale := 1 / float64(len(out))
	for T := range dst {
		dst[T] = out[T] * scale
	}
}

// best is the largest |t| of a pass.
type best struct {
	T    int
	pat  int
	size float64
	t    float64
}

// scan computes every kind's sums for the current residuals and returns
// the time and kind of the largest |t| among the times not yet used.
func (sc *scanner) scan(sigma float64, used []bool) best {
	cs := sc.transform(sc.cur)
	var suffix []float64
	b := best{T: -1}
	for i := range sc.pats {
		p := &sc.pats[i]
		sc.correlate(p.num, sc.cur, cs, p.g, p.gs)
		if p.tail != 0 {
			if suffix == nil {
				suffix = suffixSums(sc.cur)
			}
			for T := range p.num {
				p.num[T] += p.tail * suffix[T]
			}
		}
		for T, c := range p.num {
			d := p.den[T]
			if used[T] || sc.mask[T] == 0 || !(d > 0.5) {
				continue
			}
			if t := c / (sigma * math.Sqrt(d)); math.Abs(t) > math.Abs(b.t) {
				b = best{T: T, pat: i, size: c / d, t: t}
			}
		}
	}
	return b
}

// found is an outlier found by the search: time and pattern index.
type found struct {
	T   int
	pat int
}

// search runs the detection passes: the largest |t| above crit is
// recorded and its effect removed from the residuals, until none is
// above crit or maxCount are found. sigma 0 means the robust scale of
// the current residuals at each pass.
func (sc *scanner) search(crit, sigma float64, maxCount int, passes *int) ([]found, error) {
	used := make([]bool, sc.n)
	var out []found
	for len(out) < maxCount {
		*passes++
		s := sc.scale(sc.cur, sigma)
		if !(s > 0) {
			return nil, &SeriesError{Series: "residuals", Kind: ErrConstant, Detail: "every residual present is zero, so there is no scale for the t-statistics"}
		}
		b := sc.scan(s, used)
		if b.T < 0 || math.Abs(b.t) <= crit {
			break
		}
		used[b.T] = true
		out = append(out, found{T: b.T, pat: b.pat})
		sc.remove(sc.cur, b.T, b.pat, b.size)
	}
	return out, nil
}

// scaleFloor bounds the scale of the t-statistics from below, relative
// to the root mean square of the residuals, so that t stays finite when
// the residuals besides the outliers (nearly) vanish.
const scaleFloor = 1e-12

// scale returns sigma, or the robust scale of the present values of e
// when sigma is 0, at least sc.floor.
func (sc *scanner) scale(e []float64, sigma float64) float64 {
	s := sigma
	if s == 0 {
		s = robustScale(e, sc.mask, sc.buf)
	}
	return math.Max(s, sc.floor)
}

// remove subtracts w times the residual pattern of an outlier at T from
// the present residuals in e.
func (sc *scanner) remove(e []float64, T, pat int, w float64) {
	p := &sc.pats[pat]
	end := p.end(T, sc.n)
	for t := T; t < end; t++ {
		e[t] -= w * p.at(t-T) * sc.mask[t]
	}
}
