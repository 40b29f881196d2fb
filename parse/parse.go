package parse

import (
	"errors"
	"slices"
	"strconv"
	"strings"

	"github.com/alecthomas/participle/v2"
	"github.com/alecthomas/participle/v2/lexer"
	"github.com/backshift/backshift/tf"
)

// Model parses a spec and returns the model it describes.
//
// On failure it returns the zero tf.Model and an ErrorList with at least
// one *Error, each with the position (1-based line and byte column) and a
// message in the spec's own words; printing the error shows the line with
// a caret under the column. Model never modifies anything it is given and
// is safe for concurrent use. Its time and memory are linear in
// len(spec), which is at most MaxSpecLen.
func Model(spec string) (tf.Model, error) {
	b := builder{src: spec}
	if len(spec) > MaxSpecLen {
		p := tf.Pos{Offset: MaxSpecLen, Line: 1, Column: 1}
		b.errs = append(b.errs, &Error{Pos: p, Kind: ErrLimit,
			Msg: "the spec is " + strconv.Itoa(len(spec)) + " bytes long, over the limit of " + strconv.Itoa(MaxSpecLen)})
		return tf.Model{}, b.errs
	}
	buf := tokPool.Get().(*[]lexer.Token)
	toks, err := lexAppend((*buf)[:0], spec)
	defer func() {
		if cap(toks) <= maxPooled {
			*buf = toks[:0]
			tokPool.Put(buf)
		}
	}()
	if err != nil {
		var le *lexError
		errors.As(err, &le)
		b.fail(le.pos, ErrSyntax, le.msg)
		return tf.Model{}, b.errs
	}
	if e := checkNesting(toks); e != nil {
		b.fail(e.pos, ErrLimit, e.msg)
		return tf.Model{}, b.errs
	}
	if len(toks) == 1 {
		b.fail(toks[0].Pos, ErrSyntax, "the spec is empty; write a model such as y = w0 B x + a")
		return tf.Model{}, b.errs
	}
	g, stop, ok := fastParse(toks)
	if !ok {
		// The participle grammar is the reference for what parses; the
		// message is worded from the furthest token either parser
		// reached. Very long texts skip it: the participle parser needs
		// about 3 KB per token, and the fast parser's stop is as good.
		if len(toks) > maxGrammarTokens {
			b.syntax(toks, nil, stop)
			return tf.Model{}, b.errs
		}
		var err error
		if g, err = grammarParse(toks); err != nil {
			b.syntax(toks, err, stop)
			return tf.Model{}, b.errs
		}
	}
	b.build(g)
	if len(b.errs) > 0 {
		slices.SortStableFunc(b.errs, func(x, y *Error) int { return x.Pos.Offset - y.Pos.Offset })
		return tf.Model{}, b.errs
	}
	return b.m, nil
}

// maxGrammarTokens is the longest token stream given to the participle
// parser to explain an error.
const maxGrammarTokens = 2048

// grammarParse runs the participle parser on lexed tokens.
func grammarParse(toks []lexer.Token) (*gSpec, error) {
	pl, err := lexer.Upgrade(&sliceLexer{toks: toks})
	if err != nil {
		return nil, err
	}
	return specParser.ParseFromLexer(pl)
}

// checkNesting bounds the depth of parentheses before the recursive
// parser sees the tokens.
func checkNesting(toks []lexer.Token) *lexError {
	depth := 0
	for _, t := range toks {
		if t.Type != tokPunct {
			continue
		}
		switch t.Value {
		case "(":
			depth++
			if depth > MaxNesting {
				return &lexError{pos: t.Pos, msg: "parentheses nested more than " + strconv.Itoa(MaxNesting) + " deep"}
			}
		case ")":
			depth = max(depth-1, 0)
		}
	}
	return nil
}

// syntax turns a participle error into our own message, worded from the
// token where parsing stopped and the one before it.
func (b *builder) syntax(toks []lexer.Token, err error, stop int) {
	var pe participle.Error
	off := 0
	if errors.As(err, &pe) {
		off = pe.Position().Offset
	}
	i, _ := slices.BinarySearchFunc(toks, off, func(t lexer.Token, off int) int { return t.Pos.Offset - off })
	i = min(max(i, stop), len(toks)-1)
	cur := toks[i]
	b.fail(cur.Pos, ErrSyntax, syntaxMessage(toks, i))
}

