package main

import (
	"context"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/backshift/backshift/tf/fit"
	"gonum.org/v1/gonum/mat"
)

// TestTunedControllerIsTheHarnessPI checks that the discrete controller
// each rule returns is the harness's velocity PI with the tuning's Kc and
// Ti (backward difference of Kc (1 + 1/(Ti s)): Franklin, Powell &
// Workman 1998, the discrete PID), to 1e-12 relative, so that the
// controller tests on the plant run the controller the robustness
// figures are for.
func TestTunedControllerIsTheHarnessPI(t *testing.T) {
	for _, r := range defaultWalk(t).Rules {
		q0, q1 := velocity(r.PI, r.Tuning.Interval.Value)
		num, den := r.Tuning.Controller.Num(), r.Tuning.Controller.Den()
		if len(num) != 2 || len(den) != 2 || r.Tuning.Controller.Delay() != 0 ||
			math.Abs(num[0]/q0-1) > 1e-12 || math.Abs(num[1]/q1-1) > 1e-12 || den[1] != -1 {
			t.Errorf("%s: controller %v, want (%v + %v B)/(1 - B)", r.Tuning.Rule, r.Tuning.Controller, q0, q1)
		}
	}
}

// TestRobustness checks each rule's robustness figures against the loop
// closed by hand on the same drawn plants: the parameters are drawn from
// the estimate's covariance as control.ModelDraw documents it (one
// standard normal per parameter from rand.New(rand.NewPCG(seed, 0)),
// in the order of the estimate's parameters, times the lower Cholesky
// factor, here gonum's), the valve path w0 B^3/(1 - d1 B) closed with
// the velocity PI, stability from tf's poles of the characteristic
// polynomial and Ms from a dense sweep (piLoop). The fraction stable must
// agree exactly and every quantile of Ms to msTol (quantiles of R's type
// 7, as control documents its Spread).
func TestRobustness(t *testing.T) {
	wk := defaultWalk(t)
	for _, r := range wk.Rules {
		checkRobust(t, wk.Model.Est, r)
	}
}

// TestRobustnessPartlyStable repeats TestRobustness's check on an
// estimate whose covariance is 2500 times the fitted one (standard
// errors 50 times larger, as from a far shorter or noisier test), so
// that some drawn loops are unstable and the fraction stable is tested
// below 1 as well.
func TestRobustnessPartlyStable(t *testing.T) {
	wk := defaultWalk(t)
	est := *wk.Model.Est
	est.Cov = make([][]float64, len(wk.Model.Est.Cov))
	for i, row := range wk.Model.Est.Cov {
		est.Cov[i] = make([]float64, len(row))
		for j, v := range row {
			est.Cov[i][j] = 2500 * v
		}
	}
	id := *wk.Model
	id.Est = &est
	r, err := tuneRule(context.Background(), &id, tuningRules[0])
	if err != nil {
		t.Fatal(err)
	}
	if fs := r.Robust.FractionStable; !(fs > 0.5 && fs < 1) {
		t.Fatalf("fraction stable %v: the case does not test a fraction below 1", fs)
	}
	checkRobust(t, &est, r)
}

// checkRobust checks r's robustness figures against the loop closed by
// hand on the same drawn plants: the parameters are drawn from est's
// covariance as control.ModelDraw documents it (one standard normal per
// parameter from rand.New(rand.NewPCG(seed, 0)), in the order of the
// estimate's parameters, times the lower Cholesky factor, here gonum's),
// the valve path w0 B^3/(1 - d1 B) closed with the velocity PI,
// stability from tf's poles of the characteristic polynomial and Ms from
// a dense sweep (piLoop). The fraction stable must agree exactly and
// every quantile of Ms to msTol (quantiles of R's type 7, as control
// documents its Spread).
func checkRobust(t *testing.T, est *fit.Estimate, r *tuned) {
	t.Helper()
	n := len(est.Params)
	var chol mat.Cholesky
	if !chol.Factorize(mat.NewSymDense(n, slices.Concat(est.Cov...))) {
		t.Fatal("the estimate's covariance is not positive definite")
	}
	var l mat.TriDense
	chol.LTo(&l)
	iw0, id1 := paramIndex(t, est, "w0"), paramIndex(t, est, "d1")
	q0, q1 := velocity(r.PI, r.Tuning.Interval.Value)
	rng := rand.New(rand.NewPCG(robustSeed, 0))
	var ms []float64
	z := make([]float64, n)
	for range robustDraws {
		for i := range z {
			z[i] = rng.NormFloat64()
		}
		x := func(i int) float64 {
			v := est.Params[i].Value
			for j := 0; j <= i; j++ {
				v += l.At(i, j) * z[j]
			}
			return v
		}
		lp := piLoop{q0: q0, q1: q1, w0: x(iw0), d1: x(id1), b: 3}
		if lp.stable(t) {
			ms = append(ms, lp.peakS())
		}
	}
	rb := r.Robust
	if got, want := rb.FractionStable, float64(len(ms))/robustDraws; got != want {
		t.Errorf("%s: fraction stable %v, by hand %v", r.Tuning.Rule, got, want)
	}
	slices.Sort(ms)
	for i, p := range rb.Levels {
		want := quantile7(ms, p)
		if got := rb.SensitivityPeak.Values[i]; math.Abs(got/want-1) > msTol {
			t.Errorf("%s: Ms quantile %g: %v, by hand %v", r.Tuning.Rule, p, got, want)
		}
	}
	t.Logf("%s: %d of %d stable, Ms %.4f .. %.4f", r.Tuning.Rule, len(ms), robustDraws, quantile7(ms, 0.05), quantile7(ms, 0.95))
}

