package main

import (
	"bufio"
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/backshift/backshift/examples/internal/suggest"
	"github.com/backshift/backshift/tf/predict"
)

// maxLine is the longest sample line read, 64 KiB: a line holds one
// sample of a few series.
const maxLine = 64 << 10

// LineError is a sample line the service refuses: the loop, the 1-based
// line of the request body, the field (a series name, "stamp", or empty
// for the line as a whole), what is wrong and how to fix it. The lines
// before it were taken; it and the lines after it were not.
type LineError struct {
	Loop  string `json:"loop"`
	Line  int    `json:"line"`
	Field string `json:"field,omitempty"`
	Msg   string `json:"error"`
	// Taken is the number of lines of the request taken before this one.
	Taken int   `json:"taken"`
	Err   error `json:"-"`
}

// Error describes the problem with its loop, line and field.
func (e *LineError) Error() string {
	s := fmt.Sprintf("loop %q, line %d", e.Loop, e.Line)
	if e.Field != "" {
		s += ", field " + strconv.Quote(e.Field)
	}
	return s + ": " + e.Msg
}

// Unwrap returns the library's error behind the problem, if any.
func (e *LineError) Unwrap() error { return e.Err }

// fieldError is a problem with one field of a line or of a request.
type fieldError struct {
	Field string
	Msg   string
	Err   error
}

func (e *fieldError) Error() string { return fmt.Sprintf("field %q: %s", e.Field, e.Msg) }
func (e *fieldError) Unwrap() error { return e.Err }

// feed takes the JSON lines of body, one sample each, in order; l.mu
// must be held. It stops at the first bad line with a *LineError. It
// returns the number of lines taken and of alarms raised.
func (l *loop) feed(body io.Reader) (taken, alarms int, err error) {
	sc := bufio.NewScanner(body)
	sc.Buffer(make([]byte, 0, 4096), maxLine)
	line := 0
	for sc.Scan() {
		line++
		text := bytes.TrimSpace(sc.Bytes())
		if len(text) == 0 {
			continue
		}
		stamp, y, ferr := l.parse(text)
		if ferr == nil {
			var n int
			n, ferr = l.takeOrField(stamp, y)
			alarms += n
		}
		if ferr != nil {
			return taken, alarms, l.lineError(line, taken, ferr)
		}
		taken++
	}
	if err := sc.Err(); err != nil {
		msg := "the body could not be read: " + err.Error()
		if errors.Is(err, bufio.ErrTooLong) {
			msg = fmt.Sprintf("the line is longer than %d KiB; a line holds one sample as a JSON object", maxLine>>10)
		}
		return taken, alarms, &LineError{Loop: l.spec.Name, Line: line + 1, Msg: msg, Taken: taken, Err: err}
	}
	return taken, alarms, nil
}

// lineError turns a problem with one line into a *LineError.
func (l *loop) lineError(line, taken int, err error) *LineError {
	le := &LineError{Loop: l.spec.Name, Line: line, Taken: taken, Msg: err.Error(), Err: err}
	var fe *fieldError
	if errors.As(err, &fe) {
		le.Field, le.Msg, le.Err = fe.Field, fe.Msg, fe.Err
	}
	return le
}

// takeOrField takes a parsed sample and names the field of a sample the
// predictor refuses.
func (l *loop) takeOrField(stamp int64, y float64) (int, error) {
	n, err := l.take(stamp, y)
	var se *predict.SampleError
	if errors.As(err, &se) {
		return 0, &fieldError{Field: se.Series, Msg: err.Error(), Err: err}
	}
	return n, err
}

