package record

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
)

// maxGap bounds the intervals a step may span and still count as a gap
// to fill (a guard against absurd steps, far beyond any remedy's limit).
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
	// ClockChange reports a step of one interval and one hour exactly
	// between two times written without an offset from UTC, on a record
	// sampled more often than hourly: most likely a local clock that
	// skipped an hour as daylight saving began, with no sample missing.
	// Read blames the clock, and hold and linear do not fill it (they
	// would invent an hour that never existed).
	ClockChange bool
}

// clockChangeText is the advice for a record whose local clock changed
// (Break.ClockChange, or a time that goes back by up to an hour).
const clockChangeText = "the times carry no offset from UTC, so this is most likely a local clock changing for daylight saving, not a fault of the samples: write the times with their offset (2026-03-29T03:00:00+02:00) or in UTC, or, if no row is missing, read the rows as evenly spaced with "

// clockChangeSkips is the number of seconds a local clock skips or
// repeats when daylight saving begins or ends: an hour almost
// everywhere (common practice; a few places change by 30 minutes, which
// this does not recognise).
const clockChangeSkips = 3600

// GapError reports a time column with gaps or irregular steps and no
// remedy chosen (or a remedy that does not cover them). It unwraps to
// ErrSample: samples are missing or irregularly timed.
type GapError struct {
	// File and Column name the file and its time column.
	File, Column string
	// Interval is the sample interval, as text.
	Interval string
	// Breaks lists the breaks refused.
	Breaks []Break
	// Why says why the breaks are refused and which remedies there are.
	Why string
}

// shownBreaks is the number of breaks a GapError lists.
const shownBreaks = 5

