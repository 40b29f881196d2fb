package main

import "fmt"

// ExamplePI shows the PI at work on a constant error of
// 1 degC: the error does not change, so the proportional part adds
// nothing and the integral part adds Kc*Ts/Ti*e = 0.4 % each minute.
func ExamplePI() {
	pi, err := NewPI(8, 20, 1, 0, 100, 90) // 8 %/degC, Ti 20 min, 1 min samples, valve 0..100 %, now at 90 %
	if err != nil {
		fmt.Println(err)
		return
	}
	for k := range 5 {
		fmt.Printf("minute %d: valve %.1f %%\n", k, pi.Update(20, 19))
	}
	// Output:
	// minute 0: valve 90.4 %
	// minute 1: valve 90.8 %
	// minute 2: valve 91.2 %
	// minute 3: valve 91.6 %
	// minute 4: valve 92.0 %
}

// ExampleRun closes the loop around the greenhouse spec without noise
// and prints the temperature an hour after a setpoint rise.
func ExampleRun() {
	sc := SetpointStep()
	sc.NoiseSD = 0
	u0 := steadyValve(16, 2)
	pi, err := NewPI(8, 20, 1, 0, 100, u0)
	if err != nil {
		fmt.Println(err)
		return
	}
	tr, err := Run(sc, pi, u0)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("valve before %.0f %%, temperature 60 min after the step %.2f degC\n", u0, tr.Temp[tr.Index(60+60)])
	// Output:
	// valve before 45 %, temperature 60 min after the step 19.98 degC
}
