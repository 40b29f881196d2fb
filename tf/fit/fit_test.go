package fit

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"sync"
	"testing"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/filter"
	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf"
)

// TestBadInputModel checks the typed errors of Model and their messages.
func TestBadInputModel(t *testing.T) {
	y, x := fixture.SimulatePlant(fixture.NewRand(9), 60)
	good := func() map[string][]float64 {
		return map[string][]float64{"y": append([]float64(nil), y...), "x": append([]float64(nil), x...)}
	}
	fixed := fixture.PlantModel()
	fixed.Const = &tf.Coef{Value: 2}
	fixed.Inputs[0].Num = fixture.Poly(fixture.Factor(fixture.Term(false, "", 1.5, 0)))
	fixed.Inputs[0].Den = fixture.Poly(fixture.Factor(fixture.Term(false, "", 1, 0), fixture.Term(true, "", 0.6, 1)))
	fixed.Noise.AR = fixture.Poly(fixture.Factor(fixture.Term(false, "", 1, 0), fixture.Term(true, "", 0.5, 1)))
	freeDiff := fixture.PlantModel()
	freeDiff.Diff = fixture.OneMinus("k", 1)
	mixed := fixture.PlantModel()
	mixed.Noise.AR = fixture.Poly(fixture.Factor(fixture.Term(false, "", 1, 0), tf.Term{Neg: true, Coef: tf.Coef{Name: "d1", Value: 0.5}, Power: 1}))
	zeroDen := fixture.PlantModel()
	zeroDen.Inputs[0].Den = fixture.Poly(fixture.Factor(fixture.Term(false, "", 0, 0), fixture.Term(true, "d1", 0, 1)))
	noOut := fixture.PlantModel()
	noOut.Output = ""
	for _, tc := range []struct {
		name   string
		m      tf.Model
		data   func() map[string][]float64
		kind   error
		series string // the SeriesError's series, "" for a *ModelError
		msg    string
	}{
		{"missing output", fixture.PlantModel(), func() map[string][]float64 { d := good(); delete(d, "y"); return d },
			tf.ErrName, "y", `fit.Model: series "y": the model's output is not in the data; check the series names`},
		{"missing input", fixture.PlantModel(), func() map[string][]float64 { d := good(); delete(d, "x"); return d },
			tf.ErrName, "x", `fit.Model: series "x": an input of the model is not in the data; check the series names`},
		{"extra series", fixture.PlantModel(), func() map[string][]float64 { d := good(); d["xx"] = x; return d },
			tf.ErrName, "xx", `fit.Model: series "xx": it is in the data but not used by the model, often a misspelt input name; set fit.Settings.IgnoreExtra to allow extra series`},
		{"unequal lengths", fixture.PlantModel(), func() map[string][]float64 { d := good(); d["x"] = d["x"][:50]; return d },
			tf.ErrLength, "x", `fit.Model: series "x" has 50 samples against 60 (the length of the output "y"; every series of one fit has one length)`},
		{"too few observations", fixture.PlantModel(), func() map[string][]float64 {
			d := good()
			d["x"], d["y"] = d["x"][:9], d["y"][:9]
			return d
		}, tf.ErrShort, "y", `fit.Model: series "y": 4 samples, at least 6 needed (counting residuals, one more than the 5 free coefficients; residuals are summed from index 5 of 9 samples; input "x" with dead time 3, numerator degree 1 and differencing degree 0 leaves its first 4 samples without a residual: check the dead time (it counts samples))`},
		{"nothing free", fixed, good, tf.ErrModel, "", `fit.Model: model: nothing is free to estimate (every coefficient is held); mark at least one coefficient free`},
		{"free differencing", freeDiff, good, tf.ErrModel, "", `fit.Model: differencing coefficient k: differencing must be given as fixed numbers, not estimated (write the value, or hold it with =)`},
		{"mixed freedom", mixed, good, tf.ErrModel, "", `fit.Model: coefficient d1: it is free in one place and held in another; one name is one parameter, so mark it the same way everywhere (or rename one)`},
		{"zero denominator constant", zeroDen, good, tf.ErrModel, "", `fit.Model: input "x" denominator: the constant term is zero, so the term is not causal; write it as 1 + ... (or move the dead time to the input's delay)`},
		{"no output", noOut, good, tf.ErrModel, "", `fit.Model: model: it names no output series (Model.Output is empty)`},
	} {
		_, err := Model(context.Background(), tc.m, tc.data(), nil)
		if !errors.Is(err, tc.kind) {
			t.Errorf("%s: got %v, want kind %v", tc.name, err, tc.kind)
			continue
		}
		var se *tf.SeriesError
		var me *errs.ModelError
		if tc.series != "" && (!errors.As(err, &se) || se.Series != tc.series || se.Op != "fit.Model") ||
			tc.series == "" && (!errors.As(err, &me) || me.Op != "fit.Model") {
			t.Errorf("%s: got %T %v, want the shared shape naming %q", tc.name, err, err, tc.series)
			continue
		}
		if err.Error() != tc.msg {
			t.Errorf("%s: message\n%s\nwant\n%s", tc.name, err.Error(), tc.msg)
		}
	}
	// NaN and Inf give a *SampleError with the series and index.
	for _, tc := range []struct {
		series string
		index  int
		v      float64
	}{{"x", 7, math.NaN()}, {"y", 0, math.Inf(1)}, {"y", 59, math.Inf(-1)}} {
		d := good()
		d[tc.series][tc.index] = tc.v
		_, err := Model(context.Background(), fixture.PlantModel(), d, nil)
		var se *errs.SampleError
		if !errors.As(err, &se) || se.Op != "fit.Model" || se.Series != tc.series || se.Index != tc.index || !errors.Is(err, tf.ErrSample) {
			t.Errorf("%v at %s[%d]: got %v", tc.v, tc.series, tc.index, err)
		}
	}
	// Extra series are accepted on request.
	d := good()
	d["xx"] = x
	if _, err := Model(context.Background(), fixture.PlantModel(), d, &Settings{IgnoreExtra: true}); err != nil {
		t.Errorf("IgnoreExtra: %v", err)
	}
}

