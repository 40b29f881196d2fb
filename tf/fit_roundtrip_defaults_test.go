package tf_test

import (
	"context"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf"
)

// rtCase is one model of our own for the simulate-then-fit round trips:
// the truth, the spec fitted (the same structure with free names), the
// true value of every free name, and the input generator.
type rtCase struct {
	name  string
	truth string
	spec  string
	want  map[string]float64
	input func(rng *rand.Rand, n int) []float64
	in    string
}

// rtCases are three models of our own: a valve input far from zero (about
// 50 %), a differenced input far from zero, and MA noise with a dead time
// and a two-term numerator.
var rtCases = []rtCase{
	{
		name:  "valve about 50 %",
		truth: "y = 10 + 2 / (1 - 0.7 B) B valve + 1 / (1 - 0.5 B) a",
		spec:  "y = c + w0 / (1 - d1 B) B valve + 1 / (1 - p1 B) a",
		want:  map[string]float64{"c": 10, "w0": 2, "d1": 0.7, "p1": 0.5},
		in:    "valve",
		input: func(rng *rand.Rand, n int) []float64 {
			x := make([]float64, n)
			for i := range x {
				x[i] = 50 + 5*rng.NormFloat64()
			}
			return x
		},
	},
	{
		name:  "differenced feed about 20",
		truth: "(1 - B) level = 1.5 / (1 - 0.6 B) B ((1 - B) feed) + 1 / (1 - 0.4 B) a",
		spec:  "(1 - B) level = w0 / (1 - d1 B) B ((1 - B) feed) + 1 / (1 - p1 B) a",
		want:  map[string]float64{"w0": 1.5, "d1": 0.6, "p1": 0.4},
		in:    "feed",
		input: func(rng *rand.Rand, n int) []float64 {
			x := make([]float64, n)
			for i := range x {
				x[i] = 20 + rng.NormFloat64()
			}
			return x
		},
	},
	{
		name:  "MA noise, dead time 3",
		truth: "y = 5 + (1.5 - 0.4 B) / (1 - 0.5 B) B^3 u + (1 - 0.6 B) a",
		spec:  "y = c + (w0 - w1 B) / (1 - d1 B) B^3 u + (1 - t1 B) a",
		want:  map[string]float64{"c": 5, "w0": 1.5, "w1": 0.4, "d1": 0.5, "t1": 0.6},
		in:    "u",
		input: func(rng *rand.Rand, n int) []float64 {
			x := make([]float64, n)
			for i := range x {
				x[i] = 3 + rng.NormFloat64()
			}
			return x
		},
	},
}

// rtSim simulates c with the defaults of Model.Simulate (a settled
// start) and unit innovations.
func rtSim(t testing.TB, c rtCase, seed uint64, n int, fromRest bool) map[string][]float64 {
	t.Helper()
	truth := parse.MustModel(c.truth)
	x := c.input(rand.New(rand.NewPCG(seed, 77)), n)
	y, err := truth.Simulate(map[string][]float64{c.in: x}, &tf.SimSettings{Seed1: seed, Seed2: 78, Sigma: 1, FromRest: fromRest})
	if err != nil {
		t.Fatal(err)
	}
	return map[string][]float64{truth.Output: y, c.in: x}
}

