package greenhouse

import (
	"github.com/backshift/backshift/arma"
	"github.com/backshift/backshift/tf"
)

// Model returns t as a typed whole model with every coefficient fixed,
// the model that TrueSpec writes, with a 1 min sample interval.
func (t Truth) Model() tf.Model {
	c := tf.Coef{Value: t.Const}
	path := func(p Path) tf.Input {
		return tf.Input{Series: p.Series, Delay: p.Delay,
			Num: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{{Coef: tf.Coef{Value: p.Omega}}}}}},
			Den: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{
				{Coef: tf.Coef{Value: 1}}, {Neg: true, Coef: tf.Coef{Value: p.Delta}, Power: 1}}}}},
		}
	}
	return tf.Model{
		Output: Output,
		Const:  &c,
		Inputs: []tf.Input{path(t.Valve), path(t.Outdoor)},
		Noise: &arma.Noise{
			MA: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{
				{Coef: tf.Coef{Value: 1}}, {Coef: tf.Coef{Value: t.Theta}, Power: 1}}}}},
			AR: tf.Poly{Factors: []tf.Factor{{Exp: 1, Terms: []tf.Term{
				{Coef: tf.Coef{Value: 1}}, {Neg: true, Coef: tf.Coef{Value: t.Phi}, Power: 1}}}}},
		},
		Interval: tf.Interval{Value: Interval, Unit: "min"},
	}
}
