package ccf

import (
	"math"
	"math/cmplx"
	"slices"
	"sort"
	"strconv"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/poly"
)

// IdentifySettings tunes Identify. The zero value gives the defaults.
type IdentifySettings struct {
	// Level is the significance level of the dead-time rule; zero means
	// 0.99. A lag counts as the start of the response when its weight
	// is significant at Level and either the next or the one after is
	// significant at 0.95, or the weight is significant at
	// 1 - (1-Level)/10 on its own (a lone spike must be strong).
	Level float64
	// MaxR and MaxS bound the orders of delta and omega tried; zero
	// means 2. Set a negative value to allow order zero only. Bounds
	// beyond the number of weights after the dead time are cut to it.
	MaxR, MaxS int
	// Input names the input in the result and in messages; empty means
	// the weights' Input, or "x".
	Input string
	// Penalty is the score added per free coefficient when ranking the
	// forms; zero means 2 (the AIC weight).
	Penalty float64
	// MinFraction is the smallest |v_k|, as a fraction of the largest
	// |v_k| over all lags, that the dead-time rule accepts as the start
	// of the response; zero means 0.1, a negative value means no such
	// bound. In long records tiny weights are statistically significant
	// although negligible (in closed-loop data a small bias at the lags
	// before the dead time is typical); this keeps them from being read
	// as the dead time.
	MinFraction float64
}

// Identification is the result of Identify for one input.
type Identification struct {
	// Input is the input's name.
	Input string
	// DeadTime is the dead time b in samples.
	DeadTime int
	// Offset is the level subtracted from the weights before the
	// dead-time rule: the median of the cross-correlation at negative
	// lags times the weight scale, when that median is itself outside
	// the 95 % band (a common level left by incomplete prewhitening),
	// and 0 otherwise. The forms are fitted to the weights minus Offset.
	Offset float64
	// Weights are the weights used.
	Weights *Weights
	// Forms are the fitted structures, best first: by increasing Score,
	// except that Redundant and TooSlow forms come after all others.
	Forms []Form
	// Corner is the corner-method table of the weights (nil when there
	// are too few lags), and CornerR, CornerS the orders it points to
	// (-1 when it cannot tell).
	Corner           *CornerTable
	CornerR, CornerS int
}

// Form is one proposed structure (b, r, s) of an input term
// B^b omega(B)/delta(B) x_t, with the numbers fitted to the weights and
// the evidence for it. It holds numbers only: package tf turns a Form
// into a model input with named coefficients.
type Form struct {
	// Delay is the dead time b, R = deg delta, S = deg omega.
	Delay, R, S int
	// Num is omega(B), Den is delta(B) (Den[0] = 1), ascending powers of
	// B, signs as stored, fitted to the weights.
	Num, Den []float64
	// Chi2 is sum_k ((v_k - vhat_k)/se_k)^2 over lags b..K (the
	// generalised sum with the weights' correlations when Weights.Cov is
	// set); Score is Chi2 plus Penalty times the number of coefficients
	// (R+S+1), an information criterion of the AIC kind.
	Chi2, Score float64
	// Corner reports whether the corner method points to these orders.
	Corner bool
	// Redundant reports a zero of omega within 0.05 of a pole of delta in
	// the z-plane: the pair nearly cancels, so a form with one order less
	// in each describes the same weights. Identify ranks redundant forms
	// after all others.
	Redundant bool
	// TooSlow reports a pole so slow that its weights decay by less than
	// half over the fitted lags (|z|^m > 0.5 for m = K-b+1 weights): the
	// window cannot determine it, and such forms often stand in for a
	// level offset or correlated errors. Identify ranks them after the
	// others; lengthen the window (more lags) to consider slow poles.
	TooSlow bool
	// Pattern names the shape of the fitted weights after the first S
	// lags: "cut-off" (R = 0), "exponential decay" or "alternating decay"
	// (one real pole z = -Den[1], positive or negative), "two-pole decay"
	// (two real poles) or "damped oscillation" (a complex pair), as
	// read from the z-plane poles of Den.
	Pattern string
}

// Identify proposes the dead time and ranked (r, s) forms for an input
// from its impulse-response weights (see the package documentation).
//
// It returns a *NoResponseError when no lag passes the dead-time rule, a
// *SettingError for settings out of range (IdentifySettings.Validate) or
// a nil w, a *SeriesError when w has fewer than two lags (ErrShort), its
// standard errors another length (ErrLength) or a standard error that is
// not a positive finite number (ErrSample), and a *SampleError for a NaN
// or infinite weight.
func Identify(w *Weights, s *IdentifySettings) (*Identification, error) {
	r0, err := identify(w, s)
	return r0, withOp("ccf.Identify", err)
}

