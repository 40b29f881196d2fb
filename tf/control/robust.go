package control

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strconv"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/tf"
)

// Draw returns one plant drawn with the random source rng, such as a
// model whose parameters are drawn from an estimate's covariance
// (ModelDraw). It must use only rng for randomness, so that a seed fixes
// every draw.
type Draw func(rng *rand.Rand) (tf.Rational, error)

// DefaultLevels are the quantile levels of RobustSettings.Levels' default.
var DefaultLevels = []float64{0.05, 0.5, 0.95}

// RobustSettings chooses the draws of Robust. The zero value is the
// default.
type RobustSettings struct {
	// Draws is the number of plants drawn; 0 means 1000. At most 10^6,
	// and Draws times the horizon (Loop.Horizon, 200 when 0) at most
	// MaxBandSamples.
	Draws int
	// Seed seeds the random source rand.New(rand.NewPCG(Seed, 0)) passed
	// to the Draw function.
	Seed uint64
	// Levels are the quantile levels reported, each in (0, 1); nil means
	// DefaultLevels.
	Levels []float64
	// Loop is passed to the analysis of each loop; its Horizon 0 means
	// 200 samples here (the bands need one length for every draw).
	Loop LoopSettings
}

// MaxBandSamples is the largest Draws times horizon that Robust
// accepts. The bands are exact quantiles over the stable loops at each
// sample, so Robust keeps three responses (set-point output and control,
// load output) of every stable loop: 3 x 8 bytes per draw and sample,
// 240 MB at this bound. A larger product (10^6 draws of the default 200
// samples, or 1000 draws of 10^7 samples) would exhaust memory, which
// ends the process with a fatal error no caller can recover from, so it
// is refused up front: fewer draws (1000 to 10^4 give quantiles at 5 %
// and 95 % to a few per cent) or a shorter horizon.
const MaxBandSamples = 10_000_000

// Validate checks the settings and returns a *SettingError naming the
// field, or nil.
func (s RobustSettings) Validate() error { return s.validate("control.RobustSettings.Validate") }

func (s RobustSettings) validate(op string) error {
	if s.Draws < 0 || s.Draws > 1e6 {
		return &SettingError{Op: op, Setting: "RobustSettings.Draws", Value: strconv.Itoa(s.Draws), Rule: "must lie in 0..10^6 (0 means 1000)"}
	}
	if err := s.Loop.validate(op); err != nil {
		return err
	}
	if n, h := s.sizes(); n*h > MaxBandSamples {
		return &SettingError{Op: op, Setting: "RobustSettings.Draws and RobustSettings.Loop.Horizon", Value: strconv.Itoa(n) + " x " + strconv.Itoa(h) + " samples",
			Rule: "their product must be at most MaxBandSamples = 10^7 (the bands keep three responses of every stable draw: 3 x 8 bytes per draw and sample); use fewer draws or a shorter horizon"}
	}
	for i, v := range s.Levels {
		if !(v > 0 && v < 1) {
			return fsetting(op, "RobustSettings.Levels["+strconv.Itoa(i)+"]", v, "a quantile level must lie strictly between 0 and 1")
		}
	}
	return nil
}

// sizes returns the number of draws and the horizon with the defaults
// applied (1000 draws, 200 samples).
func (s RobustSettings) sizes() (draws, horizon int) {
	draws, horizon = s.Draws, s.Loop.Horizon
	if draws == 0 {
		draws = 1000
	}
	if horizon == 0 {
		horizon = 200
	}
	return draws, horizon
}

// Spread holds quantiles of one figure over the stable drawn loops:
// Values[i] is the quantile at Levels[i] (linear interpolation between
// order statistics, numpy.quantile's default and R's type 7). A figure
// that does not exist for a loop (no gain crossover, a response that
// does not settle in the horizon) counts as +Inf, the good end for a
// margin and the bad end for a time; NaN when no loop was stable.
type Spread struct {
	Levels []float64
	Values []float64
}

// Robustness summarises the loops of one controller over drawn plants.
type Robustness struct {
	// Draws is the number of plants drawn, Stable the number of stable
	// loops, FractionStable their share.
	Draws          int
	Stable         int
	FractionStable float64
	// The spreads of the loop figures over the stable loops (see Loop):
	// margins (phase margin in radians), peaks, the set-point overshoot,
	// settling time (samples) and IAE, the load peak and IAE.
	GainMargin        Spread
	PhaseMargin       Spread
	DelayMargin       Spread
	SensitivityPeak   Spread
	ComplementaryPeak Spread
	Overshoot         Spread
	Settle            Spread
	SetpointIAE       Spread
	LoadPeak          Spread
	LoadIAE           Spread
	// SetpointBand[i][t] and LoadBand[i][t] are the quantiles at
	// Levels[i] of the outputs at sample t over the stable loops;
	// ControlBand[i][t] those of the controller output after a set-point
	// step.
	Levels       []float64
	SetpointBand [][]float64
	LoadBand     [][]float64
	ControlBand  [][]float64
}