// TestModelDoesNotModify checks that Model leaves the model and the data as
// they were.
func TestModelDoesNotModify(t *testing.T) {
	y, x := fixture.SimulatePlant(fixture.NewRand(10), 200)
	data := map[string][]float64{"y": append([]float64(nil), y...), "x": append([]float64(nil), x...)}
	m := fixture.PlantModel()
	m0 := m.Clone()
	est := mustFit(t, m, data, nil)
	if !m.Equal(m0) {
		t.Error("model modified")
	}
	for i := range y {
		if data["y"][i] != y[i] || data["x"][i] != x[i] {
			t.Fatal("data modified")
		}
	}
	// The fitted model carries the estimates, still free, and prints as a spec.
	p, _ := est.Param("d1")
	if v := est.Model.Inputs[0].Den.Factors[0].Terms[1].Coef; v.Value != p.Value || !v.Free {
		t.Errorf("fitted model holds %+v, estimate %v", v, p.Value)
	}
	if s := est.Model.String(); !strings.Contains(s, "d1 ~ ") {
		t.Errorf("fitted spec %q lacks the estimate", s)
	}
}

// TestModelCancel checks that a done context stops the fit with the best
// point so far and says so, in the error (wrapping the context's error)
// as well as in the estimate.
func TestModelCancel(t *testing.T) {
	y, x := fixture.SimulatePlant(fixture.NewRand(11), 400)
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	est, err := Model(ctx, fixture.PlantModel(), map[string][]float64{"y": y, "x": x}, nil)
	var ie *InterruptedError
	if !errors.Is(err, context.Canceled) || !errors.Is(err, tf.ErrConvergence) || !errors.As(err, &ie) || ie.Series != "y" || ie.Op != "fit.Model" ||
		!strings.HasPrefix(err.Error(), `fit.Model: fit of "y" interrupted after `) || !strings.Contains(err.Error(), "best point") ||
		!strings.HasSuffix(err.Error(), "context canceled") {
		t.Fatalf("canceled fit: err = %v, want an *InterruptedError wrapping context.Canceled", err)
	}
	if est == nil {
		t.Fatal("canceled fit: no estimate (the best point so far must come with the error)")
	}
	if est.Converged || !strings.Contains(est.Reason, "cancel") || len(est.Warnings) == 0 || est.Warnings[0].Kind != NotConverged {
		t.Errorf("canceled fit: converged %v, reason %q, warnings %v", est.Converged, est.Reason, est.Warnings)
	}
}

