package fit_test

import (
	"fmt"
	"math/rand/v2"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// ExampleEstimate_Forecast fits a model to simulated data of our own (a
// feed rate driving a level, with drift) and forecasts the level five
// samples ahead for a planned feed rate, in the level's own units: the
// dead time of 2 samples delays the effect of the step, and the
// intervals widen with the horizon because the level integrates its
// noise.
func ExampleEstimate_Forecast() {
	n := 500
	rng := rand.New(rand.NewPCG(5, 6))
	feed := make([]float64, n)
	for i := range feed {
		feed[i] = 10 + rng.NormFloat64()
	}
	// fixture.SimulateRecord (internal/fixture) simulates the true model.
	data, err := fixture.SimulateRecord("(1 - B) level = 1.2 B^2 ((1 - B) feed) + (1 - 0.4 B) a",
		map[string][]float64{"feed": feed}, &tf.SimSettings{Seed1: 7, Seed2: 8, Sigma: 0.1, BurnIn: -1})
	if err != nil {
		fmt.Println(err)
		return
	}
	level := data["level"]
	est, err := estimateSpec("(1 - B) level = w0 B^2 ((1 - B) feed) + (1 - t1 B) a", data) // parse.Model, then fit.Model (fixtures_external_test.go)
	if err != nil {
		fmt.Println(err)
		return
	}
	plan := []float64{12, 12, 12, 12, 12} // step the feed up to 12 from now on
	fc, err := est.Forecast(data, 5, &fit.ForecastSettings{Future: map[string][]float64{"feed": plan}})
	if err != nil {
		fmt.Println(err)
		return
	}
	last := level[n-1]
	for j := range fc.Mean {
		fmt.Printf("t+%d: change %+.2f  95%% interval [%+.2f, %+.2f]\n", j+1, fc.Mean[j]-last, fc.Lower[j]-last, fc.Upper[j]-last)
	}
	// Output:
	// t+1: change -0.54  95% interval [-0.74, -0.35]
	// t+2: change +1.24  95% interval [+1.01, +1.46]
	// t+3: change +1.77  95% interval [+1.51, +2.02]
	// t+4: change +1.77  95% interval [+1.49, +2.04]
	// t+5: change +1.77  95% interval [+1.46, +2.07]
}
