package main

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"
	"unicode/utf8"
)

// Table is a CSV file read into named columns of cell text. Only the
// columns a run names are read as numbers (Select) or times: a column of
// dates or notes anywhere in the file is no obstacle.
type Table struct {
	// File is the name used in messages.
	File string
	// Names are the column names of the header line, in order.
	Names []string
	// Cells holds the text of every cell, by column name, one entry per
	// data line, leading and trailing spaces removed.
	Cells map[string][]string
	// Lines holds the 1-based line of the file each data row starts on.
	Lines []int
}

// Rows returns the number of data rows.
func (t *Table) Rows() int { return len(t.Lines) }

// CSVError reports a problem in a CSV file: the file, the 1-based line
// and the column name where it is, and what is wrong.
type CSVError struct {
	File   string
	Line   int
	Column string
	Msg    string
}

// Error prints file:line: column "name": message.
func (e *CSVError) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Line > 0 {
		fmt.Fprintf(&b, ":%d", e.Line)
	}
	if e.Column != "" {
		fmt.Fprintf(&b, ": column %s", clip(e.Column))
	}
	b.WriteString(": ")
	b.WriteString(e.Msg)
	return b.String()
}

// maxQuoted is the longest text quoted whole in a message; longer cells
// and names are cut to their first maxQuoted characters and a note of
// their length, so that a damaged file (a 1 MiB cell) gives a readable
// message.
const maxQuoted = 40

// clip quotes s for a message, cut to maxQuoted characters.
func clip(s string) string {
	if utf8.RuneCountInString(s) <= maxQuoted {
		return strconv.Quote(s)
	}
	r := []rune(s)
	return fmt.Sprintf("%s... (%d bytes)", strconv.Quote(string(r[:maxQuoted])), len(s))
}

// bom is the UTF-8 byte order mark some spreadsheet programs write at
// the start of a CSV file.
const bom = "\ufeff"

// ReadCSV reads a CSV file with a header line of column names; sep is
// the field separator (0 for a comma). Lines starting with # are
// comments. A UTF-8 byte order mark before the header is dropped, and a
// file whose lines end in a carriage return alone (no line feed
// anywhere) is read line by line. Every data line must have one field
// per column; the cells are kept as text until a run names the columns
// it reads (Select).
func ReadCSV(name string, r io.Reader, sep rune) (*Table, error) {
	if sep == 0 {
		sep = ','
	}
	raw, err := io.ReadAll(r)
	if err != nil {
		return nil, &CSVError{File: name, Msg: err.Error()}
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
	cr.ReuseRecord = false
	header, err := cr.Read()
	if err != nil {
		if errors.Is(err, io.EOF) {
			return nil, &CSVError{File: name, Msg: "the file is empty (a header line of column names is needed)"}
		}
		return nil, parseError(name, err)
	}
	hline, _ := cr.FieldPos(0)
	t := &Table{File: name, Cells: make(map[string][]string, len(header))}
	if len(header) == 1 {
		if hint := sepHint(header[0], sep); hint != "" {
			return nil, &CSVError{File: name, Line: hline, Msg: fmt.Sprintf("the header has a single column %s; %s", clip(header[0]), hint)}
		}
	}
	for i, h := range header {
		h = strings.TrimSpace(h)
		if h == "" {
			return nil, &CSVError{File: name, Line: hline, Msg: fmt.Sprintf("column %d of %d in the header has no name (a separator too many?): every column needs a name", i+1, len(header))}
		}
		if _, dup := t.Cells[h]; dup {
			return nil, &CSVError{File: name, Line: hline, Column: h, Msg: "column names must be unique"}
		}
		t.Names = append(t.Names, h)
		t.Cells[h] = nil
	}
	for {
		rec, err := cr.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return nil, parseError(name, err)
		}
		line, _ := cr.FieldPos(0)
		if len(rec) != len(t.Names) {
			msg := fmt.Sprintf("%d %s, but the header names %d columns (%s)", len(rec), plural(len(rec), "field", "fields"), len(t.Names), names(t.Names))
			if len(rec) == 1 {
				if hint := sepHint(rec[0], sep); hint != "" {
					msg += "; " + hint
				}
			}
			return nil, &CSVError{File: name, Line: line, Msg: msg}
		}
		for i, cell := range rec {
			t.Cells[t.Names[i]] = append(t.Cells[t.Names[i]], strings.TrimSpace(cell))
		}
		t.Lines = append(t.Lines, line)
	}
	if len(t.Lines) == 0 {
		return nil, &CSVError{File: name, Msg: "no data lines after the header"}
	}
	return t, nil
}

