package main

import (
	"bytes"
	"errors"
	"testing"
)

// FuzzReadCSV feeds arbitrary bytes to the CSV reader and the time
// column's checks: each must give a typed error with a message of
// bounded length or a well-formed table (unique non-empty names, one
// cell per column on every row, lines in order), and the gap remedies
// must give series of equal, expected lengths. Never a panic.
func FuzzReadCSV(f *testing.F) {
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
			tb, err := ReadCSV("f.csv", bytes.NewReader(raw), sep)
			if err != nil {
				var ce *CSVError
				if !errors.As(err, &ce) {
					t.Fatalf("untyped error %T %v", err, err)
				}
				if len(err.Error()) > 4096 {
					t.Fatalf("a message of %d bytes", len(err.Error()))
				}
				continue
			}
			checkTable(t, tb)
			checkTime(t, tb)
		}
	})
}

func checkTable(t *testing.T, tb *Table) {
	if len(tb.Names) == 0 || len(tb.Cells) != len(tb.Names) || tb.Rows() == 0 {
		t.Fatalf("table with %d names, %d columns, %d rows", len(tb.Names), len(tb.Cells), tb.Rows())
	}
	seen := map[string]bool{}
	for _, n := range tb.Names {
		if n == "" || seen[n] {
			t.Fatalf("column name %q empty or repeated", n)
		}
		seen[n] = true
		if len(tb.Cells[n]) != tb.Rows() {
			t.Fatalf("column %q has %d cells for %d rows", n, len(tb.Cells[n]), tb.Rows())
		}
	}
	for i := 1; i < tb.Rows(); i++ {
		if tb.Lines[i] <= tb.Lines[i-1] || tb.Lines[0] < 2 {
			t.Fatalf("lines out of order: %v", tb.Lines)
		}
	}
	if _, err := tb.Select(tb.Names...); err != nil {
		var ce *CSVError
		if !errors.As(err, &ce) || len(err.Error()) > 4096 {
			t.Fatalf("select: %T %v", err, err)
		}
	}
}

func checkTime(t *testing.T, tb *Table) {
	tm, err := findTime(tb, "", "", nil)
	if err != nil {
		var ce *CSVError
		if !errors.As(err, &ce) || len(err.Error()) > 4096 {
			t.Fatalf("time column: %T %v", err, err)
		}
		return
	}
	if tm == nil {
		return
	}
	if len(tm.secs) != tb.Rows() {
		t.Fatalf("%d times for %d rows", len(tm.secs), tb.Rows())
	}
	if !(tm.median > 0) {
		if tb.Rows() > 1 {
			t.Fatalf("median step %v with %d rows", tm.median, tb.Rows())
		}
		return
	}
	brks := tm.breaks(tb, tm.median)
	if len(brks) == 0 {
		return
	}
	n := tb.Rows()
	data := map[string][]float64{"a": make([]float64, n), "b": make([]float64, n)}
	for i := range n {
		data["a"][i] = float64(i)
	}
	for _, r := range []remedy{{}, {kind: "hold", max: 5}, {kind: "linear", max: 5}, {kind: "longest"}} {
		out, note, err := r.apply(tb, tm, "1 s", brks, data)
		if err != nil {
			var ge *GapError
			if !errors.As(err, &ge) || r.kind == "longest" || len(err.Error()) > 8192 {
				t.Fatalf("remedy %+v: %T %v", r, err, err)
			}
			continue
		}
		if note == "" || len(out["a"]) != len(out["b"]) || len(out["a"]) == 0 {
			t.Fatalf("remedy %+v: %d and %d samples, note %q", r, len(out["a"]), len(out["b"]), note)
		}
		want := n
		if r.kind != "longest" {
			for _, b := range brks {
				want += b.Missing
			}
		} else if len(out["a"]) > n {
			t.Fatalf("longest: %d samples of %d", len(out["a"]), n)
		} else {
			want = len(out["a"])
		}
		if len(out["a"]) != want {
			t.Fatalf("remedy %+v: %d samples, want %d", r, len(out["a"]), want)
		}
	}
}
