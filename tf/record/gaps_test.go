package record

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"
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
