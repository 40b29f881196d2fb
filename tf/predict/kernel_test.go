package predict

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/backshift/backshift/internal/sym"
	"github.com/backshift/backshift/tf"
)

// poly1 returns the polynomial with coefficients c (ascending powers of
// B), every coefficient a fixed number.
func poly1(c ...float64) tf.Poly { return sym.FromCoeffs(c) }

// kernelModel is a two-input model with (2, 2) terms, ARMA(2, 2) noise
// and output differencing (1 - B), in the small kernel's reach.
func kernelModel() tf.Model {
	c := tf.Coef{Value: 0.3}
	return tf.Model{Output: "y", Const: &c, Diff: poly1(1, -1),
		Inputs: []tf.Input{
			{Series: "u1", Num: poly1(0.8, 0.3), Den: poly1(1, -1.2, 0.4), Delay: 2},
			{Series: "u2", Num: poly1(-0.5, 0.2, 0.1), Den: poly1(1, -0.5), Delay: 0},
		},
		Noise: &tf.Noise{MA: poly1(1, 0.4, 0.1), AR: poly1(1, -0.6, 0.2)}}
}

// TestSmallKernelEqualsGeneral: the small kernel and the general
// recursion give the same steps bit for bit (padding adds exact zeros),
// over observed and missing outputs and a forecast. Source: the general
// recursion, itself checked against the fit's residuals.
func TestSmallKernelEqualsGeneral(t *testing.T) {
	for _, zeroPre := range []bool{false, true} {
		a, err := New(kernelModel(), 1.3, &Settings{ZeroPreSample: zeroPre})
		if err != nil {
			t.Fatal(err)
		}
		if !a.p.small {
			t.Fatal("the model does not take the small kernel")
		}
		b := a.Clone()
		general := *b.p
		general.small = false
		b.p = &general
		rng := rand.New(rand.NewPCG(4, 5))
		y := 0.0
		for i := 0; i < 400; i++ {
			x := []float64{20 + rng.NormFloat64(), 5 + rng.NormFloat64()}
			y += rng.NormFloat64()
			yy := y
			if i > 100 && i%7 < 3 {
				yy = math.NaN()
			}
			sa, ea := a.Update(x, yy)
			sb, eb := b.Update(x, yy)
			if ea != nil || eb != nil {
				t.Fatal(ea, eb)
			}
			if !same(sa.Point, sb.Point) || !sameF(sa.Innov, sb.Innov) || !sameF(sa.Error, sb.Error) {
				t.Fatalf("sample %d: small %+v, general %+v", i, sa, sb)
			}
		}
		fa, fb := make([]Point, 25), make([]Point, 25)
		plan := [][]float64{{21, 22}, nil}
		if err := a.Forecast(fa, plan); err != nil {
			t.Fatal(err)
		}
		if err := b.Forecast(fb, plan); err != nil {
			t.Fatal(err)
		}
		for j := range fa {
			if !same(fa[j], fb[j]) {
				t.Fatalf("forecast step %d: small %+v, general %+v", j+1, fa[j], fb[j])
			}
		}
	}
}

func sameF(a, b float64) bool { return a == b || math.IsNaN(a) && math.IsNaN(b) }

func same(a, b Point) bool {
	return sameF(a.Mean, b.Mean) && sameF(a.SE, b.SE) && sameF(a.Lower, b.Lower) && sameF(a.Upper, b.Upper)
}

// BenchmarkKernel times the small kernel against the general recursion
// on kernelModel.
func BenchmarkKernel(b *testing.B) {
	for _, small := range []bool{true, false} {
		name := "general"
		if small {
			name = "small"
		}
		b.Run(name, func(b *testing.B) {
			p, err := New(kernelModel(), 1, nil)
			if err != nil {
				b.Fatal(err)
			}
			pl := *p.p
			pl.small = small
			p.p = &pl
			x := []float64{20, 5}
			b.ReportAllocs()
			for i := 0; i < b.N; i++ {
				x[0] = float64(i & 63)
				if _, err := p.Update(x, float64(i&127)); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
