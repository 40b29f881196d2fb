package parse

import (
	"errors"
	"slices"
	"strconv"
	"strings"

	"github.com/alecthomas/participle/v2"
	"github.com/alecthomas/participle/v2/lexer"
)

// The messages of texts the grammar refuses. Participle's error gives the
// token where the parse stopped (Position) and the rest of the production
// it expected there (Message: "unexpected token ... (expected X)"); the
// expected production says where in the spec the slip is, the token and
// its neighbours say what the slip is. The expected productions are
// matched by the text participle prints for them (the names of the
// grammar's types); TestBadInput (the exact-message table) and
// TestMutations fail when a change of the grammar leaves a slip without
// its message.

// slip is a refused text: its tokens, the token at which the parse
// stopped and the production expected there ("" after a complete
// equation or clause).
type slip struct {
	toks   []lexer.Token
	i      int
	expect string
}

// verdict is the message of a slip: at token at, of the kind (ErrSyntax
// unless the slip is a known misuse of a well-formed part).
type verdict struct {
	at   int
	kind error
	msg  string
}

// syntax records the error of a text that the grammar refuses.
func (b *builder) syntax(toks []lexer.Token, err error) {
	var pe participle.Error
	if !errors.As(err, &pe) {
		b.fail(toks[0].Pos, ErrSyntax, err.Error())
		return
	}
	s := slip{toks: toks, i: tokenAt(toks, pe.Position().Offset)}
	if m := pe.Message(); strings.HasSuffix(m, ")") {
		if _, e, ok := strings.Cut(m, " (expected "); ok {
			s.expect = strings.TrimSuffix(e, ")")
		}
	}
	v := s.explain()
	if v.kind == ErrSyntax {
		v.msg += slipHint(toks, v.at)
	}
	b.fail(toks[v.at].Pos, v.kind, v.msg)
}

// tokenAt is the index of the token at byte offset off.
func tokenAt(toks []lexer.Token, off int) int {
	i, _ := slices.BinarySearchFunc(toks, off, func(t lexer.Token, off int) int { return t.Pos.Offset - off })
	return min(i, len(toks)-1)
}

// Helpers to read the tokens around the stop.
func (s *slip) tok(k int) lexer.Token {
	if k < 0 || k >= len(s.toks) {
		return lexer.Token{Type: lexer.EOF}
	}
	return s.toks[k]
}
func (s *slip) cur() lexer.Token  { return s.tok(s.i) }
func (s *slip) prev() lexer.Token { return s.tok(s.i - 1) }
func (s *slip) next() lexer.Token { return s.tok(s.i + 1) }

func isP(t lexer.Token, v string) bool {
	return (t.Type == tokPunct || t.Type == tokSign) && t.Value == v
}
func isK(t lexer.Token, v string) bool { return t.Type == tokKeyword && t.Value == v }

// syntaxErr is a syntax verdict at token k.
func syntaxErr(k int, msg string) verdict { return verdict{at: k, kind: ErrSyntax, msg: msg} }

// explain words the slip from the production expected at the stop.
func (s *slip) explain() verdict {
	e := s.expect
	switch {
	case isP(s.cur(), ")") && s.open(s.i) < 0:
		return syntaxErr(s.i, "')' without a matching '('")
	case strings.HasPrefix(e, "<ident> \"=\""):
		return s.output()
	case strings.HasPrefix(e, "\"=\""):
		return s.equals()
	case e == "Operand":
		return s.term()
	case e == "Factor" && isP(s.prev(), "/"):
		return syntaxErr(s.i, "expected '(' after '/': write a denominator in parentheses, as in / (1 - d1 B); found "+describe(s.cur()))
	case e == "Factor":
		return s.term()
	case strings.HasPrefix(e, "\")\""), strings.HasPrefix(e, "Factor ("), strings.HasPrefix(e, "Monomial"):
		if k := s.open(s.i); k > 0 && s.toks[k-1].Type == tokShort {
			return s.order(k - 1)
		}
		if k := s.open(s.i); s.eventOpen(k) && s.unclosed(s.i) < 0 {
			return syntaxErr(s.i, "expected ')' after the time of "+s.toks[k-1].Value+"(...), found "+describe(s.cur())+
				" (an event has one time, a sample index or a date and time)")
		}
		return s.inParens()
	case strings.HasPrefix(e, "Binding"):
		return syntaxErr(s.i, "expected a coefficient name after '"+s.prev().Value+"', found "+describe(s.cur()))
	case strings.HasPrefix(e, "(\"~\""):
		return syntaxErr(s.i, "expected '~' (start value) or '=' (held value) after "+s.prev().Value+", found "+describe(s.cur()))
	case e == "<number>" && (isK(s.prev(), "every") || isK(s.tok(s.i-2), "every")):
		return syntaxErr(s.i, "expected the sample interval as a number and a unit, as in every 30 s; found "+describe(s.cur()))
	case e == "<number>" && s.eventOpen(s.i-1):
		kw := s.tok(s.i - 2).Value
		return syntaxErr(s.i, "expected the time of the event after '"+kw+"(': a sample index as in "+kw+"(120) or a date and time as in "+
			kw+"(2026-03-01T08:00); found "+describe(s.cur()))
	case e == "<number>":
		return syntaxErr(s.i, "expected a number after '"+s.prev().Value+"', found "+describe(s.cur()))
	case e == "<ident>":
		v := clip(s.prev().Value)
		return syntaxErr(s.i, "expected a unit after the sample interval "+v+", as in every "+v+" min (units: s, min, h, d, wk, mo, qtr, yr); found "+describe(s.cur()))
	case strings.HasPrefix(e, "\"(\" Value"):
		return s.shortOpen(s.i - 1)
	case e == "":
		return s.after()
	}
	return syntaxErr(s.i, "unexpected "+describe(s.cur()))
}

