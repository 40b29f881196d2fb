package main

import (
	"encoding/csv"
	"math"
	"os"
	"strconv"
	"testing"

	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/control"
)

// The loop of pi.go's checks: the greenhouse spec's valve path
// 0.01 B^3/(1 - 0.95 B) every 1 min, the SIMC tuning (rounded) and a
// set-point step at sample piStepAt from rest at valve piU0 (the same
// constants as testdata/harness/pi.py).
const (
	piKc, piTi, piTs = 17.77, 19.46, 1.0
	piU0             = 45.0
	piStepAt, piN    = 10, 120
)

// piLoopRun closes pi.go's PI around the valve path in deviation
// variables, the output read before the new valve position is applied,
// and returns the temperature deviation and the valve.
func piLoopRun(t *testing.T, step float64) (y, u []float64) {
	t.Helper()
	pi, err := NewPI(piKc, piTi, piTs, 0, 100, piU0)
	if err != nil {
		t.Fatal(err)
	}
	y, u = make([]float64, piN), make([]float64, piN)
	yk := 0.0
	for k := range piN {
		if k > 0 {
			past := piU0
			if k >= 3 {
				past = u[k-3]
			}
			yk = 0.95*yk + 0.01*(past-piU0)
		}
		sp := 0.0
		if k >= piStepAt {
			sp = step
		}
		y[k], u[k] = yk, pi.Update(sp, yk)
	}
	return y, u
}

// TestPIUnsaturatedIsAnalyze checks that a set-point step small enough to
// keep the valve inside its limits (0.5 degC: at most 54 %) gives
// control.Analyze's set-point response of the backward-difference PI
// Kc ((1 + Ts/Ti) - B)/(1 - B) on the same plant, scaled by the step, to
// 1e-9 (both are the same difference equations in double precision; the
// tolerance leaves room for the rounding of 120 steps), and the trace of
// the independent simulation testdata/harness/pi.py (pi_small.csv,
// written with repr: 17 significant digits) to 1e-9.
func TestPIUnsaturatedIsAnalyze(t *testing.T) {
	const step = 0.5
	c, err := tf.NewRational([]float64{piKc * (1 + piTs/piTi), -piKc}, []float64{1, -1}, 0)
	if err != nil {
		t.Fatal(err)
	}
	p, err := tf.NewRational([]float64{0.01}, []float64{1, -0.95}, 3)
	if err != nil {
		t.Fatal(err)
	}
	lp, err := control.Analyze(c, p, control.LoopSettings{Horizon: piN - piStepAt})
	if err != nil {
		t.Fatal(err)
	}
	y, u := piLoopRun(t, step)
	for k := piStepAt; k < piN; k++ {
		j := k - piStepAt
		if d := math.Abs(y[k] - step*lp.Setpoint.Output[j]); d > 1e-9 {
			t.Errorf("sample %d: temperature %v, Analyze %v", k, y[k], step*lp.Setpoint.Output[j])
		}
		if d := math.Abs(u[k] - piU0 - step*lp.Setpoint.Control[j]); d > 1e-9 {
			t.Errorf("sample %d: valve %v, Analyze %v", k, u[k]-piU0, step*lp.Setpoint.Control[j])
		}
	}
	checkPITrace(t, "pi_small.csv", y, u)
}

// TestPIBackCalculation checks a set-point step that drives the valve to
// its limit (4 degC: the kick Kc (1 + Ts/Ti) 4 = 75 % on 45 %) against
// the independent simulation testdata/harness/pi.py of the rule in
// pi.go's doc (pi_saturated.csv) to 1e-9, and that the clipped kick is
// kept: the loop settles to +-5 % of the step (0.2 degC) within 12 min
// of the step, as pi.py prints (the clamped velocity form of the old
// harness took 46 min there, and 9 min is the loop without limits).
func TestPIBackCalculation(t *testing.T) {
	y, u := piLoopRun(t, 4)
	checkPITrace(t, "pi_saturated.csv", y, u)
	limited := 0
	for _, v := range u {
		if v >= 100 {
			limited++
		}
	}
	last := 0
	for k := range y {
		if math.Abs(y[k]-4) > 0.2 {
			last = k
		}
	}
	if limited == 0 || last+1-piStepAt > 12 {
		t.Errorf("valve at its limit for %d samples, settled %d min after the step; want a limited run settled within 12 min", limited, last+1-piStepAt)
	}
}

// TestPIIntegralAtLimit works the back-calculation rule by hand: Kc 2,
// Ti 4, Ts 1 (Kc Ts/Ti = 0.5, f = Ts/Ti = 0.25), limits 0..10, from 5
// with a constant error of 3. First call: I = 5 - 2*3 = -1, then
// i = -1 + 1.5 = 0.5, v = 6 + 0.5 = 6.5; then 8 and 9.5; the fourth
// i = 5, v = 11, u = 10, I = 5 + 0.25 (10 - 11) = 4.75; the fifth
// i = 6.25, v = 12.25, u = 10, I = 6.25 + 0.25 (10 - 12.25) = 5.6875.
// The fixed point of I = I + 1.5 + 0.25 (10 - (6 + I + 1.5)) is I = 8.5
// (I + Kc Ts/Ti e = 10, the limit), so the integral does not wind up; an
// error of -0.1 then gives v = -0.2 + 8.5 - 0.05 = 8.25 and the output
// leaves the limit at once.
func TestPIIntegralAtLimit(t *testing.T) {
	pi, err := NewPI(2, 4, 1, 0, 10, 5)
	if err != nil {
		t.Fatal(err)
	}
	want := []float64{6.5, 8, 9.5, 10, 10}
	for k, w := range want {
		if got := pi.Update(3, 0); math.Abs(got-w) > 1e-12 {
			t.Errorf("call %d: %v, by hand %v", k, got, w)
		}
	}
	if math.Abs(pi.integral-(5.6875)) > 1e-12 {
		t.Errorf("integral after five calls %v, by hand 5.6875", pi.integral)
	}
	for range 500 {
		pi.Update(3, 0)
	}
	if math.Abs(pi.integral-8.5) > 1e-9 {
		t.Errorf("integral after a long spell at the limit %v, want 8.5 (the contraction 0.75^k leaves < 1e-60)", pi.integral)
	}
	if got := pi.Update(-0.1, 0); math.Abs(got-8.25) > 1e-9 {
		t.Errorf("first output after the error changes sign %v, by hand 8.25", got)
	}
}

// checkPITrace compares y and u with the trace in testdata/harness/name
// (columns k, y, u) to 1e-9.
func checkPITrace(t *testing.T, name string, y, u []float64) {
	t.Helper()
	f, err := os.Open("../../testdata/harness/" + name)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != piN+1 {
		t.Fatalf("%s: %d rows, want %d and a header", name, len(rows), piN)
	}
	for k, r := range rows[1:] {
		ry, err1 := strconv.ParseFloat(r[1], 64)
		ru, err2 := strconv.ParseFloat(r[2], 64)
		if err1 != nil || err2 != nil {
			t.Fatalf("%s row %d: %v", name, k+1, r)
		}
		if math.Abs(ry-y[k]) > 1e-9 || math.Abs(ru-u[k]) > 1e-9 {
			t.Errorf("%s sample %d: y %v u %v, pi.py y %v u %v", name, k, y[k], u[k], ry, ru)
		}
	}
}