func identify(w *Weights, s *IdentifySettings) (*Identification, error) {
	if err := s.Validate(); err != nil {
		return nil, err
	}
	set := s.withDefaults()
	if w == nil {
		return nil, &SettingError{Setting: "w", Value: "nil", Rule: "must be weights (from ImpulseWeights or DistributedLag)"}
	}
	name := set.Input
	if name == "" {
		name = w.Input
	}
	if name == "" {
		name = "x"
	}
	if err := checkWeights(w, name); err != nil {
		return nil, err
	}
	id := &Identification{Input: name, Weights: w, CornerR: -1, CornerS: -1}
	v := w.V
	if off := negativeLevel(w); off != 0 {
		id.Offset = off
		v = make([]float64, len(w.V))
		for k := range v {
			v[k] = w.V[k] - off
		}
	}
	b, err := deadTime(v, w.SE, set.Level, set.MinFraction)
	if err != nil {
		e := err.(*NoResponseError)
		e.Input = name
		return nil, e
	}
	id.DeadTime = b
	// No form can have more coefficients than there are weights from the
	// dead time on: larger bounds are cut to that (and cannot make the
	// loops of fitForms run for ever).
	maxR, maxS := min(set.MaxR, len(v)-b-1), min(set.MaxS, len(v)-b-1)
	wv := &Weights{Input: w.Input, V: v, SE: w.SE, N: w.N, Cov: w.Cov}
	id.Corner = Corner(wv, min(len(v), b+8), 4)
	if id.Corner != nil {
		id.CornerR, id.CornerS = id.Corner.pick(b, maxR, maxS)
	}
	id.Forms = fitForms(wv, b, maxR, maxS, set.Penalty, id.CornerR, id.CornerS)
	rankForms(id.Forms)
	return id, nil
}

// withDefaults returns a copy of the settings (the zero value for nil)
// with every default filled in: Level 0.99, Penalty 2, MaxR and MaxS by
// the order-bound rule (2 for zero, order zero only for a negative
// value), MinFraction 0.1 (0 for a negative value).
func (s *IdentifySettings) withDefaults() IdentifySettings {
	var set IdentifySettings
	if s != nil {
		set = *s
	}
	if set.Level == 0 {
		set.Level = 0.99
	}
	if set.Penalty == 0 {
		set.Penalty = 2
	}
	set.MaxR, set.MaxS = errs.OrderBound(set.MaxR, 2), errs.OrderBound(set.MaxS, 2)
	switch {
	case set.MinFraction == 0:
		set.MinFraction = 0.1
	case set.MinFraction < 0:
		set.MinFraction = 0
	}
	return set
}

// checkWeights checks that w has at least two lags, finite weights and a
// positive finite standard error for each of them; name names the input
// in the errors.
func checkWeights(w *Weights, name string) error {
	if len(w.SE) != len(w.V) {
		return lengthError(name+" weights", name+" weight standard errors", len(w.V), len(w.SE))
	}
	if len(w.V) < 2 {
		return shortError(name+" weights", len(w.V), 2, "lags 0 and 1 at least")
	}
	if err := checkSeries(name+" weights", w.V); err != nil {
		return err
	}
	for k := range w.V {
		if !(w.SE[k] > 0) || math.IsInf(w.SE[k], 0) {
			return &SeriesError{Series: name + " weight standard errors", Kind: ErrSample,
				Detail: "lag " + strconv.Itoa(k) + " holds " + strconv.FormatFloat(w.SE[k], 'g', -1, 64) + "; standard errors must be positive finite numbers"}
		}
	}
	return nil
}

// fitForms fits every form (b, r, s) with r <= maxR, s <= maxS to the
// weights w (their errors correlated as w.Cov says, when it has their
// size), scores each with penalty per coefficient and marks the one at
// the corner (cr, cs).
func fitForms(w *Weights, b, maxR, maxS int, penalty float64, cr, cs int) []Form {
	var corr func(i, j int) float64
	if w.Cov != nil {
		if n, _ := w.Cov.Dims(); n == len(w.V) {
			corr = func(i, j int) float64 { return w.Cov.At(i, j) / (w.SE[i] * w.SE[j]) }
		}
	}
	var forms []Form
	for r := 0; r <= maxR; r++ {
		for sd := 0; sd <= maxS; sd++ {
			f := fitRational(w.V, w.SE, corr, b, r, sd)
			if f.num == nil {
				continue
			}
			c := Form{Delay: b, R: r, S: sd, Num: f.num, Den: f.den, Chi2: f.chi2,
				Score: f.chi2 + penalty*float64(r+sd+1), Corner: r == cr && sd == cs}
			c.Pattern = pattern(c.Den)
			c.Redundant = nearCancel(c.Num, c.Den, 0.05)
			c.TooSlow = tooSlow(c.Den, len(w.V)-b)
			forms = append(forms, c)
		}
	}
	return forms
}