// output explains a slip before '=': the output name is missing.
func (s *slip) output() verdict {
	cur := s.cur()
	if (cur.Type == tokKeyword || cur.Type == tokShort) && cur.Value != "where" && cur.Value != "every" {
		return syntaxErr(s.i, cur.Value+" is a reserved word and cannot name the output; expected the output series name, found "+describe(cur))
	}
	return syntaxErr(s.i, "expected the output series name, after its differencing if any, as in (1 - B) y = ...; found "+describe(cur))
}

// equals explains a slip after the output name.
func (s *slip) equals() verdict {
	name := s.prev().Value
	msg := "expected '=' after the output name " + name + ", found " + describe(s.cur())
	if isP(s.cur(), "(") {
		msg += " (write a series by its name alone: " + name + ", not " + name + "(t))"
	}
	return syntaxErr(s.i, msg)
}

// term explains a term that stops before its operand.
func (s *slip) term() verdict {
	cur, prev, next := s.cur(), s.prev(), s.next()
	switch {
	case isP(cur, "*") && isP(prev, "*") && prev.Pos.Offset+1 == cur.Pos.Offset:
		return syntaxErr(s.i-1, "'**' is not a power here: write a power with '^', as in B^3")
	case isP(cur, "*"):
		return syntaxErr(s.i, "'*' must stand between two factors")
	case isP(prev, "*"):
		return syntaxErr(s.i-1, "'*' must stand between two factors")
	case isP(cur, "/"):
		return syntaxErr(s.i+1, "expected '(' after '/': write a denominator in parentheses, as in / (1 - d1 B); found "+describe(next))
	case isP(cur, "^"):
		return syntaxErr(s.i+1, "expected a whole number after '^', found "+describe(next))
	case cur.Type == tokShort && !isP(next, "("):
		return s.shortOpen(s.i)
	case cur.Type == tokShort && !startsTerm(prev):
		return verdict{s.i, ErrModel, "a noise shorthand such as " + cur.Value + "(...) stands alone as the noise term"}
	case startsTerm(prev):
		return syntaxErr(s.i, "expected a term after '"+prev.Value+"', such as w0 B x, found "+describe(cur))
	case !endsTerm(cur):
		return syntaxErr(s.i, "expected a factor or the series name, found "+describe(cur)+" (a term is its factors followed by the series name, as in (w0 + w1 B) / (1 - d1 B) B^2 x)")
	case s.strayClose() > s.i:
		return syntaxErr(s.strayClose(), "')' without a matching '('")
	case isP(prev, ")"):
		k := s.open(s.i - 1)
		if k > 0 && s.toks[k-1].Type == tokIdent && s.tok(k+1).Value == "t" {
			series := s.toks[k-1].Value
			return verdict{k, ErrModel, "a series is written by its name alone, not " + series + "(t ...); x three samples back is B^3 x, as in w0 B^3 " + series}
		}
		return verdict{k, ErrModel, noSeries}
	}
	return verdict{s.i - 1, ErrModel, noSeries}
}

// noSeries is the message of a term whose operators act on nothing.
const noSeries = "this term has no input series: end it with the series name, as in (w0 + w1 B) B^2 x"

// endsTerm reports whether t may follow a whole term.
func endsTerm(t lexer.Token) bool {
	return t.Type == lexer.EOF || isP(t, "+") || isP(t, "-") || isP(t, ";") || isP(t, ",") || isP(t, ")") ||
		isK(t, "where") || isK(t, "every")
}

