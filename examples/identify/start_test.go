package main

import (
	"fmt"
	"math"
	"strings"
	"testing"
	"time"

	"github.com/backshift/backshift/examples/greenhouse"
	"github.com/backshift/backshift/internal/testutil"
)

// stampedCSV writes the greenhouse record d as a logger would, with a
// time column of stamp(i) for row i: time, valve, outdoor, temp.
func stampedCSV(t *testing.T, d greenhouse.Data, stamp func(i int) string) string {
	t.Helper()
	var b strings.Builder
	b.WriteString("time,valve,outdoor,temp\n")
	for i := range d.Temp {
		fmt.Fprintf(&b, "%s,%.4f,%.4f,%.4f\n", stamp(i), d.Valve[i], d.Outdoor[i], d.Temp[i])
	}
	return testutil.WriteFile(t, "stamped.csv", b.String())
}

// shiftedRecord is the clean greenhouse record with a level shift of
// +2 degC in the logged temperature from sample 3000 on, stamped every
// minute from 2026-03-02T00:00Z: sample 3000 is 2026-03-04T02:00Z
// (3000 min = 2 d 2 h, plain arithmetic).
func shiftedRecord(t *testing.T) string {
	t.Helper()
	d := greenhouse.Default()
	for i := 3000; i < len(d.Temp); i++ {
		d.Temp[i] += 2
	}
	t0 := time.Date(2026, 3, 2, 0, 0, 0, 0, time.UTC)
	return stampedCSV(t, d, func(i int) string { return t0.Add(time.Duration(i) * time.Minute).Format(time.RFC3339) })
}

// TestTimedEventFromTimeColumn: a spec whose event is given
// as a time is fitted on a record with a time column (the record's first
// stamp is the fit's Start), by either method, to the same estimates as
// the event given as the sample index (the same model, so equal to
// 1e-9 relative: the two differ only in how the event's sample is
// found), and the planted shift is estimated within 3 SE (a 99.7 % band
// for a normal estimate). The forecast, the simulation and the refit
// with -outliers refit run with the timed event too.
func TestTimedEventFromTimeColumn(t *testing.T) {
	path := shiftedRecord(t)
	for _, method := range []string{methodLeastSquares, methodExact} {
		var ks [2]float64
		for j, ev := range []string{"step(2026-03-04T02:00)", "step(3000)"} {
			o := DefaultOptions()
			o.Data, o.Spec, o.Method, o.Outliers = path, greenhouse.Structure+" + k "+ev, method, outliersRefit
			res, out, err := run(t, o)
			if err != nil {
				t.Fatalf("%s, %s: %v", method, ev, err)
			}
			for _, p := range res.Estimate.Params {
				if p.Name == "k" {
					ks[j] = p.Value
					if math.Abs(p.Value-2) > 3*p.SE {
						t.Errorf("%s, %s: k = %.4f +- %.4f, planted 2", method, ev, p.Value, p.SE)
					}
				}
			}
			for _, bad := range []string{"not available", "start time"} {
				if strings.Contains(out, bad) {
					t.Errorf("%s, %s: the report says %q:\n%s", method, ev, bad, out)
				}
			}
		}
		if math.Abs(ks[0]-ks[1]) > 1e-9*math.Abs(ks[1]) {
			t.Errorf("%s: k by time %.12g, by index %.12g", method, ks[0], ks[1])
		}
	}
}

// TestTimedEventWithoutClock: without a clock of dates and times the
// refusal says why (no time column, a column of numbers, the built-in
// record) and what to write instead, not that a time column would do.
func TestTimedEventWithoutClock(t *testing.T) {
	spec := greenhouse.Structure + " + k step(2026-03-04T02:00)"
	noTime := testutil.WriteFile(t, "gh.csv", ghCSV(t))
	cases := []struct {
		label string
		o     func(o *Options)
		why   string
	}{
		{"built-in", func(o *Options) {}, "the built-in record has no dates"},
		{"time none", func(o *Options) { o.Data, o.Time = noTime, "none" }, "has no time column"},
		{"minutes", func(o *Options) { o.Data = noTime }, "holds numbers (in min)"},
	}
	for _, c := range cases {
		o := DefaultOptions()
		o.Spec = spec
		c.o(&o)
		_, _, err := run(t, o)
		if err == nil {
			t.Errorf("%s: no error", c.label)
			continue
		}
		testutil.CheckWords(t, c.label, err.Error(), []string{"step(2026-03-04T02:00) is given as a time", c.why, "step(120)"},
			[]string{"Settings.Start", "a record with a time column has both"})
	}
}

// TestOutlierTimeInFileOffset: an outlier's time is
// printed in the offset the file writes at that row, so that it can be
// found in the file. The faulty demo record is stamped from
// 2026-03-28T00:00Z with +01:00 offsets until the clock change at
// 2026-03-29T01:00Z (minute 1500) and +02:00 after; the bad reading at
// minute 2000 is 2026-03-29T09:20Z, written 11:20:00+02:00 (plain
// arithmetic). A file in UTC ("Z") shows the time with Z.
func TestOutlierTimeInFileOffset(t *testing.T) {
	d, err := greenhouse.Default().WithFault(greenhouse.Spike)
	if err != nil {
		t.Fatal(err)
	}
	t0 := time.Date(2026, 3, 28, 0, 0, 0, 0, time.UTC)
	cet, cest := time.FixedZone("", 3600), time.FixedZone("", 7200)
	for _, c := range []struct {
		stamp func(i int) string
		want  string
	}{
		{func(i int) string {
			z := cet
			if i >= 1500 {
				z = cest
			}
			return t0.Add(time.Duration(i) * time.Minute).In(z).Format(time.RFC3339)
		}, "2026-03-29 11:20:00+02:00"},
		{func(i int) string { return t0.Add(time.Duration(i) * time.Minute).Format(time.RFC3339) }, "2026-03-29 09:20:00Z"},
	} {
		o := DefaultOptions()
		o.Data, o.Spec, o.Horizon = stampedCSV(t, d, c.stamp), greenhouse.Structure, 0
		res, out, err := run(t, o)
		if err != nil {
			t.Fatal(err)
		}
		found := false
		for _, f := range res.Outliers.Found {
			if f.Index == greenhouse.Spike.Sample {
				found = f.When == c.want
			}
		}
		if !found || !strings.Contains(out, c.want) {
			t.Errorf("the bad reading is not stamped %q: %+v", c.want, res.Outliers.Found)
		}
	}
}
