package identify

import (
	"strconv"

	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/ccf"
	"github.com/backshift/backshift/tf"
)

// The conversion of Candidates from the numbers packages ccf and prewhiten
// return (dead times, orders, fitted coefficients) to model values with
// named coefficients. Names come from one rule, coefName, and the
// models print with the package's one printer (Model.String).

// coefName is the one naming rule for the coefficients of the models
// Candidates proposes: part is "w" (numerator, k from 0), "d" (denominator),
// "phi" (noise AR) or "theta" (noise MA), k the power of B; with several
// inputs the input name and "_" come first, so that the terms of several
// inputs can share one model ("valve_w0", "d1", "theta1").
func coefName(input string, several bool, part string, k int) string {
	name := part + strconv.Itoa(k)
	if several && input != "" {
		return input + "_" + name
	}
	return name
}

// formInput builds the input term B^b omega(B)/delta(B) of a ccf form:
// omega with plus signs (w_k = Num[k]) and delta with minus signs
// (d_k = -Den[k]), the form's fitted numbers as start values.
func formInput(series string, several bool, diff tf.Poly, f ccf.Form) tf.Input {
	nf := tf.Factor{Exp: 1}
	for k, v := range f.Num {
		nf.Terms = append(nf.Terms, tf.Term{Coef: tf.Coef{Name: coefName(series, several, "w", k), Value: v, Free: true}, Power: k})
	}
	in := tf.Input{Series: series, Diff: diff.Clone(), Num: tf.Poly{Factors: []tf.Factor{nf}}, Delay: f.Delay}
	if len(f.Den) > 1 {
		df := tf.Factor{Exp: 1, Terms: []tf.Term{{Coef: tf.Coef{Value: 1}}}}
		for k := 1; k < len(f.Den); k++ {
			df.Terms = append(df.Terms, tf.Term{Neg: true, Coef: tf.Coef{Name: coefName(series, several, "d", k), Value: -f.Den[k], Free: true}, Power: k})
		}
		in.Den = tf.Poly{Factors: []tf.Factor{df}}
	}
	return in
}

// noiseOfOrder returns the noise (1 - theta1 B - ..)/(1 - phi1 B - ..) a of
// orders p and q with free coefficients at zero (start values computed by
// fit.Model), named by arma's one rule for noise coefficients (arma.Model.Noise).
func noiseOfOrder(p, q int) *arma.Noise {
	n := arma.Model{AR: make([]float64, p), MA: make([]float64, q)}.Noise()
	return &n
}