// parse reads one sample line into l.x and returns its stamp and output
// (NaN when missing). A line is a JSON object with a number for every
// input, a number or null (or no key) for the output, and optionally an
// integer "stamp"; without one the stamp is the sample's index.
func (l *loop) parse(text []byte) (int64, float64, error) {
	dec := json.NewDecoder(bytes.NewReader(text))
	dec.UseNumber()
	if tok, err := dec.Token(); err != nil || tok != json.Delim('{') {
		return 0, 0, fmt.Errorf("a sample line is one JSON object, such as %s", l.exampleLine())
	}
	stamp, y := l.samples, math.NaN()
	seen := make([]bool, len(l.inputs)+2) // inputs, output, stamp
	for dec.More() {
		tok, err := dec.Token()
		key, _ := tok.(string)
		if err != nil {
			return 0, 0, fmt.Errorf("not valid JSON: %v", err)
		}
		i, known := l.col[key]
		slot := i
		switch {
		case key == stampKey:
			slot = len(l.inputs) + 1
		case !known:
			return 0, 0, &fieldError{Field: key, Msg: l.unknown(key)}
		case i < 0:
			slot = len(l.inputs)
		}
		if seen[slot] {
			return 0, 0, &fieldError{Field: key, Msg: "given twice in the line; give each series once"}
		}
		seen[slot] = true
		v, err := dec.Token()
		if err != nil {
			return 0, 0, &fieldError{Field: key, Msg: fmt.Sprintf("not valid JSON: %v", err)}
		}
		if err := l.value(key, i, v, &stamp, &y); err != nil {
			return 0, 0, err
		}
	}
	if _, err := dec.Token(); err != nil {
		return 0, 0, fmt.Errorf("not valid JSON: %v", err)
	}
	if _, err := dec.Token(); err != io.EOF {
		return 0, 0, errors.New("text after the sample's object; give one object per line")
	}
	for i, s := range l.inputs {
		if !seen[i] {
			return 0, 0, &fieldError{Field: s, Msg: "no value for this input; every line needs every input (only the output may be missing)"}
		}
	}
	return stamp, y, nil
}

// value stores the value v of key: the stamp, the output (i < 0) or
// input i.
func (l *loop) value(key string, i int, v json.Token, stamp *int64, y *float64) error {
	num, isNum := v.(json.Number)
	switch {
	case key == stampKey:
		s, err := strconv.ParseInt(string(num), 10, 64)
		if !isNum || err != nil {
			return &fieldError{Field: key, Msg: fmt.Sprintf("the stamp is %s; give an integer (your time unit, such as Unix seconds)", show(v))}
		}
		*stamp = s
		return nil
	case v == nil && i < 0:
		return nil // a missing output
	case v == nil:
		return &fieldError{Field: key, Msg: "an input is null; inputs must be given on every sample (only the output may be null, for a missing value)"}
	case !isNum:
		return &fieldError{Field: key, Msg: fmt.Sprintf("holds %s; give a number (or null for a missing output)", show(v))}
	}
	f, err := strconv.ParseFloat(string(num), 64)
	if err != nil {
		return &fieldError{Field: key, Msg: fmt.Sprintf("%s is out of the range of float64; rescale the series", num)}
	}
	if i < 0 {
		*y = f
	} else {
		l.x[i] = f
	}
	return nil
}

// unknown words the problem of a key that is no series of the loop.
func (l *loop) unknown(key string) string {
	all := append([]string{l.spec.Model.Output}, l.inputs...)
	msg := fmt.Sprintf("not a series of the loop (its output %q, its inputs %s, and %q)", l.spec.Model.Output, quoted(l.inputs), stampKey)
	if d := suggest.DidYouMean(key, append(all, stampKey)...); d != "" {
		msg += "; " + d
	}
	return msg
}

// exampleLine is a sample line of the loop, for messages.
func (l *loop) exampleLine() string {
	parts := []string{fmt.Sprintf("%q: 1700000000", stampKey)}
	for _, s := range l.inputs {
		parts = append(parts, fmt.Sprintf("%q: 1.5", s))
	}
	parts = append(parts, fmt.Sprintf("%q: 20.1", l.spec.Model.Output))
	return "{" + strings.Join(parts, ", ") + "}"
}

// show names a JSON value for a message.
func show(v json.Token) string {
	switch v := v.(type) {
	case nil:
		return "null"
	case string:
		return "the string " + strconv.Quote(v)
	case bool:
		return strconv.FormatBool(v)
	case json.Delim:
		if v == '[' {
			return "an array"
		}
		return "an object"
	case json.Number:
		return string(v)
	}
	return fmt.Sprint(v)
}

// quoted lists names, quoted.
func quoted(list []string) string {
	q := make([]string, len(list))
	for i, s := range list {
		q[i] = strconv.Quote(s)
	}
	return strings.Join(q, ", ")
}