// syntaxMessage explains why token i cannot stand where it is, with a
// hint when a reserved word seems to be written in the wrong case.
func syntaxMessage(toks []lexer.Token, i int) string {
	msg := syntaxReason(toks, i)
	// A decimal comma: number ',' number with nothing between.
	for k := 1; k < min(i+2, len(toks)-1); k++ {
		a, c, d := toks[k-1], toks[k], toks[k+1]
		if c.Value == "," && a.Type == tokNumber && d.Type == tokNumber &&
			a.Pos.Offset+len(a.Value) == c.Pos.Offset && c.Pos.Offset+1 == d.Pos.Offset {
			return msg + " (the decimal mark is '.': write " + clip(a.Value) + "." + clip(d.Value) + ", not " + clip(a.Value) + "," + clip(d.Value) + ")"
		}
	}
	// A Laplace-domain model: s among the operators of the equation.
	for _, t := range toks[:i+1] {
		if t.Type == tokIdent && t.Value == "s" && inParens(toks, t) {
			return msg + " (a spec is in the backshift operator B of discrete time, not in s; convert a continuous-time model first, as with tf.FOPDT.Discretize)"
		}
	}
	for k, t := range toks[:i+1] {
		if t.Type != tokIdent {
			continue
		}
		switch {
		case (t.Value == "z" || t.Value == "q") && k+1 < len(toks) && toks[k+1].Value == "^":
			return msg + " (the backshift operator is written B: B^3 x is x three samples back, what z^-3 or q^-3 means)"
		case strings.EqualFold(t.Value, "ARIMA") || strings.EqualFold(t.Value, "SARIMA"):
			return msg + " (" + t.Value + " is not a shorthand: write the differencing before the output name and the noise as ARMA(p, q), as in (1 - B) y = w0 B x + ARMA(1, 1))"
		case t.Value == "b":
			return msg + " (the backshift operator is written B, upper case)"
		case strings.EqualFold(t.Value, "where") || strings.EqualFold(t.Value, "every"):
			return msg + " (write " + strings.ToLower(t.Value) + " in lower case)"
		case isShort(strings.ToUpper(t.Value)):
			return msg + " (write " + strings.ToUpper(t.Value) + " in upper case)"
		}
	}
	return msg
}

