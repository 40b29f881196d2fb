package record

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"slices"
	"strconv"
	"strings"

	"github.com/backshift/backshift/tf"
)

// op is the Op of the shared error shapes returned by Read.
const op = "record.Read"

// Settings chooses how Read reads a record. The zero value reads a comma
// separated file, every column but the time column as a series, the time
// column found automatically, and refuses gaps.
type Settings struct {
	// File is the name of the file in messages; "" means "record"
	// (ReadFile sets it to the path).
	File string
	// Sep is the field separator; 0 means a comma.
	Sep rune
	// Series names the columns to read as numbers, in the order of the
	// caller's choice; nil means every column but the time column.
	// Columns not named are not read.
	Series []string
	// Time names the time column: "" finds it (the first column when it
	// holds calendar times, or numbers under a time's name, and is not
	// one of Series), "none" means the record has none (the rows are
	// taken as equally spaced, none missing).
	Time string
	// TimeUnit is the unit of a time column of numbers: s, min, h or d;
	// "" takes it from the column's name, or seconds.
	TimeUnit string
	// Interval is the sample interval the record should have (from a
	// spec's every, for example); a time column whose median step is
	// more than 1 % away from it is refused. The zero Interval takes the
	// interval from the time column.
	Interval tf.Interval
	// Gaps is the remedy for gaps and irregular steps in the time
	// column; the zero Remedy refuses them with a *GapError.
	Gaps Remedy
	// Missing names the columns whose missing samples are read as NaN
	// rather than refused: an empty cell, or one that says NaN, NA or
	// N/A (in any case), as loggers and spreadsheets write a reading
	// they did not get. Use it for an output that a fit can skip
	// exactly (fit.Settings.Method = fit.ExactML); an input's gaps cannot
	// be skipped (the transfer filters need every past value), so leave
	// inputs out and let their empty cells be refused with their lines.
	// Every name must be a column read (one of Series, or of the file
	// when Series is nil). Record.Notes lists the missing cells found.
	// At the gaps of a time column the remedies treat a NaN as any
	// value: hold and linear next to one give NaN, which widens the
	// output gap rather than inventing readings.
	Missing []string
	// Names maps a field of Settings ("Gaps", "Time", "TimeUnit",
	// "Sep", "Interval", "Missing") to the words messages use for it, for a
	// program whose users set them otherwise (a flag "-gaps"); a word
	// starting with "-" is written before its value as a flag is. nil
	// means the field names ("Settings.Gaps").
	Names map[string]string
}

// label returns the caller's word for a field of Settings.
func (s *Settings) label(field string) string {
	if w, ok := s.Names[field]; ok && w != "" {
		return w
	}
	return "Settings." + field
}

// set writes a setting with its value as the caller would write it:
// "-gaps longest" for a flag, "Settings.Gaps = longest" otherwise.
func (s *Settings) set(field, value string) string {
	l := s.label(field)
	if strings.HasPrefix(l, "-") {
		return l + " " + value
	}
	return l + " = " + value
}

// Validate checks the settings that need no file: the unit of a time
// column, the interval and the remedy.
func (s *Settings) Validate() error {
	if s.TimeUnit != "" {
		if _, ok := Seconds(s.TimeUnit); !ok {
			return &SettingError{Op: op, Setting: s.label("TimeUnit"), Value: s.TimeUnit, Rule: "want s, min, h or d (\"\": from the column's name, or seconds)"}
		}
	}
	if s.Interval.Value != 0 || s.Interval.Unit != "" {
		if !tf.ValidUnit(s.Interval.Unit) || !(s.Interval.Value > 0) || math.IsInf(s.Interval.Value, 0) {
			return &SettingError{Op: op, Setting: s.label("Interval"), Value: ivText(s.Interval.Value, s.Interval.Unit),
				Rule: "want a positive length in s, min, h, d, wk, or the calendar units mo, qtr, yr (the zero Interval: from the time column)"}
		}
	}
	switch s.Gaps.Kind {
	case "", "longest":
	case "hold", "linear":
		if s.Gaps.Max < 1 {
			return &SettingError{Op: op, Setting: s.label("Gaps"), Value: s.Gaps.String(), Rule: "the longest gap filled must be at least 1 missing sample"}
		}
	default:
		return &SettingError{Op: op, Setting: s.label("Gaps"), Value: s.Gaps.String(), Rule: remedyRule}
	}
	return nil
}