// A dead time outside 0..MaxDelay in a model built in code is a typed
// *ModelError naming the input and the dead time, not an index panic.
func TestModelNegativeDelay(t *testing.T) {
	x := make([]float64, 300)
	y := make([]float64, 300)
	for i := range x {
		x[i] = float64(i % 7)
		y[i] = float64(i % 5)
	}
	m := tf.Model{Output: "y", Inputs: []tf.Input{{Series: "x", Delay: -1,
		Num: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{{Coef: tf.Coef{Name: "w0", Free: true}}}}}}}}}
	_, err := Model(context.Background(), m, map[string][]float64{"y": y, "x": x}, nil)
	var me *tf.ModelError
	if !errors.As(err, &me) || me.Part != `input "x" dead time` || !strings.Contains(err.Error(), "-1 samples is outside 0..10000") {
		t.Fatalf("Fit with dead time -1: err = %v, want a *ModelError", err)
	}
}

// Negative or NaN settings are *SettingError values naming the field,
// and a sample so large that its square overflows is a *SampleError
// with its limit (not an error about the number of observations).
func TestBadInputModelSettingsAndMagnitude(t *testing.T) {
	y, x := fixture.SimulatePlant(fixture.NewRand(9), 80)
	data := map[string][]float64{"y": y, "x": x}
	for _, tc := range []struct {
		set Settings
		msg string
	}{
		{Settings{MaxIter: -5}, "fit.Model: Settings.MaxIter = -5: must be zero or positive (0 means 200 iterations)"},
		{Settings{Starts: -1}, "fit.Model: Settings.Starts = -1: must be zero or positive (0 means 2 with a free denominator or MA coefficient, 1 otherwise)"},
		{Settings{First: -3}, "fit.Model: Settings.First = -3: must be zero or positive (0 means the automatic first residual index)"},
		{Settings{Tol: math.NaN()}, "fit.Model: Settings.Tol = NaN: must be a finite number, zero or positive (0 means 1e-14 up to 10^4 residuals, rising to 1e-9 at 10^5)"},
		{Settings{Tol: 1}, "fit.Model: Settings.Tol = 1: must be below 1 (a relative reduction of the sum of squares; 0 means the default)"},
	} {
		_, err := Model(context.Background(), fixture.PlantModel(), data, &tc.set)
		var se *tf.SettingError
		if !errors.As(err, &se) || !errors.Is(err, tf.ErrSetting) || err.Error() != tc.msg {
			t.Errorf("settings %+v: err = %v, want *SettingError %q", tc.set, err, tc.msg)
		}
	}
	// Validate called by the user names itself as Op.
	if err := (Settings{MaxIter: -1}).Validate(); err == nil || !strings.HasPrefix(err.Error(), "fit.Settings.Validate: Settings.MaxIter = -1") {
		t.Errorf("Validate: %v", err)
	}
	big := map[string][]float64{"y": append([]float64(nil), y...), "x": x}
	big["y"][40] = -2e150
	_, err := Model(context.Background(), fixture.PlantModel(), big, nil)
	var se *errs.SampleError
	if want := `fit.Model: series "y" sample 40 is -2e+150, beyond the largest magnitude accepted, 1e+150 (rescale the series: change its units)`; !errors.As(err, &se) || se.Index != 40 || err.Error() != want {
		t.Fatalf("sample -2e150: err = %v, want *SampleError %q", err, want)
	}
}

// TestModelConcurrent fits one model to several series in parallel and
// checks that every result equals the sequential fit of the same series
// exactly (no shared state between fits).
func TestModelConcurrent(t *testing.T) {
	const k = 8
	datas := make([]map[string][]float64, k)
	want := make([]*Estimate, k)
	for i := range datas {
		y, x := fixture.SimulatePlant(fixture.NewRand(uint64(100+i)), 300)
		datas[i] = map[string][]float64{"y": y, "x": x}
		e := mustFit(t, fixture.PlantModel(), datas[i], nil)
		want[i] = e
	}
	m := fixture.PlantModel()
	got := make([]*Estimate, k)
	var wg sync.WaitGroup
	for i := range datas {
		wg.Add(1)
		go func(i int) {
			defer wg.Done()
			e, err := Model(context.Background(), m, datas[i], nil)
			if err != nil {
				t.Error(err)
				return
			}
			got[i] = e
		}(i)
	}
	wg.Wait()
	for i := range got {
		if got[i] == nil || got[i].SSQ != want[i].SSQ {
			t.Fatalf("series %d: concurrent fit differs from sequential", i)
		}
		for j, p := range got[i].Params {
			if p.Value != want[i].Params[j].Value {
				t.Errorf("series %d %s: %v vs %v", i, p.Name, p.Value, want[i].Params[j].Value)
			}
		}
	}
}