// Robust closes the controller c around each of s.Draws plants returned
// by draw (called with one random source seeded by s.Seed, in order, so
// the result is deterministic) and returns the fraction of stable loops,
// the quantiles of each figure and bands of the step responses over the
// stable loops. It runs on the caller's goroutine; ctx is checked every
// 64 draws. Its memory grows with Draws times the horizon (see
// MaxBandSamples, the bound it enforces).
//
// Errors (Op "control.Robust"): a *SettingError for bad settings, a nil
// draw or ctx, or a draw function that panicked (naming the draw number: the
// fault is the caller's function); the error of draw, or of a loop that
// cannot be analysed (see Analyze), wrapped in a *ModelError naming the
// draw; ctx's error.
func Robust(ctx context.Context, c tf.Rational, draw Draw, s RobustSettings) (out Robustness, err error) {
	const op = "control.Robust"
	defer errs.Recover(op, &err)
	if err := s.validate(op); err != nil {
		return Robustness{}, err
	}
	if draw == nil {
		return Robustness{}, &SettingError{Op: op, Setting: "draw", Value: "nil", Rule: "must be a function returning one plant per call (ModelDraw makes one from an estimate's covariance)"}
	}
	if ctx == nil {
		return Robustness{}, &SettingError{Op: op, Setting: "ctx", Value: "nil", Rule: "pass a context (context.Background() when nothing cancels the draws)"}
	}
	n, h := s.sizes()
	ls := s.Loop
	ls.Horizon = h
	levels := s.Levels
	if levels == nil {
		levels = DefaultLevels
	}
	rng := rand.New(rand.NewPCG(s.Seed, 0))
	a := newAnalyzer()
	var loops []Loop
	for i := range n {
		if i%64 == 0 {
			if err := ctx.Err(); err != nil {
				return Robustness{}, err
			}
		}
		p, err, fault := callDraw(op, draw, rng, i)
		if fault != nil {
			return Robustness{}, fault
		}
		if err == nil {
			var lp Loop
			if lp, err = a.analyze(c, p, ls); err == nil && lp.Stable {
				// Keep only what the result reads: the load's control
				// output is not banded.
				lp.Load.Control, lp.Poles = nil, nil
				loops = append(loops, lp)
			}
		}
		if err != nil {
			return Robustness{}, &ModelError{Op: op, Part: "draw " + strconv.Itoa(i), Problem: err.Error(), Err: err}
		}
	}
	return summarise(loops, n, levels, ls.Horizon), nil
}

// callDraw calls the caller's draw for draw number i, turning a panic in
// it into a *SettingError that blames the draw function, not the
// library (fault).
func callDraw(op string, draw Draw, rng *rand.Rand, i int) (p tf.Rational, err, fault error) {
	defer func() {
		if v := recover(); v != nil {
			fault = &SettingError{Op: op, Setting: "draw", Value: fmt.Sprintf("a function that panicked at draw %d: %v", i, v), Rule: "the caller's Draw function must return a plant or an error, never panic (the fault is in that function, not in the library)"}
		}
	}()
	p, err = draw(rng)
	return p, err, nil
}

// summarise builds the Robustness of the stable loops of n draws.
func summarise(loops []Loop, n int, levels []float64, horizon int) Robustness {
	r := Robustness{Draws: n, Stable: len(loops), FractionStable: float64(len(loops)) / float64(n), Levels: slices.Clone(levels)}
	col := make([]float64, len(loops))
	spread := func(f func(Loop) float64) Spread {
		for i, lp := range loops {
			v := f(lp)
			if math.IsNaN(v) {
				v = math.Inf(1)
			}
			col[i] = v
		}
		return Spread{Levels: r.Levels, Values: quantiles(col, levels)}
	}
	r.GainMargin = spread(func(l Loop) float64 {
		if !l.Margins.HasGainMargin {
			return math.Inf(1)
		}
		return l.Margins.GainMargin
	})
	r.PhaseMargin = spread(func(l Loop) float64 {
		if !l.Margins.HasPhaseMargin {
			return math.Inf(1)
		}
		return l.Margins.PhaseMargin
	})
	r.DelayMargin = spread(func(l Loop) float64 { return l.DelayMargin.Samples })
	r.SensitivityPeak = spread(func(l Loop) float64 { return l.SensitivityPeak })
	r.ComplementaryPeak = spread(func(l Loop) float64 { return l.ComplementaryPeak })
	r.Overshoot = spread(func(l Loop) float64 { return l.Setpoint.Figures.Overshoot })
	r.Settle = spread(func(l Loop) float64 { return l.Setpoint.Figures.Settle.Samples })
	r.SetpointIAE = spread(func(l Loop) float64 { return l.Setpoint.IAE })
	r.LoadPeak = spread(func(l Loop) float64 { return l.Load.Peak })
	r.LoadIAE = spread(func(l Loop) float64 { return l.Load.IAE })
	band := func(f func(Loop) []float64) [][]float64 {
		out := make([][]float64, len(levels))
		for i := range out {
			out[i] = make([]float64, horizon)
		}
		for t := range horizon {
			for i, lp := range loops {
				col[i] = f(lp)[t]
			}
			for i, q := range quantiles(col, levels) {
				out[i][t] = q
			}
		}
		return out
	}
	r.SetpointBand = band(func(l Loop) []float64 { return l.Setpoint.Output })
	r.LoadBand = band(func(l Loop) []float64 { return l.Load.Output })
	r.ControlBand = band(func(l Loop) []float64 { return l.Setpoint.Control })
	return r
}

// quantiles returns the quantiles of x at the levels by linear
// interpolation between order statistics (numpy.quantile's "linear",
// R's type 7): position h = (n - 1) p. It sorts x in place; NaN for an
// empty x. Interpolating towards +Inf gives +Inf.
func quantiles(x, levels []float64) []float64 {
	out := make([]float64, len(levels))
	slices.Sort(x)
	for i, p := range levels {
		if len(x) == 0 {
			out[i] = math.NaN()
			continue
		}
		h := float64(len(x)-1) * p
		lo := int(math.Floor(h))
		hi := min(lo+1, len(x)-1)
		a, b := x[lo], x[hi]
		switch {
		case a == b || math.IsInf(b, 1):
			if a == b || h == float64(lo) {
				out[i] = a
			} else {
				out[i] = b
			}
		default:
			out[i] = a + (h-float64(lo))*(b-a)
		}
	}
	return out
}