// Record is a record read: its series by name and what its time column
// said.
type Record struct {
	// File is the name of the file in messages.
	File string
	// Columns are the column names of the header line, in order.
	Columns []string
	// Series holds the columns read, by name, oldest sample first, after
	// the remedy of Settings.Gaps: a map fit.Model takes as its data.
	Series map[string][]float64
	// Lines holds the 1-based line of the file each data row starts on
	// (one entry per row read, before any remedy).
	Lines []int
	// TimeColumn names the time column, "" when the record has none;
	// then Times, Interval and Breaks are empty too.
	TimeColumn string
	// Calendar is true when the time column holds timestamps or dates,
	// Dates when it holds dates alone; TimeUnit is the unit of a time
	// column of numbers.
	Calendar, Dates bool
	TimeUnit        string
	// Times holds the time of every row read in seconds (since 1970 for
	// calendar times).
	Times []float64
	// Offsets holds, for a time column of timestamps, the offset from
	// UTC in seconds east that each row's time was written with (0 for
	// "Z" and for a time written without one), so that a time can be
	// shown as the file writes it; nil for other time columns. Zoned
	// reports that the times carry an offset or "Z" (false: wall-clock
	// times of an unknown zone, read as UTC).
	Offsets []int
	Zoned   bool
	// Interval is the sample interval: Settings.Interval when given,
	// else the median step of the time column in the largest unit it is
	// a whole number of.
	Interval tf.Interval
	// Steps is the number of steps between rows, and Median their
	// median in seconds.
	Steps  int
	Median float64
	// Breaks lists the places where the step between two rows is not one
	// interval (mended as Settings.Gaps says).
	Breaks []Break
	// Notes says in sentences how the record was read and mended.
	Notes []string
}

// Rows returns the number of data rows read from the file.
func (r *Record) Rows() int { return len(r.Lines) }

// Len returns the number of samples of each series after the remedy.
func (r *Record) Len() int {
	for _, s := range r.Series {
		return len(s)
	}
	return 0
}

// bom is the UTF-8 byte order mark some spreadsheet programs write at
// the start of a CSV file.
const bom = "\ufeff"

// table is a CSV file read into named columns of cell text.
type table struct {
	file  string
	names []string
	cells map[string][]string
	lines []int
}

func (t *table) rows() int { return len(t.lines) }

func (t *table) has(name string) bool {
	_, ok := t.cells[name]
	return ok
}

