package record

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/backshift/backshift/tf"
)

// stepTolerance is how far a step between two rows may be from the
// sample interval (or from a whole number of intervals, for a gap) as a
// fraction of the interval and still count as that: 1 %, so that
// timestamps rounded to the logger's resolution (a second on a minute's
// interval) pass, while a step of 1.5 intervals does not. Our choice.
const stepTolerance = 0.01

// unitSeconds is the length of each interval unit in seconds.
var unitSeconds = map[string]float64{"s": 1, "min": 60, "h": 3600, "d": 86400, "wk": 604800}

// Seconds returns the length of an interval unit of fixed length (s,
// min, h, d or wk) in seconds; ok is false for any other unit, the
// calendar units mo, qtr and yr among them.
func Seconds(unit string) (secs float64, ok bool) {
	secs, ok = unitSeconds[unit]
	return secs, ok
}

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
	secs, _, _, ok := calendarZone(cell)
	return secs, ok
}

// calendarZone reads a calendar time as seconds since 1970, with the
// offset from UTC it was written with in seconds (0 for "Z") and
// whether it was written with one at all (a time without a zone is read
// as UTC: it is a wall-clock reading of an unknown zone).
func calendarZone(cell string) (secs float64, offset int, zoned, ok bool) {
	for _, l := range calendarLayouts {
		if t, err := time.Parse(l, cell); err == nil {
			_, offset = t.Zone()
			return float64(t.Unix()) + float64(t.Nanosecond())/1e9, offset, strings.Contains(l, "Z07"), true
		}
	}
	return 0, 0, false, false
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
	// offsets are the offsets from UTC each calendar row was written
	// with (seconds east; 0 for "Z" or none), zoned whether it was
	// written with one.
	offsets []int
	zoned   []bool
	// median is the median step between rows, in seconds.
	median float64
	steps  int
}

// findTime returns the time column of t as s.Time says, skipping the
// columns used as series when it looks for one. It returns nil when
// there is no time column.
func findTime(t *table, s *Settings, used map[string]bool) (*timing, error) {
	col, err := timeColumn(t, s, used)
	if col == "" || err != nil {
		return nil, err
	}
	tm := &timing{column: col, secs: make([]float64, t.rows())}
	cells := t.cells[col]
	_, tm.calendar = calendar(cells[0])
	_, err = time.Parse("2006-01-02", cells[0])
	tm.dates = err == nil
	if !tm.calendar {
		tm.unit = s.TimeUnit
		if tm.unit == "" {
			if u, ok := nameUnit(col); ok {
				tm.unit = u
			} else {
				tm.unit = "s"
			}
		}
	}
	if err := tm.read(t, s, cells); err != nil {
		return nil, err
	}
	if err := tm.spacing(t, s, cells); err != nil {
		return nil, err
	}
	return tm, nil
}

// timeColumn returns the name of the time column: s.Time, or the first
// column when it holds calendar times or numbers under a time's name;
// "" for none. It refuses a column named as a time in a form not read,
// an unknown column and a column that is also a series.
func timeColumn(t *table, s *Settings, used map[string]bool) (string, error) {
	col := s.Time
	switch col {
	case "none":
		return "", nil
	case "":
		first := t.names[0]
		if used[first] {
			return "", nil
		}
		cell := t.cells[first][0]
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
			return "", &LineError{File: t.file, Line: t.lines[0], Column: first, Kind: ErrSample,
				Problem: fmt.Sprintf("the first column looks like a time column by its name, but %s is neither a number nor a timestamp (2026-01-01T10:00:00Z) or a date (2026-01-01): convert it, or give %s to read no time column", clip(cell), s.set("Time", "none"))}
		default:
			return "", nil
		}
		col = first
	default:
		if !t.has(col) {
			return "", &SettingError{Op: op, Setting: s.label("Time"), Value: strconv.Quote(col),
				Rule: fmt.Sprintf("%s has no such column (columns: %s; %s: no time column)", t.file, names(t.names), s.set("Time", "none"))}
		}
		if used[col] {
			return "", &SettingError{Op: op, Setting: s.label("Time"), Value: strconv.Quote(col),
				Rule: "the column is also a series to read: the time column says when each row was sampled"}
		}
	}
	return col, nil
}

// read converts the cells of the time column to seconds, refusing a cell
// that is not a time of the column's kind.
func (tm *timing) read(t *table, s *Settings, cells []string) error {
	col := tm.column
	for i, c := range cells {
		var v float64
		ok := false
		if tm.calendar {
			if tm.offsets == nil {
				tm.offsets, tm.zoned = make([]int, len(cells)), make([]bool, len(cells))
			}
			v, tm.offsets[i], tm.zoned[i], ok = calendarZone(c)
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
			return &LineError{File: t.file, Line: t.lines[i], Column: col, Kind: ErrSample,
				Problem: fmt.Sprintf("%s is not a time: the time column wants %s (%s: no time column)", clip(c), want, s.set("Time", "none"))}
		}
		tm.secs[i] = v
	}
	return nil
}

