package main

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/tf/fit"
)

// TestMethodFlag: -method takes least-squares or exact; anything else
// exits 2 naming the flag and both values, before any output.
func TestMethodFlag(t *testing.T) {
	for _, v := range []string{"ml", "Exact", "cls"} {
		var stdout, stderr bytes.Buffer
		if got := cli([]string{"-method", v}, &stdout, &stderr); got != exitUsage {
			t.Errorf("-method %q: exit %d, want %d", v, got, exitUsage)
		}
		if !strings.Contains(stderr.String(), "-method") || !strings.Contains(stderr.String(), "least-squares") || stdout.Len() != 0 {
			t.Errorf("-method %q: stderr %q, stdout %q", v, stderr.String(), stdout.String())
		}
	}
}

// TestMethodExact: the demo's true structure fitted by exact maximum
// likelihood says so in its report, and on this long record (5760
// samples) its estimates agree with least squares' to within one
// standard error (the two methods agree as n grows: the conditioning
// affects O(1) of n samples; common practice, and tf/fit's own test of
// a long record measured 0.015 SE).
func TestMethodExact(t *testing.T) {
	o := DefaultOptions()
	o.Spec, o.Horizon, o.Outliers = greenhouse.Structure, 0, outliersOff
	o.cleanDemo = true // least squares needs every output sample
	ls, _, err := run(t, o)
	if err != nil {
		t.Fatal(err)
	}
	o.Method = methodExact
	ml, out, err := run(t, o)
	if err != nil {
		t.Fatal(err)
	}
	if ml.Estimate.Method != fit.ExactML || !strings.Contains(strings.ToLower(out), "exact") {
		t.Fatalf("method %v; report:\n%s", ml.Estimate.Method, out)
	}
	for i, p := range ml.Estimate.Params {
		q := ls.Estimate.Params[i]
		if p.Name != q.Name || !(math.Abs(p.Value-q.Value) <= q.SE) {
			t.Errorf("%s: exact %v, least squares %v (SE %v)", p.Name, p.Value, q.Value, q.SE)
		}
	}
}