// strayClose is the index of the first ')' that no '(' opens, or -1.
func (s *slip) strayClose() int {
	return s.unmatched(0, 1, "(", ")")
}

// unmatched scans the tokens from index from in steps of step (1 forward,
// -1 backward) and returns the index of the first closer that no opener
// met on the way matches, or -1. Forward, the opener is '(' and the
// closer ')'; backward, the other way round.
func (s *slip) unmatched(from, step int, opener, closer string) int {
	depth := 0
	for k := from; k >= 0 && k < len(s.toks); k += step {
		switch t := s.toks[k]; {
		case isP(t, opener):
			depth++
		case isP(t, closer) && depth == 0:
			return k
		case isP(t, closer):
			depth--
		}
	}
	return -1
}

// startsTerm reports whether a term starts after t.
func startsTerm(t lexer.Token) bool {
	return isP(t, "=") || isP(t, "+") || isP(t, "-")
}

// inParens explains a slip inside the parentheses of a factor.
func (s *slip) inParens() verdict {
	cur, prev, next := s.cur(), s.prev(), s.next()
	if k := s.unclosed(s.i); k >= 0 {
		o := s.toks[k].Pos
		return syntaxErr(len(s.toks)-1, "missing ')' to close the '(' at "+strconv.Itoa(o.Line)+":"+strconv.Itoa(o.Column))
	}
	switch {
	case isP(prev, "(") && !isP(cur, "+") && !isP(cur, "-"):
		if isK(cur, "a") || cur.Type == tokShort {
			return s.misplaced(s.i)
		}
		return syntaxErr(s.i, "expected a polynomial after '(', found "+describe(cur))
	case isP(prev, "+") || isP(prev, "-"):
		if isK(cur, "a") || cur.Type == tokShort {
			return s.misplaced(s.i)
		}
		return syntaxErr(s.i, "expected a coefficient or B after "+quoteTok(prev.Value)+", found "+describe(cur))
	case isP(cur, "+") || isP(cur, "-"):
		if isK(next, "a") || next.Type == tokShort {
			return s.misplaced(s.i + 1)
		}
		return syntaxErr(s.i+1, "expected a coefficient or B after "+quoteTok(cur.Value)+", found "+describe(next))
	case isP(cur, "^") && isK(prev, "B"):
		return syntaxErr(s.i+1, "expected a whole number after '^', found "+describe(next))
	case isP(cur, "^"):
		return syntaxErr(s.i, "unexpected '^' inside parentheses: a power is written on B or on a factor in parentheses, as in B^3 or (1 - B)^2")
	case isP(cur, "/") && !isP(next, "("):
		return syntaxErr(s.i+1, "expected '(' after '/': write a denominator in parentheses, as in / (1 - d1 B); found "+describe(next))
	case isP(cur, "*") && isP(next, "*") && cur.Pos.Offset+1 == next.Pos.Offset:
		return syntaxErr(s.i, "'**' is not a power here: write a power with '^', as in B^3")
	case isP(cur, "*") && next.Type == tokIdent && next.Value == "s", cur.Type == tokIdent && cur.Value == "s":
		k := s.i
		if isP(cur, "*") {
			k++
		}
		return syntaxErr(k, "s is not an operator of the spec language: a spec is in the backshift operator B of discrete time; convert a continuous-time model first, as with tf.FOPDT.Discretize")
	case isP(cur, "*"):
		return syntaxErr(s.i, "'*' must stand between a coefficient and B")
	case cur.Type == tokIdent && glued(cur.Value) != "":
		return syntaxErr(s.i, glued(cur.Value))
	case cur.Type == tokNumber && isK(prev, "B") && strings.Trim(cur.Value, "0123456789") == "":
		return syntaxErr(s.i, "B followed by "+clip(cur.Value)+" is not a power of B: for the term in B^"+clip(cur.Value)+" write B^"+clip(cur.Value))
	case isK(cur, "a") || cur.Type == tokShort:
		return s.misplaced(s.i)
	case isP(cur, "(") || isP(prev, ")") || isP(cur, "/"):
		return syntaxErr(s.i, "inside these parentheses write either one polynomial or a product of polynomials in parentheses, not both")
	case cur.Type == tokIdent || cur.Type == tokNumber || isK(cur, "B"):
		return syntaxErr(s.i, "expected '+', '-' or ')' after "+quoteTok(s.prevText())+": write a sign between the terms of a polynomial")
	}
	return syntaxErr(s.i, "unexpected "+describe(cur)+" inside parentheses")
}

