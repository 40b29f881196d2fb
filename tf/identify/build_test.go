package identify

import (
	"context"
	"errors"
	"testing"

	"github.com/backshift/backshift/ccf"
	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf"
)

// TestCandidatesBuild: the numbers of a ccf form and a noise order become model
// values with the one naming rule (input name and "_" first when there
// are several inputs; w from 0 with plus signs, d from 1 with minus
// signs, so that d_k = -Den[k]; phi and theta from 1), the form's
// numbers as start values, printed by Model.String (the noise of the
// usual names in its short form ARMA(p, q)).
func TestCandidatesBuild(t *testing.T) {
	f := ccf.Form{Delay: 3, R: 1, S: 1, Num: []float64{0.8, 0.4}, Den: []float64{1, -0.6}}
	for _, tc := range []struct {
		several bool
		names   []string
		text    string
	}{
		{false, []string{"w0", "w1", "d1"}, "y = (w0 + w1 B) / (1 - d1 B) B^3 valve + ARMA(1, 1); where w0 ~ 0.8, w1 ~ 0.4, d1 ~ 0.6"},
		{true, []string{"valve_w0", "valve_w1", "valve_d1"}, "y = (valve_w0 + valve_w1 B) / (1 - valve_d1 B) B^3 valve + ARMA(1, 1); where valve_w0 ~ 0.8, valve_w1 ~ 0.4, valve_d1 ~ 0.6"},
	} {
		in := formInput("valve", tc.several, tf.Poly{}, f)
		if in.Delay != 3 || in.Series != "valve" {
			t.Errorf("input %+v", in)
		}
		var got []tf.Coef
		for _, p := range []tf.Poly{in.Num, in.Den} {
			for _, fa := range p.Factors {
				for _, tm := range fa.Terms {
					if tm.Coef.Name != "" {
						got = append(got, tm.Coef)
					}
				}
			}
		}
		want := []float64{0.8, 0.4, 0.6} // w0, w1 = Num; d1 = -Den[1]
		if len(got) != len(tc.names) {
			t.Fatalf("coefficients %+v, want names %v", got, tc.names)
		}
		for i, c := range got {
			if c.Name != tc.names[i] || c.Value != want[i] || !c.Free {
				t.Errorf("coefficient %d: %+v, want free %s = %g", i, c, tc.names[i], want[i])
			}
		}
		m := tf.Model{Output: "y", Inputs: []tf.Input{in}, Noise: noiseOfOrder(1, 1)}
		if s := m.String(); s != tc.text {
			t.Errorf("printed\n%s\nwant\n%s", s, tc.text)
		}
	}
	if n := noiseOfOrder(0, 0); n.AR.Degree() != 0 || n.MA.Degree() != 0 {
		t.Errorf("white noise: %+v", n)
	}
	if got := coefName("valve", true, "theta", 2); got != "valve_theta2" {
		t.Errorf("coefName = %q", got)
	}
}

// TestCandidatesInnerOp: an error of ccf met inside Candidates names the function
// the caller called, identify.Candidates, as its Op (the Op rule of the shared
// vocabulary), and keeps its evidence and kind. The input is white noise
// unrelated to the output (seeded), so no lag passes the dead-time rule.
func TestCandidatesInnerOp(t *testing.T) {
	const n = 400
	rng := fixture.NewRand(9)
	x, y := make([]float64, n), make([]float64, n)
	for i := range x {
		x[i] = rng.NormFloat64()
		y[i] = rng.NormFloat64()
	}
	_, err := Candidates(context.Background(), "y", []string{"valve"}, map[string][]float64{"y": y, "valve": x}, nil)
	var nr *ccf.NoResponseError
	if !errors.As(err, &nr) || nr.Op != "identify.Candidates" || nr.Input != "valve" || !errors.Is(err, tf.ErrModel) {
		t.Errorf("no response: %T %v", err, err)
	}
}
