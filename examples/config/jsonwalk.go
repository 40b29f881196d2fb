package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"io"
	"unicode/utf16"
	"unicode/utf8"
)

// jval is one JSON value of a config file with its place in the file,
// so that every problem can point at the key or value it is about.
type jval struct {
	kind  jkind
	start int // file offset of the value's first byte
	end   int // file offset just past the value
	str   string
	num   json.Number
	b     bool
	// offs maps each byte of str to the file offset of the character
	// that decoded to it (a string value); offs[len(str)] is the closing
	// quote.
	offs    []int
	members []jmember // an object's members, in file order
	elems   []*jval   // an array's elements
}

// jmember is one key of an object and its value.
type jmember struct {
	key   string
	start int // file offset of the key's opening quote
	val   *jval
}

type jkind int

const (
	jNull jkind = iota
	jBool
	jNumber
	jString
	jObject
	jArray
)

// String names the kind as a message says it: "a string", "an object".
func (k jkind) String() string {
	return [...]string{"null", "a boolean", "a number", "a string", "an object", "an array"}[k]
}

// maxDepth bounds the nesting of a config file (a config nests four
// deep: the file, models, a model, its validity ranges).
const maxDepth = 32

// errDepth is returned by walk for a file nested over maxDepth.
type errDepth struct{ off int }

func (e *errDepth) Error() string { return "nested too deep" }

// errTrailing is returned by walk when text follows the top value.
type errTrailing struct{ off int }

func (e *errTrailing) Error() string { return "text after the end of the config" }

// walk reads raw as one JSON value with the positions of every key and
// value. Errors are *json.SyntaxError (with the file offset),
// io.ErrUnexpectedEOF, *errDepth or *errTrailing.
func walk(raw []byte) (*jval, error) {
	w := &walker{raw: raw, dec: json.NewDecoder(bytes.NewReader(raw))}
	w.dec.UseNumber()
	v, err := w.value(0)
	if errors.Is(err, io.EOF) {
		// Inside a value the end of the file comes too early.
		return nil, io.ErrUnexpectedEOF
	}
	if err != nil {
		return nil, err
	}
	// Whatever follows the top value is looked at here rather than by the
	// decoder: the decoder would read it as the start of a second value
	// and report a syntax error placed relative to that value ("invalid
	// character 'a' in literal true" for "trailing").
	off := v.end
	for off < len(raw) && isSpace(raw[off]) {
		off++
	}
	if off < len(raw) {
		return nil, &errTrailing{off: off}
	}
	return v, nil
}

// isSpace reports whether c is JSON white space.
func isSpace(c byte) bool { return c == ' ' || c == '\t' || c == '\r' || c == '\n' }

type walker struct {
	raw []byte
	dec *json.Decoder
}

// skip returns the offset of the next byte after off that is not
// white space, ':' or ','.
func (w *walker) skip(off int) int {
	for off < len(w.raw) {
		switch w.raw[off] {
		case ' ', '\t', '\r', '\n', ':', ',':
			off++
		default:
			return off
		}
	}
	return off
}

// value reads the JSON value at the walker's position, depth levels of
// nesting deep, with the file offsets of its parts.
//
// Over 60 lines: one case per kind of JSON token.
func (w *walker) value(depth int) (*jval, error) {
	start := w.skip(int(w.dec.InputOffset()))
	tok, err := w.dec.Token()
	if err != nil {
		return nil, err
	}
	v := &jval{start: start}
	switch t := tok.(type) {
	case json.Delim:
		if depth >= maxDepth {
			return nil, &errDepth{off: start}
		}
		if t == '{' {
			v.kind = jObject
			for w.dec.More() {
				ks := w.skip(int(w.dec.InputOffset()))
				kt, err := w.dec.Token()
				if err != nil {
					return nil, err
				}
				key, _ := kt.(string)
				val, err := w.value(depth + 1)
				if err != nil {
					return nil, err
				}
				v.members = append(v.members, jmember{key: key, start: ks, val: val})
			}
		} else {
			v.kind = jArray
			for w.dec.More() {
				e, err := w.value(depth + 1)
				if err != nil {
					return nil, err
				}
				v.elems = append(v.elems, e)
			}
		}
		if _, err := w.dec.Token(); err != nil { // the closing delimiter
			return nil, err
		}
	case string:
		v.kind, v.str = jString, t
		v.offs = stringOffsets(w.raw, start)
		if len(v.offs) != len(t)+1 {
			// Not expected: the decoding below follows encoding/json. Point
			// every byte at the opening quote rather than at a wrong place.
			v.offs = make([]int, len(t)+1)
			for i := range v.offs {
				v.offs[i] = start
			}
		}
	case json.Number:
		v.kind, v.num = jNumber, t
	case bool:
		v.kind, v.b = jBool, t
	default:
		v.kind = jNull
	}
	v.end = int(w.dec.InputOffset())
	return v, nil
}

// stringOffsets decodes the JSON string literal whose opening quote is at
// raw[q] exactly as encoding/json does, and returns for each decoded
// byte the file offset of the character it came from, plus one final
// entry for the closing quote. As encoding/json, it turns a surrogate
// pair of \u escapes into one character, a lone surrogate into U+FFFD
// (3 bytes) and each byte that is not UTF-8 into U+FFFD.
func stringOffsets(raw []byte, q int) []int {
	var offs []int
	add := func(at, n int) {
		for range n {
			offs = append(offs, at)
		}
	}
	i := q + 1
	for i < len(raw) && raw[i] != '"' {
		c := raw[i]
		switch {
		case c == '\\' && i+1 < len(raw):
			if raw[i+1] != 'u' {
				add(i, 1)
				i += 2
				continue
			}
			r := hex4(raw, i+2)
			n := 6
			if utf16.IsSurrogate(r) {
				r2 := rune(-1)
				if i+7 < len(raw) && raw[i+6] == '\\' && raw[i+7] == 'u' {
					r2 = hex4(raw, i+8)
				}
				if d := utf16.DecodeRune(r, r2); d != utf8.RuneError {
					r, n = d, 12
				} else {
					r = utf8.RuneError
				}
			}
			add(i, utf8.RuneLen(r))
			i += n
		case c < utf8.RuneSelf:
			add(i, 1)
			i++
		default:
			r, size := utf8.DecodeRune(raw[i:])
			if r == utf8.RuneError && size == 1 {
				add(i, 3) // encoding/json writes U+FFFD for the byte
				i++
				continue
			}
			for k := range size {
				offs = append(offs, i+k)
			}
			i += size
		}
	}
	return append(offs, i)
}

// hex4 reads four hex digits at raw[i:], or returns -1.
func hex4(raw []byte, i int) rune {
	if i+4 > len(raw) {
		return -1
	}
	var r rune
	for _, c := range raw[i : i+4] {
		switch {
		case '0' <= c && c <= '9':
			c -= '0'
		case 'a' <= c && c <= 'f':
			c = c - 'a' + 10
		case 'A' <= c && c <= 'F':
			c = c - 'A' + 10
		default:
			return -1
		}
		r = r*16 + rune(c)
	}
	return r
}
