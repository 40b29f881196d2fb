package record

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/backshift/backshift/tf"
)

// A file that is not a CSV record of the expected shape is a *LineError
// at the line, of the kind that says what is wrong (moved from the
// identify example's TestReadCSVErrors, with the kinds added).
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
		{"a,b\n1,NaN\n", ErrSample, `f.csv:2: column "b": "NaN" is not a finite number`},
		{"a,b\n1,\n", ErrSample, `f.csv:2: column "b": the cell is empty: every sample is needed (fill it in the file, or delete the row and let Settings.Gaps fill it by the time column)`},
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
			`record.Read: series "vlave" is not known (record has no such column; its columns: minute, valve, temp)`},
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

// The interval is the median step in the largest unit it is a whole
// number of, for each form of time column; steps within 1 % of it count
// as one interval (the documented threshold).
func TestTimeForms(t *testing.T) {
	for _, c := range []struct {
		in       string
		column   string
		interval tf.Interval
		form     string
	}{
		{"time,y\n0,1\n30,2\n60,3\n", "time", tf.Interval{Value: 30, Unit: "s"}, "numbers in seconds"},
		{"time (h),y\n0,1\n2,2\n4,3\n", "time (h)", tf.Interval{Value: 2, Unit: "h"}, "numbers in hours"},
		{"time_s,y\n0,1\n3600,2\n7200,3\n", "time_s", tf.Interval{Value: 1, Unit: "h"}, "numbers in seconds"},
		{"when,y\n2026-01-01T10:00:00Z,1\n2026-01-01 10:05:00,2\n2026-01-01T10:10:00+00:00,3\n", "when", tf.Interval{Value: 5, Unit: "min"}, "timestamps"},
		// A logger's rounding: 60.4 s is within 1 % of a minute.
		{"when,y\n2026-01-01T10:00:00Z,1\n2026-01-01T10:01:00.4Z,2\n2026-01-01T10:02:00Z,3\n2026-01-01T10:03:00Z,4\n2026-01-01T10:04:00Z,5\n", "when", tf.Interval{Value: 1, Unit: "min"}, "timestamps"},
		{"date,y\n1972-01-01,1\n1972-01-02,2\n1972-01-03,3\n", "date", tf.Interval{Value: 1, Unit: "d"}, "dates"},
	} {
		rec, err := Read(strings.NewReader(c.in), nil)
		if err != nil {
			t.Errorf("%q: %v", c.in, err)
			continue
		}
		if rec.TimeColumn != c.column || rec.Interval != c.interval || !strings.Contains(rec.Notes[0], "("+c.form+")") || len(rec.Breaks) != 0 || len(rec.Series["y"]) != rec.Rows() {
			t.Errorf("%q: column %q interval %v notes %q breaks %v", c.in, rec.TimeColumn, rec.Interval, rec.Notes, rec.Breaks)
		}
	}
	// A first column of numbers that is not named as a time is a series.
	rec, err := Read(strings.NewReader("u,y\n0,1\n30,2\n"), nil)
	if err != nil || rec.TimeColumn != "" || len(rec.Series) != 2 || rec.Notes[0] != "no time column: the rows are taken as equally spaced samples, none missing" {
		t.Errorf("no time column: %+v %v", rec, err)
	}
}

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