// ReadFile opens and reads the CSV file at path (see Read); s.File
// defaults to path. s may be nil.
func ReadFile(path string, s *Settings) (*Record, error) {
	var c Settings
	if s != nil {
		c = *s
	}
	if c.File == "" {
		c.File = path
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return Read(f, &c)
}

// Read reads a CSV record from r as s says (nil for the defaults): the
// columns of s.Series as numbers, the time column, the interval, the
// breaks mended by s.Gaps. It does not modify s.
func Read(r io.Reader, s *Settings) (rec *Record, err error) {
	if s == nil {
		s = &Settings{}
	}
	if err := s.Validate(); err != nil {
		return nil, err
	}
	file := s.File
	if file == "" {
		file = "record"
	}
	t, err := readTable(file, r, s)
	if err != nil {
		return nil, err
	}
	rec = &Record{File: file, Columns: t.names, Lines: t.lines}
	used := map[string]bool{}
	for _, c := range s.Series {
		used[c] = true
		if !t.has(c) {
			d := fmt.Sprintf("%s has no such column; its columns: %s", file, names(t.names))
			if len(t.names) == 1 {
				if hint := sepHint(t.names[0], s); hint != "" {
					d += "; " + hint
				}
			}
			return nil, &SeriesError{Op: op, Series: c, Kind: ErrName, Detail: d}
		}
	}
	cols := s.Series
	var notes []string
	if cols != nil {
		if rec.Series, notes, err = t.numbers(cols, s); err != nil {
			return nil, err
		}
	}
	tm, err := findTime(t, s, used)
	if err != nil {
		return nil, err
	}
	if cols == nil {
		for _, n := range t.names {
			if tm == nil || n != tm.column {
				cols = append(cols, n)
			}
		}
		if rec.Series, notes, err = t.numbers(cols, s); err != nil {
			return nil, err
		}
	}
	if err := rec.timing(t, tm, s); err != nil {
		return nil, err
	}
	rec.Notes = append(rec.Notes, notes...)
	return rec, nil
}

// readTable reads the header and the cells of every data line.
func readTable(name string, r io.Reader, s *Settings) (*table, error) {
	sep := s.Sep
	if sep == 0 {
		sep = ','
	}
	raw, err := io.ReadAll(r)
	if err != nil {
		return nil, &LineError{File: name, Problem: err.Error()}
	}
	raw = bytes.TrimPrefix(raw, []byte(bom))
	if bytes.IndexByte(raw, '\n') < 0 && bytes.IndexByte(raw, '\r') >= 0 {
		// Line ends of a carriage return alone: the reader knows only
		// line feeds.
		raw = bytes.ReplaceAll(raw, []byte{'\r'}, []byte{'\n'})
	}
	cr := csv.NewReader(bytes.NewReader(raw))
	cr.Comma = sep
	cr.TrimLeadingSpace = true
	cr.Comment = '#'
	cr.FieldsPerRecord = -1 // checked below, with the counts in the message
	header, err := cr.Read()
	if err != nil {
		if errors.Is(err, io.EOF) {
			return nil, &LineError{File: name, Problem: "the file is empty (a header line of column names is needed)", Kind: ErrShort}
		}
		return nil, parseError(name, err)
	}
	t, err := readHeader(cr, name, header, s)
	if err != nil {
		return nil, err
	}
	if err := t.readRows(cr, s); err != nil {
		return nil, err
	}
	if len(t.lines) == 0 {
		return nil, &LineError{File: name, Problem: "no data lines after the header", Kind: ErrShort}
	}
	return t, nil
}

// readHeader starts the table of file name from its header line,
// refusing a single column that looks like another separator, a column
// without a name and a repeated name.
func readHeader(cr *csv.Reader, name string, header []string, s *Settings) (*table, error) {
	hline, _ := cr.FieldPos(0)
	t := &table{file: name, cells: make(map[string][]string, len(header))}
	if len(header) == 1 {
		if hint := sepHint(header[0], s); hint != "" {
			return nil, &LineError{File: name, Line: hline, Problem: fmt.Sprintf("the header has a single column %s; %s", clip(header[0]), hint)}
		}
	}
	for i, h := range header {
		h = strings.TrimSpace(h)
		if h == "" {
			return nil, &LineError{File: name, Line: hline, Kind: ErrName, Problem: fmt.Sprintf("column %d of %d in the header has no name (a separator too many?): every column needs a name", i+1, len(header))}
		}
		if _, dup := t.cells[h]; dup {
			return nil, &LineError{File: name, Line: hline, Column: h, Kind: ErrName, Problem: "column names must be unique"}
		}
		t.names = append(t.names, h)
		t.cells[h] = nil
	}
	return t, nil
}

// readRows reads the data lines into t, refusing a line whose number of
// fields differs from the header's.
func (t *table) readRows(cr *csv.Reader, s *Settings) error {
	name := t.file
	for {
		row, err := cr.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return parseError(name, err)
		}
		line, _ := cr.FieldPos(0)
		if len(row) != len(t.names) {
			msg := fmt.Sprintf("%d %s, but the header names %d columns (%s)", len(row), plural(len(row), "field", "fields"), len(t.names), names(t.names))
			if len(row) == 1 {
				if hint := sepHint(row[0], s); hint != "" {
					msg += "; " + hint
				}
			}
			return &LineError{File: name, Line: line, Problem: msg}
		}
		for i, cell := range row {
			t.cells[t.names[i]] = append(t.cells[t.names[i]], strings.TrimSpace(cell))
		}
		t.lines = append(t.lines, line)
	}
	return nil
}

// parseError turns an error of the CSV reader into a LineError at the
// line where the bad record starts.
func parseError(name string, err error) error {
	var pe *csv.ParseError
	if !errors.As(err, &pe) {
		return &LineError{File: name, Problem: err.Error()}
	}
	msg := pe.Err.Error()
	switch {
	case errors.Is(pe.Err, csv.ErrQuote) && pe.Line != pe.StartLine:
		msg = fmt.Sprintf("a quoted field opened on this line is not closed (the reader ran on to line %d)", pe.Line)
	case errors.Is(pe.Err, csv.ErrQuote), errors.Is(pe.Err, csv.ErrBareQuote):
		msg = fmt.Sprintf("a stray double quote (byte %d of line %d); quote a whole field as \"...\" and double any quote inside it", pe.Column, pe.Line)
	}
	return &LineError{File: name, Line: pe.StartLine, Problem: msg}
}

// sepHint returns a hint when a line read as a single field looks
// separated by another character than the separator of s, and ""
// otherwise.
func sepHint(field string, s *Settings) string {
	sep := s.Sep
	if sep == 0 {
		sep = ','
	}
	flag := strings.HasPrefix(s.label("Sep"), "-")
	for _, c := range []struct {
		r          rune
		flag, code string
	}{{',', "','", "','"}, {';', "';'", "';'"}, {'\t', "tab", `'\t'`}, {'|', "'|'", "'|'"}} {
		if c.r != sep && strings.ContainsRune(field, c.r) {
			if c.r == ',' {
				return "the fields look separated by ',', the default: leave " + s.label("Sep") + " out"
			}
			v := c.code
			if flag {
				v = c.flag
			}
			return fmt.Sprintf("the fields look separated by %q: read the file with %s", c.r, s.set("Sep", v))
		}
	}
	return ""
}

