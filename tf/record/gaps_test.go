package record

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// Gaps are refused by default, naming the lines; hold and linear fill
// them (the straight line between the rows either side: common
// practice), longest keeps the longest stretch; the caller's series are
// not touched between calls.
func TestGaps(t *testing.T) {
	in := "minute,y\n0,1\n1,2\n2,3\n5,6\n6,7\n8,9\n"
	_, err := Read(strings.NewReader(in), &Settings{File: "g.csv"})
	var ge *GapError
	if !errors.As(err, &ge) || !errors.Is(err, ErrSample) || len(ge.Breaks) != 2 {
		t.Fatalf("default: %v", err)
	}
	for _, want := range []string{
		`g.csv: the time column "minute" is not evenly spaced at 1 min: 2 gaps`,
		`line 5 ("5") comes 3 intervals after line 4 ("2"): 2 samples missing`,
		`line 7 ("8") comes 2 intervals after line 6 ("6"): 1 sample missing`,
		"choose a remedy: Settings.Gaps = hold:N or Settings.Gaps = linear:N fill gaps",
	} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("default: message lacks %q:\n%v", want, err)
		}
	}
	if b := ge.Breaks[0]; b.Line != 5 || b.PrevLine != 4 || b.Row != 3 || b.Missing != 2 || b.Intervals != 3 {
		t.Errorf("break %+v", b)
	}
	_, err = Read(strings.NewReader(in), &Settings{File: "g.csv", Gaps: Remedy{Kind: "hold", Max: 1}, Names: map[string]string{"Gaps": "-gaps"}})
	if !errors.As(err, &ge) || len(ge.Breaks) != 1 || !strings.Contains(err.Error(), "-gaps hold:1 fills gaps of whole intervals up to 1 missing samples; these are irregular or longer (-gaps longest") {
		t.Errorf("hold:1: %v", err)
	}
	for _, c := range []struct {
		r    Remedy
		want []float64
	}{
		{Remedy{Kind: "hold", Max: 2}, []float64{1, 2, 3, 3, 3, 6, 7, 7, 9}},
		{Remedy{Kind: "linear", Max: 2}, []float64{1, 2, 3, 4, 5, 6, 7, 8, 9}},
		{Remedy{Kind: "longest"}, []float64{1, 2, 3}},
	} {
		rec, err := Read(strings.NewReader(in), &Settings{Gaps: c.r})
		if err != nil {
			t.Fatalf("%v: %v", c.r, err)
		}
		// 1e-15 relative: the interpolation's own rounding.
		got := rec.Series["y"]
		if len(got) != len(c.want) || slices.ContainsFunc(got, func(v float64) bool { return math.IsNaN(v) }) {
			t.Fatalf("%v: %v, want %v", c.r, got, c.want)
		}
		for i := range got {
			if math.Abs(got[i]-c.want[i]) > 1e-15*c.want[i] {
				t.Errorf("%v: %v, want %v", c.r, got, c.want)
				break
			}
		}
		if rec.Len() != len(c.want) || rec.Rows() != 6 || len(rec.Notes) != 2 {
			t.Errorf("%v: Len %d Rows %d notes %q", c.r, rec.Len(), rec.Rows(), rec.Notes)
		}
	}
	// Ties between stretches go to the later one; the note names its lines.
	rec, err := Read(strings.NewReader("minute,y\n0,1\n1,2\n5,3\n6,4\n"), &Settings{Gaps: Remedy{Kind: "longest"}})
	if err != nil || !slices.Equal(rec.Series["y"], []float64{3, 4}) ||
		rec.Notes[1] != "1 break in the time column: fitting only lines 4 to 5 (2 samples), the longest evenly spaced stretch; 2 of 4 rows left out" {
		t.Errorf("longest tie: %+v %v", rec, err)
	}
}