// paramIndex returns the index of the named parameter of est.
func paramIndex(t *testing.T, est *fit.Estimate, name string) int {
	t.Helper()
	for i, p := range est.Params {
		if p.Name == name {
			return i
		}
	}
	t.Fatalf("no parameter %s", name)
	return -1
}

// TestWorstCase checks each rule's worst case against the grid closed by
// hand: the identified valve path with its gain times 1, 1.075, ..., 1.3
// (five factors, control's default GainSteps) and its dead time of 3 or
// 4 samples, each loop's stability from tf's poles of the characteristic
// polynomial and Ms from the sweep (piLoop). The count of unstable cases
// must agree and the largest Ms to msTol, on the same case.
func TestWorstCase(t *testing.T) {
	wk := defaultWalk(t)
	num, den := wk.Model.Plant.Num(), wk.Model.Plant.Den()
	if len(num) != 1 || len(den) != 2 || wk.Model.Plant.Delay() != 3 {
		t.Fatalf("valve path %v is not w0 B^3/(1 - d1 B)", wk.Model.Plant)
	}
	for _, r := range wk.Rules {
		q0, q1 := velocity(r.PI, r.Tuning.Interval.Value)
		unstable, worst, gf, dc := 0, 0.0, 0.0, 0
		for _, extra := range []int{0, worstDelayAbove} {
			for k := range 5 {
				f := 1 + worstGainAbove*float64(k)/4
				lp := piLoop{q0: q0, q1: q1, w0: f * num[0], d1: -den[1], b: 3 + extra}
				if !lp.stable(t) {
					unstable++
					continue
				}
				if m := lp.peakS(); m > worst {
					worst, gf, dc = m, f, extra
				}
			}
		}
		wc := r.Worst
		if wc.Unstable != unstable || len(wc.Cases) != 10 {
			t.Errorf("%s: %d of %d cases unstable, by hand %d of 10", r.Tuning.Rule, wc.Unstable, len(wc.Cases), unstable)
		}
		k := wc.SensitivityPeak.Case
		if k < 0 || math.Abs(wc.SensitivityPeak.Value/worst-1) > msTol ||
			math.Abs(wc.Cases[k].GainFactor-gf) > 1e-12 || wc.Cases[k].DelayChange != dc {
			t.Errorf("%s: worst Ms %v (case %d), by hand %v at gain x%v, dead time %+d", r.Tuning.Rule, wc.SensitivityPeak.Value, k, worst, gf, dc)
		}
	}
}

// TestNominalLoop checks each rule's nominal figures on the identified
// valve path by the loop closed by hand: Ms against the sweep (to
// msTol), and the gain margin by its definition, the factor on the
// controller's gain at which the loop reaches the stability boundary
// (stable at GM (1 - 1e-6), unstable at GM (1 + 1e-6); Franklin, Powell
// & Workman 1998, on the Nyquist criterion for a stable open loop with
// one phase crossover).
func TestNominalLoop(t *testing.T) {
	wk := defaultWalk(t)
	num, den := wk.Model.Plant.Num(), wk.Model.Plant.Den()
	for _, r := range wk.Rules {
		q0, q1 := velocity(r.PI, r.Tuning.Interval.Value)
		lp := piLoop{q0: q0, q1: q1, w0: num[0], d1: -den[1], b: 3}
		if got, want := r.Nominal.SensitivityPeak, lp.peakS(); math.Abs(got/want-1) > msTol {
			t.Errorf("%s: nominal Ms %v, by hand %v", r.Tuning.Rule, got, want)
		}
		gm := r.Nominal.Margins.GainMargin
		below, above := lp, lp
		below.q0, below.q1 = q0*gm*(1-1e-6), q1*gm*(1-1e-6)
		above.q0, above.q1 = q0*gm*(1+1e-6), q1*gm*(1+1e-6)
		if !below.stable(t) || above.stable(t) {
			t.Errorf("%s: gain margin %v is not the stability boundary (stable just below: %v, just above: %v)",
				r.Tuning.Rule, gm, below.stable(t), above.stable(t))
		}
	}
}

// TestTunedMeetsRequirements runs the controller tests of harness_test.go
// with each rule's tuning on the plant itself (PlantSpec, noise-free):
// both must meet the same requirements as the hand tuning (settling,
// overshoot, steady-state error, peak deviation and recovery; the limits
// are harness_test.go's).
func TestTunedMeetsRequirements(t *testing.T) {
	for _, r := range defaultWalk(t).Rules {
		_, m := setpointStepRun(t, r.PI)
		if m.Settling > maxSettling || m.Overshoot > maxOvershoot || abs(m.SteadyError) > maxSteadyError {
			t.Errorf("%s, setpoint step: settling %v min, overshoot %v, steady-state error %v", r.Tuning.Rule, m.Settling, m.Overshoot, m.SteadyError)
		}
		settle := m.Settling
		_, m = disturbanceStepRun(t, r.PI)
		if m.PeakDeviation > maxPeakDev || m.Settling > maxRecovery || abs(m.SteadyError) > maxSteadyError {
			t.Errorf("%s, outdoor step: peak %v degC, recovery %v min, steady-state error %v", r.Tuning.Rule, m.PeakDeviation, m.Settling, m.SteadyError)
		}
		t.Logf("%s: setpoint settles within %.2f degC in %.0f min; outdoor step peaks at %.2f degC, back in %.0f min",
			r.Tuning.Rule, settleBand, settle, m.PeakDeviation, m.Settling)
	}
}
