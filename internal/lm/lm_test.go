package lm

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"math/big"
	"os"
	"path/filepath"
	"runtime"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/backshift/backshift/internal/vec"
)

type refProblem struct {
	Name   string      `json:"name"`
	X      []float64   `json:"x"`
	Y      []float64   `json:"y"`
	X0     []float64   `json:"x0"`
	Sol    []float64   `json:"sol"`
	SSQ    float64     `json:"ssq"`
	JTJInv [][]float64 `json:"jtj_inv"`
}

// models holds the residual functions of the problems in lm.json with
// their analytic Jacobians (columns).
var models = map[string]func(b, x, y, r []float64, jac [][]float64){
	"expdecay": func(b, x, y, r []float64, jac [][]float64) {
		for i, t := range x {
			e := math.Exp(-b[1] * t)
			r[i] = b[0]*e + b[2] - y[i]
			if jac != nil {
				jac[0][i], jac[1][i], jac[2][i] = e, -b[0]*t*e, 1
			}
		}
	},
	"saturation": func(b, x, y, r []float64, jac [][]float64) {
		for i, t := range x {
			e := math.Exp(-b[1] * t)
			r[i] = b[0]*(1-e) - y[i]
			if jac != nil {
				jac[0][i], jac[1][i] = 1-e, b[0]*t*e
			}
		}
	},
	"twoexp": func(b, x, y, r []float64, jac [][]float64) {
		for i, t := range x {
			e1, e2 := math.Exp(-b[1]*t), math.Exp(-b[3]*t)
			r[i] = b[0]*e1 + b[2]*e2 - y[i]
			if jac != nil {
				jac[0][i], jac[1][i], jac[2][i], jac[3][i] = e1, -b[0]*t*e1, e2, -b[2]*t*e2
			}
		}
	},
}

// TestAgainstScipy solves three nonlinear regressions (data and
// reference from testdata/arma/lm_scipy.py: scipy 1.10.1
// optimize.least_squares(method = "lm"), MINPACK, tolerances 1e-15) and
// compares the solution to 1e-7 relative, the sum of squares to 1e-12
// relative (ours must not be larger by more) and (J'J)^-1 to 1e-6
// relative (it depends on the solution through J).
func TestAgainstScipy(t *testing.T) {
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "arma", "lm.json"))
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		Problems []refProblem `json:"problems"`
	}
	if err := json.Unmarshal(b, &ref); err != nil {
		t.Fatal(err)
	}
	if len(ref.Problems) != 3 {
		t.Fatalf("%d problems, want 3", len(ref.Problems))
	}
	for _, p := range ref.Problems {
		f := models[p.Name]
		prob := Problem{M: len(p.X), N: len(p.X0), Eval: func(x, r []float64, jac [][]float64) error {
			f(x, p.X, p.Y, r, jac)
			return nil
		}}
		res, err := Minimize(context.Background(), prob, p.X0, nil)
		if err != nil {
			t.Fatal(p.Name, err)
		}
		if !res.Reason.Converged() {
			t.Errorf("%s: %v", p.Name, res.Reason)
		}
		for j := range p.Sol {
			if math.Abs(res.X[j]-p.Sol[j]) > 1e-7*math.Abs(p.Sol[j]) {
				t.Errorf("%s: x[%d] = %.12g, scipy %.12g", p.Name, j, res.X[j], p.Sol[j])
			}
		}
		if res.SSQ > p.SSQ*(1+1e-12) {
			t.Errorf("%s: SSQ %.15g > scipy %.15g", p.Name, res.SSQ, p.SSQ)
		}
		for i := range p.JTJInv {
			for j := range p.JTJInv[i] {
				if got := res.JTJInv.At(i, j); math.Abs(got-p.JTJInv[i][j]) > 1e-6*math.Abs(p.JTJInv[i][j]) {
					t.Errorf("%s: (J'J)^-1[%d,%d] = %.10g, scipy %.10g", p.Name, i, j, got, p.JTJInv[i][j])
				}
			}
		}
		t.Logf("%s: %d iterations, %d evaluations, %v", p.Name, res.Iter, res.Evals, res.Reason)
		// Restarted at its own solution the solver must stay there and
		// stop within a few iterations: at most two where the full
		// Gauss-Newton step predicts below FTol (then a failing step
		// means the rounding floor), and where the stopping point was
		// still a few FTol from the exact minimum, rejected steps shrink
		// below XTol quickly (at most 6 here; before the rounding-floor
		// rule, a restart in tf took 8).
		again, err := Minimize(context.Background(), prob, res.X, nil)
		if err != nil {
			t.Fatal(p.Name, err)
		}
		if !again.Reason.Converged() || again.Iter > 6 || again.SSQ > res.SSQ {
			t.Errorf("%s: restart at the solution: %d iterations, %v, SSQ %v (first %v)", p.Name, again.Iter, again.Reason, again.SSQ, res.SSQ)
		}
	}
}

