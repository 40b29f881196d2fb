package parse

import (
	"io"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/alecthomas/participle/v2/lexer"
)

// Token types of the spec lexer. Keywords (B, a, where, every) have their
// own type so that a name in the grammar never matches one. The signs,
// the noise shorthands (AR, MA, ARMA) and the events (step or pulse
// before '(') have a type each, so that the grammar matches each class
// as one token type rather than as a choice of words: participle tries
// each alternative of a choice on a branch of its own, and these choices
// stand in every term.
const (
	tokNumber lexer.TokenType = iota + 1
	tokIdent
	tokKeyword
	tokPunct
	tokTime
	tokSign
	tokShort
	tokEvent
)

// keywords are the reserved words, never a name (AR, MA and ARMA are
// lexed as tokShort, the others as tokKeyword).
var keywords = map[string]bool{
	"B": true, "a": true, "AR": true, "MA": true, "ARMA": true, "where": true, "every": true,
}

// specLexer is the participle lexer definition for spec text. It lexes
// the whole string into a token slice in one linear pass.
type specLexer struct{}

func (specLexer) Symbols() map[string]lexer.TokenType {
	return map[string]lexer.TokenType{
		"EOF": lexer.EOF, "Number": tokNumber, "Ident": tokIdent, "Keyword": tokKeyword, "Punct": tokPunct,
		"Time": tokTime, "Sign": tokSign, "Short": tokShort, "Event": tokEvent,
	}
}

func (d specLexer) Lex(filename string, r io.Reader) (lexer.Lexer, error) {
	var b strings.Builder
	if _, err := io.Copy(&b, r); err != nil {
		return nil, err
	}
	return d.LexString(filename, b.String())
}

func (specLexer) LexString(_ string, s string) (lexer.Lexer, error) {
	toks, err := lexSpec(s)
	if err != nil {
		return nil, err
	}
	return &sliceLexer{toks: toks}, nil
}

// sliceLexer hands out tokens lexed beforehand.
type sliceLexer struct {
	toks []lexer.Token
	i    int
}

func (l *sliceLexer) Next() (lexer.Token, error) {
	t := l.toks[l.i]
	if l.i < len(l.toks)-1 {
		l.i++
	}
	return t, nil
}

// lexError is a lexing failure at a byte offset, turned into an *Error by
// the caller, which has the source text.
type lexError struct {
	pos  lexer.Position
	kind error // ErrSyntax or ErrLimit
	msg  string
}

func (e *lexError) Error() string { return e.msg }

const punct = "=~+-*/^(),;"

// lexSpec splits s into tokens, skipping spaces, line breaks and #
// comments, and appends an EOF token. Columns count bytes, 1-based. It
// stops at the first token over MaxTokens, so that its memory is bounded
// whatever the text.
func lexSpec(s string) ([]lexer.Token, error) {
	return lexAppend(make([]lexer.Token, 0, min(len(s)/3+2, 128)), s)
}

// lexAppend is lexSpec appending to toks.
//
// Over 60 lines: a lexer's one loop over the text, a case per token class,
// which reads best whole.
func lexAppend(toks []lexer.Token, s string) ([]lexer.Token, error) {
	line, lineStart := 1, 0
	i := 0
	for i < len(s) {
		c := s[i]
		switch {
		case c == '\n':
			i++
			line, lineStart = line+1, i
			continue
		case c == ' ' || c == '\t' || c == '\r':
			i++
			continue
		case c == '#':
			for i < len(s) && s[i] != '\n' {
				i++
			}
			continue
		}
		pos := lexer.Position{Offset: i, Line: line, Column: i - lineStart + 1}
		start := i
		var typ lexer.TokenType
		switch {
		case isDate(s[i:]):
			typ, i = tokTime, timeEnd(s, i)
		case isDigit(c) || c == '.' && i+1 < len(s) && isDigit(s[i+1]):
			typ, i = tokNumber, numberEnd(s, i)
		case isLetter(c):
			typ = tokIdent
			for i < len(s) && (isLetter(s[i]) || isDigit(s[i])) {
				i++
			}
			switch w := s[start:i]; {
			case w == "AR" || w == "MA" || w == "ARMA":
				typ = tokShort
			case keywords[w]:
				typ = tokKeyword
			case (w == "step" || w == "pulse") && opens(s, i):
				typ = tokEvent
			}
		case c == '+' || c == '-':
			typ = tokSign
			i++
		case strings.IndexByte(punct, c) >= 0:
			typ = tokPunct
			i++
		case c == ':' && len(toks) >= 2 && toks[len(toks)-2].Type == tokTime:
			return nil, &lexError{pos: pos, kind: ErrSyntax, msg: "unexpected character ':' after the time " + toks[len(toks)-2].Value +
				" (write a date and time as one word with T between them, as in 2026-03-01T08:00)"}
		default:
			return nil, &lexError{pos: pos, kind: ErrSyntax, msg: "unexpected character " + quoteChar(s[i:]) + charHint(s[i:])}
		}
		if len(toks) == MaxTokens {
			return nil, &lexError{pos: pos, kind: ErrLimit, msg: "the spec has more than " + strconv.Itoa(MaxTokens) +
				" tokens (names, numbers and symbols), over the limit"}
		}
		if len(toks) == cap(toks) {
			// Double (append grows large slices by only 1.25), so that the
			// copying stays within twice the final size.
			toks = append(make([]lexer.Token, 0, 2*cap(toks)+16), toks...)
		}
		toks = append(toks, lexer.Token{Type: typ, Value: s[start:i], Pos: pos})
	}
	toks = append(toks, lexer.Token{Type: lexer.EOF,
		Pos: lexer.Position{Offset: len(s), Line: line, Column: len(s) - lineStart + 1}})
	return toks, nil
}

