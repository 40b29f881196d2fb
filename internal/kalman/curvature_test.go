package kalman

import (
	"context"
	"errors"
	"math"
	"testing"
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

// countCtx is a context whose Err is context.Canceled from its
// (after+1)-th call on.
type countCtx struct {
	context.Context
	calls, after int
}

func (c *countCtx) Err() error {
	if c.calls++; c.calls > c.after {
		return context.Canceled
	}
	return nil
}

// TestCurvatureCanceled: a context done in the middle of the stencil
// stops Curvature before the next evaluation, with the context's error;
// one done before the stencil lets only f(x) run. (A check of the
// wiring: no outside value is involved.)
func TestCurvatureCanceled(t *testing.T) {
	x := []float64{0.3, -1.7, 12} // 13 evaluations: f(x), 6 on the axes, 6 off them
	for _, after := range []int{0, 1, 5, 9, 11} {
		evals := 0
		f := func(v []float64) float64 { evals++; return v[0]*v[0] + v[1]*v[2] }
		ctx := &countCtx{Context: context.Background(), after: after}
		_, g, H, err := Curvature(ctx, f, x, Steps(x, CurvatureStep))
		if !errors.Is(err, context.Canceled) || g != nil || H != nil {
			t.Errorf("cancelled after %d checks: err %v, g %v, H %v; want context.Canceled and no result", after, err, g, H)
		}
		if evals != after+1 || ctx.calls != after+1 {
			t.Errorf("cancelled after %d checks: %d evaluations, %d checks; want %d of each", after, evals, ctx.calls, after+1)
		}
	}
	ctx := &countCtx{Context: context.Background(), after: 1 << 30}
	if _, _, _, err := Curvature(ctx, func(v []float64) float64 { return v[0] * v[1] }, x, Steps(x, CurvatureStep)); err != nil || ctx.calls != 12 {
		t.Errorf("not cancelled: err %v, %d checks (want nil, 12: one before each evaluation after the first)", err, ctx.calls)
	}
}
