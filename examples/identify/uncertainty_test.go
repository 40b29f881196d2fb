package main

import (
	"context"
	"math"
	"testing"

	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/parse"
	"github.com/backshift/backshift/tf/fit"
)

// TestDeltaSEFirstOrder checks the numerical delta method against the
// closed form for the gain g = w/(1 - d) of a first-order path:
//
//	var g = var w/(1-d)^2 + w^2 var d/(1-d)^4 + 2 w cov(w,d)/(1-d)^3
//
// (first-order Taylor expansion, common practice), and that the true
// gains lie within 4 standard errors of the estimates.
func TestDeltaSEFirstOrder(t *testing.T) {
	g := greenhouse.Default()
	data := g.ByName()
	m := parse.MustModel(greenhouse.Structure)
	est, err := fit.Model(context.Background(), m, data, &fit.Settings{First: 288})
	if err != nil {
		t.Fatal(err)
	}
	idx := map[string]int{}
	for i, p := range est.Params {
		idx[p.Name] = i
	}
	for i, c := range []struct {
		w, d  string
		truth float64
	}{{"w0", "d1", greenhouse.True.Valve.Gain()}, {"v0", "e1", greenhouse.True.Outdoor.Gain()}} {
		w, d := est.Params[idx[c.w]].Value, est.Params[idx[c.d]].Value
		vw, vd, cwd := est.Cov[idx[c.w]][idx[c.w]], est.Cov[idx[c.d]][idx[c.d]], est.Cov[idx[c.w]][idx[c.d]]
		q := 1 - d
		want := math.Sqrt(vw/(q*q) + w*w*vd/(q*q*q*q) + 2*w*cwd/(q*q*q))
		got := deltaSE(est, pathGain(i))
		// Central differences with a relative step of 1e-6 on a smooth
		// function: agreement to 1e-5 relative.
		if math.Abs(got/want-1) > 1e-5 {
			t.Errorf("%s gain SE %.6g, closed form %.6g", c.w, got, want)
		}
		gain := w / q
		if math.Abs(gain-c.truth) > 4*got {
			t.Errorf("%s gain %.5f is %.1f SE from the truth %.3f", c.w, gain, math.Abs(gain-c.truth)/got, c.truth)
		}
	}
}
