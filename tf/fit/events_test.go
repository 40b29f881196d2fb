package fit_test

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// fitEvents fits the model written as spec to data, the record starting
// at start (fit.Settings.Start places events given as times; fit.Model
// builds the indicators of the events itself).
func fitEvents(t testing.TB, spec string, data map[string][]float64, start time.Time) *fit.Estimate {
	t.Helper()
	m, err := parse.Model(spec)
	if err != nil {
		t.Fatal(err)
	}
	est, err := fit.Model(context.Background(), m, data, &fit.Settings{Start: start})
	if err != nil {
		t.Fatal(err)
	}
	return est
}

// TestEventFitMonteCarlo plants a step intervention of known size and
// time (Box & Tiao 1975, the law of known effect) in a record with an
// input and AR(1) noise, 200 records of 200 samples with fixed seeds, and
// fits the model with the event written as step(120) in one half of the
// records and as the time of sample 120 in the other (every 1 h from
// 2026-03-01T00:00, so step(2026-03-06T00:00)). The estimated size lies
// within 2 standard errors of the truth in 95.4 % of records if the
// estimator and its SE are right (a normal's +-2 sd); the check allows
// two binomial standard errors below (sqrt(0.954 0.046 / 200) = 1.5 %),
// so at least 92.4 %. Measured: see the log (go test -run
// EventFitMonteCarlo -v).
func TestEventFitMonteCarlo(t *testing.T) {
	const n, reps, size, phi = 200, 200, 3.0, 0.5
	start := time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC)
	rng := rand.New(rand.NewPCG(42, 43))
	inside, sum := 0, 0.0
	for rep := 0; rep < reps; rep++ {
		x, y := stepRecord(rng, n, phi, 120, size)
		spec := "y = c + w0 B x + k step(120) + 1 / (1 - p1 B) a"
		if rep%2 == 1 {
			spec = "y = c + w0 B x + k step(2026-03-06T00:00) + 1 / (1 - p1 B) a; every 1 h"
		}
		est := fitEvents(t, spec, map[string][]float64{"y": y, "x": x}, start)
		for _, p := range est.Params {
			if p.Name == "k" {
				sum += p.Value
				if math.Abs(p.Value-size) <= 2*p.SE {
					inside++
				}
			}
		}
	}
	frac := float64(inside) / reps
	t.Logf("step of %v at sample 120: mean estimate %.4f, within 2 SE in %.3f of %d records", size, sum/reps, frac, reps)
	if frac < 0.924 {
		t.Errorf("the step's size lies within 2 SE of the truth in %.3f of records, want >= 0.924", frac)
	}
}

