package identify

import (
	"errors"
	"math"
	"strconv"
	"strings"

	"github.com/backshift/backshift/internal/errs"
	"github.com/backshift/backshift/internal/gaps"
)

// Gaps returns the runs of missing samples (NaN) of x, oldest first,
// each as a half-open range [start, end) of indices: x[start:end] is all
// NaN and the samples either side (when inside x) are not. A series with
// no missing sample gives nil. Gaps is safe for concurrent use and does
// not modify x.
func Gaps(x []float64) [][2]int { return gaps.Runs(x) }

// GapFree returns the longest stretch of samples [from, to) in which
// none of the named series of data is NaN (a missing sample), the later
// one on a tie (the process as it is now). A name that is not in data,
// or series of different lengths, count only up to the shortest; with
// no gap it returns 0 and the length of the series, and 0, 0 when every
// sample is missing.
//
// Identification needs a gap-free record (see Candidates): identify on
// data[name][from:to] and fit the chosen structure to the whole record
// with fit.Settings.Method = fit.ExactML, which skips missing outputs
// exactly. GapFree is safe for concurrent use and does not modify data.
func GapFree(data map[string][]float64, names ...string) (from, to int) {
	n := -1
	for _, name := range names {
		if l := len(data[name]); n < 0 || l < n {
			n = l
		}
	}
	if n <= 0 {
		return 0, 0
	}
	start, best := 0, -1
	for t := 0; t <= n; t++ {
		if t < n && !anyMissing(data, names, t) {
			continue
		}
		if t-start >= best {
			best, from, to = t-start, start, t
		}
		start = t + 1
	}
	if best == 0 {
		return 0, 0
	}
	return from, to
}

// anyMissing reports whether any named series is NaN at t.
func anyMissing(data map[string][]float64, names []string, t int) bool {
	for _, name := range names {
		if math.IsNaN(data[name][t]) {
			return true
		}
	}
	return false
}

// missingErr is the error for the missing (NaN) samples of a series:
// the *SampleError of the first one joined with a *SeriesError of kind
// ErrSample that lists the gaps (at most eight) and says what to do.
// role is "output" or "input".
func missingErr(name, role string, x []float64, data map[string][]float64, all []string) error {
	rs := gaps.Runs(x)
	var parts []string
	total := 0
	for i, r := range rs {
		total += r[1] - r[0]
		if i < 8 {
			parts = append(parts, gaps.Span(r))
		}
	}
	where := strings.Join(parts, ", ")
	if len(rs) > 8 {
		where += " and " + strconv.Itoa(len(rs)-8) + " more gaps"
	}
	from, to := GapFree(data, all...)
	detail := "the " + role + ": " + strconv.Itoa(total) + " missing (NaN) at " + where +
		"; identification (prewhitening, cross-correlation, the least-squares fits that rank the candidates) needs a gap-free record: " +
		"identify on the longest gap-free stretch (identify.GapFree: samples " + strconv.Itoa(from) + ".." + strconv.Itoa(to-1) + ")"
	if role == "output" {
		detail += " and fit the chosen structure to the whole record with fit.Settings.Method = fit.ExactML, which skips missing outputs exactly"
	} else {
		detail += ", or fill short input gaps (fit.Settings.InputGaps; the transfer filters need every past input value)"
	}
	return errors.Join(&errs.SampleError{Series: name, Index: rs[0][0], Value: math.NaN()},
		&errs.SeriesError{Series: name, Kind: errs.ErrSample, Detail: detail})
}
