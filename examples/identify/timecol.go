package main

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
	"time"
)

// The time column of a CSV file says when each row was sampled. The
// program reads it to find the sample interval and to check that the
// rows are equally spaced with none missing: the library's models are in
// samples, and a record with rows deleted from the middle fits without
// complaint to wrong estimates.
//
// A time column holds either numbers (seconds, or the unit of -time-unit
// or of the column's name: "minute", "time (h)", ...) or calendar times:
// RFC 3339 timestamps (2026-01-01T10:00:00Z, also with a space for the
// T, with fractional seconds or without a zone, read as UTC) or dates
// alone (2026-01-01, for daily records).

// stepTolerance is how far a step between two rows may be from the
// sample interval (or from a whole number of intervals, for a gap) as a
// fraction of the interval and still count as that: 1 %, so that
// timestamps rounded to the logger's resolution (a second on a minute's
// interval) pass, while a step of 1.5 intervals does not. Our choice.
const stepTolerance = 0.01

// unitSeconds is the length of each interval unit in seconds.
var unitSeconds = map[string]float64{"s": 1, "min": 60, "h": 3600, "d": 86400}

// unitWords maps the words a time column's name may hold to a unit.
var unitWords = map[string]string{
	"s": "s", "sec": "s", "secs": "s", "second": "s", "seconds": "s",
	"min": "min", "mins": "min", "minute": "min", "minutes": "min",
	"h": "h", "hr": "h", "hrs": "h", "hour": "h", "hours": "h",
	"d": "d", "day": "d", "days": "d",
}

// nameUnit returns the unit a column name announces: a unit word alone
// ("minute", "seconds"), or "time" with one in brackets, parentheses or
// after an underscore or space ("time (s)", "time_min"); "time" alone
// means seconds. ok is false for any other name.
func nameUnit(name string) (unit string, ok bool) {
	n := strings.ToLower(strings.TrimSpace(name))
	if u, ok := unitWords[n]; ok {
		return u, true
	}
	if n == "time" {
		return "s", true
	}
	rest, found := strings.CutPrefix(n, "time")
	if !found {
		return "", false
	}
	rest = strings.Trim(rest, " _-()[]")
	u, ok := unitWords[rest]
	return u, ok
}

// dateNames are column names that announce calendar times.
var dateNames = map[string]bool{"date": true, "datetime": true, "timestamp": true, "time stamp": true, "date time": true}

// calendarLayouts are the calendar forms a time cell may take.
var calendarLayouts = []string{
	time.RFC3339Nano,
	"2006-01-02 15:04:05.999999999Z07:00",
	"2006-01-02T15:04:05.999999999",
	"2006-01-02 15:04:05.999999999",
	"2006-01-02T15:04",
	"2006-01-02 15:04",
	"2006-01-02",
}

// calendar reads a calendar time as seconds since 1970 (UTC when no
// zone is given).
func calendar(cell string) (float64, bool) {
	for _, l := range calendarLayouts {
		if t, err := time.Parse(l, cell); err == nil {
			return float64(t.Unix()) + float64(t.Nanosecond())/1e9, true
		}
	}
	return 0, false
}

// timing is a time column read: the time of every row in seconds.
type timing struct {
	column string
	secs   []float64
	// calendar is true for timestamps or dates, false for numbers;
	// dates is true when the first cell is a date alone.
	calendar, dates bool
	// unit is the unit of numeric times.
	unit string
	// median is the median step between rows, in seconds.
	median float64
	steps  int
}