// parseError turns an error of the CSV reader into a CSVError at the
// line where the bad record starts.
func parseError(name string, err error) error {
	var pe *csv.ParseError
	if !errors.As(err, &pe) {
		return &CSVError{File: name, Msg: err.Error()}
	}
	msg := pe.Err.Error()
	switch {
	case errors.Is(pe.Err, csv.ErrQuote) && pe.Line != pe.StartLine:
		msg = fmt.Sprintf("a quoted field opened on this line is not closed (the reader ran on to line %d)", pe.Line)
	case errors.Is(pe.Err, csv.ErrQuote), errors.Is(pe.Err, csv.ErrBareQuote):
		msg = fmt.Sprintf("a stray double quote (byte %d of line %d); quote a whole field as \"...\" and double any quote inside it", pe.Column, pe.Line)
	}
	return &CSVError{File: name, Line: pe.StartLine, Msg: msg}
}

// sepHint returns a hint when a line read as a single field looks
// separated by another character than sep, and "" otherwise.
func sepHint(field string, sep rune) string {
	for _, c := range []struct {
		r    rune
		flag string
	}{{';', "-sep ';'"}, {'\t', "-sep tab"}, {'|', "-sep '|'"}} {
		if c.r != sep && strings.ContainsRune(field, c.r) {
			return fmt.Sprintf("the fields look separated by %q: read the file with %s", c.r, c.flag)
		}
	}
	return ""
}

// ReadCSVFile opens and reads a CSV file (see ReadCSV).
func ReadCSVFile(path string, sep rune) (*Table, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return ReadCSV(path, f, sep)
}

// Has reports whether the table has a column name.
func (t *Table) Has(name string) bool {
	_, ok := t.Cells[name]
	return ok
}

// Numbers returns column name read as numbers, or a CSVError naming the
// line and the column of the first cell that is not a finite number.
func (t *Table) Numbers(name string) ([]float64, error) {
	cells := t.Cells[name]
	out := make([]float64, len(cells))
	for i, cell := range cells {
		v, err := strconv.ParseFloat(cell, 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			msg := fmt.Sprintf("%s is not a finite number", clip(cell))
			switch {
			case cell == "":
				msg = "the cell is empty: every sample is needed (fill it in the file, or delete the row and let -gaps fill it by the time column)"
			case strings.Count(cell, ",") == 1 && !strings.ContainsAny(cell, ". "):
				msg += " (a decimal comma? write a decimal point)"
			}
			return nil, &CSVError{File: t.File, Line: t.Lines[i], Column: name, Msg: msg}
		}
		out[i] = v
	}
	return out, nil
}

// Select returns the named columns read as numbers, as a data map for
// the library, or an error naming a missing column and listing those
// present, or the line and column of a cell that is not a number.
// Columns not named are not read.
func (t *Table) Select(cols ...string) (map[string][]float64, error) {
	data := make(map[string][]float64, len(cols))
	for _, n := range cols {
		if !t.Has(n) {
			return nil, fmt.Errorf("no column %s in %s (columns: %s)", clip(n), t.File, names(t.Names))
		}
		c, err := t.Numbers(n)
		if err != nil {
			return nil, err
		}
		data[n] = c
	}
	return data, nil
}

// names lists column names for a message, each clipped, at most 20.
func names(ns []string) string {
	var b strings.Builder
	for i, n := range ns {
		if i == 20 {
			fmt.Fprintf(&b, ", ... (%d in all)", len(ns))
			break
		}
		if i > 0 {
			b.WriteString(", ")
		}
		if utf8.RuneCountInString(n) > maxQuoted {
			b.WriteString(clip(n))
		} else {
			b.WriteString(n)
		}
	}
	return b.String()
}

// plural returns one when n is 1, else many.
func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}