// TestFitSimulateRoundTripDefaults simulates each of the three models
// with the defaults of Model.Simulate, fits the same structure with the
// defaults of Fit, and counts the seeds in which every estimate lies
// within 4 standard errors of the truth: at least 99 of 100 per model.
// Asymptotically the CLS estimates are normal about the truth (Box,
// Jenkins & Reinsel, chapter on fitting transfer-function models), so
// that a 4 SE miss has probability 6e-5 per estimate; the 1 % allowance
// is for the finite sample (n = 300). With Simulate's former default
// (inputs from rest) the valve model misses in most seeds, which this
// test also shows.
func TestFitSimulateRoundTripDefaults(t *testing.T) {
	seeds, n := 100, 300
	for _, c := range rtCases {
		m := parse.MustModel(c.spec)
		ok, worst := 0, 0.0
		for s := range seeds {
			data := rtSim(t, c, uint64(s), n, false)
			e, err := tf.Fit(context.Background(), m, data, nil)
			if err != nil {
				t.Fatalf("%s, seed %d: %v", c.name, s, err)
			}
			all := true
			for name, v := range c.want {
				p, found := e.Param(name)
				if !found {
					t.Fatalf("%s: no estimate of %s", c.name, name)
				}
				z := math.Abs(p.Value-v) / p.SE
				worst = math.Max(worst, z)
				if !(z <= 4) {
					all = false
					t.Logf("%s, seed %d: %s = %.4g, truth %.4g, %.1f SE away", c.name, s, name, p.Value, v, z)
				}
			}
			if all {
				ok++
			}
		}
		t.Logf("%s: %d of %d seeds with every estimate within 4 SE (largest %.2f SE)", c.name, ok, seeds, worst)
		if ok < 99 {
			t.Errorf("%s: only %d of %d seeds with every estimate within 4 SE of the truth, want >= 99", c.name, ok, seeds)
		}
	}
	// The trap the new default removes: the valve model simulated from
	// rest and fitted with the defaults misses (phi1 soaks up the
	// start-up transient) and Fit says so with a StartupTransient
	// warning.
	c := rtCases[0]
	data := rtSim(t, c, 1, n, true)
	e, err := tf.Fit(context.Background(), parse.MustModel(c.spec), data, nil)
	if err != nil {
		t.Fatal(err)
	}
	p, _ := e.Param("p1")
	if z := math.Abs(p.Value-0.5) / p.SE; z < 4 {
		t.Errorf("from rest: p1 = %.3g, %.1f SE from 0.5; the trap no longer reproduces", p.Value, z)
	}
	if !rtHas(e, tf.StartupTransient) {
		t.Errorf("from rest: no StartupTransient warning: %v", e.Warnings)
	}
}

func rtHas(e *tf.Estimate, k tf.WarningKind) bool {
	for _, w := range e.Warnings {
		if w.Kind == k {
			return true
		}
	}
	return false
}

func rtWarning(e *tf.Estimate, k tf.WarningKind) string {
	for _, w := range e.Warnings {
		if w.Kind == k {
			return w.Message
		}
	}
	return ""
}

// TestFitStartupTransient checks the StartupTransient warning: no false
// alarm on records that start settled (200 seeds of each of the three
// models; the test's stated false-alarm rate is 1e-4 a fit, so 600 fits
// give a false alarm with probability about 0.06), a warning naming the
// samples and the Settle remedy on a record simulated from rest with a
// valve about 50 %, and none once Settle leaves the transient out.
func TestFitStartupTransient(t *testing.T) {
	n := 300
	for _, c := range rtCases {
		m := parse.MustModel(c.spec)
		alarms := 0
		for s := range 200 {
			e, err := tf.Fit(context.Background(), m, rtSim(t, c, uint64(1000+s), n, false), nil)
			if err != nil {
				t.Fatalf("%s, seed %d: %v", c.name, s, err)
			}
			if rtHas(e, tf.StartupTransient) {
				alarms++
				t.Logf("%s, seed %d: %s", c.name, 1000+s, rtWarning(e, tf.StartupTransient))
			}
		}
		if alarms > 0 {
			t.Errorf("%s: %d false alarms in 200 settled records", c.name, alarms)
		}
	}
	c := rtCases[0]
	m := parse.MustModel(c.spec)
	for s := range 20 {
		data := rtSim(t, c, uint64(2000+s), n, true)
		e, err := tf.Fit(context.Background(), m, data, nil)
		if err != nil {
			t.Fatal(err)
		}
		msg := rtWarning(e, tf.StartupTransient)
		if msg == "" {
			t.Errorf("seed %d: record from rest, valve about 50: no StartupTransient warning (%v)", 2000+s, e.Warnings)
			continue
		}
		for _, key := range []string{"samples 2..", "FitSettings.Settle", "FitSettings.First", "start-up transient"} {
			if !strings.Contains(msg, key) {
				t.Errorf("seed %d: warning %q lacks %q", 2000+s, msg, key)
			}
		}
		es, err := tf.Fit(context.Background(), m, data, &tf.FitSettings{Settle: true})
		if err != nil {
			t.Fatal(err)
		}
		if rtHas(es, tf.StartupTransient) {
			t.Errorf("seed %d: with Settle (first residual %d) the warning stays: %s", 2000+s, es.Conditioning.First, rtWarning(es, tf.StartupTransient))
		}
	}
}
