package record

import (
	"fmt"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/backshift/backshift/internal/errs"
)

// SettingError reports a setting that breaks its rule (the shared
// shape, see tf.SettingError).
type SettingError = errs.SettingError

// SeriesError reports a problem with a whole series (the shared shape):
// here a series named in Settings.Series that the file has no column
// for, of kind ErrName.
type SeriesError = errs.SeriesError

// SampleError reports one bad sample (the shared shape).
type SampleError = errs.SampleError

// The kinds of error shared by the library, for errors.Is.
var (
	// ErrSample: a cell is not a finite number or a time, or rows of
	// the record are missing (a *GapError).
	ErrSample = errs.ErrSample
	// ErrName: a column name is empty or repeated, or a named series
	// has no column.
	ErrName = errs.ErrName
	// ErrSetting: a setting breaks its rule.
	ErrSetting = errs.ErrSetting
	// ErrShort: a record with a header and no data lines, or an empty
	// file.
	ErrShort = errs.ErrShort
)

// ErrFormat (the shared kind of text that does not follow its format) is
// the kind of a *LineError for text that is not a CSV
// record of the expected shape: a stray quote, a line with more or fewer
// fields than the header, a header read as a single column.
var ErrFormat = errs.ErrFormat

// LineError reports a problem at a place in a file: the file name, the
// 1-based line (0 when the problem is the whole file) and the column
// name (empty when the problem is the line), what is wrong and how to
// fix it. Kind is one of ErrFormat, ErrSample, ErrName and ErrShort.
// The message starts with file:line, as a compiler's does, so that
// editors can jump to it.
type LineError struct {
	File    string
	Line    int
	Column  string
	Problem string
	Kind    error
}

// Error prints file:line: column "name": problem.
func (e *LineError) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Line > 0 {
		fmt.Fprintf(&b, ":%d", e.Line)
	}
	if e.Column != "" {
		fmt.Fprintf(&b, ": column %s", clip(e.Column))
	}
	b.WriteString(": ")
	b.WriteString(e.Problem)
	return b.String()
}

// Unwrap returns Kind (ErrFormat when not set).
func (e *LineError) Unwrap() error {
	if e.Kind == nil {
		return ErrFormat
	}
	return e.Kind
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
