package testutil_test

import (
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/backshift/backshift/internal/testutil"
)

// TestReadCSV reads a small file of our own: column order is kept,
// numbers parse, NA reads as NaN and a text column keeps its cells.
func TestReadCSV(t *testing.T) {
	path := testutil.WriteFile(t, "ok.csv", "series,t,value\nx,0,1.5\nx,1,NA\ny,0,-2e3\n")
	tb := testutil.ReadCSV(t, path, "series")
	if !slices.Equal(tb.Names, []string{"series", "t", "value"}) || tb.Path != path {
		t.Errorf("names %v, path %q", tb.Names, tb.Path)
	}
	if got := tb.Text["series"]; !slices.Equal(got, []string{"x", "x", "y"}) {
		t.Errorf("series %q", got)
	}
	if _, ok := tb.Num["series"]; ok {
		t.Error("text column also read as numbers")
	}
	if got := tb.Column(t, "t"); !slices.Equal(got, []float64{0, 1, 0}) {
		t.Errorf("t %v", got)
	}
	v := tb.Column(t, "value")
	if len(v) != 3 || v[0] != 1.5 || !math.IsNaN(v[1]) || v[2] != -2000 {
		t.Errorf("value %v, want [1.5 NaN -2000]", v)
	}
	// A header alone is a table of empty columns.
	if tb := testutil.ReadCSV(t, testutil.WriteFile(t, "head.csv", "a,b\n")); len(tb.Column(t, "a")) != 0 || len(tb.Column(t, "b")) != 0 {
		t.Errorf("header only: %v", tb.Num)
	}
}

// TestLoadRecord keeps the columns asked for, as numbers, and names the
// columns the file has when one asked for is missing.
func TestLoadRecord(t *testing.T) {
	path := testutil.WriteFile(t, "rec.csv", "t,y,x\n1,2.5,3\n2,4,NA\n")
	rec, err := testutil.LoadRecord(path, "y", "x")
	if err != nil || len(rec) != 2 || !slices.Equal(rec["y"], []float64{2.5, 4}) || rec["x"][0] != 3 || !math.IsNaN(rec["x"][1]) {
		t.Errorf("record %v, error %v", rec, err)
	}
	if rec, err := testutil.LoadRecord(path, "y", "u"); rec != nil || err == nil || !strings.Contains(err.Error(), `no numeric column "u" (columns t, y, x)`) {
		t.Errorf("missing column: record %v, error %v", rec, err)
	}
}

// TestLoadCSVBadInput: each malformed file gives an error that starts with
// the file and the line at fault and says what is wrong.
func TestLoadCSVBadInput(t *testing.T) {
	for _, c := range []struct {
		name, body string
		text       []string
		want       string
	}{
		{"short.csv", "a,b\n1,2\n3\n", nil, "short.csv:3: 1 fields, the header has 2 (a, b)"},
		{"long.csv", "a,b\n1,2\n3,4\n5,6,7\n", nil, "long.csv:4: 3 fields, the header has 2 (a, b)"},
		{"word.csv", "a,b\n1,2\n3,four\n", nil, `word.csv:3: column "b": "four" is not a number`},
		{"empty.csv", "", nil, "empty.csv:1: no header line"},
		{"twice.csv", "a,b,a\n1,2,3\n", nil, `twice.csv:1: column name "a" appears twice`},
		{"blank.csv", "a,,c\n1,2,3\n", nil, "blank.csv:1: column 2 has no name"},
		{"text.csv", "a,b\n1,2\n", []string{"c"}, `text.csv:1: no column "c" to read as text (columns a, b)`},
		{"quote.csv", "a,b\n1,2\n3,\"4\n", nil, "quote.csv:3: extraneous or missing \" in quoted-field"},
	} {
		path := testutil.WriteFile(t, c.name, c.body)
		tb, err := testutil.LoadCSV(path, c.text...)
		if err == nil || tb != nil || !strings.HasPrefix(err.Error(), filepath.Dir(path)) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: table %v, error %v, want one ending %q", c.name, tb, err, c.want)
		}
	}
	if _, err := testutil.LoadCSV(filepath.Join(t.TempDir(), "none.csv")); err == nil || !os.IsNotExist(err) {
		t.Errorf("missing file: %v", err)
	}
}
