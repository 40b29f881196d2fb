package main

import (
	"context"
	"fmt"
	"log"

	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf/fit"
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
	est, err := fit.Model(context.Background(), m, data, &fit.Settings{First: 300}) // sum residuals after the start-up
	if err != nil {
		log.Fatal(err)
	}
	for _, p := range est.Params {
		fmt.Printf("%-2s = %7.4g  (SE %.2g)\n", p.Name, p.Value, p.SE)
	}
	fc, err := est.Forecast(data, 60, &fit.ForecastSettings{Future: map[string][]float64{"valve": plan}})
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("in 1 h: %.1f degC (95 %% interval %.1f to %.1f)\n", fc.Mean[59], fc.Lower[59], fc.Upper[59])
	// Output:
	// c  =   5.971  (SE 0.021)
	// w0 = 0.009988  (SE 3.6e-05)
	// d1 =  0.9502  (SE 0.00019)
	// v0 = 0.04906  (SE 0.00086)
	// e1 =  0.9021  (SE 0.0017)
	// t1 =  0.3033  (SE 0.015)
	// p1 =  0.7928  (SE 0.0093)
	// in 1 h: 17.0 degC (95 % interval 15.9 to 18.0)
}
