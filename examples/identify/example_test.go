package main

import (
	"context"
	"fmt"
	"log"

	"github.com/backshift/backshift/examples/internal/greenhouse"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// Example is the README's ten-line example: parse a spec, fit it, print
// it, forecast. data maps series names to samples (oldest first); here
// the greenhouse demo record, with a plan to hold the valve at 70 %.
func Example() {
	d := greenhouse.Default()
	data := map[string][]float64{"temp": d.Temp, "valve": d.Valve, "outdoor": d.Outdoor}
	plan := make([]float64, 60)
	for i := range plan {
		plan[i] = 70 // % valve for the next hour
	}

	m, err := parse.Model("temp = c + w0 / (1 - d1 B) B^3 valve + v0 / (1 - e1 B) B outdoor + (1 + t1 B) / (1 - p1 B) a; every 1 min")
	if err != nil {
		log.Fatal(err)
	}
	est, err := tf.Fit(context.Background(), m, data, nil)
	if err != nil {
		log.Fatal(err)
	}
	w0, _ := est.Param("w0")
	d1, _ := est.Param("d1")
	fmt.Printf("valve gain %.2f degC/%%, dead time %d min\n", w0.Value/(1-d1.Value), est.Model.Inputs[0].Delay)
	fc, err := est.Forecast(data, 60, &tf.ForecastSettings{Future: map[string][]float64{"valve": plan}})
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("in 1 h: %.1f degC (95 %% interval %.1f to %.1f)\n", fc.Mean[59], fc.Lower[59], fc.Upper[59])
	// Output:
	// valve gain 0.20 degC/%, dead time 3 min
	// in 1 h: 17.0 degC (95 % interval 15.9 to 18.0)
}