// TestOutliersWholeModel runs the outlier search of package arma on the
// residuals of a fitted transfer-function model (its noise and
// differencing give the pi weights), turns what it finds into event
// inputs with Model.WithOutliers and refits: a bad reading of +6 at
// sample 80 and a level shift of +4 from sample 200 (innovation sd 1,
// AR(1) noise 0.5, fixed seed) are found, and the refit recovers their
// sizes within 3 standard errors and a smaller residual variance (the
// outliers no longer count as noise).
func TestOutliersWholeModel(t *testing.T) {
	const n = 300
	rng := rand.New(rand.NewPCG(7, 8))
	x, y := stepRecord(rng, n, 0.5, 200, 4)
	y[80] += 6
	data := map[string][]float64{"y": y, "x": x}
	est := fitEvents(t, "y = c + w0 B x + 1 / (1 - p1 B) a", data, time.Time{})
	r, err := arma.Outliers(est.Resid, *est.Model.Noise, est.Model.Diff, nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Outliers) != 2 || r.Outliers[0].Index != 80 || r.Outliers[0].Kind != arma.Additive ||
		r.Outliers[1].Kind != arma.LevelShift || r.Outliers[1].Index < 198 || r.Outliers[1].Index > 202 {
		t.Fatalf("found %+v", r.Outliers)
	}
	m2, skipped, err := est.Model.WithOutliers(r.Outliers, r.Decay)
	if err != nil || len(skipped) != 0 {
		t.Fatal(err, skipped)
	}
	ls := "ls" + strconv.Itoa(r.Outliers[1].Index)
	if !strings.Contains(m2.String(), " + ao80 pulse(80) + "+ls+" step(") {
		t.Errorf("model with outliers: %s", m2)
	}
	re := fitEvents(t, m2.String(), data, time.Time{})
	want := map[string]float64{"ao80": 6, ls: 4, "w0": 0.8}
	for _, p := range re.Params {
		if w, ok := want[p.Name]; ok && math.Abs(p.Value-w) > 3*p.SE {
			t.Errorf("%s = %.3f (SE %.3f), planted %v", p.Name, p.Value, p.SE, w)
		}
	}
	t.Logf("sigma^2 %.3f without the outliers, %.3f with them (model %s)", est.Sigma2, re.Sigma2, re.Model.Held())
	if !(re.Sigma2 < est.Sigma2) {
		t.Errorf("refit sigma^2 %v not below %v", re.Sigma2, est.Sigma2)
	}
	if _, _, err := m2.WithOutliers(r.Outliers[:1], r.Decay); !errors.Is(err, tf.ErrModel) || !strings.Contains(err.Error(), "ao80 pulse(80)") {
		t.Errorf("an outlier added twice: %v", err)
	}
}

// TestEventForecast: the future of an event input is known from the
// model, so Forecast needs no Future for it; far ahead, the forecast of
// y = c + k step(T) + 1/(1 - p1 B) a is c + k, the AR(1) part's
// forecast decaying as p1^h (Box, Jenkins, Reinsel & Ljung 2015, the
// forecasting chapter: an AR(1)'s forecast tends to its mean).
func TestEventForecast(t *testing.T) {
	y := eventForecastRecord()
	est := fitEvents(t, "y = c + k step(150) + 1 / (1 - p1 B) a", map[string][]float64{"y": y}, time.Time{})
	fc, err := est.Forecast(map[string][]float64{"y": y}, 200, nil)
	if err != nil {
		t.Fatal(err)
	}
	var c, k float64
	for _, p := range est.Params {
		switch p.Name {
		case "c":
			c = p.Value
		case "k":
			k = p.Value
		}
	}
	if got := fc.Mean[199]; math.Abs(got-(c+k)) > 1e-9 {
		t.Errorf("forecast 200 steps ahead %.12g, want c + k = %.12g", got, c+k)
	}
	if _, err := fit.Model(context.Background(), est.Model, map[string][]float64{"y": y, "step(150)": y}, nil); !errors.Is(err, tf.ErrName) || !strings.Contains(err.Error(), "named like the event input") {
		t.Errorf("a data column named like the event: got %v, want ErrName", err)
	}
}

// TestBadInputEventBeforeFirst: an event whose effect does not change
// over the residuals summed (a step begun by the first residual, a pulse
// before it, a dead time that carries it past the record's end) is
// refused by name instead of giving a singular fit with no standard
// errors. The model y = c + k EVENT + w0 B x + a has Conditioning.First
// = 1 (the dead time of x; worked by hand).
func TestBadInputEventBeforeFirst(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	x, y := make([]float64, 100), make([]float64, 100)
	for i := range x {
		x[i] = rng.NormFloat64()
		y[i] = 1 + rng.NormFloat64()
	}
	data := map[string][]float64{"y": y, "x": x}
	for _, tc := range []struct{ event, want string }{
		{"step(1)", "input step(1): its effect begins at sample 1, but the residuals are summed from sample 1 on"},
		{"pulse(0)", "input pulse(0): its effect begins at sample 0, but the residuals are summed from sample 1 on"},
		{"B^5 pulse(97)", "input pulse(97): its effect begins at sample 102 (the event's sample 97 plus the dead time 5), after the record's last sample 99"},
	} {
		m := parse.MustModel("y = c + k " + tc.event + " + w0 B x + a")
		_, err := fit.Model(context.Background(), m, data, nil)
		if !errors.Is(err, tf.ErrModel) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: got %v, want %q", tc.event, err, tc.want)
		}
	}
	if _, err := fit.Model(context.Background(), parse.MustModel("y = c + k step(2) + w0 B x + a"), data, nil); err != nil {
		t.Errorf("step(2), after the first residual: %v", err)
	}
}