// findTime returns the time column of t: the column named by flag (""
// for automatic, "none" for no time column), or by default the first
// column when its first cell is a calendar time or its name is a time
// name (nameUnit) over numbers, unless a run uses it as a series. unit
// is -time-unit ("" for automatic). It returns nil when there is no time
// column.
func findTime(t *Table, flag, unit string, used map[string]bool) (*timing, error) {
	col := flag
	switch flag {
	case "none":
		return nil, nil
	case "":
		first := t.Names[0]
		if used[first] {
			return nil, nil
		}
		cell := t.Cells[first][0]
		_, isCal := calendar(cell)
		_, nameOK := nameUnit(first)
		_, numErr := strconv.ParseFloat(cell, 64)
		switch {
		case isCal || ((nameOK || dateNames[strings.ToLower(first)]) && numErr == nil):
			// Calendar times, or numbers under a time's name (a
			// "timestamp" of seconds since 1970).
		case nameOK || dateNames[strings.ToLower(first)]:
			// Named as a time, but in a form not read: refuse rather
			// than silently take the rows as evenly spaced.
			return nil, &CSVError{File: t.File, Line: t.Lines[0], Column: first,
				Msg: fmt.Sprintf("the first column looks like a time column by its name, but %s is neither a number nor a timestamp (2026-01-01T10:00:00Z) or a date (2026-01-01): convert it, or give -time none to read no time column", clip(cell))}
		default:
			return nil, nil
		}
		col = first
	default:
		if !t.Has(col) {
			return nil, fmt.Errorf("-time names column %s, but %s has no such column (columns: %s; -time none: no time column)", clip(col), t.File, names(t.Names))
		}
		if used[col] {
			return nil, fmt.Errorf("-time names column %s, which is also a series of the model: the time column says when each row was sampled", clip(col))
		}
	}
	tm := &timing{column: col, secs: make([]float64, t.Rows())}
	cells := t.Cells[col]
	_, tm.calendar = calendar(cells[0])
	_, err := time.Parse("2006-01-02", cells[0])
	tm.dates = err == nil
	if !tm.calendar {
		tm.unit = unit
		if tm.unit == "" {
			if u, ok := nameUnit(col); ok {
				tm.unit = u
			} else {
				tm.unit = "s"
			}
		}
	}
	for i, c := range cells {
		var v float64
		ok := false
		if tm.calendar {
			v, ok = calendar(c)
		} else {
			x, err := strconv.ParseFloat(c, 64)
			ok = err == nil && !math.IsNaN(x) && !math.IsInf(x, 0)
			v = x * unitSeconds[tm.unit]
			ok = ok && !math.IsInf(v, 0)
		}
		if !ok {
			want := "a number of " + unitName(tm.unit) + " like row 1's " + clip(cells[0])
			if tm.calendar {
				want = "a timestamp (2026-01-01T10:00:00Z) or a date (2026-01-01) like row 1's " + clip(cells[0])
			}
			return nil, &CSVError{File: t.File, Line: t.Lines[i], Column: col, Msg: fmt.Sprintf("%s is not a time: the time column wants %s (-time none: no time column)", clip(c), want)}
		}
		tm.secs[i] = v
	}
	var steps []float64
	for i := 1; i < len(tm.secs); i++ {
		d := tm.secs[i] - tm.secs[i-1]
		if !(d > 0) {
			what := "repeats"
			if d < 0 {
				what = "goes back"
			}
			return nil, &CSVError{File: t.File, Line: t.Lines[i], Column: col,
				Msg: fmt.Sprintf("the time %s: %s after %s on line %d (the rows must be in time order, each sampled once)", what, clip(cells[i]), clip(cells[i-1]), t.Lines[i-1])}
		}
		steps = append(steps, d)
	}
	tm.steps = len(steps)
	if len(steps) > 0 {
		slices.Sort(steps)
		tm.median = steps[len(steps)/2]
	}
	return tm, nil
}

func unitName(u string) string {
	switch u {
	case "s":
		return "seconds"
	case "min":
		return "minutes"
	case "h":
		return "hours"
	case "d":
		return "days"
	}
	return u
}

// niceInterval writes secs seconds in the largest unit it is a whole
// number of.
func niceInterval(secs float64) (float64, string) {
	for _, u := range []string{"d", "h", "min"} {
		k := secs / unitSeconds[u]
		if k >= 1 && math.Abs(k-math.Round(k)) < 1e-9*k {
			return math.Round(k), u
		}
	}
	return secs, "s"
}

// ivText writes an interval for a message.
func ivText(v float64, unit string) string { return strconv.FormatFloat(v, 'g', 6, 64) + " " + unit }

