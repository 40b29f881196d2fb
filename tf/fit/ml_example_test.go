package fit_test

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// ExampleModel_exactML fits a model by exact maximum likelihood to a
// record of our own whose temperature sensor dropped out for 12 samples:
// the missing outputs are skipped by the Kalman filter and estimated by
// the smoother, and a short gap in the power record is filled by holding
// its last value, as Settings.InputGaps allows.
func ExampleModel_exactML() {
	n := 600
	rng := rand.New(rand.NewPCG(5, 6))
	power := make([]float64, n)
	level := 5.0
	for i := range power {
		if rng.Float64() < 0.05 {
			level = 10 * rng.Float64()
		}
		power[i] = level
	}
	data, err := fixture.SimulateRecord("temp = 20 + 0.8 / (1 - 0.9 B) B^2 power + (1 + 0.5 B) / (1 - 0.6 B) a",
		map[string][]float64{"power": power}, &tf.SimSettings{Seed1: 7, Seed2: 8, Sigma: 0.2, BurnIn: 100})
	if err != nil {
		fmt.Println(err)
		return
	}
	temp := append([]float64(nil), data["temp"]...)
	for t := 300; t < 312; t++ {
		temp[t] = math.NaN() // the sensor's dropout
	}
	pw := append([]float64(nil), power...)
	pw[450] = math.NaN() // one lost power reading
	rec := map[string][]float64{"temp": temp, "power": pw}
	m := parse.MustModel("temp = c + w0 / (1 - d1 B) B^2 power + (1 + t1 B) / (1 - p1 B) a")
	est, err := fit.Model(context.Background(), m, rec, &fit.Settings{Method: fit.ExactML, InputGaps: fit.GapFill{Rule: fit.HoldFill}})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("method:", est.Method)
	for _, p := range est.Params {
		fmt.Printf("%-2s %7.4f +- %.4f\n", p.Name, p.Value, p.SE)
	}
	mv := est.Missing[5]
	fmt.Printf("temp[%d] smoothed %.3f +- %.3f (recorded before the dropout was cut: %.3f)\n", mv.Index, mv.Value, mv.SE, data["temp"][mv.Index])
	f := est.Filled[0]
	fmt.Printf("filled: %s, %d sample at %d, %s\n", f.Series, f.Len, f.Index, f.Rule)
	// Output:
	// method: exact maximum likelihood
	// c  20.0023 +- 0.0711
	// w0  0.8017 +- 0.0033
	// d1  0.8999 +- 0.0004
	// t1  0.5142 +- 0.0405
	// p1  0.5812 +- 0.0394
	// temp[305] smoothed 81.940 +- 0.341 (recorded before the dropout was cut: 81.771)
	// filled: power, 1 sample at 450, held
}
