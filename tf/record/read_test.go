package record

import (
	"bytes"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/backshift/backshift/tf"
)

// A file that is not a CSV record of the expected shape is a *LineError
// at the line, of the kind that says what is wrong.
func TestReadLinesBadInput(t *testing.T) {
	for _, c := range []struct {
		in   string
		kind error
		want string
	}{
		{"", ErrShort, "f.csv: the file is empty (a header line of column names is needed)"},
		{"a,b\n", ErrShort, "f.csv: no data lines after the header"},
		{"a,b\n1,2\n3,x\n", ErrSample, `f.csv:3: column "b": "x" is not a finite number`},
		{"a,b\n1,2\n3\n", ErrFormat, "f.csv:3: 1 field, but the header names 2 columns (a, b)"},
		{"a,b\n1,2\n3,4,5\n", ErrFormat, "f.csv:3: 3 fields, but the header names 2 columns (a, b)"},
		{"a,a\n1,2\n", ErrName, `f.csv:1: column "a": column names must be unique`},
		{"a,b,\n1,2,3\n", ErrName, `f.csv:1: column 3 of 3 in the header has no name (a separator too many?): every column needs a name`},
		{"a,b\n1,NaN\n", ErrSample, `f.csv:2: column "b": the cell says "NaN", a missing sample: every sample is needed (fill it in the file, or delete the row and let Settings.Gaps fill it by the time column; an output's gaps can be read as missing with Settings.Missing)`},
		{"a,b\n1,\n", ErrSample, `f.csv:2: column "b": the cell is empty: every sample is needed (fill it in the file, or delete the row and let Settings.Gaps fill it by the time column; an output's gaps can be read as missing with Settings.Missing)`},
		{"a;b\n1;2\n", ErrFormat, `f.csv:1: the header has a single column "a;b"; the fields look separated by ';': read the file with Settings.Sep = ';'`},
		{"a,b\n1\"2,3\n", ErrFormat, `f.csv:2: a stray double quote (byte 2 of line 2); quote a whole field as "..." and double any quote inside it`},
		{"a,b\n\"1,2\n3,4\n", ErrFormat, `f.csv:2: a quoted field opened on this line is not closed (the reader ran on to line 3)`},
		{"a,b\n1,2,5\n", ErrFormat, "f.csv:2: 3 fields, but the header names 2 columns (a, b)"},
		{"minute,y\n0,1\n2,2\n1,3\n", ErrSample, `f.csv:4: column "minute": the time goes back: "1" after "2" on line 3 (the rows must be in time order, each sampled once)`},
		{"minute,y\n0,1\n0,2\n", ErrSample, `f.csv:3: column "minute": the time repeats`},
		{"minute,y\n0,1\nx,2\n", ErrSample, `f.csv:3: column "minute": "x" is not a time: the time column wants a number of minutes like row 1's "0" (Settings.Time = none: no time column)`},
		{"Date,y\n01/02/2026,1\n", ErrSample, `f.csv:2: column "Date": the first column looks like a time column by its name, but "01/02/2026" is neither a number nor a timestamp (2026-01-01T10:00:00Z) or a date (2026-01-01): convert it, or give Settings.Time = none to read no time column`},
	} {
		_, err := Read(strings.NewReader(c.in), &Settings{File: "f.csv"})
		var le *LineError
		if !errors.As(err, &le) || !strings.HasPrefix(err.Error(), c.want) || !errors.Is(err, c.kind) {
			t.Errorf("%q: got %v, want %s (kind %v)", c.in, err, c.want, c.kind)
		}
	}
	// Comments, spaces after separators, and only the named columns read.
	rec, err := Read(strings.NewReader("# comment\nt, y, note\n1, 2.5, ok\n2, 3, fine\n"), &Settings{File: "f.csv", Series: []string{"y", "t"}, Time: "none"})
	if err != nil {
		t.Fatal(err)
	}
	if rec.Series["y"][0] != 2.5 || len(rec.Series["t"]) != 2 || rec.Lines[0] != 3 || rec.Lines[1] != 4 || len(rec.Series) != 2 || rec.TimeColumn != "" {
		t.Errorf("%+v", rec)
	}
}