func syntaxReason(toks []lexer.Token, i int) string {
	cur := toks[i]
	found := describe(cur)
	// Where are we: before '=', in the equation, in a where or every clause;
	// how deep in parentheses; which '(' is open.
	const (
		inLeft = iota
		inRight
		inWhere
		inEvery
	)
	region := inLeft
	var open []lexer.Token
	for _, t := range toks[:i] {
		switch {
		case t.Type == tokPunct && t.Value == "(":
			open = append(open, t)
		case t.Type == tokPunct && t.Value == ")":
			if len(open) > 0 {
				open = open[:len(open)-1]
			}
		case t.Type == tokPunct && t.Value == "=" && region == inLeft:
			region = inRight
		case t.Type == tokKeyword && t.Value == "where":
			region = inWhere
		case t.Type == tokKeyword && t.Value == "every":
			region = inEvery
		}
	}
	var prev lexer.Token
	hasPrev := i > 0
	if hasPrev {
		prev = toks[i-1]
	}
	pv := prev.Value
	isP := func(t lexer.Token, v string) bool { return t.Type == tokPunct && t.Value == v }
	// Shorthand orders: AR( ... ).
	if len(open) > 0 {
		o := open[len(open)-1]
		if k := indexOf(toks, o); k > 0 && toks[k-1].Type == tokKeyword && isShort(toks[k-1].Value) {
			form := toks[k-1].Value + "(p)"
			switch toks[k-1].Value {
			case "MA":
				form = "MA(q)"
			case "ARMA":
				form = "ARMA(p, q)"
			}
			if hasPrev && (isP(prev, "(") || isP(prev, ",") || isP(prev, "-")) {
				return "expected a whole number as the order in " + form + ", found " + found
			}
			return "expected ',' or ')' in " + form + ", found " + found
		}
	}
	switch {
	case hasPrev && isP(prev, "^"):
		return "expected a whole number after '^', found " + found
	case hasPrev && isP(prev, "/"):
		return "expected '(' after '/': write a denominator in parentheses, as in / (1 - d1 B); found " + found
	case hasPrev && prev.Type == tokKeyword && isShort(pv):
		return "expected '(' after " + pv + ", as in " + map[string]string{"AR": "AR(1)", "MA": "MA(1)", "ARMA": "ARMA(1, 1)"}[pv] + "; found " + found
	case cur.Type == lexer.EOF && len(open) > 0:
		o := open[len(open)-1]
		return "missing ')' to close the '(' at " + strconv.Itoa(o.Pos.Line) + ":" + strconv.Itoa(o.Pos.Column)
	case isP(cur, ")") && len(open) == 0:
		return "')' without a matching '('"
	case len(open) > 0 && hasPrev && isP(prev, "("):
		return "expected a polynomial after '(', found " + found
	case len(open) > 0:
		return "unexpected " + found + " inside parentheses"
	}
	switch region {
	case inLeft:
		if hasPrev && prev.Type == tokIdent {
			if isP(cur, "(") {
				return "expected '=' after the output name " + pv + ", found " + found + " (write a series by its name alone: " + pv + ", not " + pv + "(t))"
			}
			return "expected '=' after the output name " + pv + ", found " + found
		}
		if cur.Type == tokKeyword && cur.Value != "where" && cur.Value != "every" {
			return cur.Value + " is a reserved word and cannot name the output; expected the output series name, found " + found
		}
		return "expected the output series name, after its differencing if any, as in (1 - B) y = ...; found " + found
	case inRight:
		if hasPrev && (isP(prev, "=") || isP(prev, "+") || isP(prev, "-")) {
			return "expected a term after '" + pv + "', such as w0 B x, found " + found
		}
		if hasPrev && isP(prev, "*") {
			return "expected a factor after '*', found " + found
		}
		if isP(cur, ",") {
			return "expected '+', '-', where, every or the end of the spec after a term, found ',' (join terms with '+'; put where and every after a space or ';')"
		}
		return "expected '+', '-', where, every or the end of the spec after a term, found " + found
	case inWhere:
		switch {
		case hasPrev && (prev.Value == "where" || isP(prev, ",")):
			return "expected a coefficient name after '" + pv + "', found " + found
		case hasPrev && prev.Type == tokIdent:
			return "expected '~' (start value) or '=' (held value) after " + pv + ", found " + found
		case hasPrev && (isP(prev, "~") || isP(prev, "=") || isP(prev, "-")):
			return "expected a number after '" + pv + "', found " + found
		case hasPrev && isP(prev, ";") && cur.Type == tokIdent:
			return "expected where, every or the end of the spec after ';', found " + found + " (';' ends the where clause: separate its bindings with ',', as in where w0 ~ 1, w1 ~ 2)"
		case cur.Type == tokIdent && strings.EqualFold(cur.Value, "and"):
			return "expected ',', where, every or the end of the spec after a value, found " + found + " (separate the bindings with ',', as in where w0 ~ 1, w1 ~ 2)"
		}
		return "expected ',', where, every or the end of the spec after a value, found " + found
	default:
		switch {
		case hasPrev && (prev.Value == "every" || isP(prev, "-")):
			return "expected the sample interval as a number and a unit, as in every 30 s; found " + found
		case hasPrev && prev.Type == tokNumber:
			return "expected a unit after the sample interval " + clip(pv) + ", as in every " + clip(pv) + " min (units: s, min, h, d, wk, mo, qtr, yr); found " + found
		}
		return "expected where, every or the end of the spec after the sample interval, found " + found
	}
}

// inParens reports whether token t stands inside parentheses.
func inParens(toks []lexer.Token, t lexer.Token) bool {
	depth := 0
	for _, u := range toks {
		if u.Pos.Offset >= t.Pos.Offset {
			break
		}
		switch {
		case u.Type == tokPunct && u.Value == "(":
			depth++
		case u.Type == tokPunct && u.Value == ")":
			depth = max(depth-1, 0)
		}
	}
	return depth > 0
}

func isShort(s string) bool { return s == "AR" || s == "MA" || s == "ARMA" }

func indexOf(toks []lexer.Token, t lexer.Token) int {
	i, _ := slices.BinarySearchFunc(toks, t.Pos.Offset, func(t lexer.Token, off int) int { return t.Pos.Offset - off })
	return i
}

// describe names a token for a message.
func describe(t lexer.Token) string {
	switch t.Type {
	case lexer.EOF:
		return "the end of the spec"
	case tokNumber:
		return "number " + clip(t.Value)
	case tokIdent:
		return "name " + clip(t.Value)
	case tokKeyword:
		return "'" + t.Value + "'"
	}
	return "'" + t.Value + "'"
}
