package identify

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/fixture"
)

// TestGapFree checks the longest stretch without a NaN in any named
// series on small cases worked by hand (counting, no outside source).
func TestGapFree(t *testing.T) {
	nan := math.NaN()
	for _, c := range []struct {
		y, x     []float64
		from, to int
	}{
		{[]float64{1, 2, 3}, []float64{1, 2, 3}, 0, 3},
		{[]float64{1, nan, 3, 4}, []float64{1, 2, 3, 4}, 2, 4},
		{[]float64{1, 2, 3, nan}, []float64{1, 2, 3, 4}, 0, 3},
		{[]float64{1, 2, nan, 4, 5}, []float64{1, 2, 3, 4, 5}, 3, 5}, // a tie goes to the later stretch
		{[]float64{1, 2, 3, 4, 5, 6}, []float64{1, nan, 3, 4, 5, 6}, 2, 6},
		{[]float64{nan, nan}, []float64{1, 2}, 0, 0},
		{nil, nil, 0, 0},
	} {
		from, to := GapFree(map[string][]float64{"y": c.y, "x": c.x}, "y", "x")
		if from != c.from || to != c.to {
			t.Errorf("GapFree(%v, %v) = %d, %d, want %d, %d", c.y, c.x, from, to, c.from, c.to)
		}
	}
}

// TestMissingRefused checks that Candidates refuses a record with a
// gap in the output or an input with the typed errors, the gap and the
// longest gap-free stretch in the message, and the remedy named.
func TestMissingRefused(t *testing.T) {
	y, x := fixture.SimulatePlant(fixture.NewRand(3), 300)
	y2 := append([]float64(nil), y...)
	for i := 200; i < 230; i++ {
		y2[i] = math.NaN()
	}
	y2[20] = math.NaN()
	_, err := Candidates(context.Background(), "y", []string{"x"}, map[string][]float64{"y": y2, "x": x}, nil)
	var se *errs.SampleError
	var sr *errs.SeriesError
	if !errors.As(err, &se) || se.Index != 20 || se.Series != "y" || !errors.As(err, &sr) || !errors.Is(err, errs.ErrSample) {
		t.Fatalf("output gaps: %v", err)
	}
	for _, want := range []string{"identify.Candidates", "31 missing (NaN) at 20, 200..229 (30 samples)", "samples 21..199", "fit.ExactML"} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("output gaps: message lacks %q:\n%v", want, err)
		}
	}
	x2 := append([]float64(nil), x...)
	x2[250] = math.NaN()
	_, err = Candidates(context.Background(), "y", []string{"x"}, map[string][]float64{"y": y, "x": x2}, nil)
	if !errors.As(err, &se) || se.Index != 250 || se.Series != "x" || !strings.Contains(err.Error(), "fit.Settings.InputGaps") || !strings.Contains(err.Error(), "samples 0..249") {
		t.Errorf("input gap: %v", err)
	}
}

// ExampleGapFree finds the stretch of a record to identify on when its
// output has a gap: the identification runs there, and the chosen
// structure is then fitted to the whole record by exact likelihood.
func ExampleGapFree() {
	nan := math.NaN()
	data := map[string][]float64{
		"temp":  {20.1, 20.3, nan, nan, 20.2, 20.4, 20.6, 20.5, 20.3},
		"valve": {40, 42, 45, 45, 44, 43, 41, 40, 40},
	}
	from, to := GapFree(data, "temp", "valve")
	fmt.Printf("identify on samples %d to %d\n", from, to-1)
	// Output:
	// identify on samples 4 to 8
}
