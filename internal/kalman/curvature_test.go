package kalman

import (
	"context"
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// TestCurvatureQuadratic: central differences are exact for a quadratic
// up to rounding (their truncation error holds third and higher
// derivatives only: Abramowitz & Stegun 1964, 25.3.23 and 25.3.27), so
// Curvature of f(x) = 1/2 x'Ax + b'x returns A and Ax + b to about
// eps |f| / h^2 (below 1e-6 here, with steps 2^-13 max(|x_k|, 1)).
func TestCurvatureQuadratic(t *testing.T) {
	A := []float64{4, 1, -0.5, 1, 3, 0.25, -0.5, 0.25, 2}
	b := []float64{1, -2, 0.5}
	f := func(x []float64) float64 {
		s := 0.0
		for i := 0; i < 3; i++ {
			s += b[i] * x[i]
			for j := 0; j < 3; j++ {
				s += 0.5 * x[i] * A[i*3+j] * x[j]
			}
		}
		return s
	}
	x := []float64{0.3, -1.7, 12}
	f0, g, H, err := Curvature(context.Background(), f, x, Steps(x, CurvatureStep))
	if err != nil || f0 != f(x) {
		t.Fatalf("err %v, f0 %v", err, f0)
	}
	for i := 0; i < 3; i++ {
		gi := b[i]
		for j := 0; j < 3; j++ {
			gi += A[i*3+j] * x[j]
			if d := math.Abs(H[i*3+j] - A[i*3+j]); d > 1e-6 {
				t.Errorf("H[%d][%d] = %v, want %v", i, j, H[i*3+j], A[i*3+j])
			}
		}
		if math.Abs(g[i]-gi) > 1e-8*math.Max(1, math.Abs(gi)) {
			t.Errorf("g[%d] = %v, want %v", i, g[i], gi)
		}
	}
	if _, _, _, err := Curvature(context.Background(), func([]float64) float64 { return math.Inf(1) }, x, Steps(x, CurvatureStep)); !errors.Is(err, ErrNotFinite) {
		t.Errorf("err %v for a function that is not finite, want ErrNotFinite", err)
	}
}

// TestCurvatureCanceled: a context cancelled by f itself in the middle
// of the stencil stops Curvature before the next evaluation, with the
// context's error and no result. (A check of the wiring: no outside
// value is involved.)
func TestCurvatureCanceled(t *testing.T) {
	x := []float64{0.3, -1.7, 12} // 13 evaluations: f(x), 6 on the axes, 6 off them
	for _, at := range []int{1, 2, 6, 10, 12} {
		ctx, cancel := context.WithCancel(context.Background())
		evals := 0
		f := func(v []float64) float64 {
			if evals++; evals == at {
				cancel()
			}
			return v[0]*v[0] + v[1]*v[2]
		}
		_, g, H, err := Curvature(ctx, f, x, Steps(x, CurvatureStep))
		cancel()
		if !errors.Is(err, context.Canceled) || g != nil || H != nil || evals != at {
			t.Errorf("cancelled at evaluation %d: err %v, g %v, H %v, %d evaluations; want context.Canceled, no result, %d", at, err, g, H, evals, at)
		}
	}
	evals := 0
	if _, _, _, err := Curvature(context.Background(), func(v []float64) float64 { evals++; return v[0] * v[1] }, x, Steps(x, CurvatureStep)); err != nil || evals != 13 {
		t.Errorf("not cancelled: err %v, %d evaluations (want nil, 13)", err, evals)
	}
}

// TestInformationCorrelated: for a quadratic f(x) = 1/2 x'Ax with
// strongly correlated parameters (correlation -0.9995 in A^-1, a
// conditional standard error 1/32 of the marginal one, as for AR
// coefficients with roots near the unit circle), Information returns A
// to 1e-6 relative when given a Gauss-Newton covariance equal to A^-1
// (so H_u is the identity: central differences are exact for a
// quadratic, Abramowitz & Stegun 1964, 25.3.23 and 25.3.27) and also
// when the guide is off by a factor 3 (H_u diagonal 3, still within
// [0.1, 10]); with a guide off by 100 or no guide it falls back to the
// axis steps, still exact for a quadratic. The inverse of the result
// is A^-1 to 1e-5 relative in every case (the inverse amplifies errors
// by the condition number, 4e3). (Facts of the formulas; no outside
// value.)
func TestInformationCorrelated(t *testing.T) {
	A := mat.NewSymDense(2, []float64{1000, 999.5, 999.5, 1000})
	var ch mat.Cholesky
	if !ch.Factorize(A) {
		t.Fatal("A not positive definite")
	}
	Ainv := mat.NewSymDense(2, nil)
	if err := ch.InverseTo(Ainv); err != nil {
		t.Fatal(err)
	}
	x := []float64{0.4, -0.3}
	f := func(v []float64) float64 {
		return 0.5 * (A.At(0, 0)*v[0]*v[0] + 2*A.At(0, 1)*v[0]*v[1] + A.At(1, 1)*v[1]*v[1])
	}
	for _, c := range []struct {
		name  string
		guide *mat.SymDense
		scale float64
	}{{"exact guide", Ainv, 1}, {"guide off by 3", Ainv, 3}, {"guide off by 100", Ainv, 100}, {"no guide", nil, 1}} {
		_, g, H, err := Information(context.Background(), f, x, c.guide, c.scale, 1)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		var hc mat.Cholesky
		if !hc.Factorize(H) {
			t.Fatalf("%s: H %v not positive definite", c.name, H)
		}
		inv := mat.NewSymDense(2, nil)
		if err := hc.InverseTo(inv); err != nil {
			t.Fatal(err)
		}
		for i := 0; i < 2; i++ {
			gi := A.At(i, 0)*x[0] + A.At(i, 1)*x[1]
			if math.Abs(g[i]-gi) > 1e-6*math.Abs(gi) {
				t.Errorf("%s: g[%d] = %v, want %v", c.name, i, g[i], gi)
			}
			for j := 0; j < 2; j++ {
				if math.Abs(H.At(i, j)-A.At(i, j)) > 1e-6*A.At(i, i) || math.Abs(inv.At(i, j)/Ainv.At(i, j)-1) > 1e-5 {
					t.Errorf("%s: H[%d][%d] = %v (inverse %v), want %v (%v)", c.name, i, j, H.At(i, j), inv.At(i, j), A.At(i, j), Ainv.At(i, j))
				}
			}
		}
	}
}
