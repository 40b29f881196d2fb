package fit_test

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf/fit"
)

// TestExactMLEvent: a step event in a model fitted by exact maximum
// likelihood, with the output missing around the event's time: the
// indicator comes from the model as in least squares, the size is
// estimated within 3 SE of the planted 3.0 (a normal tail of 0.3 %),
// and the forecast carries the step on.
func TestExactMLEvent(t *testing.T) {
	const n = 300
	rng := rand.New(rand.NewPCG(91, 92))
	x, y := stepRecord(rng, n, 0.5, 150, 3)
	for i := 148; i < 153; i++ {
		y[i] = math.NaN()
	}
	m := parse.MustModel("y = c + w0 B x + k step(150) + 1 / (1 - p1 B) a")
	data := map[string][]float64{"y": y, "x": x}
	e, err := fit.Model(context.Background(), m, data, &fit.Settings{Method: fit.ExactML})
	if err != nil {
		t.Fatal(err)
	}
	k, _ := e.Param("k")
	if !(math.Abs(k.Value-3) < 3*k.SE) {
		t.Errorf("step size %.4f +- %.4f, planted 3", k.Value, k.SE)
	}
	fc, err := e.Forecast(data, 2, &fit.ForecastSettings{Future: map[string][]float64{"x": {0, 0}}})
	if err != nil {
		t.Fatal(err)
	}
	c, _ := e.Param("c")
	// x = 0 ahead: the forecast two steps on is c + k plus the decayed
	// noise forecast, within a few sigma of c + k.
	if d := fc.Mean[1] - (c.Value + k.Value); !(math.Abs(d) < 4*fc.SE[1]) {
		t.Errorf("forecast %.4f, c + k = %.4f (SE %.4f)", fc.Mean[1], c.Value+k.Value, fc.SE[1])
	}
}
