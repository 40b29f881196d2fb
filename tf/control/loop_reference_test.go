package control

import (
	"math"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/tf"
)

// refTerm is a term of testdata/control/loops.json.
type refTerm struct {
	Num   []float64 `json:"num"`
	Den   []float64 `json:"den"`
	Delay int       `json:"delay"`
}

func (r refTerm) rational(t *testing.T) tf.Rational {
	t.Helper()
	q, err := tf.NewRational(r.Num, r.Den, r.Delay)
	if err != nil {
		t.Fatal(err)
	}
	return q
}

// refLoop is one loop of testdata/control/loops.json.
type refLoop struct {
	Plant      refTerm   `json:"plant"`
	Controller refTerm   `json:"controller"`
	PolesRe    []float64 `json:"poles_re"`
	PolesIm    []float64 `json:"poles_im"`
	MaxPole    float64   `json:"max_pole"`
	Ms         float64   `json:"ms"`
	MsAt       float64   `json:"ms_at"`
	Mt         float64   `json:"mt"`
	GM         *float64  `json:"gm"`
	GMAt       *float64  `json:"gm_at"`
	PM         *float64  `json:"pm"`
	PMAt       *float64  `json:"pm_at"`
	DM         *float64  `json:"dm"`
	GridStep   float64   `json:"grid_step"`
	Setpoint   []float64 `json:"setpoint"`
	Control    []float64 `json:"control"`
	Load       []float64 `json:"load"`
}

// TestAnalyzeReference checks Analyze against testdata/control/loops.json
// (make_reference.py): poles against numpy.roots of the characteristic
// polynomial; margins, delay margin and the |S|, |T| peaks against a
// dense scipy.signal.freqz sweep (2^20 points); step responses against
// scipy.signal.lfilter of the closed-loop transfer functions.
func TestAnalyzeReference(t *testing.T) {
	var ref map[string]refLoop
	testutil.ReadJSON(t, "testdata/control/loops.json", &ref)
	if len(ref) < 5 {
		t.Fatalf("%d reference loops, want 5", len(ref))
	}
	for name, r := range ref {
		t.Run(name, func(t *testing.T) {
			c, p := r.Controller.rational(t), r.Plant.rational(t)
			lp, err := Analyze(c, p, LoopSettings{Horizon: len(r.Setpoint)})
			if err != nil {
				t.Fatal(err)
			}
			// numpy.roots (LAPACK eigenvalues) and ours (gonum eigenvalues
			// with Newton polishing) agree to rounding: 1e-9 for the
			// simple poles here.
			if e := testutil.RootsErr(lp.Poles, testutil.Complex(r.PolesRe, r.PolesIm)); e > 1e-9 {
				t.Errorf("poles differ from numpy.roots by %g", e)
			}
			if lp.Stable != (r.MaxPole < 1) || math.Abs(lp.MaxPole-r.MaxPole) > 1e-9 {
				t.Errorf("max pole %v stable %v, numpy %v", lp.MaxPole, lp.Stable, r.MaxPole)
			}
			if !lp.Stable {
				// Analyze marks an unstable loop's frequency figures
				// (+Inf peaks, NaN margins); the sweep under them is
				// still checked against scipy.
				if !math.IsInf(lp.SensitivityPeak, 1) || !math.IsInf(lp.ComplementaryPeak, 1) || !math.IsNaN(lp.Margins.GainMargin) || lp.Margins.HasGainMargin || lp.Margins.HasPhaseMargin || !math.IsNaN(lp.DelayMargin.Samples) {
					t.Errorf("unstable loop reports Ms %v, Mt %v, margins %+v, delay margin %v; want +Inf peaks and NaN margins", lp.SensitivityPeak, lp.ComplementaryPeak, lp.Margins, lp.DelayMargin)
				}
				l := newLoopFreq(c, p)
				f := newAnalyzer().sweep(&l)
				sw := lp
				sw.Margins, sw.DelayMargin.Samples = f.margins, f.delayMargin
				sw.SensitivityPeak, sw.SensitivityPeakAt, sw.ComplementaryPeak = f.ms, f.msAt, f.mt
				checkFreqRef(t, sw, r)
			} else {
				checkFreqRef(t, lp, r)
			}
			checkResponses(t, lp, r)
		})
	}
}

// checkFreqRef compares the frequency figures with the dense freqz
// sweep. The sweep's grid step h = pi/2^20 bounds its error: a peak read
// at a grid point is low by O(h^2) relative (1e-10 here), a crossover
// interpolated linearly is off by O(h^2) in w; 1e-7 relative covers both
// with room for the curvature of these loops.
func checkFreqRef(t *testing.T, lp Loop, r refLoop) {
	t.Helper()
	near := func(what string, got, want, tol float64) {
		if math.Abs(got-want) > tol*math.Max(1, math.Abs(want)) {
			t.Errorf("%s = %.12g, scipy sweep %.12g", what, got, want)
		}
	}
	near("Ms", lp.SensitivityPeak, r.Ms, 1e-7)
	near("Ms frequency", lp.SensitivityPeakAt, r.MsAt, 1e-3) // a flat peak: its place is loosely defined
	// |T| tends to 1 at w -> 0 with integral action; both sweeps start
	// near 0 (ours at pi 1e-5, scipy's at pi 2^-20).
	near("Mt", lp.ComplementaryPeak, r.Mt, 1e-7)
	if (r.GM != nil) != lp.Margins.HasGainMargin {
		t.Fatalf("has gain margin %v, scipy %v", lp.Margins.HasGainMargin, r.GM != nil)
	}
	if r.GM != nil {
		near("GM", lp.Margins.GainMargin, *r.GM, 1e-7)
		near("phase crossover", lp.Margins.PhaseCrossover, *r.GMAt, 1e-7)
	}
	if r.PM != nil {
		near("PM", lp.Margins.PhaseMargin, *r.PM, 1e-7)
		near("gain crossover", lp.Margins.GainCrossover, *r.PMAt, 1e-7)
	}
	if r.DM != nil {
		near("delay margin", lp.DelayMargin.Samples, *r.DM, 1e-7)
	}
	// tf.Rational.LoopMargins, the library's own sweep, agrees too.
	l, err := lp0(t, r).Times(r.Plant.rational(t))
	if err != nil {
		t.Fatal(err)
	}
	m, err := l.LoopMargins()
	if err != nil {
		t.Fatal(err)
	}
	near("GM against tf.LoopMargins", lp.Margins.GainMargin, m.GainMargin, 1e-9)
	near("PM against tf.LoopMargins", lp.Margins.PhaseMargin, m.PhaseMargin, 1e-9)
}

func lp0(t *testing.T, r refLoop) tf.Rational { return r.Controller.rational(t) }

// checkResponses compares the simulated responses with lfilter of the
// closed-loop transfer functions: the same sums in another order, so
// they agree to rounding relative to the largest value so far (1e-9
// leaves room for the growth of an unstable loop over 150 samples).
func checkResponses(t *testing.T, lp Loop, r refLoop) {
	t.Helper()
	for _, c := range []struct {
		name      string
		got, want []float64
	}{{"set-point output", lp.Setpoint.Output, r.Setpoint}, {"set-point control", lp.Setpoint.Control, r.Control}, {"load output", lp.Load.Output, r.Load}} {
		if e := testutil.RunningRelErr(c.got, c.want); e > 1e-9 {
			t.Errorf("%s differs from scipy.signal.lfilter by %g (relative)", c.name, e)
		}
	}
}