// maxGap bounds the intervals a step may span and still count as a gap
// to fill (a guard against absurd steps, far beyond any -gaps limit).
const maxGap = 1e9

// Break is a place in a record where the time between two rows is not
// one sample interval.
type Break struct {
	// Line and PrevLine are the 1-based lines of the file of the two
	// rows; Row is the 0-based data row of the later one.
	Line, PrevLine, Row int
	// Time and PrevTime are the cells of the time column.
	Time, PrevTime string
	// Intervals is the time between the rows in sample intervals.
	Intervals float64
	// Missing is the number of samples missing for a gap (a step of a
	// whole number of intervals); 0 for an irregular step.
	Missing int
}

// GapError reports a time column with gaps or irregular steps and no
// remedy chosen (or a remedy that does not cover them).
type GapError struct {
	File, Column string
	// Interval is the sample interval, as text.
	Interval string
	Breaks   []Break
	// Why says why the breaks are refused ("" when no remedy was
	// chosen).
	Why string
}

// shownBreaks is the number of breaks a GapError lists.
const shownBreaks = 5

// Error lists the first breaks by line and the remedies.
func (e *GapError) Error() string {
	var b strings.Builder
	gaps, irregular := 0, 0
	for _, br := range e.Breaks {
		if br.Missing > 0 {
			gaps++
		} else {
			irregular++
		}
	}
	fmt.Fprintf(&b, "%s: the time column %s is not evenly spaced at %s:", e.File, clip(e.Column), e.Interval)
	if gaps > 0 {
		fmt.Fprintf(&b, " %d %s", gaps, plural(gaps, "gap", "gaps"))
	}
	if irregular > 0 {
		if gaps > 0 {
			b.WriteString(" and")
		}
		fmt.Fprintf(&b, " %d irregular %s", irregular, plural(irregular, "step", "steps"))
	}
	b.WriteString("\n")
	for i, br := range e.Breaks {
		if i == shownBreaks {
			fmt.Fprintf(&b, "  ... and %d more\n", len(e.Breaks)-shownBreaks)
			break
		}
		fmt.Fprintf(&b, "  line %d (%s) comes %s intervals after line %d (%s)", br.Line, clip(br.Time), strconv.FormatFloat(br.Intervals, 'g', 4, 64), br.PrevLine, clip(br.PrevTime))
		if br.Missing > 0 {
			fmt.Fprintf(&b, ": %d %s missing\n", br.Missing, plural(br.Missing, "sample", "samples"))
		} else {
			b.WriteString(": not a whole number of intervals\n")
		}
	}
	if e.Why != "" {
		b.WriteString(e.Why)
	} else {
		b.WriteString("fitting across them would treat rows far apart in time as neighbours; choose a remedy: -gaps hold:N or -gaps linear:N fill gaps of up to N missing samples (holding the last value, or on a straight line), -gaps longest fits only the longest evenly spaced stretch (-time none if the column is not a time)")
	}
	if irregular > 0 {
		b.WriteString("; a record whose clock jitters by more than 1 % of the interval must be resampled to the interval first")
	}
	return b.String()
}

// breaks returns the places where tm's steps differ from iv seconds.
func (tm *timing) breaks(t *Table, iv float64) []Break {
	var out []Break
	cells := t.Cells[tm.column]
	for i := 1; i < len(tm.secs); i++ {
		r := (tm.secs[i] - tm.secs[i-1]) / iv
		if math.Abs(r-1) <= stepTolerance {
			continue
		}
		br := Break{Line: t.Lines[i], PrevLine: t.Lines[i-1], Row: i, Time: cells[i], PrevTime: cells[i-1], Intervals: r}
		// A gap is a whole number of intervals, at most maxGap: a step
		// of more is a break no remedy fills (only -gaps longest).
		if k := math.Round(r); k >= 2 && k <= maxGap && math.Abs(r-k) <= stepTolerance {
			br.Missing = int(k) - 1
		}
		out = append(out, br)
	}
	return out
}

// remedy is the -gaps choice.
type remedy struct {
	// kind is "" (refuse), "hold", "linear" or "longest".
	kind string
	// max is the longest gap filled, in missing samples.
	max int
}

