package control_test

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/control"
	"github.com/backshift/backshift/tf/fit"
)

// fitForTest is the one call of the estimation API in this package's
// tests (fit.Model, returning *fit.Estimate
// with the same Model, Params and Cov).
func fitForTest(t *testing.T, m tf.Model, data map[string][]float64) *fit.Estimate {
	t.Helper()
	est, err := fit.Model(context.Background(), m, data, nil)
	if err != nil {
		t.Fatal(err)
	}
	return est
}

// TestRobustOverEstimate runs the whole path: fit a model to a simulated
// record, draw plants from the estimate's covariance (ModelDraw with the
// names of Estimate.Params and Estimate.Cov, the adapter the README
// shows), tune on the estimate and check the spread. The drawn gains
// scatter about the estimate with the standard error the fit reports:
// the draws' sample standard deviation of w0 agrees with SE(w0) within
// 10 % (400 draws: the standard error of a standard deviation is about
// sd/sqrt(2n) = 3.5 %).
func TestRobustOverEstimate(t *testing.T) {
	n := 600
	rng := rand.New(rand.NewPCG(5, 6))
	valve := make([]float64, n)
	level := 0.0
	for i := range valve {
		if rng.Float64() < 0.1 {
			level = rng.Float64()
		}
		valve[i] = level
	}
	truth := parse.MustModel("temp = 0.4 / (1 - 0.8 B) B^3 valve + a")
	y, err := truth.Simulate(map[string][]float64{"valve": valve}, &tf.SimSettings{Seed1: 1, Seed2: 2, Sigma: 0.05})
	if err != nil {
		t.Fatal(err)
	}
	est := fitForTest(t, parse.MustModel("temp = w0 / (1 - d1 B) B^3 valve + a"), map[string][]float64{"temp": y, "valve": valve})
	names := make([]string, len(est.Params))
	for i, p := range est.Params {
		names[i] = p.Name
	}
	draw, err := control.ModelDraw(est.Model, "valve", names, est.Cov)
	if err != nil {
		t.Fatal(err)
	}
	plant, err := est.Model.Path("valve")
	if err != nil {
		t.Fatal(err)
	}
	tu, err := control.Tune(plant, tf.Interval{Value: 1, Unit: "min"}, control.TuneSettings{})
	if err != nil {
		t.Fatal(err)
	}
	r, err := control.Robust(context.Background(), tu.Controller, draw, control.RobustSettings{Draws: 400, Seed: 9, Loop: control.LoopSettings{Horizon: 120}})
	if err != nil {
		t.Fatal(err)
	}
	if r.FractionStable < 0.99 || !(r.SensitivityPeak.Values[0] <= tu.Ms && tu.Ms <= r.SensitivityPeak.Values[2]) {
		t.Errorf("stable %v, Ms band %v around the nominal %v", r.FractionStable, r.SensitivityPeak.Values, tu.Ms)
	}
	w0, _ := est.Param("w0")
	dr := rand.New(rand.NewPCG(9, 0))
	var s, s2 float64
	for range 400 {
		p, err := draw(dr)
		if err != nil {
			t.Fatal(err)
		}
		v := p.Num()[0]
		s, s2 = s+v, s2+v*v
	}
	sd := math.Sqrt(s2/400 - (s/400)*(s/400))
	if math.Abs(sd/w0.SE-1) > 0.1 {
		t.Errorf("drawn w0 spread %v, standard error %v", sd, w0.SE)
	}
}
