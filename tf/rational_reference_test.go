package tf_test

import (
	"math"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/tf"
)

// referenceRational is the rational transfer function a case of the
// scipy reference files (golden.json, initial.json) is computed for.
type referenceRational struct {
	Name  string    `json:"name"`
	Num   []float64 `json:"num"`
	Den   []float64 `json:"den"`
	Delay int       `json:"delay"`
}

// golden mirrors testdata/scipy/golden.json, written by
// testdata/scipy/make_golden.py (scipy 1.10.1, numpy; Debian python3).
type golden struct {
	Source string `json:"source"`
	Models []struct {
		referenceRational
		Impulse []float64 `json:"impulse"`
		Step    []float64 `json:"step"`
		DImp    []float64 `json:"dimpulse"`
		DStep   []float64 `json:"dstep"`
		Input   []float64 `json:"input"`
		Output  []float64 `json:"output"`
		ZerosRe []float64 `json:"zeros_re"`
		ZerosIm []float64 `json:"zeros_im"`
		PolesRe []float64 `json:"poles_re"`
		PolesIm []float64 `json:"poles_im"`
		Gain    *float64  `json:"gain"`
		W       []float64 `json:"w"`
		Mag     []float64 `json:"mag"`
		Phase   []float64 `json:"phase"`
	} `json:"models"`
	C2D []struct {
		goldenContinuous
		NumZ []float64 `json:"num_z"`
		DenZ []float64 `json:"den_z"`
	} `json:"c2d"`
	Steps []struct {
		goldenContinuous
		Theta float64   `json:"theta"`
		Y     []float64 `json:"y"`
	} `json:"steps"`
}

// goldenContinuous names a continuous-time model of golden.json: its kind
// ("fopdt", "sopdt", "second"), its parameters and the sample interval T.
type goldenContinuous struct {
	Name   string             `json:"name"`
	Kind   string             `json:"kind"`
	Params map[string]float64 `json:"params"`
	T      float64            `json:"T"`
}

func readGolden(t *testing.T) golden {
	var g golden
	testutil.ReadJSON(t, "testdata/scipy/golden.json", &g)
	if len(g.Models) < 8 {
		t.Fatalf("golden file has %d models, want >= 8", len(g.Models))
	}
	return g
}

// Tolerances: the responses are the same recursion evaluated in a
// different order (scipy's lfilter uses the transposed direct form II),
// so they agree to a few ulps of the largest value so far; 1e-12 leaves
// room for growth over 200 samples of the unstable and integrating
// models. Frequency responses are single evaluations, 1e-12 absolute on
// the phase (radians) and relative on the magnitude. Roots from two companion-matrix eigen-solvers (LAPACK via numpy,
// gonum with Newton polishing here) agree to 1e-9 for the well separated
// poles used.
const (
	respTol = 1e-12
	rootTol = 1e-9
)

func TestRationalGoldenScipy(t *testing.T) {
	g := readGolden(t)
	for _, m := range g.Models {
		t.Run(m.Name, func(t *testing.T) {
			r, err := tf.NewRational(m.Num, m.Den, m.Delay)
			if err != nil {
				t.Fatal(err)
			}
			// scipy.signal.lfilter 1.10.1 on a unit pulse, a unit step and
			// a random input.
			if e := testutil.RunningRelErr(r.Impulse(len(m.Impulse)), m.Impulse); !(e <= respTol) {
				t.Errorf("impulse: relative error %.3g vs scipy.signal.lfilter", e)
			}
			if e := testutil.RunningRelErr(r.Step(len(m.Step)), m.Step); !(e <= respTol) {
				t.Errorf("step: relative error %.3g vs scipy.signal.lfilter", e)
			}
			// scipy.signal.dimpulse/dstep 1.10.1 (state-space simulation).
			if e := testutil.RunningRelErr(r.Impulse(len(m.DImp)), m.DImp); !(e <= respTol) {
				t.Errorf("impulse: relative error %.3g vs scipy.signal.dimpulse", e)
			}
			if e := testutil.RunningRelErr(r.Step(len(m.DStep)), m.DStep); !(e <= respTol) {
				t.Errorf("step: relative error %.3g vs scipy.signal.dstep", e)
			}
			y, err := r.Filter(m.Input)
			if err != nil {
				t.Fatal(err)
			}
			if e := testutil.RunningRelErr(y, m.Output); !(e <= respTol) {
				t.Errorf("filter: relative error %.3g vs scipy.signal.lfilter", e)
			}
			// scipy.signal.tf2zpk 1.10.1.
			if e := testutil.RootsErr(r.Poles(), testutil.Complex(m.PolesRe, m.PolesIm)); !(e <= rootTol) {
				t.Errorf("poles %v: error %.3g vs scipy.signal.tf2zpk", r.Poles(), e)
			}
			if e := testutil.RootsErr(r.Zeros(), testutil.Complex(m.ZerosRe, m.ZerosIm)); !(e <= rootTol) {
				t.Errorf("zeros %v: error %.3g vs scipy.signal.tf2zpk", r.Zeros(), e)
			}
			// Gain: sum(b)/sum(a) from numpy; the integrator has none.
			gain, err := r.Gain()
			switch {
			case m.Gain == nil && err == nil:
				t.Errorf("gain %v for a pole at z = 1, want a *GainError", gain)
			case m.Gain != nil && (err != nil || math.Abs(gain-*m.Gain) > 1e-13*math.Abs(*m.Gain)):
				t.Errorf("gain %v, %v, want %v", gain, err, *m.Gain)
			}
			// scipy.signal.freqz 1.10.1 with numpy.unwrap of the phase.
			if m.W != nil {
				mag, ph, err := r.GainPhase(m.W)
				if err != nil {
					t.Fatal(err)
				}
				for i := range m.W {
					if math.Abs(mag[i]-m.Mag[i]) > 1e-12*math.Max(1, m.Mag[i]) {
						t.Errorf("w=%.4g: |G| %v, scipy.signal.freqz %v", m.W[i], mag[i], m.Mag[i])
					}
					if math.Abs(ph[i]-m.Phase[i]) > 1e-12 {
						t.Errorf("w=%.4g: phase %v, scipy.signal.freqz+numpy.unwrap %v", m.W[i], ph[i], m.Phase[i])
					}
				}
			}
		})
	}
}

