package parse_test

import (
	"fmt"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

func ExampleModel() {
	m, err := parse.Model(`
		# kiln: burner firing rate (%) -> chamber temperature (degC)
		temp = 21.5 + (w0 + w1 B) / (1 - d1 B) B^4 burner + ARMA(1, 1)
		where d1 ~ 0.6, phi1 = 0.3
		every 30 s`)
	if err != nil {
		fmt.Println(err)
		return
	}
	in := m.Inputs[0]
	fmt.Println(in.Series, "dead time", in.Delay, "samples;", m.Interval)
	fmt.Println("noise", tf.FormatPoly(m.Noise.MA), "/", tf.FormatPoly(m.Noise.AR))
	fmt.Println(m)
	// Output:
	// burner dead time 4 samples; 30 s
	// noise (1 - theta1 B) / (1 - phi1 B)
	// temp = 21.5 + (w0 + w1 B) / (1 - d1 B) B^4 burner + ARMA(1, 1); where d1 ~ 0.6, phi1 = 0.3; every 30 s
}

func ExampleModel_error() {
	_, err := parse.Model("temp = (w0 + w1 B) / (2 - d1 B) burner + a")
	fmt.Println(err)
	// Output:
	// 1:22: the constant term of the denominator must be 1, not 2; divide the numerator and the denominator by 2
	//     temp = (w0 + w1 B) / (2 - d1 B) burner + a
	//                          ^
}
