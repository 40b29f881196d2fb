package main

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"
)

// Table is a CSV file read into named columns of numbers.
type Table struct {
	Names   []string
	Columns map[string][]float64
}

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
		fmt.Fprintf(&b, ": column %q", e.Column)
	}
	b.WriteString(": ")
	b.WriteString(e.Msg)
	return b.String()
}

// ReadCSV reads a CSV file with a header line of column names and one
// number per cell. Empty cells and cells that are not finite numbers are
// errors that name the line and column: the library's fits need every
// sample (fill gaps before, and say how in your report).
func ReadCSV(name string, r io.Reader) (*Table, error) {
	cr := csv.NewReader(r)
	cr.TrimLeadingSpace = true
	cr.Comment = '#'
	cr.FieldsPerRecord = -1 // checked below, with the counts in the message
	header, err := cr.Read()
	if err != nil {
		if errors.Is(err, io.EOF) {
			return nil, &CSVError{File: name, Msg: "the file is empty (a header line of column names is needed)"}
		}
		return nil, &CSVError{File: name, Line: 1, Msg: err.Error()}
	}
	t := &Table{Columns: make(map[string][]float64, len(header))}
	for _, h := range header {
		h = strings.TrimSpace(h)
		if _, dup := t.Columns[h]; dup || h == "" {
			return nil, &CSVError{File: name, Line: 1, Column: h, Msg: "column names must be unique and not empty"}
		}
		t.Names = append(t.Names, h)
		t.Columns[h] = nil
	}
	for {
		rec, err := cr.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		line, _ := cr.FieldPos(0)
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				return nil, &CSVError{File: name, Line: pe.Line, Msg: pe.Err.Error()}
			}
			return nil, &CSVError{File: name, Line: line, Msg: err.Error()}
		}
		if len(rec) != len(t.Names) {
			return nil, &CSVError{File: name, Line: line,
				Msg: fmt.Sprintf("%d %s, but the header names %d columns (%s)", len(rec), plural(len(rec), "field", "fields"), len(t.Names), strings.Join(t.Names, ", "))}
		}
		for i, cell := range rec {
			col := t.Names[i]
			v, err := strconv.ParseFloat(strings.TrimSpace(cell), 64)
			if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
				return nil, &CSVError{File: name, Line: line, Column: col, Msg: fmt.Sprintf("%q is not a finite number", cell)}
			}
			t.Columns[col] = append(t.Columns[col], v)
		}
	}
	if len(t.Columns[t.Names[0]]) == 0 {
		return nil, &CSVError{File: name, Msg: "no data lines after the header"}
	}
	return t, nil
}

// ReadCSVFile opens and reads a CSV file (see ReadCSV).
func ReadCSVFile(path string) (*Table, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return ReadCSV(path, f)
}

// Select returns the named columns as a data map for the library, or an
// error naming a missing column and listing those present.
func (t *Table) Select(names ...string) (map[string][]float64, error) {
	data := make(map[string][]float64, len(names))
	for _, n := range names {
		c, ok := t.Columns[n]
		if !ok {
			return nil, fmt.Errorf("no column %q in the data (columns: %s)", n, strings.Join(t.Names, ", "))
		}
		data[n] = c
	}
	return data, nil
}

// plural returns one when n is 1, else many.
func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}