// TestClockChange: times written without an offset from
// UTC that skip an hour (a local clock entering daylight saving) are
// blamed on the clock, not called 60 missing samples, and neither hold
// nor linear fills them (the hour never existed); a time that goes back
// by up to an hour (leaving daylight saving) is blamed on the clock too.
// The same rows written with their offsets (+01:00, then +02:00) are
// evenly spaced, and Offsets keeps what each row was written with; a
// skipped hour in UTC ("Z") or on an hourly record stays an ordinary
// gap. The EU changed clocks on 2026-03-29 at 01:00 UTC and changes
// back on 2026-10-25 at 01:00 UTC (Directive 2000/84/EC, art. 2 and 3).
func TestClockChange(t *testing.T) {
	spring := "time,y\n2026-03-29T01:58:00,1\n2026-03-29T01:59:00,2\n2026-03-29T03:00:00,3\n2026-03-29T03:01:00,4\n"
	_, err := Read(strings.NewReader(spring), &Settings{File: "s.csv"})
	var ge *GapError
	if !errors.As(err, &ge) || len(ge.Breaks) != 1 || !ge.Breaks[0].ClockChange {
		t.Fatalf("spring forward: %v", err)
	}
	testutil.CheckWords(t, "spring", err.Error(), []string{"1 skipped hour", "daylight saving", "write the times with their offset", "Settings.Time = none"},
		[]string{"60 samples missing", "linear:N fill"})
	for _, r := range []Remedy{{Kind: "linear", Max: 60}, {Kind: "hold", Max: 60}} {
		_, err := Read(strings.NewReader(spring), &Settings{File: "s.csv", Gaps: r})
		if !errors.As(err, &ge) {
			t.Fatalf("%s: %v", r, err)
		}
		testutil.CheckWords(t, r.String(), err.Error(), []string{"Settings.Gaps = " + r.String() + " would fill an hour that never existed", "daylight saving"}, nil)
	}
	if rec, err := Read(strings.NewReader(spring), &Settings{File: "s.csv", Gaps: Remedy{Kind: "longest"}}); err != nil || rec.Len() != 2 {
		t.Errorf("longest: %v", err)
	}

	zoned := "time,y\n2026-03-29T01:58:00+01:00,1\n2026-03-29T01:59:00+01:00,2\n2026-03-29T03:00:00+02:00,3\n2026-03-29T03:01:00+02:00,4\n"
	rec, err := Read(strings.NewReader(zoned), &Settings{File: "z.csv"})
	if err != nil || !rec.Zoned || !slices.Equal(rec.Offsets, []int{3600, 3600, 7200, 7200}) {
		t.Fatalf("with offsets: %v, zoned %v, offsets %v", err, rec != nil && rec.Zoned, rec)
	}
	if rec, err := Read(strings.NewReader(spring), &Settings{File: "s.csv", Gaps: Remedy{Kind: "longest"}}); err != nil || rec.Zoned || !slices.Equal(rec.Offsets, []int{0, 0, 0, 0}) {
		t.Errorf("without offsets: zoned %v, offsets %v (%v)", rec.Zoned, rec.Offsets, err)
	}

	for label, in := range map[string]string{
		"UTC":    "time,y\n2026-03-29T01:58:00Z,1\n2026-03-29T01:59:00Z,2\n2026-03-29T03:00:00Z,3\n2026-03-29T03:01:00Z,4\n",
		"hourly": "time,y\n2026-03-29T00:00:00,1\n2026-03-29T01:00:00,2\n2026-03-29T03:00:00,3\n2026-03-29T04:00:00,4\n2026-03-29T05:00:00,5\n",
	} {
		_, err := Read(strings.NewReader(in), &Settings{File: "u.csv"})
		if !errors.As(err, &ge) || ge.Breaks[0].ClockChange || strings.Contains(err.Error(), "daylight") {
			t.Errorf("%s: %v", label, err)
		}
	}

	autumn := "time,y\n2026-10-25T02:58:00,1\n2026-10-25T02:59:00,2\n2026-10-25T02:00:00,3\n2026-10-25T02:01:00,4\n"
	_, err = Read(strings.NewReader(autumn), &Settings{File: "a.csv", Names: map[string]string{"Time": "-time"}})
	var le *LineError
	if !errors.As(err, &le) || le.Line != 4 {
		t.Fatalf("autumn: %v", err)
	}
	testutil.CheckWords(t, "autumn", err.Error(), []string{"goes back", "daylight saving", "write the times with their offset", "-time none"}, nil)
	if _, err := Read(strings.NewReader(strings.ReplaceAll(autumn, ":00,", ":00Z,")), &Settings{File: "a.csv"}); err == nil || strings.Contains(err.Error(), "daylight") {
		t.Errorf("autumn in UTC: %v", err)
	}
}
