package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"slices"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/backshift/backshift/parse"
)

// Config is a site's model library.
type Config struct {
	// Site names the plant.
	Site string `json:"site"`
	// Models lists the models, each with a unique name.
	Models []Entry `json:"models"`
}

// Entry is one model of the library.
type Entry struct {
	Name  string     `json:"name"`
	Notes string     `json:"notes,omitempty"`
	Spec  parse.Spec `json:"spec"`
}

// Problem is one thing wrong with a config file, at a 1-based line and
// byte column of the file.
type Problem struct {
	File         string
	Line, Column int
	Msg          string
	// Text is the file's line holding the problem (without its line
	// break), for a caret display.
	Text string
}

// Error prints file:line:col: message, the offending line and a caret.
func (p *Problem) Error() string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s:%d:%d: %s", p.File, p.Line, p.Column, p.Msg)
	if p.Text != "" {
		pad := utf8.RuneCountInString(p.Text[:min(p.Column-1, len(p.Text))])
		fmt.Fprintf(&b, "\n    %s\n    %s^", strings.ReplaceAll(p.Text, "\t", " "), strings.Repeat(" ", pad))
	}
	return b.String()
}

// Problems is every problem found in one file, in file order.
type Problems []*Problem

// Error prints every problem, one after the other.
func (ps Problems) Error() string {
	s := make([]string, len(ps))
	for i, p := range ps {
		s[i] = p.Error()
	}
	return strings.Join(s, "\n")
}

// Unwrap returns the problems for errors.As.
func (ps Problems) Unwrap() []error {
	out := make([]error, len(ps))
	for i, p := range ps {
		out[i] = p
	}
	return out
}

// Load decodes and validates a config file. file names it in messages.
// It returns Problems when anything is wrong: JSON syntax or unknown
// fields (the first such problem), or else every missing or repeated
// model name, spec that does not parse (each spec error positioned in
// the file) and model without a sample interval.
func Load(file string, raw []byte) (*Config, error) {
	pos := newPositions(file, raw)
	// First pass: decode with the specs as plain strings, to check the
	// JSON and the fields.
	var plain struct {
		Site   string `json:"site"`
		Models []struct {
			Name  string `json:"name"`
			Notes string `json:"notes"`
			Spec  string `json:"spec"`
		} `json:"models"`
	}
	dec := json.NewDecoder(bytes.NewReader(raw))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&plain); err != nil {
		return nil, Problems{pos.fromJSON(err)}
	}
	names, err := findStrings(raw, "name")
	if err != nil {
		return nil, Problems{pos.fromJSON(err)}
	}
	specs, err := findStrings(raw, "spec")
	if err != nil {
		return nil, Problems{pos.fromJSON(err)}
	}
	var probs Problems
	if len(plain.Models) == 0 {
		probs = append(probs, pos.at(0, `the config lists no models (a "models" array is needed)`))
	}
	// Names: present and unique. The i-th name and spec literals belong
	// to the i-th model when every model has both; otherwise point at
	// the start of the file.
	seen := map[string]bool{}
	for i, e := range plain.Models {
		at := 0
		if len(names) == len(plain.Models) {
			at = names[i].start
		}
		switch {
		case e.Name == "":
			probs = append(probs, pos.at(at, fmt.Sprintf("model %d has no name", i+1)))
		case seen[e.Name]:
			probs = append(probs, pos.at(at, fmt.Sprintf("model name %q is used twice; names must be unique", e.Name)))
		}
		seen[e.Name] = true
	}
	// Specs: each parses (every problem, positioned in the file) and has
	// a sample interval.
	for i, e := range plain.Models {
		var sp *specString
		if len(specs) == len(plain.Models) {
			sp = &specs[i]
		}
		at := func(off int) int {
			if sp == nil {
				return 0
			}
			return sp.fileOffset(off)
		}
		if strings.TrimSpace(e.Spec) == "" {
			probs = append(probs, pos.at(at(-1), fmt.Sprintf("model %q has no spec", e.Name)))
			continue
		}
		m, err := parse.Model(e.Spec)
		if err != nil {
			var list parse.ErrorList
			if !errors.As(err, &list) {
				probs = append(probs, pos.at(at(-1), err.Error()))
				continue
			}
			for _, pe := range list {
				probs = append(probs, pos.at(at(pe.Pos.Offset), pe.Msg))
			}
			continue
		}
		if m.Interval.Value == 0 {
			probs = append(probs, pos.at(at(len(e.Spec)), fmt.Sprintf(`model %q has no sample interval; end its spec with "every 1 min" (or s, h, d)`, e.Name)))
		}
	}
	if len(probs) > 0 {
		slices.SortStableFunc(probs, func(a, b *Problem) int {
			if a.Line != b.Line {
				return a.Line - b.Line
			}
			return a.Column - b.Column
		})
		return nil, probs
	}
	// Second pass: decode into the typed config; encoding/json hands
	// each spec field to parse.Spec.UnmarshalText.
	var c Config
	if err := json.Unmarshal(raw, &c); err != nil {
		return nil, Problems{pos.fromJSON(err)}
	}
	return &c, nil
}

// specString is a "spec" string literal found in the file.
type specString struct {
	text  string // decoded
	start int    // file offset of the opening quote
	// offs[i] is the file offset of decoded byte i (one past the end for
	// i = len(text)).
	offs []int
}

