package testutil

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"
)

// Table is a CSV file with a header line as read by LoadCSV: the column
// names in file order, the numeric columns by name, and the columns
// asked for as text by name.
type Table struct {
	// Path is the file the table was read from, for messages.
	Path string
	// Names are the header's column names in file order.
	Names []string
	// Num holds every column not asked for as text, one value per data
	// line; the cell NA (written by R for a missing value) reads as NaN.
	Num map[string][]float64
	// Text holds the columns asked for as text, cells as written.
	Text map[string][]string
}

// Column returns the numeric column name, failing the test naming the
// file and the columns it has when there is none.
func (tb *Table) Column(t testing.TB, name string) []float64 {
	t.Helper()
	c, ok := tb.Num[name]
	if !ok {
		t.Fatalf("%s: no numeric column %q (columns %s)", tb.Path, name, strings.Join(tb.Names, ", "))
	}
	return c
}

// ReadCSV reads the CSV file at path (relative to the repository root
// unless absolute) with LoadCSV, failing the test on error.
func ReadCSV(t testing.TB, path string, text ...string) *Table {
	t.Helper()
	if !filepath.IsAbs(path) {
		path = filepath.Join(Root(), path)
	}
	tb, err := LoadCSV(path, text...)
	if err != nil {
		t.Fatal(err)
	}
	return tb
}

// LoadCSV reads the CSV file at path: a header line naming the columns,
// then data lines with as many fields as the header. The columns named
// in text are kept as strings; every other cell must be a number or NA.
// Errors name the file and the line ("file.csv:4: ..."): a missing
// header, an empty or repeated column name, a text column the header
// lacks, a line with the wrong number of fields, a cell that is not a
// number.
func LoadCSV(path string, text ...string) (*Table, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	tb, err := parseCSV(f, path, text)
	if err != nil {
		return nil, fmt.Errorf("%s:%w", path, err)
	}
	return tb, nil
}

// LoadRecord reads the CSV file at path (relative to the repository root
// unless absolute) with LoadCSV and returns the numeric columns named, by
// name: a record as the estimation functions take it. A column the file
// lacks is an error naming the file and the columns it has. For the
// examples and programs that have no testing.TB to fail.
func LoadRecord(path string, names ...string) (map[string][]float64, error) {
	if !filepath.IsAbs(path) {
		path = filepath.Join(Root(), path)
	}
	tb, err := LoadCSV(path)
	if err != nil {
		return nil, err
	}
	rec := make(map[string][]float64, len(names))
	for _, name := range names {
		c, ok := tb.Num[name]
		if !ok {
			return nil, fmt.Errorf("%s: no numeric column %q (columns %s)", path, name, strings.Join(tb.Names, ", "))
		}
		rec[name] = c
	}
	return rec, nil
}

// parseCSV reads a table from r; errors start with the line number.
//
// Over 60 lines: one pass of a small CSV reader, each check beside the
// field it reads so that its line-numbered messages can be matched to
// the format.
func parseCSV(r io.Reader, path string, text []string) (*Table, error) {
	rd := csv.NewReader(r)
	rd.FieldsPerRecord = -1 // counted below, for a message naming the header
	header, err := rd.Read()
	if errors.Is(err, io.EOF) {
		return nil, fmt.Errorf("1: no header line")
	}
	if err != nil {
		return nil, csvLineErr(err)
	}
	tb := &Table{Path: path, Names: header, Num: map[string][]float64{}, Text: map[string][]string{}}
	for j, h := range header {
		if h == "" {
			return nil, fmt.Errorf("1: column %d has no name", j+1)
		}
		if slices.Index(header, h) != j {
			return nil, fmt.Errorf("1: column name %q appears twice", h)
		}
	}
	isText := make([]bool, len(header))
	for _, name := range text {
		j := slices.Index(header, name)
		if j < 0 {
			return nil, fmt.Errorf("1: no column %q to read as text (columns %s)", name, strings.Join(header, ", "))
		}
		isText[j] = true
	}
	for j, h := range header {
		if isText[j] {
			tb.Text[h] = []string{}
		} else {
			tb.Num[h] = []float64{}
		}
	}
	for {
		row, err := rd.Read()
		if errors.Is(err, io.EOF) {
			return tb, nil
		}
		if err != nil {
			return nil, csvLineErr(err)
		}
		line, _ := rd.FieldPos(0)
		if len(row) != len(header) {
			return nil, fmt.Errorf("%d: %d fields, the header has %d (%s)", line, len(row), len(header), strings.Join(header, ", "))
		}
		for j, cell := range row {
			h := header[j]
			if isText[j] {
				tb.Text[h] = append(tb.Text[h], cell)
				continue
			}
			v := math.NaN()
			if cell != "NA" {
				if v, err = strconv.ParseFloat(strings.TrimSpace(cell), 64); err != nil {
					return nil, fmt.Errorf("%d: column %q: %q is not a number", line, h, cell)
				}
			}
			tb.Num[h] = append(tb.Num[h], v)
		}
	}
}

// csvLineErr rewrites a *csv.ParseError to start with its line number.
func csvLineErr(err error) error {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return fmt.Errorf("%d: %v", pe.Line, pe.Err)
	}
	return fmt.Errorf(" %w", err) // not a line's fault: an I/O error
}