// Error lists the first breaks by line and the remedies.
func (e *GapError) Error() string {
	var b strings.Builder
	gaps, irregular, clock := 0, 0, 0
	for _, br := range e.Breaks {
		if br.ClockChange {
			clock++
		} else if br.Missing > 0 {
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
	if clock > 0 {
		if gaps+irregular > 0 {
			b.WriteString(" and")
		}
		fmt.Fprintf(&b, " %d skipped %s", clock, plural(clock, "hour", "hours"))
	}
	b.WriteString("\n")
	for i, br := range e.Breaks {
		if i == shownBreaks {
			fmt.Fprintf(&b, "  ... and %d more\n", len(e.Breaks)-shownBreaks)
			break
		}
		fmt.Fprintf(&b, "  line %d (%s) comes %s intervals after line %d (%s)", br.Line, clip(br.Time), strconv.FormatFloat(br.Intervals, 'g', 4, 64), br.PrevLine, clip(br.PrevTime))
		if br.ClockChange {
			fmt.Fprintf(&b, ": one hour more than one interval, between times without an offset: most likely the local clock skipping an hour as daylight saving began\n")
		} else if br.Missing > 0 {
			fmt.Fprintf(&b, ": %d %s missing\n", br.Missing, plural(br.Missing, "sample", "samples"))
		} else {
			b.WriteString(": not a whole number of intervals\n")
		}
	}
	b.WriteString(e.Why)
	if irregular > 0 {
		b.WriteString("; a record whose clock jitters by more than 1 % of the interval must be resampled to the interval first")
	}
	return b.String()
}

// Unwrap returns ErrSample.
func (e *GapError) Unwrap() error { return ErrSample }

// breaks returns the places where tm's steps differ from iv seconds.
func (tm *timing) breaks(t *table, iv float64) []Break {
	var out []Break
	cells := t.cells[tm.column]
	for i := 1; i < len(tm.secs); i++ {
		r := (tm.secs[i] - tm.secs[i-1]) / iv
		if math.Abs(r-1) <= stepTolerance {
			continue
		}
		br := Break{Line: t.lines[i], PrevLine: t.lines[i-1], Row: i, Time: cells[i], PrevTime: cells[i-1], Intervals: r}
		// A gap is a whole number of intervals, at most maxGap: a step
		// of more is a break no remedy fills (only "longest").
		if k := math.Round(r); k >= 2 && k <= maxGap && math.Abs(r-k) <= stepTolerance {
			br.Missing = int(k) - 1
		}
		if tm.zoned != nil && !tm.zoned[i] && !tm.zoned[i-1] && iv < clockChangeSkips &&
			math.Abs(tm.secs[i]-tm.secs[i-1]-iv-clockChangeSkips) <= stepTolerance*iv {
			br.ClockChange = true
		}
		out = append(out, br)
	}
	return out
}

// Remedy says what Read does at the breaks of a time column. The zero
// Remedy refuses them.
type Remedy struct {
	// Kind is "" (refuse), "hold" (fill each gap with the last value
	// before it), "linear" (fill each gap on a straight line between
	// the rows either side) or "longest" (keep only the longest evenly
	// spaced stretch of rows).
	Kind string
	// Max is the longest gap hold and linear fill, in missing samples
	// (at least 1); a longer gap or an irregular step is refused.
	Max int
}

// String writes r as ParseRemedy reads it: "hold:5", "longest", or ""
// for the zero Remedy.
func (r Remedy) String() string {
	switch r.Kind {
	case "hold", "linear":
		return r.Kind + ":" + strconv.Itoa(r.Max)
	}
	return r.Kind
}

// remedyRule is the rule of Settings.Gaps in messages.
const remedyRule = "want hold:N or linear:N (fill gaps of up to N missing samples, N at least 1) or longest (keep the longest evenly spaced stretch)"

// ParseRemedy reads a remedy written as "hold:N", "linear:N", "longest",
// or "" or "none" for the zero Remedy.
func ParseRemedy(s string) (Remedy, error) {
	s = strings.TrimSpace(s)
	if s == "" || s == "none" {
		return Remedy{}, nil
	}
	if s == "longest" {
		return Remedy{Kind: "longest"}, nil
	}
	k, n, ok := strings.Cut(s, ":")
	if ok && (k == "hold" || k == "linear") {
		if m, err := strconv.Atoi(strings.TrimSpace(n)); err == nil && m > 0 {
			return Remedy{Kind: k, Max: m}, nil
		}
	}
	return Remedy{}, &SettingError{Op: "record.ParseRemedy", Setting: "Gaps", Value: clip(s), Rule: remedyRule}
}

// apply mends data (the series read from t, by name) at the breaks as r
// says and returns the new series and a sentence of what was done, or a
// GapError when r does not cover the breaks. data is not modified.
func (r Remedy) apply(t *table, tm *timing, ivText string, brks []Break, data map[string][]float64, s *Settings) (map[string][]float64, string, error) {
	fail := func(why string, bs []Break) error {
		return &GapError{File: t.file, Column: tm.column, Interval: ivText, Breaks: bs, Why: why}
	}
	var clock []Break
	for _, b := range brks {
		if b.ClockChange {
			clock = append(clock, b)
		}
	}
	if len(clock) > 0 && r.Kind != "longest" {
		// A fill would invent the hour the clock skipped; the other
		// breaks are left for after the times are mended.
		why := clockChangeText + s.set("Time", "none")
		if r.Kind != "" {
			why = s.set("Gaps", r.String()) + " would fill an hour that never existed: " + why
		}
		return nil, "", fail(why+" ("+s.set("Gaps", "longest")+" fits only the longest evenly spaced stretch)", clock)
	}
	switch r.Kind {
	case "":
		return nil, "", fail(fmt.Sprintf("fitting across them would treat rows far apart in time as neighbours; choose a remedy: %s or %s fill gaps of up to N missing samples (holding the last value, or on a straight line), %s fits only the longest evenly spaced stretch (%s if the column is not a time)",
			s.set("Gaps", "hold:N"), s.set("Gaps", "linear:N"), s.set("Gaps", "longest"), s.set("Time", "none")), brks)
	case "longest":
		return longestStretch(t, tm, brks, data)
	}
	var bad []Break
	for _, b := range brks {
		if b.Missing == 0 || b.Missing > r.Max {
			bad = append(bad, b)
		}
	}
	if len(bad) > 0 {
		return nil, "", fail(fmt.Sprintf("%s fills gaps of whole intervals up to %d missing samples; these are irregular or longer (%s fits only the longest evenly spaced stretch)", s.set("Gaps", r.String()), r.Max, s.set("Gaps", "longest")), bad)
	}
	return r.fill(brks, data)
}

// longestStretch keeps the rows of the longest evenly spaced stretch
// between breaks (the later one on a tie: the plant as it is now) and
// returns a note saying so.
func longestStretch(t *table, tm *timing, brks []Break, data map[string][]float64) (map[string][]float64, string, error) {
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
		len(brks), plural(len(brks), "break", "breaks"), t.lines[from], t.lines[to-1], to-from, len(tm.secs)-(to-from), len(tm.secs))
	return out, note, nil
}

// fill fills the gaps of the breaks by the remedy (holding the last value
// or on straight lines) and returns a note listing them.
func (r Remedy) fill(brks []Break, data map[string][]float64) (map[string][]float64, string, error) {
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
					if r.Kind == "hold" {
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
	if r.Kind == "linear" {
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