func (s specString) fileOffset(i int) int {
	if i < 0 {
		return s.start
	}
	if i >= len(s.offs) {
		return s.offs[len(s.offs)-1]
	}
	return s.offs[i]
}

// findStrings walks the JSON tokens and returns every string value of
// the given key in an object, in file order, with the map from decoded
// bytes to file offsets.
func findStrings(raw []byte, key string) ([]specString, error) {
	dec := json.NewDecoder(bytes.NewReader(raw))
	var out []specString
	var stack []bool // true for an object (keys alternate with values)
	expectKey := false
	lastKey := ""
	for {
		tok, err := dec.Token()
		if err != nil {
			if errors.Is(err, io.EOF) {
				return out, nil
			}
			return nil, err
		}
		end := int(dec.InputOffset())
		switch t := tok.(type) {
		case json.Delim:
			switch t {
			case '{':
				stack = append(stack, true)
				expectKey = true
			case '[':
				stack = append(stack, false)
				expectKey = false
			default:
				stack = stack[:len(stack)-1]
				expectKey = len(stack) > 0 && stack[len(stack)-1]
			}
			continue
		case string:
			if expectKey {
				lastKey = t
				expectKey = false
				continue
			}
			if lastKey == key && len(stack) > 0 && stack[len(stack)-1] {
				s, err := literalAt(raw, end)
				if err != nil {
					return nil, err
				}
				out = append(out, s)
			}
		}
		if len(stack) > 0 && stack[len(stack)-1] {
			expectKey = true
			lastKey = ""
		}
	}
}

// literalAt decodes the JSON string literal that ends just before file
// offset end, recording where each decoded byte came from.
func literalAt(raw []byte, end int) (specString, error) {
	// Find the opening quote: scan back over the literal, which ends
	// with an unescaped quote at end-1.
	q := end - 1
	for q >= 0 && raw[q] != '"' {
		q--
	}
	start := q - 1
	for ; start >= 0; start-- {
		if raw[start] == '"' && !escaped(raw, start) {
			break
		}
	}
	s := specString{start: start}
	var b []byte
	for i := start + 1; i < q; {
		c := raw[i]
		if c != '\\' {
			s.offs = append(s.offs, i)
			b = append(b, c)
			i++
			continue
		}
		// An escape: all decoded bytes map to the backslash.
		var dec []byte
		n := 2
		switch raw[i+1] {
		case 'n':
			dec = []byte{'\n'}
		case 't':
			dec = []byte{'\t'}
		case 'r':
			dec = []byte{'\r'}
		case 'b':
			dec = []byte{'\b'}
		case 'f':
			dec = []byte{'\f'}
		case 'u':
			n = 6
			v, err := strconv.ParseUint(string(raw[i+2:i+6]), 16, 32)
			if err != nil {
				return s, err
			}
			dec = utf8.AppendRune(nil, rune(v))
		default:
			dec = []byte{raw[i+1]}
		}
		for range dec {
			s.offs = append(s.offs, i)
		}
		b = append(b, dec...)
		i += n
	}
	s.offs = append(s.offs, q)
	s.text = string(b)
	return s, nil
}

// escaped reports whether the byte at i is preceded by an odd number of
// backslashes.
func escaped(raw []byte, i int) bool {
	n := 0
	for j := i - 1; j >= 0 && raw[j] == '\\'; j-- {
		n++
	}
	return n%2 == 1
}

// positions turns file offsets into lines and columns.
type positions struct {
	file  string
	raw   []byte
	lines []int // offset of the start of each line
}

func newPositions(file string, raw []byte) *positions {
	p := &positions{file: file, raw: raw, lines: []int{0}}
	for i, c := range raw {
		if c == '\n' {
			p.lines = append(p.lines, i+1)
		}
	}
	return p
}

func (p *positions) at(off int, msg string) *Problem {
	off = max(0, min(off, len(p.raw)))
	l := 0
	for l+1 < len(p.lines) && p.lines[l+1] <= off {
		l++
	}
	endLine := len(p.raw)
	if l+1 < len(p.lines) {
		endLine = p.lines[l+1] - 1
	}
	text := strings.TrimRight(string(p.raw[p.lines[l]:endLine]), "\r")
	return &Problem{File: p.file, Line: l + 1, Column: off - p.lines[l] + 1, Msg: msg, Text: text}
}

// fromJSON positions an error from encoding/json.
func (p *positions) fromJSON(err error) *Problem {
	var se *json.SyntaxError
	if errors.As(err, &se) {
		return p.at(int(se.Offset)-1, "JSON: "+se.Error())
	}
	var te *json.UnmarshalTypeError
	if errors.As(err, &te) {
		return p.at(int(te.Offset), fmt.Sprintf("JSON: field %q holds a %s, want a %s", te.Field, te.Value, te.Type))
	}
	msg := err.Error()
	if strings.Contains(msg, "unknown field") {
		name := msg[strings.Index(msg, `"`):]
		off := bytes.Index(p.raw, []byte(name))
		return p.at(off, "JSON: unknown field "+name+" (known: site, models, name, notes, spec)")
	}
	return p.at(0, "JSON: "+msg)
}
