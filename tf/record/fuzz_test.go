package record

import (
	"bytes"
	"errors"
	"testing"
)

// FuzzRead feeds arbitrary bytes to Read (the CSV reader, the time
// column's checks and the gap remedies; it moved here from the identify
// example's FuzzReadCSV with its seeds): each must give an error of a
// shared kind with a message of bounded length or a well-formed record
// (unique non-empty column names, one sample per row in every series,
// lines in order), and a remedy must give series of equal, expected
// lengths. Never a panic.
func FuzzRead(f *testing.F) {
	for _, s := range []string{
		"minute,valve,temp\n0,50,15\n1,51,15.1\n3,52,15.3\n",
		"when,note,valve,temp\n2026-01-01T10:00:00Z,ok,50,15\n2026-01-01T10:00:10Z,ok,51,15\n",
		"date,y,x\n1972-01-01,1,2\n1972-01-03,2,3\n",
		"time (s);y;x\n0;1,5;2\n60;2;3\n",
		"\ufefftemp,valve\r1,2\r3,4\r",
		"temp,valve,outdoor\n1\"2,3,4\n",
		"temp,valve\n\"1,2\n3,4\n",
		"# c\na,a\n1,2\n",
		"t,y\n1e308,1\n-1e308,2\n",
		"minute,y\n0,1\n1e-300,2\n2e-300,3\n1,4\n",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, raw []byte) {
		for _, sep := range []rune{',', ';'} {
			for _, r := range []Remedy{{}, {Kind: "hold", Max: 5}, {Kind: "linear", Max: 5}, {Kind: "longest"}} {
				rec, err := Read(bytes.NewReader(raw), &Settings{File: "f.csv", Sep: sep, Gaps: r})
				if err != nil {
					checkError(t, r, err)
					continue
				}
				checkRecord(t, r, rec)
			}
		}
	})
}

// checkError asserts a typed error of a shared kind and a bounded
// message; "longest" never refuses breaks.
func checkError(t *testing.T, r Remedy, err error) {
	var le *LineError
	var ge *GapError
	var se *SettingError
	switch {
	case errors.As(err, &se):
		// A remedy for a record without a time column.
		if r.Kind == "" || se.Setting != "Settings.Gaps" {
			t.Fatalf("remedy %+v: %v", r, err)
		}
	case errors.As(err, &le):
		if !errors.Is(err, ErrFormat) && !errors.Is(err, ErrSample) && !errors.Is(err, ErrName) && !errors.Is(err, ErrShort) {
			t.Fatalf("line error of no kind: %v", err)
		}
	case errors.As(err, &ge):
		if r.Kind == "longest" || !errors.Is(err, ErrSample) || len(ge.Breaks) == 0 {
			t.Fatalf("remedy %+v: %v", r, err)
		}
	default:
		t.Fatalf("untyped error %T %v", err, err)
	}
	if len(err.Error()) > 8192 {
		t.Fatalf("a message of %d bytes", len(err.Error()))
	}
}

func checkRecord(t *testing.T, r Remedy, rec *Record) {
	if len(rec.Columns) == 0 || rec.Rows() == 0 {
		t.Fatalf("record with %d columns, %d rows", len(rec.Columns), rec.Rows())
	}
	seen := map[string]bool{}
	for _, n := range rec.Columns {
		if n == "" || seen[n] {
			t.Fatalf("column name %q empty or repeated", n)
		}
		seen[n] = true
	}
	for i := 1; i < rec.Rows(); i++ {
		if rec.Lines[i] <= rec.Lines[i-1] || rec.Lines[0] < 2 {
			t.Fatalf("lines out of order: %v", rec.Lines)
		}
	}
	want := rec.Rows()
	switch {
	case r.Kind == "longest" && len(rec.Breaks) > 0:
		want = -1 // some stretch, checked below
	case r.Kind != "":
		for _, b := range rec.Breaks {
			want += b.Missing
		}
	}
	n := -1
	for name, s := range rec.Series {
		if n >= 0 && len(s) != n {
			t.Fatalf("series %q has %d samples, another %d", name, len(s), n)
		}
		n = len(s)
		if want >= 0 && n != want {
			t.Fatalf("remedy %+v: %q has %d samples, want %d (breaks %+v)", r, name, n, want, rec.Breaks)
		}
		if want < 0 && (n == 0 || n > rec.Rows()) {
			t.Fatalf("longest: %d samples of %d rows", n, rec.Rows())
		}
	}
	if rec.TimeColumn != "" && len(rec.Times) != rec.Rows() {
		t.Fatalf("%d times for %d rows", len(rec.Times), rec.Rows())
	}
	if rec.TimeColumn != "" && rec.Rows() > 1 && !(rec.Median > 0 && rec.Interval.Value > 0) {
		t.Fatalf("median step %v, interval %v with %d rows", rec.Median, rec.Interval, rec.Rows())
	}
}
