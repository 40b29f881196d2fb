package main

import (
	"bytes"
	"context"
	"math"
	"math/cmplx"
	"sync"
	"testing"

	"github.com/backshift/backshift/tf"
)

// The loop of the default run, walked once for every test that reads it.
var (
	walkOnce   sync.Once
	walkResult *walk
	walkErr    error
)

// The report of the default run, written once for every test that
// reads it.
var (
	runOnce   sync.Once
	runOutput string
	runErr    error
)

// defaultRunOutput returns what the default run (run) writes.
func defaultRunOutput(t *testing.T) string {
	t.Helper()
	runOnce.Do(func() {
		var buf bytes.Buffer
		runErr = run(&buf)
		runOutput = buf.String()
	})
	if runErr != nil {
		t.Fatal(runErr)
	}
	return runOutput
}

// defaultWalk returns the loop of the default run on the greenhouse
// demo (walked once).
func defaultWalk(t *testing.T) *walk {
	t.Helper()
	walkOnce.Do(func() { walkResult, walkErr = walkLoop(context.Background(), PlantSpec, testStructure, NoiseSD) })
	if walkErr != nil {
		t.Fatal(walkErr)
	}
	return walkResult
}

// piLoop is a PI controller in velocity form, C(B) = (q0 + q1 B)/(1 - B),
// closed around the first-order plant w0 B^b / (1 - d1 B), written out
// by hand for the tests: the characteristic polynomial of the loop
// (1 + C P = 0 times the denominators) is
//
//	A(B) = (1 - B)(1 - d1 B) + (q0 + q1 B) w0 B^b,
//
// and the sensitivity S = 1/(1 + C P) = (1 - B)(1 - d1 B)/A(B) at
// B = e^{-i w} (Franklin, Powell & Workman 1998, the discrete loop's
// characteristic equation; the algebra by hand).
type piLoop struct {
	q0, q1, w0, d1 float64
	b              int
}

// charPoly returns A(B) in ascending powers of B.
func (l piLoop) charPoly() []float64 {
	a := make([]float64, max(3, l.b+2))
	a[0], a[1], a[2] = 1, -(1 + l.d1), l.d1
	a[l.b] += l.q0 * l.w0
	a[l.b+1] += l.q1 * l.w0
	return a
}

// stable reports whether every root of A(B) lies outside the unit
// circle, by tf's poles of 1/A(B).
func (l piLoop) stable(t *testing.T) bool {
	r, err := tf.NewRational([]float64{1}, l.charPoly(), 0)
	if err != nil {
		t.Fatal(err)
	}
	return r.Stable()
}

// peakS returns max |S(e^{-i w})| over a grid of sweepPoints frequencies
// evenly spaced on (0, pi] rad/sample. At the grid's spacing (1.6e-4
// rad/sample) a smooth peak is read to about (spacing/2)^2 |S”|/(2 |S|),
// below 1e-6 relative for the peaks of these loops (their |S”| is of
// order 10 at Ms near 1.5).
func (l piLoop) peakS() float64 {
	a := l.charPoly()
	peak := 0.0
	for _, z := range sweepGrid() {
		num := (1 - z) * (1 - complex(l.d1, 0)*z)
		den, zk := complex(0, 0), complex(1, 0)
		for _, c := range a {
			den += complex(c, 0) * zk
			zk *= z
		}
		peak = max(peak, cmplx.Abs(num/den))
	}
	return peak
}

// sweepPoints is the number of frequencies of peakS's grid.
const sweepPoints = 20000

// sweepGrid holds e^{-i w} at w = pi k/sweepPoints, k = 1..sweepPoints.
var sweepGrid = sync.OnceValue(func() []complex128 {
	z := make([]complex128, sweepPoints)
	for k := range z {
		z[k] = cmplx.Exp(complex(0, -math.Pi*float64(k+1)/sweepPoints))
	}
	return z
})

// msTol is the relative tolerance between the harness's Ms figures
// (control's sweep, refined by golden-section search) and peakS: the
// grid's error (below 1e-6) with room.
const msTol = 1e-5

// quantile7 returns the quantile at level p of sorted x by linear
// interpolation between order statistics (R's type 7, numpy.quantile's
// default: h = (n - 1) p).
func quantile7(x []float64, p float64) float64 {
	h := float64(len(x)-1) * p
	lo := math.Floor(h)
	if int(lo)+1 >= len(x) {
		return x[len(x)-1]
	}
	return x[int(lo)] + (h-lo)*(x[int(lo)+1]-x[int(lo)])
}

// velocity returns the coefficients q0, q1 of the harness's PI (pi.go)
// within its limits, written in velocity form, with the tuning tu at the
// sample interval ts:
// du_t = Kc (e_t - e_{t-1}) + Kc ts/Ti e_t.
func velocity(tu PITuning, ts float64) (q0, q1 float64) { return tu.Kc * (1 + ts/tu.Ti), -tu.Kc }