// rankForms sorts the forms best first: by increasing Score, Redundant
// and TooSlow forms after all others, ties to fewer coefficients.
func rankForms(forms []Form) {
	sort.SliceStable(forms, func(i, j int) bool {
		a, c := forms[i], forms[j]
		if ra, rc := a.Redundant || a.TooSlow, c.Redundant || c.TooSlow; ra != rc {
			return !ra
		}
		if a.Score != c.Score {
			return a.Score < c.Score
		}
		return a.R+a.S < c.R+c.S
	})
}

// String writes the structure as "b=3 (r=1, s=0)": the dead time, the
// degree of delta and the degree of omega.
func (f Form) String() string {
	return "b=" + strconv.Itoa(f.Delay) + " (r=" + strconv.Itoa(f.R) + ", s=" + strconv.Itoa(f.S) + ")"
}

// deadTime applies the dead-time rule of IdentifySettings.Level to the
// weights' t-ratios.
func deadTime(v, se []float64, level, frac float64) (int, error) {
	z := normalQuantile((1 + level) / 2)
	vmax := 0.0
	for _, x := range v {
		vmax = math.Max(vmax, math.Abs(x))
	}
	small := frac * vmax
	zStrong := normalQuantile(1 - (1-level)/20)
	z95 := normalQuantile(0.975)
	best, bestLag := 0.0, 0
	for k := range v {
		t := math.Abs(v[k] / se[k])
		if t > best {
			best, bestLag = t, k
		}
		if t <= z || math.Abs(v[k]) < small {
			continue
		}
		if t > zStrong {
			return k, nil
		}
		for j := k + 1; j <= k+2 && j < len(v); j++ {
			if math.Abs(v[j]/se[j]) > z95 && math.Abs(v[j]) >= small {
				return k, nil
			}
		}
	}
	return 0, &NoResponseError{MaxLag: len(v) - 1, Level: level, Largest: best, Lag: bestLag}
}

// negativeLevel returns the common level of the cross-correlation at
// negative lags, scaled to weight units, when it is clearly non-zero.
func negativeLevel(w *Weights) float64 {
	c := w.Corr
	if c == nil || c.MaxLag < 8 {
		return 0
	}
	neg := slices.Clone(c.R[:c.MaxLag])
	sort.Float64s(neg)
	m := len(neg)
	med := neg[m/2]
	if m%2 == 0 {
		med = (neg[m/2-1] + neg[m/2]) / 2
	}
	if math.Abs(med) <= c.Band(0.95) {
		return 0
	}
	return med * c.SDY / c.SDX
}

// pattern describes the decay of the weights of 1/den(B) from its
// z-plane poles (the roots of z^r + den[1] z^(r-1) + ... + den[r]).
func pattern(den []float64) string {
	switch len(den) - 1 {
	case 0:
		return "cut-off"
	case 1:
		if -den[1] >= 0 {
			return "exponential decay"
		}
		return "alternating decay"
	case 2:
		if den[1]*den[1]-4*den[2] < 0 {
			return "damped oscillation"
		}
		return "two-pole decay"
	}
	return "decay of order " + strconv.Itoa(len(den)-1)
}

// nearCancel reports whether a z-plane zero of num(B) lies within tol of a
// z-plane pole of den(B) (z = 1/B: the roots of the reversed
// coefficients).
func nearCancel(num, den []float64, tol float64) bool {
	if len(num) < 2 || len(den) < 2 {
		return false
	}
	zs, err1 := poly.Roots(poly.Reciprocal(num))
	ps, err2 := poly.Roots(poly.Reciprocal(den))
	if err1 != nil || err2 != nil {
		return false
	}
	for _, z := range zs {
		for _, p := range ps {
			if cmplx.Abs(z-p) < tol {
				return true
			}
		}
	}
	return false
}

// tooSlow reports whether a z-plane pole of den(B) has |z|^m > 0.5.
func tooSlow(den []float64, m int) bool {
	if len(den) < 2 {
		return false
	}
	ps, err := poly.Roots(poly.Reciprocal(den))
	if err != nil {
		return false
	}
	for _, p := range ps {
		if math.Pow(cmplx.Abs(p), float64(m)) > 0.5 {
			return true
		}
	}
	return false
}
