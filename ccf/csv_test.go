package ccf

import (
	"encoding/csv"
	"os"
	"strconv"
	"testing"
)

// readCSV reads a CSV file with a header row into a map from column name
// to the column's text values.
func readCSV(t *testing.T, path string) (header []string, rows [][]string) {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.FieldsPerRecord = -1
	all, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return all[0], all[1:]
}

// readColumns reads the named numeric columns of a CSV file.
func readColumns(t *testing.T, path string, names ...string) [][]float64 {
	t.Helper()
	header, rows := readCSV(t, path)
	out := make([][]float64, len(names))
	for i, name := range names {
		col := -1
		for j, h := range header {
			if h == name {
				col = j
			}
		}
		if col < 0 {
			t.Fatalf("%s: no column %q", path, name)
		}
		for _, row := range rows {
			v, err := strconv.ParseFloat(row[col], 64)
			if err != nil {
				t.Fatalf("%s: %v", path, err)
			}
			out[i] = append(out[i], v)
		}
	}
	return out
}
