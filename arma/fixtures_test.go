package arma

// Shared fixtures of the arma tests: the R reference datasets and the
// readers of a Result's Params as parallel slices, an explosive fit, the
// central-difference step.

import (
	"encoding/json"
	"errors"
	"math"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// Reference files written by testdata/arma/make_golden.R (R 4.2.2, base
// stats). JSON null (R's NA) decodes to NaN through jnum.

type jnum float64

func (j *jnum) UnmarshalJSON(b []byte) error {
	if string(b) == "null" {
		*j = jnum(math.NaN())
		return nil
	}
	var f float64
	if err := json.Unmarshal(b, &f); err != nil {
		return err
	}
	*j = jnum(f)
	return nil
}

func floats(v []jnum) []float64 {
	out := make([]float64, len(v))
	for i, x := range v {
		out[i] = float64(x)
	}
	return out
}

// datasets returns the series exported from R's datasets package (lh,
// LakeHuron, Nile, WWWusage) and the simulated "sim".
func datasets(t testing.TB) map[string][]float64 {
	var raw map[string][]jnum
	testutil.ReadJSON(t, "testdata/arma/datasets.json", &raw)
	out := make(map[string][]float64, len(raw))
	for k, v := range raw {
		out[k] = floats(v)
	}
	return out
}

// close reports whether got agrees with want within rel relative to
// max(|want|, floor).
func closeTo(got, want, rel, floor float64) bool {
	if math.IsNaN(got) || math.IsNaN(want) {
		return math.IsNaN(got) && math.IsNaN(want)
	}
	return math.Abs(got-want) <= rel*math.Max(math.Abs(want), floor)
}

func checkSlice(t *testing.T, what string, got, want []float64, rel, floor float64) {
	t.Helper()
	if len(got) != len(want) {
		t.Errorf("%s: length %d, want %d", what, len(got), len(want))
		return
	}
	for i := range got {
		if !closeTo(got[i], want[i], rel, floor) {
			t.Errorf("%s[%d] = %.15g, want %.15g (rel tol %g)", what, i, got[i], want[i], rel)
		}
	}
}

// Helpers reading the Params of a Result as parallel slices, for the
// tests written against the values.

func names(r *Result) []string {
	out := make([]string, len(r.Params))
	for i, p := range r.Params {
		out[i] = p.Name
	}
	return out
}

func ests(r *Result) []float64 {
	out := make([]float64, len(r.Params))
	for i, p := range r.Params {
		out[i] = p.Value
	}
	return out
}

func ses(r *Result) []float64 {
	out := make([]float64, len(r.Params))
	for i, p := range r.Params {
		out[i] = p.SE
	}
	return out
}

// kindOf returns the kind of the library (ErrSample ... ErrInternal) that
// err matches, nil when it matches none.
func kindOf(err error) error {
	for _, k := range []error{ErrSample, ErrShort, ErrConstant, ErrLength, ErrSetting, ErrModel, ErrConvergence, ErrOverflow, ErrInternal} {
		if errors.Is(err, k) {
			return k
		}
	}
	return nil
}

// centralStep returns copies of x moved by +h and -h in coordinate k,
// with h = 1e-6 max(1, |x_k|), the step of the central differences the
// derivative checks compare with (truncation error O(h^2), about 1e-12,
// and rounding O(eps/h), about 2e-10 relative: common practice).
func centralStep(x []float64, k int) (xp, xm []float64, h float64) {
	h = 1e-6 * math.Max(1, math.Abs(x[k]))
	xp = append([]float64(nil), x...)
	xm = append([]float64(nil), x...)
	xp[k] += h
	xm[k] -= h
	return xp, xm, h
}

// hostileExplosive is a short series and its fit with phi1 held at 3 (an
// explosive AR part).
func hostileExplosive(t *testing.T) ([]float64, *Result) {
	t.Helper()
	y := make([]float64, 200)
	for i := range y {
		y[i] = math.Sin(float64(i)*0.7) + 0.1*float64(i%5)
	}
	res, err := Fit(nil, y, Order{P: 1}, &FitSettings{Held: map[string]float64{"phi1": 3}})
	if err != nil {
		t.Fatal(err)
	}
	return y, res
}