// TestModelMonteCarlo fits 100 replicates of n = 400 and checks that the
// 95 % intervals estimate -/+ 1.96 SE cover the truth in 89-99 % of the
// replicates for every parameter (the binomial(100, 0.95) range is about
// 90-99 at 99 %), and that the 95 % forecast intervals with the future
// input known cover 92-98 % of the simulated futures (100 replicates x 10
// steps; the steps of one replicate are correlated, hence the width).
// Fixed seeds make it deterministic.
func TestModelMonteCarlo(t *testing.T) {
	const reps, n, h = 100, 400, 10
	rng := rand.New(rand.NewPCG(2026, 12))
	cover := map[string]int{}
	fcCover, fcTotal := 0, 0
	for r := 0; r < reps; r++ {
		y, x, est, data := replicatePlant(t, rng, n, h)
		for _, p := range est.Params {
			if math.Abs(p.Value-fixture.PlantTruth()[p.Name]) <= 1.96*p.SE {
				cover[p.Name]++
			}
		}
		fc, err := est.Forecast(data, h, &ForecastSettings{Future: map[string][]float64{"x": x[n:]}})
		if err != nil {
			t.Fatal(err)
		}
		for j := 0; j < h; j++ {
			fcTotal++
			if y[n+j] >= fc.Lower[j] && y[n+j] <= fc.Upper[j] {
				fcCover++
			}
		}
	}
	for name := range fixture.PlantTruth() {
		if c := cover[name]; c < 89 || c > 99 {
			t.Errorf("%s: 95 %% interval covers the truth in %d of %d replicates", name, c, reps)
		}
	}
	if f := float64(fcCover) / float64(fcTotal); f < 0.92 || f > 0.98 {
		t.Errorf("forecast intervals cover %.3f of %d futures", f, fcTotal)
	}
	t.Logf("coverage %v, forecasts %d/%d", cover, fcCover, fcTotal)
}

// TestModelRun1 checks the fused first-order kernel against the general
// path (recursive filter, moving average, recursive filter) bit for bit.
func TestModelRun1(t *testing.T) {
	rng := fixture.NewRand(71)
	n, b := 1000, 3
	zc := make([]float64, n)
	for i := range zc {
		zc[i] = rng.NormFloat64()
	}
	for _, c := range [][]float64{{0.7}, {0.7, -0.2}, {0.7, -0.2, 0.1}} {
		s1, u1, q1 := make([]float64, n), make([]float64, n), make([]float64, n)
		runFirstOrder(s1, u1, q1, zc, b, -0.8, c)
		s2, u2, q2 := make([]float64, n), make([]float64, n), make([]float64, n)
		filter.Run(s2[b:], unitPoly, []float64{1, -0.8}, zc[:n-b])
		fir(u2, c, s2, 0, false)
		filter.Run(q2, unitPoly, []float64{1, -0.8}, u2)
		for i := 0; i < n; i++ {
			if s1[i] != s2[i] || u1[i] != u2[i] || q1[i] != q2[i] {
				t.Fatalf("omega %v, t=%d: fused (%v %v %v), general (%v %v %v)", c, i, s1[i], u1[i], q1[i], s2[i], u2[i], q2[i])
			}
		}
	}
}

// TestModelSettle simulates a slow process (pole 0.95) whose input was not
// at its first value before the record (the record starts in the middle
// of a transient from an earlier level) and checks that Settle moves
// the first residual index past ln 0.01/ln 0.95 = 90 samples and brings
// the pole estimate back within 3 SE of the truth, where the plain fit
// is biased.
func TestModelSettle(t *testing.T) {
	n := 2000
	data := fixture.TransientRecord(41, n, 300)
	m := tf.Model{Output: "y", Const: &tf.Coef{Name: "c", Free: true},
		Inputs: []tf.Input{{Series: "x", Num: fixture.Poly(fixture.Factor(fixture.Term(false, "w0", 0, 0))), Den: fixture.OneMinus("d1", 1), Delay: 1}}}
	plain := mustFit(t, m, data, nil)
	settled := mustFit(t, m, data, &Settings{Settle: true})
	d0, _ := plain.Param("d1")
	d1, _ := settled.Param("d1")
	if settled.Conditioning.First < 90 || settled.Conditioning.First > n/10 {
		t.Errorf("settled first index %d", settled.Conditioning.First)
	}
	if math.Abs(d1.Value-0.95) > 3*d1.SE {
		t.Errorf("settled d1 = %v (SE %v), truth 0.95", d1.Value, d1.SE)
	}
	if math.Abs(d0.Value-0.95) < 10*d0.SE {
		t.Errorf("plain fit d1 = %v (SE %v) should be biased by the start-up transient", d0.Value, d0.SE)
	}
	t.Logf("plain d1 %.4f (%.4f) first %d; settled d1 %.4f (%.4f) first %d", d0.Value, d0.SE, plain.Conditioning.First, d1.Value, d1.SE, settled.Conditioning.First)
}

