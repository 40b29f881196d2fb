package prewhiten_test

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/ccf"
	"github.com/backshift/backshift/prewhiten"
)

// try runs f, failing on a panic or an error that is not one of the
// packages' typed errors (a pointer type of arma, prewhiten or ccf, or
// one of the shared shapes); an error of prewhiten or ccf must also
// match one of the shared kinds.
func try(t *testing.T, name string, f func() error) {
	t.Helper()
	defer func() {
		if r := recover(); r != nil {
			t.Errorf("%s: panic %v", name, r)
		}
	}()
	err := f()
	if err == nil {
		return
	}
	typ := fmt.Sprintf("%T", err)
	if !strings.HasPrefix(typ, "*arma.") && !strings.HasPrefix(typ, "*prewhiten.") && !strings.HasPrefix(typ, "*ccf.") && !strings.HasPrefix(typ, "*errs.") {
		t.Errorf("%s: untyped error %s %v", name, typ, err)
	}
	if strings.HasPrefix(typ, "*arma.") {
		return // arma's own errors (its migration to the shared kinds is its own)
	}
	for _, k := range []error{prewhiten.ErrSample, prewhiten.ErrShort, prewhiten.ErrConstant, prewhiten.ErrLength, prewhiten.ErrSetting,
		prewhiten.ErrModel, prewhiten.ErrConvergence, prewhiten.ErrInternal, ccf.ErrOverflow} {
		if errors.Is(err, k) {
			return
		}
	}
	t.Errorf("%s: error of no kind %s %v", name, typ, err)
}