// checkMissing refuses a name of s.Missing that is not a column read
// (cols): a *SeriesError of kind ErrName when the file has no such
// column, a *SettingError when it is not among the columns read.
func checkMissing(t *table, s *Settings, cols []string) error {
	for _, m := range s.Missing {
		switch {
		case !t.has(m):
			return &SeriesError{Op: op, Series: m, Kind: ErrName,
				Detail: fmt.Sprintf("%s names it, but %s has no such column; its columns: %s", s.label("Missing"), t.file, names(t.names))}
		case !slices.Contains(cols, m):
			return &SettingError{Op: op, Setting: s.label("Missing"), Value: clip(m), Rule: "name columns that are read as series (" + names(cols) + ")"}
		}
	}
	return nil
}

// isMissingCell reports whether a cell says a sample is missing: empty,
// or NaN, NA or N/A in any case.
func isMissingCell(cell string) bool {
	switch strings.ToLower(cell) {
	case "", "nan", "na", "n/a":
		return true
	}
	return false
}

// numbers returns the named columns read as numbers, with a note for
// each column of s.Missing that has missing cells (read as NaN), or a
// LineError naming the line and the column of the first cell that is
// not a finite number (or checkMissing's error).
func (t *table) numbers(cols []string, s *Settings) (map[string][]float64, []string, error) {
	if err := checkMissing(t, s, cols); err != nil {
		return nil, nil, err
	}
	data := make(map[string][]float64, len(cols))
	var notes []string
	for _, name := range cols {
		cells := t.cells[name]
		out := make([]float64, len(cells))
		allowed := slices.Contains(s.Missing, name)
		var miss []int // rows of missing cells
		for i, cell := range cells {
			if allowed && isMissingCell(cell) {
				out[i] = math.NaN()
				miss = append(miss, i)
				continue
			}
			v, err := strconv.ParseFloat(cell, 64)
			if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
				return nil, nil, &LineError{File: t.file, Line: t.lines[i], Column: name, Problem: cellProblem(cell, s), Kind: ErrSample}
			}
			out[i] = v
		}
		data[name] = out
		if len(miss) > 0 {
			notes = append(notes, t.missingNote(name, miss))
		}
	}
	return data, notes, nil
}

// cellProblem says why a cell is not a sample, and what to do.
func cellProblem(cell string, s *Settings) string {
	fix := fmt.Sprintf("every sample is needed (fill it in the file, or delete the row and let %s fill it by the time column", s.label("Gaps"))
	if w, ok := s.Names["Missing"]; !ok || w != "" {
		fix += fmt.Sprintf("; an output's gaps can be read as missing with %s", s.label("Missing"))
	}
	fix += ")"
	switch {
	case cell == "":
		return "the cell is empty: " + fix
	case isMissingCell(cell):
		return fmt.Sprintf("the cell says %s, a missing sample: %s", clip(cell), fix)
	case strings.Count(cell, ",") == 1 && !strings.ContainsAny(cell, ". "):
		return fmt.Sprintf("%s is not a finite number (a decimal comma? write a decimal point)", clip(cell))
	}
	return fmt.Sprintf("%s is not a finite number", clip(cell))
}

// missingNote says where the column name has missing cells (rows miss,
// ascending): their number and the runs of lines, at most five.
func (t *table) missingNote(name string, miss []int) string {
	var runs []string
	nruns := 0
	for i := 0; i < len(miss); {
		j := i
		for j+1 < len(miss) && miss[j+1] == miss[j]+1 {
			j++
		}
		nruns++
		switch {
		case nruns > 5:
		case i == j:
			runs = append(runs, fmt.Sprintf("line %d", t.lines[miss[i]]))
		default:
			runs = append(runs, fmt.Sprintf("lines %d to %d", t.lines[miss[i]], t.lines[miss[j]]))
		}
		i = j + 1
	}
	where := strings.Join(runs, ", ")
	if nruns > 5 {
		where += fmt.Sprintf(" and %d more", nruns-5)
	}
	return fmt.Sprintf("column %s: %d missing %s read as NaN (%d %s): %s", clip(name), len(miss), plural(len(miss), "cell", "cells"), nruns, plural(nruns, "run", "runs"), where)
}