// misplaced explains the noise symbol or a shorthand at token k inside a
// polynomial.
func (s *slip) misplaced(k int) verdict {
	if t := s.toks[k]; t.Value != "a" {
		return verdict{k, ErrModel, "a noise shorthand such as " + t.Value + "(...) cannot stand inside a polynomial"}
	}
	return verdict{k, ErrModel, "the white-noise symbol a cannot stand inside a polynomial"}
}

// prevText is the monomial part before the stop, for a message: B^2
// rather than 2.
func (s *slip) prevText() string {
	p := s.prev()
	if p.Type == tokNumber && isP(s.tok(s.i-2), "^") {
		return s.tok(s.i-3).Value + "^" + p.Value
	}
	return p.Value
}

// order explains a slip in the orders of the shorthand at token k.
func (s *slip) order(k int) verdict {
	form := map[string]string{"AR": "AR(p)", "MA": "MA(q)", "ARMA": "ARMA(p, q)"}[s.toks[k].Value]
	if p := s.prev(); isP(p, "(") || isP(p, ",") || isP(p, "-") {
		return syntaxErr(s.i, "expected a whole number as the order in "+form+", found "+describe(s.cur()))
	}
	return syntaxErr(s.i, "expected ',' or ')' in "+form+", found "+describe(s.cur()))
}

// shortOpen explains a shorthand at token k without its '('.
func (s *slip) shortOpen(k int) verdict {
	kw := s.toks[k].Value
	form := map[string]string{"AR": "AR(1)", "MA": "MA(1)", "ARMA": "ARMA(1, 1)"}[kw]
	return syntaxErr(k+1, "expected '(' after "+kw+", as in "+form+"; found "+describe(s.tok(k+1)))
}

// after explains a token that cannot follow a complete equation or
// clause.
func (s *slip) after() verdict {
	cur, prev := s.cur(), s.prev()
	switch s.clauseBefore() {
	case "where":
		switch {
		case isP(prev, ";") && cur.Type == tokIdent:
			return syntaxErr(s.i, "expected where, every or the end of the spec after ';', found "+describe(cur)+" (';' ends the where clause: separate its bindings with ',', as in where w0 ~ 1, w1 ~ 2)")
		case cur.Type == tokIdent && strings.EqualFold(cur.Value, "and"):
			return syntaxErr(s.i, "expected ',', where, every or the end of the spec after a value, found "+describe(cur)+" (separate the bindings with ',', as in where w0 ~ 1, w1 ~ 2)")
		}
		return syntaxErr(s.i, "expected ',', where, every or the end of the spec after a value, found "+describe(cur))
	case "every":
		return syntaxErr(s.i, "expected where, every or the end of the spec after the sample interval, found "+describe(cur))
	}
	switch {
	case isP(cur, ")") && s.open(s.i) < 0:
		return syntaxErr(s.i, "')' without a matching '('")
	case isP(prev, ")") && isP(cur, "^"):
		return verdict{s.i + 1, ErrModel, "a power cannot apply to a series; write the power on the differencing, as in ((1 - B)^2 x)"}
	case isP(prev, ")") && startsOperator(cur) && s.eventOpen(s.open(s.i-1)):
		k := s.open(s.i - 1)
		return verdict{k - 1, ErrModel, "an event such as " + s.toks[k-1].Value + "(...) is the series of its term and must come last in it"}
	case isP(prev, ")") && startsOperator(cur):
		return verdict{s.open(s.i - 1), ErrModel, "a differenced series such as ((1 - B) x) must come last in its term"}
	case isK(prev, "a") && startsOperator(cur):
		return syntaxErr(s.i, "the white-noise symbol a must come last in the noise term")
	case cur.Type == tokShort && !isP(s.next(), "("):
		return s.shortOpen(s.i)
	case cur.Type == tokShort:
		return verdict{s.i, ErrModel, "a noise shorthand such as " + cur.Value + "(...) stands alone as the noise term"}
	case isP(cur, ","):
		return syntaxErr(s.i, "expected '+', '-', where, every or the end of the spec after a term, found ',' (join terms with '+'; put where and every after a space or ';')")
	}
	return syntaxErr(s.i, "expected '+', '-', where, every or the end of the spec after a term, found "+describe(cur))
}

// startsOperator reports whether t can start an operator of a term.
func startsOperator(t lexer.Token) bool {
	return t.Type == tokIdent || t.Type == tokNumber || isP(t, "(") || isP(t, "/") || isK(t, "B") || isK(t, "a")
}

