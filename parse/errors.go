package parse

import (
	"fmt"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/backshift/backshift/tf"
)

// Kinds of spec errors. Every *Error wraps one of them, so that callers
// may test the kind with errors.Is. Each is a precise kind under the
// library's shared kind tf.ErrModel ("a model cannot be used"): a spec
// that does not parse, breaks a rule of the language or is over a limit
// describes no usable model, so errors.Is(err, tf.ErrModel) holds for
// every error of this package, as it does for tf's own model errors.
var (
	// ErrSyntax marks text that is not written in the spec language.
	ErrSyntax error = &kind{"parse: syntax error"}
	// ErrModel marks a spec that is well formed but does not describe a
	// valid model (a denominator whose constant term is not 1, an input
	// named twice, ...).
	ErrModel error = &kind{"parse: invalid model"}
	// ErrLimit marks a spec over one of the documented limits (length,
	// tokens, degree, dead time, number of inputs, nesting).
	ErrLimit error = &kind{"parse: over a limit"}
)

// kind is a kind of spec error: a sentinel that unwraps to tf.ErrModel.
type kind struct{ msg string }

func (k *kind) Error() string { return k.msg }

// Unwrap returns the shared kind tf.ErrModel.
func (k *kind) Unwrap() error { return tf.ErrModel }

// Error is one problem in a spec, at a position in its text.
//
// Error() prints it as
//
//	line:col: message
//	    the offending line of the spec
//	    ^ (a caret under column col)
//
// Line and column are 1-based; the column counts bytes from the start of
// the line (the caret is placed by characters, so it sits under the right
// character in a line with non-ASCII text). A line longer than 120 bytes
// is printed as a window around the column, marked with "...".
type Error struct {
	Pos  tf.Pos // where the problem is
	Msg  string // what is wrong, in the spec's own words
	Text string // the line of the spec that holds Pos, without its line break
	Kind error  // ErrSyntax, ErrModel or ErrLimit
	// Path is set by Check for a problem in the values of a model (not
	// in spec text): the Go path of the offending field from the model,
	// such as "Inputs[0].Num.Factors[1].Exp" or "Interval.Unit" ("." for
	// the model as a whole). It is empty for errors in spec text.
	Path string
}

// Error returns "line:col: message" followed by the spec line and a caret.
// For a problem Check found in a model's values it returns "path:
// message", followed by " (written at line:col)" when the value came
// from a spec; for an error with neither a path nor a position, the
// message alone.
func (e *Error) Error() string {
	if e.Path != "" {
		s := e.Path + ": " + e.Msg
		if e.Pos.IsValid() {
			s += " (written at " + strconv.Itoa(e.Pos.Line) + ":" + strconv.Itoa(e.Pos.Column) + ")"
		}
		return s
	}
	if !e.Pos.IsValid() {
		return e.Msg
	}
	var b strings.Builder
	b.WriteString(strconv.Itoa(e.Pos.Line))
	b.WriteByte(':')
	b.WriteString(strconv.Itoa(e.Pos.Column))
	b.WriteString(": ")
	b.WriteString(e.Msg)
	if e.Text != "" || e.Pos.Column > 0 {
		line, col := snippet(e.Text, e.Pos.Column-1)
		b.WriteString("\n    ")
		b.WriteString(line)
		b.WriteString("\n    ")
		b.WriteString(caretPad(line, col))
		b.WriteByte('^')
	}
	return b.String()
}

// snippetLen is the longest spec line printed whole under an error;
// longer lines are cut to a window around the column.
const snippetLen = 120

// snippet returns the part of line to print and the byte column of the
// caret in it: the whole line when it is short, else about 60 bytes
// before and 50 after the column, cut at character boundaries and marked
// with "...".
func snippet(line string, col int) (string, int) {
	if len(line) <= snippetLen {
		return line, col
	}
	col = min(max(col, 0), len(line))
	lo, hi := max(col-60, 0), min(col+50, len(line))
	for lo > 0 && !utf8.RuneStart(line[lo]) {
		lo--
	}
	for hi < len(line) && !utf8.RuneStart(line[hi]) {
		hi++
	}
	out := line[lo:hi]
	if lo > 0 {
		out = "..." + out
		col = col - lo + 3
	}
	if hi < len(line) {
		out += "..."
	}
	return out, col
}

// Unwrap returns the kind of the error (ErrSyntax, ErrModel or ErrLimit).
func (e *Error) Unwrap() error { return e.Kind }

// caretPad returns the blanks that put a caret under byte column n of
// line: one blank per character, tabs kept as tabs.
func caretPad(line string, n int) string {
	if n > len(line) {
		return strings.Repeat(" ", utf8.RuneCountInString(line)+n-len(line))
	}
	var b strings.Builder
	for _, r := range line[:max(n, 0)] {
		if r == '\t' {
			b.WriteByte('\t')
		} else {
			b.WriteByte(' ')
		}
	}
	return b.String()
}

// ErrorList is the list of problems found in one spec, in the order of
// their positions. Model returns an ErrorList holding at least one
// *Error; errors.As(err, &e) with e a *Error yields the first one.
type ErrorList []*Error

// Error prints the first error, followed by "(and N more errors)" when
// there are more.
func (l ErrorList) Error() string {
	switch len(l) {
	case 0:
		return "no errors"
	case 1:
		return l[0].Error()
	}
	return fmt.Sprintf("%s\n(and %d more errors)", l[0].Error(), len(l)-1)
}

// Unwrap returns the errors of the list, for errors.Is and errors.As.
func (l ErrorList) Unwrap() []error {
	out := make([]error, len(l))
	for i, e := range l {
		out[i] = e
	}
	return out
}

// maxErrors caps how many problems one spec reports.
const maxErrors = 10

// quoteChar quotes the first character of s for a message; a byte that
// is not UTF-8 is shown in hex.
func quoteChar(s string) string {
	r, n := utf8.DecodeRuneInString(s)
	if r == utf8.RuneError && n <= 1 {
		return fmt.Sprintf("byte 0x%02x", s[0])
	}
	return strconv.QuoteRune(r)
}

// lineAt returns the line of src that holds byte offset off.
func lineAt(src string, off int) string {
	off = min(max(off, 0), len(src))
	start := strings.LastIndexByte(src[:off], '\n') + 1
	end := strings.IndexByte(src[off:], '\n')
	if end < 0 {
		end = len(src)
	} else {
		end += off
	}
	return strings.TrimSuffix(src[start:end], "\r")
}
