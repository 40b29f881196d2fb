package kalman

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// TestForwardJacobian: for residuals linear in x, r = A x - b, forward
// differences are exact up to rounding, so the columns equal A's to
// about 1e-7 (step 2^-26 relative, rounding eps/h ~ 1.5e-8 per unit of
// r; worked by hand). A forward point that is not admissible (x_0 > 1)
// makes the step go backwards, with the same result.
func TestForwardJacobian(t *testing.T) {
	A := [][]float64{{2, -1}, {0.5, 3}, {1, 1}} // rows: residuals; columns: parameters
	res := func(x, r []float64) error {
		if x[0] > 1 {
			return errors.New("not admissible")
		}
		for i := range r {
			r[i] = A[i][0]*x[0] + A[i][1]*x[1] - float64(i)
		}
		return nil
	}
	for _, x := range [][]float64{{0.3, -2}, {1, 4}} { // the second sits on the boundary
		r := make([]float64, 3)
		if err := res(x, r); err != nil {
			t.Fatal(err)
		}
		jac := [][]float64{make([]float64, 3), make([]float64, 3)}
		if err := ForwardJacobian(res, x, r, jac); err != nil {
			t.Fatal(err)
		}
		for k := range jac {
			for i := range jac[k] {
				if math.Abs(jac[k][i]-A[i][k]) > 1e-6 {
					t.Errorf("x %v: d r_%d / d x_%d = %v, want %v", x, i, k, jac[k][i], A[i][k])
				}
			}
		}
	}
}

// TestNewtonStep: on the quadratic f = 1/2 x'Hx - b'x, one Newton step
// from any point lands on the minimum H^-1 b (exact for a quadratic;
// here H = [[4, 1], [1, 3]], b = (1, 2), minimum (1/11, 7/11) worked by
// hand); an H that is not positive definite is refused.
func TestNewtonStep(t *testing.T) {
	H := mat.NewSymDense(2, []float64{4, 1, 1, 3})
	x := []float64{5, -3}
	g := []float64{4*x[0] + x[1] - 1, x[0] + 3*x[1] - 2}
	trial, step, ok := NewtonStep(x, H, g)
	if !ok {
		t.Fatal("refused a positive definite H")
	}
	want := []float64{1.0 / 11, 7.0 / 11}
	for k := range want {
		if math.Abs(trial[k]-want[k]) > 1e-14 {
			t.Errorf("trial %v, want %v", trial, want)
		}
	}
	if math.Abs(step-math.Abs(want[1]+3)/(3+1e-10)) > 1e-12 {
		t.Errorf("step %v", step)
	}
	if _, _, ok := NewtonStep(x, mat.NewSymDense(2, []float64{1, 2, 2, 1}), g); ok {
		t.Error("accepted an indefinite H")
	}
}

// TestClearOfUnitCircle: the step-down test against roots worked by
// hand. 1 - 0.78 B + B^2 has its roots on the unit circle (their product
// is 1/1 and they are complex: 0.78^2 < 4), the input the fuzzer found
// giving a negative forecast variance; 1 - 0.78 B + 0.9 B^2 has them at
// |B| = 1/sqrt(0.9) > 1; 1 - 1.5 B + 0.5 B^2 = (1 - B)(1 - 0.5 B) has a
// unit root; an AR(1) within unitMargin of 1 is refused, one at 1 - 1e-6
// is not. Set refuses what the test refuses.
func TestClearOfUnitCircle(t *testing.T) {
	for _, tc := range []struct {
		ar   []float64
		want bool
	}{
		{[]float64{1, -0.78, 1}, false},
		{[]float64{1, -0.78, 0.9}, true},
		{[]float64{1, -1.5, 0.5}, false},
		{[]float64{1, -(1 - 1e-6)}, true},
		{[]float64{1, -(1 - 1e-10)}, false},
		{[]float64{2, -1.2, 0.5}, true}, // 1 - 0.6 B + 0.25 B^2 after dividing by 2
	} {
		if got := clearOfUnitCircle(tc.ar, nil); got != tc.want {
			t.Errorf("%v: got %v, want %v", tc.ar, got, tc.want)
		}
		f, err := New([]float64{1}, []float64{1}, []float64{1})
		if err != nil {
			t.Fatal(err)
		}
		if err := f.Set(tc.ar, []float64{1}); (err == nil) != tc.want {
			t.Errorf("Set(%v): %v", tc.ar, err)
		}
	}
}

// TestDecrement: g'H^-1 g for H = diag(2, 4), g = (2, 4) is 4/2 + 16/4
// = 6 (the definition, Boyd & Vandenberghe 2004, eq. 9.28; exact in
// floating point); a Hessian that is not positive definite gives ok
// false; H and g are not modified.
func TestDecrement(t *testing.T) {
	H := mat.NewSymDense(2, []float64{2, 0, 0, 4})
	g := []float64{2, 4}
	dec, ok := Decrement(H, g)
	if !ok || dec != 6 || g[0] != 2 || H.At(0, 0) != 2 {
		t.Errorf("got %v %v", dec, ok)
	}
	if _, ok := Decrement(mat.NewSymDense(2, []float64{1, 2, 2, 1}), g); ok {
		t.Error("indefinite H accepted")
	}
}

// TestGaussNewtonInverse: for the linear residuals r = A x - b, J = A
// and (J'J)^-1 = (A'A)^-1; A = [[1 0] [1 1] [1 2]] gives A'A = [[3 3]
// [3 5]] and its inverse [[5 -3] [-3 3]]/6 (hand-computed, common
// practice; forward differences are exact for linear residuals up to
// rounding: tolerance 1e-6, the 2^-26 step's rounding). A failing
// residual function gives nil.
func TestGaussNewtonInverse(t *testing.T) {
	A := [][]float64{{1, 0}, {1, 1}, {1, 2}}
	b := []float64{1, 2, 4}
	res := func(x, r []float64) error {
		for i, a := range A {
			r[i] = a[0]*x[0] + a[1]*x[1] - b[i]
		}
		return nil
	}
	x := []float64{0.3, -0.7}
	inv := GaussNewtonInverse(JacobianEval(res), x, 3)
	want := [][]float64{{5.0 / 6, -0.5}, {-0.5, 0.5}}
	if inv == nil {
		t.Fatal("nil")
	}
	for i := range want {
		for j := range want[i] {
			if math.Abs(inv.At(i, j)-want[i][j]) > 1e-6 {
				t.Errorf("(%d,%d) %v, want %v", i, j, inv.At(i, j), want[i][j])
			}
		}
	}
	if x[0] != 0.3 {
		t.Error("x modified")
	}
	fail := func(x, r []float64, jac [][]float64) error { return ErrNotFinite }
	if GaussNewtonInverse(fail, x, 3) != nil {
		t.Error("failing residuals gave a matrix")
	}
}
