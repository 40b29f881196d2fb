package statespace

import (
	"errors"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/backshift/backshift/internal/fixture"
	"github.com/backshift/backshift/internal/poly"
	"github.com/backshift/backshift/tf"
)

// The state count is the package doc's formula, worked out by hand for
// each fixture (see fixtures).
func TestStateCount(t *testing.T) {
	for _, f := range fixtures {
		r, err := Realise(fixture.MustModel(t, f.spec))
		if err != nil {
			t.Fatalf("%s: %v", f.name, err)
		}
		if r.States() != f.want {
			t.Errorf("%s: %d states, want %d", f.name, r.States(), f.want)
		}
		sum := 0
		for _, p := range r.Parts() {
			sum += p.States
		}
		if sum != r.States() {
			t.Errorf("%s: parts hold %d states, the realisation %d", f.name, sum, r.States())
		}
	}
}

// Each Part realises the model's own transfer function: Num/Den equals
// omega D_i / (delta D) for an input and theta / (phi D) for the noise,
// checked by cross-multiplication (polynomial identity, so exact up to
// the rounding of a few products: 1e-12 relative).
func TestPartsTransfer(t *testing.T) {
	for _, f := range fixtures {
		m, r := mustRealise(t, f.spec)
		parts := r.Parts()
		for i, in := range m.Inputs {
			g, _ := in.Rational()
			p := parts[i]
			if p.Name != in.Series || p.Delay != in.Delay {
				t.Errorf("%s input %d: part %q delay %d, want %q delay %d", f.name, i, p.Name, p.Delay, in.Series, in.Delay)
			}
			crossEqual(t, f.name+" "+in.Series, p.Num, p.Den, poly.Mul(g.Num(), in.DiffCoeffs()), poly.Mul(g.Den(), m.DiffCoeffs()))
		}
		if m.Noise != nil {
			ma, ar, _ := m.NoiseCoeffs()
			p := parts[len(m.Inputs)]
			crossEqual(t, f.name+" noise", p.Num, p.Den, ma, poly.Mul(ar, m.DiffCoeffs()))
		}
	}
}

// crossEqual fails unless n1/d1 = n2/d2, that is n1 d2 = n2 d1.
func crossEqual(t *testing.T, what string, n1, d1, n2, d2 []float64) {
	t.Helper()
	a, b := trim(poly.Mul(n1, d2)), trim(poly.Mul(n2, d1))
	if len(a) != len(b) {
		t.Errorf("%s: %v/%v is not %v/%v", what, n1, d1, n2, d2)
		return
	}
	for k := range a {
		if math.Abs(a[k]-b[k]) > 1e-12*max(maxAbs(a), maxAbs(b)) {
			t.Errorf("%s: %v/%v is not %v/%v", what, n1, d1, n2, d2)
			return
		}
	}
}

// rank returns the numerical rank of x: singular values above 1e-9 of
// the largest (the matrices here have entries of order 1 and at most 10
// columns; a structurally missing direction gives a singular value of
// rounding size, 1e-15 or so).
func rank(x *mat.Dense) int {
	var svd mat.SVD
	if !svd.Factorize(x, mat.SVDNone) {
		return -1
	}
	s := svd.Values(nil)
	k := 0
	for _, v := range s {
		if v > 1e-9*s[0] {
			k++
		}
	}
	return k
}

// kalmanRanks returns the ranks of the controllability matrix
// [b, A b, ..., A^{n-1} b] and the observability matrix [c; c A; ...;
// c A^{n-1}] of the block of states first..first+n-1 (Kalman's rank
// tests: the block is minimal iff both are n; Kailath 1980, from
// memory).
func kalmanRanks(a *mat.Dense, b, c []float64) (int, int) {
	n := len(b)
	ctrb, obsv := mat.NewDense(n, n, nil), mat.NewDense(n, n, nil)
	v := mat.NewVecDense(n, append([]float64(nil), b...))
	w := mat.NewVecDense(n, append([]float64(nil), c...))
	for k := range n {
		ctrb.SetCol(k, v.RawVector().Data)
		obsv.SetRow(k, w.RawVector().Data)
		nv, nw := mat.NewVecDense(n, nil), mat.NewVecDense(n, nil)
		nv.MulVec(a, v)
		nw.MulVec(a.T(), w)
		v, w = nv, nw
	}
	return rank(ctrb), rank(obsv)
}

// block returns the sub-matrices of one part: A restricted to its
// states, the column driving it (input i of B, or G for i < 0) and C.
func block(r *Realisation, p Part, i int) (*mat.Dense, []float64, []float64) {
	a := mat.DenseCopyOf(r.A().Slice(p.First, p.First+p.States, p.First, p.First+p.States))
	b, c := make([]float64, p.States), make([]float64, p.States)
	for j := range p.States {
		if i >= 0 {
			b[j] = r.b[(p.First+j)*r.m+i]
		} else {
			b[j] = r.g[p.First+j]
		}
		c[j] = r.c[p.First+j]
	}
	return a, b, c
}