// TestHostileCalls calls every exported function and method of arma,
// prewhiten and ccf that takes series with nil, one- and two-sample,
// NaN, infinite, constant and 1e300 series, and lags -1, 0, 3 and
// MaxInt: each returns a typed error or a result, never a panic.
// (arma.AutocovTo is left out: it documents a panic for more lags than
// samples, a programmer error, and does not check its input.) This
// probe found prewhiten.Fit passing a 1e300 sample to arma, whose error
// named "series" instead of the input, a one-sample input reported as
// "constant", the zero arma.Result's LjungBox blaming its series, and a
// nil *ccf.Identification panicking in String.
func TestHostileCalls(t *testing.T) {
	ctx := context.Background()
	nan := math.NaN()
	sets := map[string][]float64{"nil": nil, "one": {1}, "two": {1, 2}, "nan": {1, nan, 3, 4, 5, 6}, "inf": {1, 2, math.Inf(1), 4, 5}, "const": {2, 2, 2, 2, 2, 2, 2, 2}, "big": {1e300, -1e300, 1, 2, 3, 4, 5, 6, 7, 8}}
	for nm, x := range sets {
		for _, lag := range []int{-1, 0, 3, math.MaxInt} {
			try(t, fmt.Sprint("ACF ", nm, lag), func() error { _, err := arma.ACF(x, lag); return err })
			try(t, fmt.Sprint("PACF ", nm, lag), func() error { _, err := arma.PACF(x, lag); return err })
			try(t, fmt.Sprint("LjungBox ", nm, lag), func() error { _, err := arma.LjungBox(x, lag, 0); return err })
			try(t, fmt.Sprint("YW ", nm, lag), func() error { _, err := arma.YuleWalker(x, lag); return err })
			try(t, fmt.Sprint("YWO ", nm, lag), func() error { _, err := arma.YuleWalkerOrder(x, lag); return err })
			try(t, fmt.Sprint("HR ", nm, lag), func() error { _, _, err := arma.HannanRissanen(x, lag, 1, 0); return err })
			try(t, fmt.Sprint("ImpulseWeights ", nm, lag), func() error { _, err := ccf.ImpulseWeights(x, x, lag, "", nil); return err })
		}
		try(t, "PACFFromACF "+nm, func() error { arma.PACFFromACF(x); return nil })
		try(t, "pw Fit "+nm, func() error { _, err := prewhiten.Fit(x, nil); return err })
		try(t, "pw Pair "+nm, func() error { _, err := prewhiten.Pair(x, x, "", nil); return err })
		try(t, "pw IdentifyNoise "+nm, func() error { _, err := prewhiten.IdentifyNoise(ctx, x, nil); return err })
		try(t, "pw Apply "+nm, func() error {
			_, _, err := prewhiten.Filter{Diff: []float64{1}, AR: []float64{1, -0.5}, MA: []float64{1}}.Apply(x, "")
			return err
		})
		try(t, "NoiseSeries "+nm, func() error {
			_, _, err := ccf.NoiseSeries(x, [][]float64{x}, []*ccf.Weights{{V: []float64{1, 0.5}}})
			return err
		})
		try(t, "DL "+nm, func() error { _, err := ccf.DistributedLag(x, [][]float64{x}, nil); return err })
		try(t, "Identify "+nm, func() error {
			_, err := ccf.Identify(&ccf.Weights{V: x, SE: x}, nil)
			return err
		})
		try(t, "Corner "+nm, func() error { ccf.Corner(&ccf.Weights{V: x, SE: x}, 5, 5); return nil })
		try(t, "Psi "+nm, func() error { _, err := arma.Psi(x, x, 5); return err })
		try(t, "Select "+nm, func() error { _, err := arma.Select(ctx, x, arma.Grid{MaxP: 1, MaxQ: 1}, nil); return err })
		try(t, "FitNoise "+nm, func() error {
			_, err := arma.FitNoise(ctx, x, arma.Model{AR: []float64{0.3}}.Noise(), nil, nil)
			return err
		})
	}
	try(t, "Corner nil", func() error { ccf.Corner(nil, 5, 5); return nil })
	try(t, "Corner neg", func() error { ccf.Corner(&ccf.Weights{V: []float64{1, 2}, SE: []float64{1, 1}}, -5, -5); return nil })
	var r *arma.Result
	try(t, "nil Result LjungBox", func() error { _, err := r.LjungBox(5); return err })
	try(t, "nil Result String", func() error { _ = r.String(); return nil })
	try(t, "nil Result Constant", func() error { r.EquationConstant(); return nil })
	try(t, "zero Result", func() error {
		_ = (&arma.Result{}).String()
		(&arma.Result{}).EquationConstant()
		_, err := (&arma.Result{}).LjungBox(3)
		return err
	})
	var id *ccf.Identification
	try(t, "nil Identification String", func() error { _ = id.String(); return nil })
	try(t, "zero Identification String", func() error { _ = (&ccf.Identification{}).String(); return nil })
	try(t, "Form String", func() error { _ = ccf.Form{}.String(); return nil })
	try(t, "ARFit zero", func() error { _ = arma.ARFit{}.Poly(); _ = arma.ARFit{}.Residuals([]float64{1, 2}); return nil })
	try(t, "ARFit nil resid", func() error {
		f, _ := arma.YuleWalker([]float64{1, 3, 2, 5, 4, 6, 3, 7}, 2)
		_ = f.Residuals(nil)
		return nil
	})
	try(t, "Filter String zero", func() error { _ = prewhiten.Filter{}.String(); return nil })
	try(t, "ApplyInput zero", func() error { _, _, err := prewhiten.Filter{}.ApplyInput([]float64{1, 2, 3}); return err })
	// The fixes this probe led to.
	var ve *prewhiten.SampleError
	if _, err := prewhiten.Fit(sets["big"], &prewhiten.Settings{Name: "valve"}); !errors.As(err, &ve) || ve.Series != "valve" || ve.Index != 0 || ve.Limit != arma.MaxAbs ||
		err.Error() != `prewhiten.Fit: series "valve" sample 0 is 1e+300, beyond the largest magnitude accepted, 1e+140 (rescale the series: change its units)` {
		t.Errorf("1e300 sample: %T %v", err, err)
	}
	var se *prewhiten.SeriesError
	if _, err := prewhiten.Fit(sets["one"], nil); !errors.As(err, &se) || se.Need != 3 || !errors.Is(err, prewhiten.ErrShort) {
		t.Errorf("one sample: %T %v", err, err)
	}
	if _, err := (&arma.Result{}).LjungBox(3); err == nil || !strings.Contains(err.Error(), "needs a result of Fit or FitNoise") {
		t.Errorf("zero Result: %v", err)
	}
	if got := id.String(); got != "<nil ccf.Identification>" {
		t.Errorf("nil Identification: %q", got)
	}
}