// A named series missing from the file, and settings that break their
// rule, are the shared shapes naming the series or the setting, in the
// caller's words when Settings.Names gives them.
func TestReadSeriesAndSettingsBadInput(t *testing.T) {
	in := "minute,valve,temp\n0,50,15\n1,51,15.1\n2,52,15.3\n"
	for _, c := range []struct {
		s    Settings
		kind error
		want string
	}{
		{Settings{Series: []string{"temp", "vlave"}}, ErrName,
			`record.Read: series "vlave": record has no such column; its columns: minute, valve, temp`},
		{Settings{TimeUnit: "week"}, ErrSetting, `record.Read: Settings.TimeUnit = week: want s, min, h or d`},
		{Settings{Interval: tf.Interval{Value: 1, Unit: "month"}}, ErrSetting, `record.Read: Settings.Interval = 1 month: want a positive length in s, min, h, d, wk, or the calendar units mo, qtr, yr`},
		{Settings{Interval: tf.Interval{Value: 1, Unit: "mo"}}, ErrSetting,
			`record.Read: Settings.Interval = 1 mo: a calendar interval has no fixed length, so the time column "minute" of record cannot be checked against it: read the record without its time column (Settings.Time = none)`},
		{Settings{Interval: tf.Interval{Value: -1, Unit: "min"}}, ErrSetting, `record.Read: Settings.Interval = -1 min: want a positive length`},
		{Settings{Gaps: Remedy{Kind: "hold"}}, ErrSetting, `record.Read: Settings.Gaps = hold:0: the longest gap filled must be at least 1 missing sample`},
		{Settings{Gaps: Remedy{Kind: "nearest", Max: 2}}, ErrSetting, `record.Read: Settings.Gaps = nearest: want hold:N or linear:N`},
		{Settings{Time: "stamp"}, ErrSetting, `record.Read: Settings.Time = "stamp": record has no such column (columns: minute, valve, temp; Settings.Time = none: no time column)`},
		{Settings{Time: "valve", Series: []string{"temp", "valve"}}, ErrSetting, `record.Read: Settings.Time = "valve": the column is also a series to read`},
		{Settings{Time: "none", TimeUnit: "min"}, ErrSetting, `record.Read: Settings.TimeUnit = min: the unit of a time column, and record has none (name it with Settings.Time)`},
		{Settings{Time: "none", Gaps: Remedy{Kind: "longest"}}, ErrSetting, `record.Read: Settings.Gaps = longest: needs a time column to find the gaps`},
		{Settings{Interval: tf.Interval{Value: 10, Unit: "s"}}, ErrSetting,
			`record.Read: Settings.Interval = 10 s: the time column "minute" of record steps by 1 min (the median of its 2 steps): correct the one that is wrong (Settings.TimeUnit sets the unit of a numeric time column)`},
		{Settings{Interval: tf.Interval{Value: 10, Unit: "s"}, Names: map[string]string{"Interval": "-interval", "TimeUnit": "-time-unit"}}, ErrSetting,
			`record.Read: -interval = 10 s: the time column "minute" of record steps by 1 min (the median of its 2 steps): correct the one that is wrong (-time-unit sets`},
	} {
		_, err := Read(strings.NewReader(in), &c.s)
		if err == nil || !strings.HasPrefix(err.Error(), c.want) || !errors.Is(err, c.kind) {
			t.Errorf("%+v: got %v, want %s", c.s, err, c.want)
		}
	}
	if _, err := ParseRemedy("hold:0"); err == nil || err.Error() != "record.ParseRemedy: Gaps = \"hold:0\": "+remedyRule || !errors.Is(err, ErrSetting) {
		t.Errorf("ParseRemedy(hold:0): %v", err)
	}
	for _, s := range []string{"", "none", "hold:3", "linear:12", "longest"} {
		r, err := ParseRemedy(s)
		if err != nil || (s != "none" && r.String() != s) {
			t.Errorf("ParseRemedy(%q) = %+v, %v", s, r, err)
		}
	}
}

// ReadFile names the file by its path; a missing file is the os error.
func TestReadFile(t *testing.T) {
	if _, err := ReadFile("testdata/no-such-file.csv", nil); err == nil || !strings.Contains(err.Error(), "no-such-file.csv") {
		t.Errorf("missing file: %v", err)
	}
	s := &Settings{Series: []string{"y"}}
	_, err := ReadFile(t.TempDir()+"/x.csv", s)
	if err == nil || s.File != "" {
		t.Errorf("the settings were modified or no error: %+v %v", s, err)
	}
}