// TestFilterFromScipy checks filtering from given initial conditions and
// from the steady state of a constant input against
// testdata/scipy/initial.json (scipy.signal.lfiltic + lfilter, and
// lfilter_zi + lfilter, scipy 1.10.1), for FilterFrom/SteadyPast and for
// the streaming Plant (SetHistory/SetSteady). Tolerance respTol (1e-12
// relative to the largest value so far): the same recursion as scipy's
// transposed direct form II, evaluated in another order, over 40 samples
// of stable terms.
func TestFilterFromScipy(t *testing.T) {
	var ref struct {
		Source string `json:"source"`
		Cases  []struct {
			referenceRational
			PastInput   []float64 `json:"past_input"`
			PastOutput  []float64 `json:"past_output"`
			Input       []float64 `json:"input"`
			Output      []float64 `json:"output"`
			U           float64   `json:"u"`
			SteadyConst []float64 `json:"steady_const_output"`
			SteadyInput []float64 `json:"steady_input"`
			SteadyOut   []float64 `json:"steady_output"`
		} `json:"cases"`
	}
	testutil.ReadJSON(t, "testdata/scipy/initial.json", &ref)
	if len(ref.Cases) < 5 {
		t.Fatalf("%d cases in initial.json, want 5", len(ref.Cases))
	}
	stream := func(p *tf.Plant, x []float64) []float64 {
		y := make([]float64, len(x))
		for i, v := range x {
			y[i] = p.Step(v)
		}
		return y
	}
	for _, c := range ref.Cases {
		r, err := tf.NewRational(c.Num, c.Den, c.Delay)
		if err != nil {
			t.Fatal(err)
		}
		past := tf.Past{Input: c.PastInput, Output: c.PastOutput}
		y, err := r.FilterFrom(c.Input, past)
		if err != nil {
			t.Fatal(err)
		}
		if e := testutil.RunningRelErr(y, c.Output); !(e <= respTol) {
			t.Errorf("%s: FilterFrom relative error %.3g vs scipy.signal.lfiltic+lfilter", c.Name, e)
		}
		p := tf.NewPlant(r)
		if err := p.SetHistory(c.PastInput, c.PastOutput); err != nil {
			t.Fatal(err)
		}
		if e := testutil.RunningRelErr(stream(p, c.Input), c.Output); !(e <= respTol) {
			t.Errorf("%s: Plant.SetHistory relative error %.3g vs scipy.signal.lfiltic+lfilter", c.Name, e)
		}
		sp, err := r.SteadyPast(c.U)
		if err != nil {
			t.Fatal(err)
		}
		constant := make([]float64, len(c.SteadyConst))
		for i := range constant {
			constant[i] = c.U
		}
		for _, run := range []struct {
			what    string
			x, want []float64
		}{{"constant input", constant, c.SteadyConst}, {"noisy input", c.SteadyInput, c.SteadyOut}} {
			ys, err := r.FilterFrom(run.x, sp)
			if err != nil {
				t.Fatal(err)
			}
			if e := testutil.RunningRelErr(ys, run.want); !(e <= respTol) {
				t.Errorf("%s, %s: SteadyPast+FilterFrom relative error %.3g vs scipy.signal.lfilter_zi+lfilter", c.Name, run.what, e)
			}
			p := tf.NewPlant(r)
			if err := p.SetSteady(c.U); err != nil {
				t.Fatal(err)
			}
			if e := testutil.RunningRelErr(stream(p, run.x), run.want); !(e <= respTol) {
				t.Errorf("%s, %s: Plant.SetSteady relative error %.3g vs scipy.signal.lfilter_zi+lfilter", c.Name, run.what, e)
			}
		}
	}
}
