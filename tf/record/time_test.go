package record

import (
	"strings"
	"testing"

	"github.com/backshift/backshift/tf"
)

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