// A monthly record has no time column the reader can check (a month has
// no fixed length); without one, a calendar interval is carried as given.
func TestCalendarIntervalWithoutTimeColumn(t *testing.T) {
	rec, err := Read(strings.NewReader("sales,spend\n1,2\n3,4\n5,6\n"), &Settings{Time: "none", Interval: tf.Interval{Value: 1, Unit: "mo"}})
	if err != nil {
		t.Fatal(err)
	}
	if rec.Interval != (tf.Interval{Value: 1, Unit: "mo"}) || len(rec.Series["sales"]) != 3 {
		t.Errorf("interval %v, %d samples", rec.Interval, len(rec.Series["sales"]))
	}
}

// FuzzRead feeds arbitrary bytes to Read (the CSV reader, the time
// column's checks and the gap remedies): each must give an error of a
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
		"minute,valve,temp\n0,50,\n1,51,NA\n3,52,15.3\n4,,n/a\n",
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
		// With the missing cells of a column "temp" read as NaN: the
		// file may lack it (a *SeriesError of kind ErrName).
		rec, err := Read(bytes.NewReader(raw), &Settings{File: "f.csv", Missing: []string{"temp"}, Gaps: Remedy{Kind: "linear", Max: 5}})
		var sr *SeriesError
		switch {
		case errors.As(err, &sr):
			if !errors.Is(err, ErrName) || sr.Series != "temp" {
				t.Fatalf("Missing: %v", err)
			}
		case err != nil:
			checkError(t, Remedy{Kind: "linear", Max: 5}, err)
		default:
			checkRecord(t, Remedy{Kind: "linear", Max: 5}, rec)
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

// TestMissingCells checks Settings.Missing: empty, NaN, NA and N/A
// cells of a named column read as NaN with a note of their lines, the
// other columns' empty cells still refused with their line, a name that
// is not a column read refused, and the remedies of the time column
// widening a gap rather than inventing readings (counting by hand, no
// outside source).
func TestMissingCells(t *testing.T) {
	src := "minute,valve,temp\n0,40,20.1\n1,41,\n2,42,NaN\n3,43,na\n4,44,20.5\n6,45,N/A\n7,46,20.7\n"
	rem, _ := ParseRemedy("linear:2")
	rec, err := Read(strings.NewReader(src), &Settings{File: "f.csv", Series: []string{"temp", "valve"}, Missing: []string{"temp"}, Gaps: rem})
	if err != nil {
		t.Fatal(err)
	}
	y := rec.Series["temp"]
	want := []float64{20.1, math.NaN(), math.NaN(), math.NaN(), 20.5, math.NaN(), math.NaN(), 20.7}
	if len(y) != len(want) {
		t.Fatalf("temp %v, want %v", y, want)
	}
	for i := range y {
		if math.IsNaN(y[i]) != math.IsNaN(want[i]) || !math.IsNaN(y[i]) && y[i] != want[i] {
			t.Fatalf("temp %v, want %v", y, want)
		}
	}
	if v := rec.Series["valve"]; v[5] != 44.5 {
		t.Errorf("valve filled at the missing row: %v, want 44.5", v[5])
	}
	note := strings.Join(rec.Notes, "\n")
	if !strings.Contains(note, `column "temp": 4 missing cells read as NaN (2 runs): lines 3 to 5, line 7`) {
		t.Errorf("notes lack the missing cells:\n%s", note)
	}
	_, err = Read(strings.NewReader(src), &Settings{File: "f.csv", Series: []string{"temp", "valve"}, Missing: []string{"temp"}})
	var ge *GapError
	if !errors.As(err, &ge) {
		t.Errorf("a missing row is still a gap of the time column: %v", err)
	}
	bad := "minute,valve,temp\n0,40,20.1\n1,,20.2\n"
	var le *LineError
	if _, err := Read(strings.NewReader(bad), &Settings{File: "f.csv", Series: []string{"temp", "valve"}, Missing: []string{"temp"}}); !errors.As(err, &le) || le.Line != 3 || le.Column != "valve" || !errors.Is(err, ErrSample) {
		t.Errorf("empty input cell: %v", err)
	}
	var sr *SeriesError
	if _, err := Read(strings.NewReader(bad), &Settings{Series: []string{"temp"}, Missing: []string{"tmp"}}); !errors.As(err, &sr) || sr.Series != "tmp" || !errors.Is(err, ErrName) {
		t.Errorf("unknown column in Missing: %v", err)
	}
	var st *SettingError
	if _, err := Read(strings.NewReader(bad), &Settings{Series: []string{"temp"}, Missing: []string{"valve"}}); !errors.As(err, &st) || st.Setting != "Settings.Missing" {
		t.Errorf("a column not read in Missing: %v", err)
	}
}