// parseRemedy reads -gaps: "", "hold:N", "linear:N" or "longest".
func parseRemedy(s string) (remedy, error) {
	s = strings.TrimSpace(s)
	if s == "" || s == "none" {
		return remedy{}, nil
	}
	if s == "longest" {
		return remedy{kind: "longest"}, nil
	}
	k, n, ok := strings.Cut(s, ":")
	if ok && (k == "hold" || k == "linear") {
		if m, err := strconv.Atoi(strings.TrimSpace(n)); err == nil && m > 0 {
			return remedy{kind: k, max: m}, nil
		}
	}
	return remedy{}, fmt.Errorf("-gaps %s: want hold:N or linear:N (fill gaps of up to N missing samples, N at least 1) or longest (fit the longest evenly spaced stretch)", clip(s))
}

// apply mends data (the series read from t, by name) at the breaks as r
// says and returns the new series and a sentence of what was done, or a
// GapError when r does not cover the breaks. data is not modified.
func (r remedy) apply(t *Table, tm *timing, ivText string, brks []Break, data map[string][]float64) (map[string][]float64, string, error) {
	fail := func(why string, bs []Break) error {
		return &GapError{File: t.File, Column: tm.column, Interval: ivText, Breaks: bs, Why: why}
	}
	switch r.kind {
	case "":
		return nil, "", fail("", brks)
	case "longest":
		from, to := 0, len(tm.secs) // the stretch [from, to)
		best := -1
		start := 0
		for i := 0; i <= len(brks); i++ {
			end := len(tm.secs)
			if i < len(brks) {
				end = brks[i].Row
			}
			// Ties go to the later stretch: the plant as it is now.
			if end-start >= best {
				best, from, to = end-start, start, end
			}
			if i < len(brks) {
				start = brks[i].Row
			}
		}
		out := make(map[string][]float64, len(data))
		for k, v := range data {
			out[k] = slices.Clone(v[from:to])
		}
		note := fmt.Sprintf("%d %s in the time column: fitting only lines %d to %d (%d samples), the longest evenly spaced stretch; %d of %d rows left out",
			len(brks), plural(len(brks), "break", "breaks"), t.Lines[from], t.Lines[to-1], to-from, len(tm.secs)-(to-from), len(tm.secs))
		return out, note, nil
	}
	var bad []Break
	for _, b := range brks {
		if b.Missing == 0 || b.Missing > r.max {
			bad = append(bad, b)
		}
	}
	if len(bad) > 0 {
		return nil, "", fail(fmt.Sprintf("-gaps %s:%d fills gaps of whole intervals up to %d missing samples; these are irregular or longer (-gaps longest fits only the longest evenly spaced stretch)", r.kind, r.max, r.max), bad)
	}
	out := make(map[string][]float64, len(data))
	filled := 0
	for _, b := range brks {
		filled += b.Missing
	}
	for k, v := range data {
		s := make([]float64, 0, len(v)+filled)
		s = append(s, v[0])
		bi := 0
		for i := 1; i < len(v); i++ {
			if bi < len(brks) && brks[bi].Row == i {
				k := brks[bi].Missing + 1
				for j := 1; j < k; j++ {
					if r.kind == "hold" {
						s = append(s, v[i-1])
					} else {
						s = append(s, v[i-1]+(v[i]-v[i-1])*float64(j)/float64(k))
					}
				}
				bi++
			}
			s = append(s, v[i])
		}
		out[k] = s
	}
	how := "holding the last value before each"
	if r.kind == "linear" {
		how = "straight lines between the rows either side"
	}
	var where []string
	for i, b := range brks {
		if i == shownBreaks {
			where = append(where, fmt.Sprintf("... %d more", len(brks)-shownBreaks))
			break
		}
		where = append(where, fmt.Sprintf("%d before line %d", b.Missing, b.Line))
	}
	note := fmt.Sprintf("filled %d missing %s in %d %s (%s) by %s", filled, plural(filled, "sample", "samples"), len(brks), plural(len(brks), "gap", "gaps"), strings.Join(where, ", "), how)
	return out, note, nil
}