// opens reports whether the next token after s[i] is '(' (spaces, line
// breaks and comments skipped): step and pulse are events only then.
func opens(s string, i int) bool {
	for i < len(s) {
		switch c := s[i]; {
		case c == ' ' || c == '\t' || c == '\r' || c == '\n':
			i++
		case c == '#':
			for i < len(s) && s[i] != '\n' {
				i++
			}
		default:
			return c == '('
		}
	}
	return false
}

// numberEnd returns the end of the number that starts at s[i]: digits,
// an optional fraction and an optional exponent (an 'e' not followed by
// digits is not part of the number).
func numberEnd(s string, i int) int {
	digits := func(i int) int {
		for i < len(s) && isDigit(s[i]) {
			i++
		}
		return i
	}
	i = digits(i)
	if i < len(s) && s[i] == '.' {
		i = digits(i + 1)
	}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		j := i + 1
		if j < len(s) && (s[j] == '+' || s[j] == '-') {
			j++
		}
		if j < len(s) && isDigit(s[j]) {
			i = digits(j)
		}
	}
	return i
}

// isDate reports whether s starts with a date, four digits, '-', two
// digits, '-', two digits (2026-03-01): the start of an event's time. No
// spec without events has such text (it would be a number followed by
// two more constants, and a model has at most one).
func isDate(s string) bool {
	if len(s) < 10 || s[4] != '-' || s[7] != '-' {
		return false
	}
	for _, k := range []int{0, 1, 2, 3, 5, 6, 8, 9} {
		if !isDigit(s[k]) {
			return false
		}
	}
	return true
}

// timeEnd returns the end of the time that starts at s[i] with a date:
// the date and every letter, digit, ':', '.', '+' and '-' after it, so
// that a malformed time (2026-03-01T8:00, 2026-02-30) is one token that
// the builder refuses with a message of its own.
func timeEnd(s string, i int) int {
	i += 10
	for i < len(s) && (isLetter(s[i]) || isDigit(s[i]) || strings.IndexByte(":.+-", s[i]) >= 0) {
		i++
	}
	return i
}

// charHint suggests what to write instead of a character the spec
// language does not use, or returns "".
func charHint(s string) string {
	r, _ := utf8.DecodeRuneInString(s)
	switch r {
	case ':':
		return " (the spec language has no ':'; write where w0 ~ 1 for a start value, where w0 = 1 to hold a value, every 30 s for the interval)"
	case '{', '}':
		return " (write a power without braces, as in B^12)"
	case '[', ']':
		return " (group with parentheses)"
	case '\u2212', '\u2013', '\u2014':
		return " (write the minus sign as the ASCII '-')"
	case '\u00d7', '\u00b7', '\u22c5':
		return " (write a product with '*' or a space)"
	case '"', '\'', '`':
		return " (names are written without quotes)"
	}
	return ""
}

func isDigit(c byte) bool  { return '0' <= c && c <= '9' }
func isLetter(c byte) bool { return 'a' <= c && c <= 'z' || 'A' <= c && c <= 'Z' || c == '_' }
