package main

import (
	"fmt"
)

// Example loads a one-model config and prints what the model says.
func Example() {
	raw := []byte(`{
  "site": "test bench",
  "models": [
    {"name": "heater", "spec": "temp = 0.5 / (1 - 0.8 B) B^2 power + a; every 1 min"}
  ]
}`)
	c, err := Load("bench.json", raw)
	if err != nil {
		fmt.Println(err)
		return
	}
	m := c.Models[0].Spec.Model
	fmt.Println(c.Models[0].Name, "->", m.Output, "from", m.Inputs[0].Series, "dead time", m.Inputs[0].Delay, "samples")

	_, err = Load("bench.json", []byte(`{"models": [{"name": "heater", "spec": "temp = 0.5 / (1 - 0.8 B) B^2 power + a; every 1 minute"}]}`))
	fmt.Println(err)
	// Output:
	// heater -> temp from power dead time 2 samples
	// bench.json:1:89: spec of model 1 ("heater"): unknown unit "minute" for the sample interval; use s, min, h, d, wk, mo, qtr or yr (for minutes write min)
	//     {"models": [{"name": "heater", "spec": "temp = 0.5 / (1 - 0.8 B) B^2 power + a; every 1 minute"}]}
	//                                                                                             ^
}