// clauseBefore names the clause (where or every) that the stop follows,
// or "" in the equation.
func (s *slip) clauseBefore() string {
	for k := s.i - 1; k >= 0; k-- {
		if t := s.toks[k]; t.Type == tokKeyword && (t.Value == "where" || t.Value == "every") {
			return t.Value
		}
	}
	return ""
}

// eventOpen reports whether token k is the '(' of an event, after step
// or pulse.
func (s *slip) eventOpen(k int) bool {
	if k < 1 || !isP(s.tok(k), "(") {
		return false
	}
	return s.toks[k-1].Type == tokEvent
}

// open is the index of the innermost '(' still open at token k, or -1.
func (s *slip) open(k int) int {
	return s.unmatched(k-1, -1, ")", "(")
}

// unclosed is the index of the '(' open at token k that no ')' in the
// rest of the text closes, or -1.
func (s *slip) unclosed(k int) int {
	o := s.open(k)
	if o < 0 || s.unmatched(o+1, 1, "(", ")") >= 0 {
		return -1
	}
	return o
}

// slipHint names a common slip at or before token i (a decimal comma, a
// Laplace s, z^-k, ARIMA, b for B, a keyword in the wrong case), or
// returns "".
func slipHint(toks []lexer.Token, i int) string {
	// A decimal comma: number ',' number with nothing between.
	for k := 1; k < min(i+2, len(toks)-1); k++ {
		a, c, d := toks[k-1], toks[k], toks[k+1]
		if c.Value == "," && a.Type == tokNumber && d.Type == tokNumber &&
			a.Pos.Offset+len(a.Value) == c.Pos.Offset && c.Pos.Offset+1 == d.Pos.Offset {
			return " (the decimal mark is '.': write " + clip(a.Value) + "." + clip(d.Value) + ", not " + clip(a.Value) + "," + clip(d.Value) + ")"
		}
	}
	for k, t := range toks[:i+1] {
		if t.Type != tokIdent {
			continue
		}
		switch {
		case (t.Value == "z" || t.Value == "q") && k+1 < len(toks) && toks[k+1].Value == "^":
			return " (the backshift operator is written B: B^3 x is x three samples back, what z^-3 or q^-3 means)"
		case strings.EqualFold(t.Value, "ARIMA") || strings.EqualFold(t.Value, "SARIMA"):
			return " (" + t.Value + " is not a shorthand: write the differencing before the output name and the noise as ARMA(p, q), as in (1 - B) y = w0 B x + ARMA(1, 1))"
		case t.Value == "b":
			return " (the backshift operator is written B, upper case)"
		case strings.EqualFold(t.Value, "where") || strings.EqualFold(t.Value, "every"):
			return " (write " + strings.ToLower(t.Value) + " in lower case)"
		case isShort(strings.ToUpper(t.Value)):
			return " (write " + strings.ToUpper(t.Value) + " in upper case)"
		case k == i && nearWord(t.Value) != "":
			return " (did you mean " + nearWord(t.Value) + "?)"
		}
	}
	return ""
}

// nearWord returns where or every when s is a slip of one of them (at
// most two edits, as in wehre or evry), or "".
func nearWord(s string) string {
	for _, w := range []string{"where", "every"} {
		if s != w && len(s) >= 3 && editDistance(strings.ToLower(s), w) <= 2 {
			return w
		}
	}
	return ""
}

// editDistance returns the number of single-letter insertions, deletions,
// substitutions and swaps of neighbours that turn a into b.
func editDistance(a, b string) int {
	d := make([][]int, len(a)+1)
	for i := range d {
		d[i] = make([]int, len(b)+1)
		d[i][0] = i
	}
	for j := range d[0] {
		d[0][j] = j
	}
	for i := 1; i <= len(a); i++ {
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			d[i][j] = min(d[i-1][j]+1, d[i][j-1]+1, d[i-1][j-1]+cost)
			if i > 1 && j > 1 && a[i-1] == b[j-2] && a[i-2] == b[j-1] {
				d[i][j] = min(d[i][j], d[i-2][j-2]+1)
			}
		}
	}
	return d[len(a)][len(b)]
}

func isShort(s string) bool { return s == "AR" || s == "MA" || s == "ARMA" }

// describe names a token for a message.
func describe(t lexer.Token) string {
	switch t.Type {
	case lexer.EOF:
		return "the end of the spec"
	case tokNumber:
		return "number " + clip(t.Value)
	case tokIdent:
		return "name " + clip(t.Value)
	case tokTime:
		return "time " + clip(t.Value) + " (a time stands only in an event, as in step(" + clip(t.Value) + "))"
	}
	return "'" + t.Value + "'"
}