// TestBadInputSettingsValidate checks the exported Validate of every settings
// struct of the estimation side: the one rule (zero means the default,
// a negative count or a probability outside (0, 1) is an error), a
// *SettingError naming the caller's field, Op naming Validate itself;
// the zero value is valid.
func TestBadInputSettingsValidate(t *testing.T) {
	for _, tc := range []struct {
		err  error
		want string
	}{
		{Settings{Starts: -1}.Validate(), "fit.Settings.Validate: Settings.Starts = -1: must be zero or positive"},
		{CheckSettings{CrossLags: -1}.Validate(), "fit.CheckSettings.Validate: CheckSettings.CrossLags = -1: must be zero or positive (0 means Lags)"},
		{CheckSettings{Alpha: 1.5}.Validate(), "fit.CheckSettings.Validate: CheckSettings.Alpha = 1.5: must lie strictly between 0 and 1 (0 means 0.05)"},
		{ForecastSettings{Level: -0.1}.Validate(), "fit.ForecastSettings.Validate: ForecastSettings.Level = -0.1: must lie strictly between 0 and 1 (0 means 0.95)"},
		{ForecastSettings{InputModels: map[string]InputModel{"x": {Sigma2: math.NaN()}}}.Validate(),
			`fit.ForecastSettings.Validate: ForecastSettings.InputModels["x"].Sigma2 = NaN: the innovation variance must be zero or positive and finite`},
	} {
		var se *tf.SettingError
		if !errors.As(tc.err, &se) || !errors.Is(tc.err, tf.ErrSetting) || !strings.HasPrefix(tc.err.Error(), tc.want) {
			t.Errorf("got %v\nwant %s", tc.err, tc.want)
		}
	}
	for _, err := range []error{Settings{}.Validate(), CheckSettings{}.Validate(), ForecastSettings{}.Validate()} {
		if err != nil {
			t.Errorf("valid settings refused: %v", err)
		}
	}
}

// TestErrorsOfInnerStagesNameTheCaller checks that an error found by an
// inner stage carries the Op of the function the caller called: Model's
// data check run inside Check and Forecast says fit.Check and
// fit.Estimate.Forecast, not fit.Model.
func TestErrorsOfInnerStagesNameTheCaller(t *testing.T) {
	est, data := plantEstimate(t)
	short := map[string][]float64{"y": data["y"], "x": data["x"][:100]}
	_, err := Check(est, short, nil)
	var se *tf.SeriesError
	if !errors.As(err, &se) || se.Op != "fit.Check" || !errors.Is(err, tf.ErrLength) || !strings.HasPrefix(err.Error(), `fit.Check: series "x" has 100 samples against 300`) {
		t.Errorf("Check: %v", err)
	}
	_, err = est.Forecast(short, 3, nil)
	if !errors.As(err, &se) || se.Op != "fit.Estimate.Forecast" || !errors.Is(err, tf.ErrLength) {
		t.Errorf("Forecast: %v", err)
	}
}

// benchModel is the benchmark model: b = 3, s = 2, r = 1, AR(2) noise
// and a constant,
//
//	y_t = c + (w0 + w1 B + w2 B^2)/(1 - d1 B) B^3 x_t + 1/(1 - p1 B - p2 B^2) a_t.
func benchModel() tf.Model {
	c := tf.Coef{Name: "c", Free: true}
	num := fixture.Poly(fixture.Factor(fixture.Term(false, "w0", 0, 0), fixture.Term(false, "w1", 0, 1), fixture.Term(false, "w2", 0, 2)))
	ar := fixture.Poly(fixture.Factor(fixture.Term(false, "", 1, 0), fixture.Term(true, "p1", 0, 1), fixture.Term(true, "p2", 0, 2)))
	return tf.Model{Output: "y", Const: &c,
		Inputs: []tf.Input{{Series: "x", Num: num, Den: fixture.OneMinus("d1", 1), Delay: 3}},
		Noise:  &arma.Noise{AR: ar}}
}

func BenchmarkModel(b *testing.B) {
	m := benchModel()
	for _, n := range []int{1000, 10000, 100000, 1000000} {
		data := fixture.BenchData(n, 1)
		b.Run(strconv.Itoa(n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Model(context.Background(), m, data, nil); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
