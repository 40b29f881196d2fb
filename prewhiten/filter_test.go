package prewhiten_test

import (
	"context"
	"encoding/csv"
	"errors"
	"math"
	"math/rand/v2"
	"os"
	"strconv"
	"strings"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/testutil"
	"github.com/backshift/backshift/prewhiten"
)

// TestFitAgainstR checks the prewhitening autoregression against R 4.2.2
// stats::ar(s, aic = TRUE, order.max = m, method = "yule-walker")
// (testdata/ccf/reference.R): the chosen order, the coefficients, the
// innovation variance (var.pred), the mean, and the filtered series
// against ar()$resid. Series: x (an AR(2) simulated in R), the first
// differences of BJsales.lead (R datasets, Series M of Box, Jenkins &
// Reinsel; here through Settings.Diff = 1 - B), and a white series w.
// Tolerance 1e-10 relative: the same Durbin-Levinson recursion on the
// same autocovariances in double precision.
func TestFitAgainstR(t *testing.T) {
	series := map[string][]float64{}
	series["x"] = testutil.ReadCSV(t, "testdata/ccf/series.csv").Column(t, "x")
	series["w"] = testutil.ReadCSV(t, "testdata/ccf/white.csv").Column(t, "w")
	series["lead"] = testutil.ReadCSV(t, "testdata/bjsales/bjsales.csv").Column(t, "lead")

	f, err := os.Open("../testdata/ccf/ar.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rd := csv.NewReader(f)
	rd.FieldsPerRecord = -1
	rows, err := rd.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	resid := residColumns(t)
	for _, row := range rows[1:] {
		name := row[0]
		maxOrder, err1 := strconv.Atoi(row[1])
		order, err2 := strconv.Atoi(row[2])
		if err1 != nil || err2 != nil {
			t.Fatalf("ar.csv line %q: order_max or order is not an integer", row)
		}
		want := make([]float64, 0, len(row)-3)
		for _, s := range row[3:] {
			v, err := strconv.ParseFloat(s, 64)
			if err != nil {
				t.Fatal(err)
			}
			want = append(want, v)
		}
		varPred, mean, coef := want[0], want[1], want[2:]
		x := series[name]
		set := &prewhiten.Settings{MaxOrder: maxOrder, Name: name}
		if name == "dlead" {
			x = series["lead"]
			set.Diff = []float64{1, -1}
		}
		flt, err := prewhiten.Fit(x, set)
		if err != nil {
			t.Fatal(err)
		}
		if flt.Order() != order {
			t.Errorf("%s order.max %d: order %d, R ar gives %d", name, maxOrder, flt.Order(), order)
			continue
		}
		for k, v := range coef {
			// ar()$ar holds phi_k of x_t = sum phi_k x_{t-k} + e_t; AR
			// stores phi(B) = 1 - sum phi_k B^k.
			if got := -flt.AR[k+1]; !close(got, v, 1e-10) {
				t.Errorf("%s order.max %d: phi_%d = %.15g, R %.15g", name, maxOrder, k+1, got, v)
			}
		}
		if !close(flt.Sigma2, varPred, 1e-10) || !close(flt.Mean, mean, 1e-10) {
			t.Errorf("%s: var %.15g mean %.15g, R var.pred %.15g x.mean %.15g", name, flt.Sigma2, flt.Mean, varPred, mean)
		}
		t.Logf("%s order.max %d: order %d, phi %v (R ar: order %d)", name, maxOrder, flt.Order(), flt.AR, order)
		out, start, err := flt.Apply(x, name)
		if err != nil {
			t.Fatal(err)
		}
		// R's resid for the differenced lead has one sample less: it is
		// indexed from the first difference, ours from the level series.
		rr := resid[name+"/"+row[1]]
		d := len(flt.Diff) - 1
		for i, v := range rr {
			got := out[i+d]
			if math.IsNaN(v) {
				if i+d >= start {
					t.Errorf("%s: index %d valid, R has NA", name, i+d)
				}
				continue
			}
			if !close(got, v, 1e-9) {
				t.Errorf("%s: filtered[%d] = %.15g, R resid %.15g", name, i+d, got, v)
				break
			}
		}
	}
}

func close(a, b, rel float64) bool {
	return math.Abs(a-b) <= rel*math.Max(1, math.Abs(b))
}

// residColumns reads R's ar()$resid from testdata/ccf/ar_resid.csv (one
// line per series, order.max and time index; NA before the first
// residual) into series keyed "name/order.max".
func residColumns(t *testing.T) map[string][]float64 {
	tb := testutil.ReadCSV(t, "testdata/ccf/ar_resid.csv", "series", "order_max")
	names, orders, resid := tb.Text["series"], tb.Text["order_max"], tb.Column(t, "resid")
	out := map[string][]float64{}
	for i, v := range resid {
		key := names[i] + "/" + orders[i]
		out[key] = append(out[key], v)
	}
	return out
}

// TestSettingsValidate: every field of Settings and NoiseSettings with a
// bad value gives a *SettingError naming that field, from Validate and from
// the call that takes the settings. Fields with no bad value: Settings.
// Name, AutoDiff, KeepAR and NoiseSettings.Name (any string or bool);
// MaxP/MaxQ negative is documented (order zero only).
func TestSettingsValidate(t *testing.T) {
	x := walk(300, 1)
	y := walk(300, 2)
	nan := math.NaN()
	cases := []struct {
		field string
		s     prewhiten.Settings
		want  string
	}{
		{"Settings.MaxOrder", prewhiten.Settings{MaxOrder: -1}, "Settings.MaxOrder = -1: must be zero or positive (0 means min(n-1, floor(10 log10 n)))"},
		{"Settings.Diff", prewhiten.Settings{Diff: []float64{2, -1}}, "constant term 1"},
		{"Settings.Diff", prewhiten.Settings{Diff: []float64{1, nan}}, "finite"},
		{"Settings.Diff", prewhiten.Settings{Diff: []float64{}}, "constant term 1"},
		{"Settings.Order", prewhiten.Settings{Order: &arma.Order{P: -1}}, "non-negative orders"},
		{"Settings.Order", prewhiten.Settings{Order: &arma.Order{SQ: 1}}, "Period >= 2"},
		{"Settings.Order", prewhiten.Settings{Order: &arma.Order{Q: 1}, ARMA: &arma.Model{}}, "one of Order"},
		{"Settings.Order", prewhiten.Settings{Order: &arma.Order{D: 1, Q: 1}, Diff: []float64{1, -1}}, "differencing written once"},
		{"Settings.ARMA", prewhiten.Settings{ARMA: &arma.Model{D: -1}}, "valid orders"},
		{"Settings.ARMA", prewhiten.Settings{ARMA: &arma.Model{AR: []float64{nan}}}, "finite"},
		{"Settings.ARMA", prewhiten.Settings{ARMA: &arma.Model{Mean: math.Inf(1)}}, "finite"},
		{"Settings.ARMA.Sigma2", prewhiten.Settings{ARMA: &arma.Model{Sigma2: -1}}, "Settings.ARMA.Sigma2 = -1: must be zero or positive"},
		{"Settings.Diff", prewhiten.Settings{ARMA: &arma.Model{D: 1}, Diff: []float64{1, 0, -1}}, "differencing written once"},
		{"Settings.Lags", prewhiten.Settings{Lags: -3}, "Settings.Lags = -3: must be zero or positive (0 means min(20, n/5))"},
		{"Settings.Level", prewhiten.Settings{Level: 1}, "Settings.Level = 1: must lie strictly between 0 and 1 (0 means 0.01)"},
		{"Settings.Level", prewhiten.Settings{Level: -0.05}, "strictly between 0 and 1"},
		{"Settings.Level", prewhiten.Settings{Level: nan}, "strictly between 0 and 1"},
	}
	for _, c := range cases {
		check := func(how string, err error) {
			t.Helper()
			var ae *prewhiten.SettingError
			if !errors.As(err, &ae) || ae.Setting != c.field || !strings.Contains(err.Error(), c.want) || !errors.Is(err, prewhiten.ErrSetting) {
				t.Errorf("%s %+v: %v, want a *SettingError on %s containing %q", how, c.s, err, c.field, c.want)
			}
			if how != "Validate" && ae != nil && ae.Op != "prewhiten."+how {
				t.Errorf("%s: Op %q", how, ae.Op)
			}
		}
		check("Validate", c.s.Validate())
		_, err := prewhiten.Fit(x, &c.s)
		check("Fit", err)
		_, err = prewhiten.Pair(x, y, "y", &c.s)
		check("Pair", err)
	}
	// The same differencing written in both places is accepted.
	same := prewhiten.Settings{ARMA: &arma.Model{D: 1, AR: []float64{0.3}}, Diff: []float64{1, -1}}
	if err := same.Validate(); err != nil {
		t.Errorf("equal differencing in ARMA and Diff: %v", err)
	}
	if err := (*prewhiten.Settings)(nil).Validate(); err != nil {
		t.Errorf("nil settings: %v", err)
	}

	noise := []struct {
		field string
		s     prewhiten.NoiseSettings
		want  string
	}{
		{"NoiseSettings.MaxP", prewhiten.NoiseSettings{MaxP: arma.MaxLag + 1}, "at most arma.MaxLag"},
		{"NoiseSettings.MaxQ", prewhiten.NoiseSettings{MaxQ: math.MaxInt}, "at most arma.MaxLag"},
		{"NoiseSettings.Lags", prewhiten.NoiseSettings{Lags: -1}, "must be zero or positive"},
		{"NoiseSettings.Criterion", prewhiten.NoiseSettings{Criterion: 7}, "Criterion(7)"},
		{"NoiseSettings.Criterion", prewhiten.NoiseSettings{Criterion: -1}, "arma.ByAICc"},
	}
	for _, c := range noise {
		for how, err := range map[string]error{
			"Validate": c.s.Validate(),
			"IdentifyNoise": func() error {
				_, err := prewhiten.IdentifyNoise(context.Background(), x, &c.s)
				return err
			}(),
		} {
			var ae *prewhiten.SettingError
			if !errors.As(err, &ae) || ae.Setting != c.field || !strings.Contains(err.Error(), c.want) || !errors.Is(err, prewhiten.ErrSetting) {
				t.Errorf("%s %+v: %v, want a *SettingError on %s containing %q", how, c.s, err, c.field, c.want)
			}
			if how != "Validate" && ae != nil && ae.Op != "prewhiten."+how {
				t.Errorf("%s: Op %q", how, ae.Op)
			}
		}
	}
}

// TestOrderSpellingsAgree: Settings{Order: {D: 1, Q: 1}} and
// Settings{Diff: {1, -1}, Order: {Q: 1}} are the same filter (the first
// spelling must keep the mean of the differenced input, a drift of 0.3
// per sample, or the MA coefficient moves to absorb it). Both estimate
// the mean; the fits are the same
// least-squares problem, so they agree to rounding (1e-9 relative: the
// optimiser's path is identical, the differencing done in another
// place). The estimated drift must be near the true 0.3: within 4
// standard errors of the mean of an MA(1) with theta 0.4, sqrt(Sigma2
// (1-0.4)^2 / n) = 0.035 for n = 300 (Box, Jenkins & Reinsel, the
// variance of the sample mean of an MA(1); from memory).
func TestOrderSpellingsAgree(t *testing.T) {
	x := walk(300, 5)
	f1, err := prewhiten.Fit(x, &prewhiten.Settings{Order: &arma.Order{D: 1, Q: 1}})
	if err != nil {
		t.Fatal(err)
	}
	f2, err := prewhiten.Fit(x, &prewhiten.Settings{Diff: []float64{1, -1}, Order: &arma.Order{Q: 1}})
	if err != nil {
		t.Fatal(err)
	}
	near := func(a, b float64) bool { return math.Abs(a-b) <= 1e-9*math.Max(1, math.Abs(b)) }
	if len(f1.Diff) != 2 || len(f2.Diff) != 2 || f1.Diff[1] != -1 || f2.Diff[1] != -1 {
		t.Errorf("differencing %v and %v, want (1 - B) in both", f1.Diff, f2.Diff)
	}
	if len(f1.MA) != 2 || len(f2.MA) != 2 || !near(f1.MA[1], f2.MA[1]) || !near(f1.Mean, f2.Mean) || !near(f1.Sigma2, f2.Sigma2) {
		t.Errorf("spellings differ: %v mean %v var %v against %v mean %v var %v", f1, f1.Mean, f1.Sigma2, f2, f2.Mean, f2.Sigma2)
	}
	if math.Abs(f1.Mean-0.3) > 4*0.035 {
		t.Errorf("drift %v, true 0.3", f1.Mean)
	}
}

// TestOrderNotConverged: a Settings.Order fit that stops without
// converging is not used silently: Fit returns the filter of the best
// point with the *arma.ConvergenceError, and Pair returns its result with
// that error. The series (seed 291 of a random
// walk of 40 samples with an over-parameterised ARIMA(3,1,3)) was found
// by search to stop at the iteration limit.
func TestOrderNotConverged(t *testing.T) {
	rng := rand.New(rand.NewPCG(291, 1))
	x := make([]float64, 40)
	for i := range x {
		x[i] = rng.NormFloat64()
		if i > 0 {
			x[i] += x[i-1]
		}
	}
	s := &prewhiten.Settings{Order: &arma.Order{P: 3, D: 1, Q: 3}}
	f, err := prewhiten.Fit(x, s)
	var cv *arma.ConvergenceError
	if !errors.As(err, &cv) || len(f.AR) != 4 || len(f.MA) != 4 {
		t.Fatalf("Fit: %v %v, want the filter with an *arma.ConvergenceError", f, err)
	}
	res, err := prewhiten.Pair(x, walk(40, 9), "y", s)
	if !errors.As(err, &cv) || res == nil {
		t.Errorf("Pair: %v %v, want the result with an *arma.ConvergenceError", res, err)
	}
}

// TestOrderShortMessage: the ARIMA filter of Settings.Order is fitted to
// the differenced input, and its length error counts the input's
// samples ("x has 6 samples", not the 5 differenced ones).
func TestOrderShortMessage(t *testing.T) {
	x := []float64{1, 3, 2, 5, 4, 7}
	_, err := prewhiten.Fit(x, &prewhiten.Settings{Name: "valve", Order: &arma.Order{P: 2, D: 1, Q: 2}})
	var se *prewhiten.SeriesError
	if !errors.As(err, &se) || se.Have != 6 || se.Need != 9 || err.Error() != `prewhiten.Fit: series "valve": 6 samples, at least 9 needed (for the filter of Settings.Order (2,1,2) after the differencing (1 - B))` {
		t.Errorf("%T %v, want a *SeriesError for 6 samples needing 9", err, err)
	}
	y := []float64{1, 3, 2, 5, 4, 7, 1e140, -1e140, 3, 4, 2, 1, 5, 6, 2, 3}
	_, err = prewhiten.Fit(y, &prewhiten.Settings{Name: "valve", Order: &arma.Order{D: 1, Q: 1}})
	var ve *prewhiten.SampleError
	if !errors.As(err, &ve) || ve.Index != 7 || ve.Value != -2e140 || ve.Series != "valve after the differencing (1 - B)" || !strings.Contains(err.Error(), "-2e+140") {
		t.Errorf("%T %v, want a *SampleError at index 7", err, err)
	}
}

// TestARMAFilter: a caller-given ARMA(1,1) filter applied to the series
// it describes returns (nearly) the innovations: after the start-up, the
// filtered series equals the innovations the series was built from.
func TestARMAFilter(t *testing.T) {
	rng := rand.New(rand.NewPCG(4, 4))
	n := 300
	a := make([]float64, n)
	x := make([]float64, n)
	for i := range a {
		a[i] = rng.NormFloat64()
	}
	// (1 - 0.6 B) x = (1 - 0.3 B) a  (Box-Jenkins signs: phi1 0.6, theta1 0.3)
	for i := range x {
		x[i] = a[i]
		if i > 0 {
			x[i] += 0.6*x[i-1] - 0.3*a[i-1]
		}
	}
	m := arma.Model{AR: []float64{0.6}, MA: []float64{0.3}}
	f, err := prewhiten.Fit(x, &prewhiten.Settings{ARMA: &m})
	if err != nil {
		t.Fatal(err)
	}
	out, start, err := f.Apply(x, "x")
	if err != nil {
		t.Fatal(err)
	}
	// Apply removes the sample mean and starts the MA recursion at zero;
	// both effects decay as 0.3^t (and the mean offset is tiny), so after
	// 40 samples the difference is below 1e-2 of the innovation scale.
	mean := 0.0
	for _, v := range x {
		mean += v
	}
	mean /= float64(n)
	shift := mean * (1 - 0.6) / (1 - 0.3)
	for i := start + 40; i < n; i++ {
		if math.Abs(out[i]+shift-a[i]) > 1e-2 {
			t.Fatalf("index %d: filtered %g, innovation %g", i, out[i]+shift, a[i])
		}
	}
	if got := f.String(); got != "(1 - 0.6 B) / (1 - 0.3 B) x" {
		t.Errorf("String() = %q", got)
	}
}

// TestFitBadInput feeds Fit, Pair and Apply settings and hand-built
// filters that could panic or give unbounded numbers: each must come back
// as a typed error, and the series must be left as they were.
func TestFitBadInput(t *testing.T) {
	x := make([]float64, 200)
	y := make([]float64, 200)
	for i := 1; i < len(x); i++ {
		x[i] = 0.7*x[i-1] + math.Sin(float64(i)*1.3)
		y[i] = 0.5*x[i-1] + 0.2*math.Cos(float64(i)*0.7)
	}
	x0 := append([]float64(nil), x...)
	y0 := append([]float64(nil), y...)
	var se *prewhiten.SeriesError
	long := make([]float64, 300) // (1 - B^299), longer than the series
	long[0], long[299] = 1, -1
	if _, err := prewhiten.Fit(x, &prewhiten.Settings{Diff: long}); !errors.As(err, &se) || se.Need != 302 {
		t.Errorf("differencing longer than the series: %v", err)
	}
	if _, err := prewhiten.Fit(x, &prewhiten.Settings{MaxOrder: math.MaxInt}); !errors.As(err, &se) || se.Need < len(x) {
		t.Errorf("MaxOrder = MaxInt: %v", err)
	}
	if _, err := prewhiten.Pair(x, y, "y", &prewhiten.Settings{Lags: math.MaxInt}); !errors.As(err, &se) || se.Need < len(x) {
		t.Errorf("Lags = MaxInt: %v", err)
	}
	var ae *prewhiten.SettingError
	if _, err := prewhiten.Fit(x, &prewhiten.Settings{ARMA: &arma.Model{AR: []float64{math.NaN()}}}); !errors.As(err, &ae) ||
		err.Error() != "prewhiten.Fit: Settings.ARMA = a NaN or infinite coefficient, Mean or Sigma2: must be finite values" {
		t.Errorf("caller's ARMA with a NaN coefficient: %v", err)
	}
	f, err := prewhiten.Fit(x, nil)
	if err != nil {
		t.Fatal(err)
	}
	for name, g := range map[string]prewhiten.Filter{
		"zero value":        {},
		"NaN in AR":         {Diff: []float64{1}, AR: []float64{1, math.NaN()}, MA: []float64{1}},
		"AR leading 2":      {Diff: []float64{1}, AR: []float64{2, 0.5}, MA: []float64{1}},
		"non-invertible MA": {Diff: []float64{1}, AR: f.AR, MA: []float64{1, 3}}, // root B = -1/3
	} {
		if _, _, err := g.Apply(y, "y"); !errors.As(err, &ae) {
			t.Errorf("Apply with a filter %s: %v", name, err)
		}
	}
	for i := range x {
		if x[i] != x0[i] || y[i] != y0[i] {
			t.Fatalf("series modified at %d", i)
		}
	}
}

// TestZeroFilter: the zero Filter reports order 0 and start 0 (nil
// polynomials count as {1}, as documented; was -1 and -2), and Apply
// rejects it with a *SettingError naming Filter.Diff.
func TestZeroFilter(t *testing.T) {
	var f prewhiten.Filter
	if f.Order() != 0 || f.Start() != 0 {
		t.Errorf("zero Filter: order %d, start %d; want 0 and 0", f.Order(), f.Start())
	}
	f.AR = []float64{1, -0.5}
	if f.Order() != 1 || f.Start() != 1 {
		t.Errorf("AR only: order %d, start %d; want 1 and 1", f.Order(), f.Start())
	}
	var ae *prewhiten.SettingError
	if _, _, err := (prewhiten.Filter{}).Apply([]float64{1, 2, 3}, "y"); !errors.As(err, &ae) || ae.Setting != "Filter.Diff" ||
		err.Error() != "prewhiten.Filter.Apply: Filter.Diff = nil: must be a polynomial with constant term 1 ({1} for none)" {
		t.Errorf("Apply of the zero Filter: %v", err)
	}
}