// spacing refuses times that repeat or go back, and sets the number of
// steps and their median.
func (tm *timing) spacing(t *table, s *Settings, cells []string) error {
	col := tm.column
	var steps []float64
	for i := 1; i < len(tm.secs); i++ {
		d := tm.secs[i] - tm.secs[i-1]
		if !(d > 0) {
			what := "repeats"
			if d < 0 {
				what = "goes back"
			}
			problem := fmt.Sprintf("the time %s: %s after %s on line %d (the rows must be in time order, each sampled once)", what, clip(cells[i]), clip(cells[i-1]), t.lines[i-1])
			if d < 0 && d >= -clockChangeSkips && tm.zoned != nil && !tm.zoned[i] && !tm.zoned[i-1] {
				// A local clock going back as daylight saving ends.
				problem += "; " + clockChangeText + s.set("Time", "none")
			}
			return &LineError{File: t.file, Line: t.lines[i], Column: col, Kind: ErrSample, Problem: problem}
		}
		steps = append(steps, d)
	}
	tm.steps = len(steps)
	if len(steps) > 0 {
		slices.Sort(steps)
		tm.median = steps[len(steps)/2]
	}
	return nil
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
func niceInterval(secs float64) tf.Interval {
	for _, u := range []string{"d", "h", "min"} {
		k := secs / unitSeconds[u]
		if k >= 1 && math.Abs(k-math.Round(k)) < 1e-9*k {
			return tf.Interval{Value: math.Round(k), Unit: u}
		}
	}
	return tf.Interval{Value: secs, Unit: "s"}
}

// ivText writes an interval for a message.
func ivText(v float64, unit string) string { return strconv.FormatFloat(v, 'g', 6, 64) + " " + unit }

// timing fills the time facts of rec from tm (nil for no time column),
// checks the interval and mends the breaks as s.Gaps says.
func (rec *Record) timing(t *table, tm *timing, s *Settings) error {
	switch {
	case tm == nil && s.TimeUnit != "":
		return &SettingError{Op: op, Setting: s.label("TimeUnit"), Value: s.TimeUnit,
			Rule: fmt.Sprintf("the unit of a time column, and %s has none (name it with %s)", t.file, s.label("Time"))}
	case tm != nil && tm.calendar && s.TimeUnit != "":
		return &SettingError{Op: op, Setting: s.label("TimeUnit"), Value: s.TimeUnit,
			Rule: fmt.Sprintf("for a time column of numbers, and %s holds timestamps or dates: leave %s out", clip(tm.column), s.label("TimeUnit"))}
	}
	if tm == nil {
		if s.Gaps.Kind != "" {
			return &SettingError{Op: op, Setting: s.label("Gaps"), Value: s.Gaps.String(),
				Rule: fmt.Sprintf("needs a time column to find the gaps, and %s has none (name it with %s)", t.file, s.label("Time"))}
		}
		if s.Interval.Value > 0 {
			rec.Interval = s.Interval
		}
		rec.Notes = append(rec.Notes, "no time column: the rows are taken as equally spaced samples, none missing")
		return nil
	}
	rec.TimeColumn, rec.Times, rec.Calendar, rec.Dates, rec.TimeUnit = tm.column, tm.secs, tm.calendar, tm.dates, tm.unit
	rec.Steps, rec.Median = tm.steps, tm.median
	rec.Offsets = tm.offsets
	rec.Zoned = slices.Contains(tm.zoned, true)
	what := "numbers in " + unitName(tm.unit)
	switch {
	case tm.dates:
		what = "dates"
	case tm.calendar:
		what = "timestamps"
	}
	if err := rec.setInterval(t, tm, s); err != nil {
		return err
	}
	if rec.Interval.Value == 0 {
		// A single row: no step to take an interval from.
		rec.Notes = append(rec.Notes, fmt.Sprintf("time column %s (%s): a single row, no interval", clip(tm.column), what))
		return nil
	}
	ivs := ivText(rec.Interval.Value, rec.Interval.Unit)
	rec.Notes = append(rec.Notes, fmt.Sprintf("time column %s (%s): rows every %s", clip(tm.column), what, ivs))
	rec.Breaks = tm.breaks(t, rec.Interval.Value*unitSeconds[rec.Interval.Unit])
	if len(rec.Breaks) == 0 {
		if s.Gaps.Kind != "" {
			rec.Notes = append(rec.Notes, fmt.Sprintf("no gaps: %s had nothing to do", s.set("Gaps", s.Gaps.String())))
		}
		return nil
	}
	data, note, err := s.Gaps.apply(t, tm, ivs, rec.Breaks, rec.Series, s)
	if err != nil {
		return err
	}
	rec.Series = data
	rec.Notes = append(rec.Notes, note)
	return nil
}

// setInterval sets the record's sampling interval: s.Interval, checked
// against the median step of the time column (within stepTolerance), or
// else that median step as a round interval.
func (rec *Record) setInterval(t *table, tm *timing, s *Settings) error {
	if s.Interval.Value > 0 && tm.steps > 0 {
		if _, fixed := Seconds(s.Interval.Unit); !fixed {
			return &SettingError{Op: op, Setting: s.label("Interval"), Value: ivText(s.Interval.Value, s.Interval.Unit),
				Rule: fmt.Sprintf("a calendar interval has no fixed length, so the time column %s of %s cannot be checked against it: read the record without its time column (%s)",
					clip(tm.column), t.file, s.set("Time", "none"))}
		}
		given := s.Interval.Value * unitSeconds[s.Interval.Unit]
		if math.Abs(tm.median/given-1) > stepTolerance {
			iv := niceInterval(tm.median)
			return &SettingError{Op: op, Setting: s.label("Interval"), Value: ivText(s.Interval.Value, s.Interval.Unit),
				Rule: fmt.Sprintf("the time column %s of %s steps by %s (the median of its %d steps): correct the one that is wrong (%s sets the unit of a numeric time column)",
					clip(tm.column), t.file, ivText(iv.Value, iv.Unit), tm.steps, s.label("TimeUnit"))}
		}
		rec.Interval = s.Interval
	} else if tm.median > 0 {
		rec.Interval = niceInterval(tm.median)
	}
	return nil
}
