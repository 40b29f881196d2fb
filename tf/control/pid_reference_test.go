package control

import (
	"math"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// TestDiscreteReference checks PID.Discrete against
// scipy.signal.cont2discrete (methods "backward_diff" and "bilinear") of
// the same continuous controller (testdata/control/pid.json, written by
// make_reference.py). Both normalise the leading denominator
// coefficient to 1; the coefficients agree to rounding (1e-12 relative
// to the largest).
func TestDiscreteReference(t *testing.T) {
	var ref []struct {
		Form   Form      `json:"form"`
		Kc     float64   `json:"kc"`
		Ti     float64   `json:"ti"`
		Td     float64   `json:"td"`
		Filter float64   `json:"filter"`
		T      float64   `json:"T"`
		Method string    `json:"method"`
		Num    []float64 `json:"num"`
		Den    []float64 `json:"den"`
	}
	testutil.ReadJSON(t, "testdata/control/pid.json", &ref)
	methods := map[string]Method{"backward_diff": BackwardDifference, "bilinear": Tustin}
	for _, r := range ref {
		c := PID{Form: r.Form, Gain: r.Kc, Integral: r.Ti, Derivative: r.Td, Filter: r.Filter}
		got, err := c.Discrete(r.T, methods[r.Method])
		if err != nil {
			t.Fatal(err)
		}
		// scipy pads the z-polynomials to one length; trailing zeros in B
		// are dropped by tf.NewRational.
		for _, p := range []struct {
			name      string
			got, want []float64
		}{{"num", got.Num(), r.Num}, {"den", got.Den(), r.Den}} {
			want := trim(p.want)
			if len(p.got) != len(want) {
				t.Errorf("%v %s: %s %v, scipy %v", c, r.Method, p.name, p.got, want)
				continue
			}
			scale := 0.0
			for _, v := range want {
				scale = math.Max(scale, math.Abs(v))
			}
			for k := range want {
				if math.Abs(p.got[k]-want[k]) > 1e-12*scale {
					t.Errorf("%v %s: %s[%d] = %v, scipy %v", c, r.Method, p.name, k, p.got[k], want[k])
				}
			}
		}
	}
}
