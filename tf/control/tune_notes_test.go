package control

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/tf"
)

func mustRational(t *testing.T, num, den []float64, d int) tf.Rational {
	t.Helper()
	r, err := tf.NewRational(num, den, d)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func hasNote(tu Tuning, part string) bool {
	for _, n := range tu.Notes {
		if strings.Contains(n, part) {
			return true
		}
	}
	return false
}

// TestTuneRingingNote: Tustin with a derivative filter time below T/2
// maps the filter pole s = -1/(a Td) to z = (1 - T/(2 a Td))/(1 + T/(2
// a Td)) < 0 (the bilinear map, a published formula: Franklin, Powell &
// Workman, Digital Control, sec. 6.3.1, from memory). The case,
// 0.01 B^2/((1 - 0.9 B)(1 - 0.7 B)) every 2 h, SIMC PID, Filter 0.01,
// has its controller pole at -0.894 (so its output alternates in sign:
// 72.8, -35.7, ...) and must carry the note, in String too; the
// backward-difference controller (pole at a Td/(a Td + T) > 0) must not.
func TestTuneRingingNote(t *testing.T) {
	p := mustRational(t, []float64{0.01}, poly.Mul([]float64{1, -0.9}, []float64{1, -0.7}), 2)
	iv := tf.Interval{Value: 2, Unit: "h"}
	tu, err := Tune(p, iv, TuneSettings{Derivative: true, Method: Tustin, Filter: 0.01})
	if err != nil {
		t.Fatal(err)
	}
	// The pole from the bilinear map of the filter (series SIMC PID:
	// Td = Tau2; the filter time is Filter x Td).
	tf := 0.01 * tu.PID.Derivative
	want := (1 - 2/(2*tf)) / (1 + 2/(2*tf))
	if !(want < -RingingPole) {
		t.Fatalf("bilinear pole %v: the case does not test the threshold", want)
	}
	if !hasNote(tu, "ringing controller: a pole at z = "+strings.TrimSpace(fmtG3(want))) || !strings.Contains(tu.String(), "note: ringing controller") {
		t.Errorf("no ringing note for a pole at %v: notes %q", want, tu.Notes)
	}
	tb, err := Tune(p, iv, TuneSettings{Derivative: true, Filter: 0.01})
	if err != nil {
		t.Fatal(err)
	}
	if hasNote(tb, "ringing") {
		t.Errorf("backward difference noted as ringing: %q", tb.Notes)
	}
}

func fmtG3(v float64) string { return strconv.FormatFloat(v, 'g', 3, 64) }

// TestTuneSIMCDerivativeUnused: SIMC's PID row sets Td = Tau2 (Skogestad
// 2003); on a model with one lag Tau2 = 0, so the result is a PI, and
// the note the docs promise must say so.
func TestTuneSIMCDerivativeUnused(t *testing.T) {
	p := mustRational(t, []float64{0.3}, []float64{1, -0.5}, 1)
	tu, err := Tune(p, tf.Interval{}, TuneSettings{Derivative: true})
	if err != nil {
		t.Fatal(err)
	}
	if tu.PID.Derivative != 0 || !hasNote(tu, "derivative asked for is not used") {
		t.Errorf("Td %v, notes %q: want a PI with the note", tu.PID.Derivative, tu.Notes)
	}
	p2 := mustRational(t, []float64{0.01}, poly.Mul([]float64{1, -0.9}, []float64{1, -0.7}), 2)
	if tu, err := Tune(p2, tf.Interval{}, TuneSettings{Derivative: true}); err != nil || hasNote(tu, "not used") {
		t.Errorf("two lags: %v, notes %q", err, tu.Notes)
	}
}

// TestTuneSlowLoadNote: IMC's PI (Ti = Tau1, Rivera et al. 1986) on
// 0.001 B^2/(1 - 0.999 B) every hour settles the set point in about 13 h
// and recovers from a load in about 3934 h (its Analyze
// run); SIMC (Ti = 4 (tc + theta)) recovers in some 49 h against
// 35 h. The first must carry the note, the second not (threshold
// SlowLoadRecovery = 10, checked here against Analyze's own figures).
func TestTuneSlowLoadNote(t *testing.T) {
	p := mustRational(t, []float64{0.001}, []float64{1, -0.999}, 2)
	iv := tf.Interval{Value: 1, Unit: "h"}
	for _, c := range []struct {
		rule Rule
		slow bool
	}{{IMC, true}, {SIMC, false}} {
		tu, err := Tune(p, iv, TuneSettings{Rule: c.rule})
		if err != nil {
			t.Fatal(err)
		}
		lp, err := Analyze(tu.Controller, p, LoopSettings{Interval: iv})
		if err != nil {
			t.Fatal(err)
		}
		ratio := lp.Load.Recover.Samples / lp.Setpoint.Figures.Settle.Samples
		if (ratio > SlowLoadRecovery) != c.slow || hasNote(tu, "slow load recovery") != c.slow {
			t.Errorf("%s: recovery/settle %.3g, notes %q; want slow %v", c.rule, ratio, tu.Notes, c.slow)
		}
	}
}

// TestAnalyzeUnstableFigures: the loop (SIMC PI tuned on 0.05
// B^2/(1 - 0.5 B), closed around the integrating path 0.05 B^2/((1 - 0.5
// B)(1 - B))) is unstable; Analyze must say so in its figures (+Inf Ms,
// as Tuning.Ms, and NaN margins), not report Ms 2.25.
func TestAnalyzeUnstableFigures(t *testing.T) {
	model := mustRational(t, []float64{0.05}, []float64{1, -0.5}, 2)
	tu, err := Tune(model, tf.Interval{}, TuneSettings{})
	if err != nil {
		t.Fatal(err)
	}
	real := mustRational(t, []float64{0.05}, poly.Mul([]float64{1, -0.5}, []float64{1, -1}), 2)
	lp, err := Analyze(tu.Controller, real, LoopSettings{})
	if err != nil {
		t.Fatal(err)
	}
	if lp.Stable || !math.IsInf(lp.SensitivityPeak, 1) || !math.IsInf(lp.ComplementaryPeak, 1) || lp.Margins.HasGainMargin || lp.Margins.HasPhaseMargin || !math.IsNaN(lp.Margins.PhaseMargin) || !math.IsNaN(lp.DelayMargin.Samples) {
		t.Errorf("unstable loop (max pole %v): Ms %v, Mt %v, margins %+v, delay margin %v", lp.MaxPole, lp.SensitivityPeak, lp.ComplementaryPeak, lp.Margins, lp.DelayMargin)
	}
}

// TestTuneLongTimeAdvice: a closed-loop time of 1e300 leaves the
// controller gain about 1e-300, so the integrator's pole stays at |z| =
// 1; the refusal must advise a shorter closed-loop time, not a longer.
func TestTuneLongTimeAdvice(t *testing.T) {
	p := mustRational(t, []float64{0.3}, []float64{1, -0.5}, 1)
	_, err := Tune(p, tf.Interval{}, TuneSettings{ClosedLoopTime: 1e300})
	var me *errs.ModelError
	if !errors.As(err, &me) || !strings.Contains(err.Error(), "shorter ClosedLoopTime") || strings.Contains(err.Error(), "longer ClosedLoopTime") {
		t.Errorf("got %v, want a *ModelError advising a shorter ClosedLoopTime", err)
	}
}

// TestTuningStringNoZeroTerms: Dahlin's controller on 2 B^40/(1 - 0.9
// B) has a denominator 1 - q B - (1 - q) B^40 (Dahlin 1968, the E(B)
// of the Rule's doc times (1 - B)); String must print its two non-zero
// terms only, and the printed polynomial must read back (term by term)
// to the controller's coefficients at the 6 digits printed.
func TestTuningStringNoZeroTerms(t *testing.T) {
	p := mustRational(t, []float64{2}, []float64{1, -0.9}, 40)
	tu, err := Tune(p, tf.Interval{}, TuneSettings{Rule: Dahlin})
	if err != nil {
		t.Fatal(err)
	}
	s := shortRational(tu.Controller)
	if strings.Contains(s, "+ 0 B") || strings.Contains(s, "- 0 B") {
		t.Errorf("zero terms printed: %s", s)
	}
	got := readTerms(t, s[strings.Index(s, "/ (")+3:])
	den := tu.Controller.Den()
	for k, v := range den {
		if math.Abs(got[k]-v) > 5e-6*math.Abs(v) {
			t.Errorf("B^%d: printed %v, controller %v", k, got[k], v)
		}
	}
	for k := range got {
		if k >= len(den) {
			t.Errorf("printed term B^%d beyond the controller's degree", k)
		}
	}
}

// readTerms reads "(c0 +- c1 B +- c B^k ...)" back into coefficients by
// power (a test-side reader of shortRational's own layout).
func readTerms(t *testing.T, s string) map[int]float64 {
	t.Helper()
	s = s[:strings.Index(s, ")")]
	out := map[int]float64{}
	f := strings.Fields(strings.ReplaceAll(strings.ReplaceAll(s, " - ", " -"), " + ", " +"))
	for i := 0; i < len(f); i++ {
		var v float64
		if _, err := fmtSscan(f[i], &v); err != nil {
			t.Fatalf("reading %q: %v", f[i], err)
		}
		k := 0
		if i+1 < len(f) && strings.HasPrefix(f[i+1], "B") {
			i++
			k = 1
			if j := strings.Index(f[i], "^"); j > 0 {
				fmtSscan(f[i][j+1:], &k)
			}
		}
		out[k] = v
	}
	return out
}

// TestWorstCaseDelayBound: DelayAbove 2000 would run some 250 cases
// before the 256-degree limit (3 s before); it is refused up
// front, naming the most that fits (a plant of 250 samples of dead time
// keeps the accepted run short).
func TestWorstCaseDelayBound(t *testing.T) {
	p := mustRational(t, []float64{0.3}, []float64{1, -0.5}, 250)
	tu, err := Tune(p, tf.Interval{}, TuneSettings{})
	if err != nil {
		t.Fatal(err)
	}
	_, err = CheckWorstCase(tu.Controller, p, WorstCaseSettings{DelayAbove: 2000, GainAbove: 0.3})
	var se *errs.SettingError
	if !errors.As(err, &se) || se.Setting != "WorstCaseSettings.DelayAbove" || !strings.Contains(err.Error(), "at most ") {
		t.Fatalf("got %v, want a *SettingError on DelayAbove", err)
	}
	// The most it names is accepted and analysed.
	var most int
	fmtSscan(err.Error()[strings.Index(err.Error(), "at most ")+8:], &most)
	if _, err := CheckWorstCase(tu.Controller, p, WorstCaseSettings{DelayAbove: most}); err != nil {
		t.Errorf("DelayAbove %d (the most named): %v", most, err)
	}
	if _, err := CheckWorstCase(tu.Controller, p, WorstCaseSettings{DelayAbove: most + 1}); !errors.As(err, &se) {
		t.Errorf("DelayAbove %d: %v, want refused", most+1, err)
	}
}

func fmtSscan(s string, v any) (int, error) { return fmt.Sscan(s, v) }