// Every path and noise part of the fixtures (numerators and denominators
// without a shared root) is minimal: controllable from its input and
// observable from y. A path with a shared root is realised with its
// written order and fails the test, which shows that it can fail.
func TestMinimal(t *testing.T) {
	for _, f := range fixtures {
		m, r := mustRealise(t, f.spec)
		for i, p := range r.Parts() {
			if p.States == 0 || p.Name == "constant" || (p.Name == "noise" && m.Noise == nil) {
				continue
			}
			src := i
			if i >= len(m.Inputs) {
				src = -1
			}
			a, b, c := block(r, p, src)
			if kc, ko := kalmanRanks(a, b, c); kc != p.States || ko != p.States {
				t.Errorf("%s %s: %d states, controllability rank %d, observability rank %d", f.name, p.Name, p.States, kc, ko)
			}
		}
	}
	r, err := Realise(fixture.MustModel(t, "y = (1 - 0.5 B) / ((1 - 0.5 B)(1 - 0.8 B)) B x"))
	if err != nil {
		t.Fatal(err)
	}
	p := r.Parts()[0]
	a, b, c := block(r, p, 0)
	if kc, ko := kalmanRanks(a, b, c); p.States != 2 || (kc == 2 && ko == 2) {
		t.Errorf("shared root: %d states, ranks %d, %d; want 2 states, one rank short", p.States, kc, ko)
	}
}

// The delay states hold the past inputs: a path with dead time 3 and
// one numerator coefficient fewer than its denominator has two delay
// states (the third sample of delay is taken up by the lag); after
// inputs 1 and then 2 the state holds (2, 1, ...): u_{t-1} first.
// Its pulse response is 0.5 0.8^(k-3) from k = 3 (the difference
// equation y_t = 0.8 y_{t-1} + 0.5 x_{t-3} by hand).
func TestDelayStates(t *testing.T) {
	r, err := Realise(fixture.MustModel(t, "y = 0.5 / (1 - 0.8 B) B^3 x"))
	if err != nil {
		t.Fatal(err)
	}
	p := r.Parts()[0]
	if p.DelayStates != 2 || p.States != 3 {
		t.Fatalf("delay states %d of %d, want 2 of 3", p.DelayStates, p.States)
	}
	x, nx := make([]float64, 3), make([]float64, 3)
	for _, u := range []float64{1, 2} {
		r.advance(nx, x, []float64{u}, nil, 0)
		x, nx = nx, x
	}
	if x[0] != 2 || x[1] != 1 {
		t.Errorf("delay states %v after inputs 1, 2; want 2, 1", x[:2])
	}
	sim, err := r.Simulate([][]float64{{1, 0, 0, 0, 0}}, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if sim[0] != 0 || sim[1] != 0 || sim[2] != 0 || sim[3] != 0.5 || math.Abs(sim[4]-0.4) > 1e-15 {
		t.Errorf("pulse response %v, want 0 0 0 0.5 0.4", sim)
	}
}

// TestRealiseBadInput: each model Realise must refuse, with the kind and
// the words of its message.
func TestRealiseBadInput(t *testing.T) {
	zeroConst := fixture.MustModel(t, "y = 0.5 B x")
	zeroConst.Diff = tf.Poly{Factors: []tf.Factor{{Terms: []tf.Term{{Coef: tf.Coef{Value: 1}, Power: 1}}, Exp: 1}}}
	huge := fixture.MustModel(t, "y = 1e200 ((1 - B) x)")
	huge.Inputs[0].Diff.Factors[0].Terms[1].Coef.Value = 1e200
	for _, c := range []struct {
		name string
		m    tf.Model
		want []string
	}{
		{"free", fixture.MustModel(t, "y = c + w0 / (1 - d1 B) B x + a where c ~ 1, w0 ~ 0.5, d1 = 0.5"), []string{"coefficients c, w0", "free", "Held()"}},
		{"invalid", tf.Model{Output: "y", Inputs: []tf.Input{{Series: "", Num: tf.Poly{}}}}, []string{"input 1", "no series name"}},
		{"states", fixture.MustModel(t, "y = 0.5 / (1 - 0.8 B) B^2000 x"), []string{"needs 2000 states", "MaxStates", "dead time 2000"}},
		{"zero constant", zeroConst, []string{"differencing", "constant term", "zero"}},
		{"overflow", huge, []string{"matrix", "too large"}},
		{"event", fixture.MustModel(t, "y = 0.5 B x + 2 step(10) + a"), []string{`input "step(10)"`, "event", "tf/predict", "EventData"}},
	} {
		_, err := Realise(c.m)
		var me *ModelError
		if !errors.As(err, &me) || !errors.Is(err, ErrModel) || me.Op != "statespace.Realise" {
			t.Errorf("%s: error %v, want a *ModelError from statespace.Realise", c.name, err)
			continue
		}
		for _, w := range c.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: %q does not say %q", c.name, err, w)
			}
		}
	}
}