// TestRosenbrock: the zero-residual problem r = (10(x2 - x1^2), 1 - x1)
// from (-1.2, 1) has its minimum at (1, 1) with SSQ 0 (Rosenbrock 1960,
// a classic test; common practice).
func TestRosenbrock(t *testing.T) {
	prob := Problem{M: 2, N: 2, Eval: func(x, r []float64, jac [][]float64) error {
		r[0], r[1] = 10*(x[1]-x[0]*x[0]), 1-x[0]
		if jac != nil {
			jac[0][0], jac[0][1] = -20*x[0], -1
			jac[1][0], jac[1][1] = 10, 0
		}
		return nil
	}}
	x0 := []float64{-1.2, 1}
	res, err := Minimize(context.Background(), prob, x0, nil)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(res.X[0]-1) > 1e-10 || math.Abs(res.X[1]-1) > 1e-10 || res.SSQ > 1e-20 {
		t.Errorf("got %v SSQ %g (%v)", res.X, res.SSQ, res.Reason)
	}
	if x0[0] != -1.2 || x0[1] != 1 {
		t.Error("x0 modified")
	}
}

// TestInadmissibleRegion: Eval errors (here for x < 0.5) are treated as
// worse points; the solver ends at the constrained minimum's boundary
// side without failing. And an error at the start is ErrStart.
func TestInadmissibleRegion(t *testing.T) {
	prob := Problem{M: 1, N: 1, Eval: func(x, r []float64, jac [][]float64) error {
		if x[0] < 0.5 {
			return errors.New("inadmissible")
		}
		r[0] = x[0]
		if jac != nil {
			jac[0][0] = 1
		}
		return nil
	}}
	res, err := Minimize(context.Background(), prob, []float64{3}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if res.X[0] < 0.5 || res.X[0] > 0.51 {
		t.Errorf("x = %v (%v)", res.X, res.Reason)
	}
	if _, err := Minimize(context.Background(), prob, []float64{0}, nil); !errors.Is(err, ErrStart) {
		t.Errorf("start error: %v", err)
	}
	if _, err := Minimize(context.Background(), Problem{M: 1, N: 2}, []float64{0}, nil); err == nil {
		t.Error("malformed problem accepted")
	}
	for _, set := range []Settings{{MaxIter: -1}, {FTol: -1}, {XTol: math.NaN()}, {GTol: -1e-9}} {
		if _, err := Minimize(context.Background(), prob, []float64{3}, &set); err == nil {
			t.Errorf("malformed settings %+v accepted", set)
		}
	}
}

func TestCanceled(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	prob := Problem{M: 1, N: 1, Eval: func(x, r []float64, jac [][]float64) error {
		r[0] = x[0] - 2
		if jac != nil {
			jac[0][0] = 1
		}
		return nil
	}}
	res, err := Minimize(ctx, prob, []float64{0}, nil)
	if err != nil || res.Reason != Canceled || res.Reason.Converged() || res.X[0] != 0 {
		t.Errorf("got %v %v %v", res.X, res.Reason, err)
	}
}

// normal's blocked products must equal, bit for bit, the sums of vec.Dot
// over the blocks in row order (and, from NormalSplit rows, over each half
// separately, halves added), with one goroutine or two; and they must lie
// within the rounding bound of the exact products (300-bit math/big sums;
// the error of a recursive sum of m products is at most about
// m eps sum|a_i b_i|, Higham, Accuracy and Stability of Numerical
// Algorithms, 2nd ed., section 3.1). Column counts odd and even, lengths
// not multiples of the block or the unrolling.
func TestNormalBlocked(t *testing.T) {
	for _, procs := range []int{1, 2} {
		old := runtime.GOMAXPROCS(procs)
		for _, c := range []struct{ n, m int }{{1, 1}, {2, 5}, {3, 103}, {6, 1000}, {7, 257}, {3, NormalSplit + 1}, {4, 2*NormalSplit + 77}} {
			n, m := c.n, c.m
			jac := newCols(n, m)
			r := make([]float64, m)
			for i := range r {
				r[i] = math.Sin(float64(3*i + 1))
				for j := range jac {
					jac[j][i] = math.Cos(float64(i*(j+2) + j))
				}
			}
			a := mat.NewSymDense(n, nil)
			g := make([]float64, n)
			normal(a, g, jac, r, make([]float64, 2*n*(n+1)))
			where := fmt.Sprintf("procs=%d n=%d m=%d", procs, n, m)
			for j := 0; j < n; j++ {
				checkProduct(t, where, fmt.Sprintf("g[%d]", j), g[j], jac[j], r)
				for k := j; k < n; k++ {
					checkProduct(t, where, fmt.Sprintf("(J'J)[%d,%d]", j, k), a.At(j, k), jac[j], jac[k])
				}
			}
		}
		runtime.GOMAXPROCS(old)
	}
}

// checkProduct checks got, the product of x and y formed by normal,
// against the blocked dot sums bit for bit and, up to 2000 rows, against
// the exact product within the rounding bound (TestNormalBlocked).
func checkProduct(t *testing.T, where, what string, got float64, x, y []float64) {
	t.Helper()
	if w := blockedDot(x, y); got != w {
		t.Fatalf("%s: %s = %v, blocked dot sums give %v", where, what, got, w)
	}
	if len(x) > 2000 {
		return // the exact sums are slow; the small cases cover the bound
	}
	if e, tol := exactDot(x, y); math.Abs(got-e) > tol {
		t.Fatalf("%s: %s = %v, exact %v (tolerance %v)", where, what, got, e, tol)
	}
}

// blockedDot sums vec.Dot over blocks of NormalBlock rows in row order,
// from NormalSplit rows over each half separately, the halves added.
func blockedDot(a, b []float64) float64 {
	blockSum := func(lo, hi int) float64 {
		s := 0.0
		for i := lo; i < hi; i += NormalBlock {
			e := min(i+NormalBlock, hi)
			s += vec.Dot(a[i:e], b[i:e])
		}
		return s
	}
	m := len(a)
	if m < NormalSplit {
		return blockSum(0, m)
	}
	h := (m / 2) &^ (NormalBlock - 1)
	return blockSum(0, h) + blockSum(h, m)
}

// exactDot returns the product of a and b rounded once from a 300-bit
// sum (math/big), and the rounding bound of a recursive float64 sum,
// (m+1) eps sum|a_i b_i|.
func exactDot(a, b []float64) (v, bound float64) {
	s := new(big.Float).SetPrec(300)
	abs := 0.0
	for i := range a {
		p := new(big.Float).SetPrec(300).SetFloat64(a[i])
		s.Add(s, p.Mul(p, new(big.Float).SetPrec(300).SetFloat64(b[i])))
		abs += math.Abs(a[i] * b[i])
	}
	v, _ = s.Float64()
	return v, float64(len(a)+1) * epsilon * abs
}

// A reused, dirty buffer must not leak into a problem that writes only
// some entries (WritesAll false): two solves of the same problem, the
// second after a solve that filled the pool with non-zero values, agree.
func TestWorkBuffersCleared(t *testing.T) {
	// r_i = x - i for even i only; odd entries are left as the buffer has them.
	prob := Problem{M: 64, N: 1, Eval: func(x, r []float64, jac [][]float64) error {
		for i := 0; i < len(r); i += 2 {
			r[i] = x[0] - float64(i)
			if jac != nil {
				jac[0][i] = 1
			}
		}
		return nil
	}}
	first, err := Minimize(context.Background(), prob, []float64{3}, nil)
	if err != nil {
		t.Fatal(err)
	}
	dirty := Problem{M: 64, N: 1, WritesAll: true, Eval: func(x, r []float64, jac [][]float64) error {
		for i := range r {
			r[i] = x[0] - 1e6
			if jac != nil {
				jac[0][i] = 7
			}
		}
		return nil
	}}
	if _, err := Minimize(context.Background(), dirty, []float64{0}, nil); err != nil {
		t.Fatal(err)
	}
	second, err := Minimize(context.Background(), prob, []float64{3}, nil)
	if err != nil {
		t.Fatal(err)
	}
	// The mean of 0, 2, ..., 62 is 31 (least squares of x - i over even i).
	if math.Abs(first.X[0]-31) > 1e-12 || second.X[0] != first.X[0] || second.SSQ != first.SSQ {
		t.Fatalf("solves differ: first x=%v ssq=%v, second x=%v ssq=%v (want x = 31)", first.X, first.SSQ, second.X, second.SSQ)
	}
}

// getWork with zero must hand out a zeroed buffer, whether it reuses a
// dirty one from the pool or makes a new one.
func TestGetWorkZeroes(t *testing.T) {
	for rep := 0; rep < 20; rep++ {
		b := make([]float64, 100)
		for i := range b {
			b[i] = 1
		}
		workPool.Put(&b)
		w := getWork(50, true)
		if len(*w) != 50 {
			t.Fatalf("len %d, want 50", len(*w))
		}
		for i, v := range *w {
			if v != 0 {
				t.Fatalf("entry %d = %v after getWork(zero)", i, v)
			}
		}
	}
}

// SplitRow: one pass below NormalSplit; above it the first half ends on
// a block boundary at or below m/2 (by hand: 50001/2 = 25000, rounded
// down to a multiple of 256 is 24832; 100077/2 = 50038 -> 49920).
func TestSplitRow(t *testing.T) {
	for _, c := range []struct{ m, want int }{{1, 0}, {NormalSplit - 1, 0}, {NormalSplit + 1, 24832}, {2*NormalSplit + 77, 49920}} {
		if got := SplitRow(c.m); got != c.want {
			t.Errorf("SplitRow(%d) = %d, want %d", c.m, got, c.want)
		}
	}
}
