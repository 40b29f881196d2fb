package main

import (
	"fmt"
	"io"
	"math"

	"github.com/backshift/backshift/examples/internal/modelinfo"
	"github.com/backshift/backshift/tf"
	"github.com/backshift/backshift/tf/fit"
)

// withParam returns a copy of m with every coefficient named name set to
// v.
func withParam(m tf.Model, name string, v float64) tf.Model {
	return mapCoefs(m, func(k *tf.Coef) {
		if k.Name == name {
			k.Value = v
		}
	})
}

// deltaSE returns the standard error of f(estimates) by the delta
// method, sqrt(g' Cov g) with g the gradient of f by central differences
// (step 1e-6 times the parameter's size, at least 1e-9), and NaN when f
// fails near the estimate or the covariance is not available.
func deltaSE(est *fit.Estimate, f func(tf.Model) (float64, error)) float64 {
	k := len(est.Params)
	if len(est.Cov) != k {
		return math.NaN()
	}
	g := make([]float64, k)
	for i, p := range est.Params {
		h := math.Max(1e-6*math.Abs(p.Value), 1e-9)
		up, err1 := f(withParam(est.Model, p.Name, p.Value+h))
		dn, err2 := f(withParam(est.Model, p.Name, p.Value-h))
		if err1 != nil || err2 != nil {
			return math.NaN()
		}
		g[i] = (up - dn) / (2 * h)
	}
	v := 0.0
	for i := range k {
		for j := range k {
			v += g[i] * est.Cov[i][j] * g[j]
		}
	}
	if !(v >= 0) {
		return math.NaN()
	}
	return math.Sqrt(v)
}

// pathGain returns the steady-state gain of input i of m.
func pathGain(i int) func(tf.Model) (float64, error) {
	return func(m tf.Model) (float64, error) {
		ps, err := modelinfo.Paths(m, 0)
		if err != nil {
			return 0, err
		}
		if math.IsNaN(ps[i].Gain) {
			return 0, fmt.Errorf("no gain")
		}
		return ps[i].Gain, nil
	}
}

// pathTau returns the longest time constant (in samples) of input i of
// m, from its real poles in (0, 1).
func pathTau(i int) func(tf.Model) (float64, error) {
	return func(m tf.Model) (float64, error) {
		ps, err := modelinfo.Paths(m, 0)
		if err != nil {
			return 0, err
		}
		tau := math.NaN()
		for _, md := range ps[i].Modes {
			if md.Kind == tf.ModeReal {
				tau = math.Max(nanToZero(tau), md.TimeConstant.Samples)
			}
		}
		if math.IsNaN(tau) {
			return 0, fmt.Errorf("no real pole")
		}
		return tau, nil
	}
}

// writeUncertainty prints the gains and the longest time constants of
// the input paths with their standard errors.
func writeUncertainty(w io.Writer, est *fit.Estimate, ds *dataset, paths []modelinfo.Path) {
	fmt.Fprintf(w, "\nGains and time constants with standard errors (delta method on the estimates' covariance;\ndead times are chosen by the identification, not estimated):\n")
	missing := false
	for i, p := range paths {
		g := deltaSE(est, pathGain(i))
		missing = missing || math.IsNaN(g)
		if math.IsNaN(p.Gain) {
			fmt.Fprintf(w, "  %-8s gain none (integrating)", p.Input)
		} else {
			fmt.Fprintf(w, "  %-8s gain %.4g +- %s", p.Input, p.Gain, seText(g, 1))
		}
		if tau, err := pathTau(i)(est.Model); err == nil {
			se := deltaSE(est, pathTau(i))
			missing = missing || math.IsNaN(se)
			fmt.Fprintf(w, ", time constant %.3g +- %s %s", tau*ds.step(), seText(se, ds.step()), ds.timeUnit())
		}
		fmt.Fprintln(w)
	}
	if missing {
		fmt.Fprintf(w, "  (n/a: no standard error, since the estimates' covariance is not available; the figures are not to be relied on)\n")
	}
}

// seText formats a standard error se scaled by k, or "n/a" when there
// is none.
func seText(se, k float64) string {
	if math.IsNaN(se) || math.IsInf(se, 0) {
		return "n/a"
	}
	return fmt.Sprintf("%.2g", se*k)
}