// TestExactMLHonoursFirst: Settings.First keeps the samples before it
// out of the exact likelihood as out of the sum of squares: the
// likelihood starts there (Conditioning.LikelihoodStart), the residuals
// before it are NaN, and a start-up transient planted before it (a
// +5 offset over the first 100 samples of y = c + w0 B x + AR(1) noise)
// leaves the estimates where the clean record puts them, within one
// standard error (the two records are the same from sample 100 on).
func TestExactMLHonoursFirst(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 10))
	n := 1500
	x, y := stepRecord(rng, n, 0.6, n, 0)
	bad := append([]float64(nil), y...)
	for i := 0; i < 100; i++ {
		bad[i] += 5 * math.Pow(0.97, float64(i))
	}
	m := parse.MustModel("y = c + w0 B x + 1 / (1 - p1 B) a")
	set := &fit.Settings{Method: fit.ExactML, First: 100}
	clean, err := fit.Model(context.Background(), m, map[string][]float64{"y": y, "x": x}, set)
	if err != nil {
		t.Fatal(err)
	}
	got, err := fit.Model(context.Background(), m, map[string][]float64{"y": bad, "x": x}, set)
	if err != nil {
		t.Fatal(err)
	}
	if got.Conditioning.LikelihoodStart != 100 || !math.IsNaN(got.Resid[99]) || math.IsNaN(got.Resid[100]) {
		t.Errorf("likelihood start %d, resid[99] %v, resid[100] %v", got.Conditioning.LikelihoodStart, got.Resid[99], got.Resid[100])
	}
	for i, p := range got.Params {
		q := clean.Params[i]
		if !(math.Abs(p.Value-q.Value) <= q.SE) {
			t.Errorf("%s: %v with the transient before First, %v without (SE %v)", p.Name, p.Value, q.Value, q.SE)
		}
	}
}

// stepRecord returns n samples of a white input x and of
//
//	y_t = 2 + 0.8 x_{t-1} + n_t + size [t >= at],  (1 - phi B) n_t = a_t,
//
// a_t standard normal, drawn from rng in the order x_t, a_t at each t
// (at = n plants no step): the record of the event, outlier and
// exact-likelihood tests of this package, whose truths they state.
func stepRecord(rng *rand.Rand, n int, phi float64, at int, size float64) (x, y []float64) {
	x, y = make([]float64, n), make([]float64, n)
	noise := 0.0
	for i := range x {
		x[i] = rng.NormFloat64()
		noise = phi*noise + rng.NormFloat64()
		y[i] = 2 + noise
		if i > 0 {
			y[i] += 0.8 * x[i-1]
		}
		if i >= at {
			y[i] += size
		}
	}
	return x, y
}

// eventForecastRecord is the record of the event forecast tests: 300
// samples of y_t = 2 + n_t + 3 [t >= 150], (1 - 0.5 B) n_t = a_t, a_t
// standard normal from a fixed seed.
func eventForecastRecord() []float64 {
	rng := rand.New(rand.NewPCG(3, 4))
	y := make([]float64, 300)
	noise := 0.0
	for i := range y {
		noise = 0.5*noise + rng.NormFloat64()
		y[i] = 2 + noise
		if i >= 150 {
			y[i] += 3
		}
	}
	return y
}
