package parse

import (
	"github.com/alecthomas/participle/v2"
	"github.com/alecthomas/participle/v2/lexer"
)

// The participle grammar. It is deliberately a little wider than the
// language (a term is any run of items, a parenthesised group any run of
// elements) so that the checks in build.go can say precisely what is
// wrong, in the spec's words, with the position of the offending part.

type gSpec struct {
	Eq      gEquation `parser:"@@"`
	Clauses []gClause `parser:"( \";\" | @@ )*"`
}

type gEquation struct {
	Diff   []*gGroup `parser:"@@*"`
	Output gName     `parser:"@@"`
	Eq     string    `parser:"@\"=\""`
	Terms  []gTerm   `parser:"@@+"`
}

type gName struct {
	Pos  lexer.Position
	Name string `parser:"@Ident"`
}

// gTerm is one summand of the right-hand side.
type gTerm struct {
	Pos   lexer.Position
	Sign  string  `parser:"@(\"+\" | \"-\")?"`
	Items []gItem `parser:"@@+"`
}

// gItem is one factor of a term.
type gItem struct {
	Pos    lexer.Position
	Star   bool    `parser:"@\"*\""`
	Slash  *gGroup `parser:"| \"/\" @@"`
	Group  *gGroup `parser:"| @@"`
	B      *gBPow  `parser:"| @@"`
	Number string  `parser:"| @Number"`
	Name   string  `parser:"| @Ident"`
	Noise  bool    `parser:"| @\"a\""`
	Short  *gShort `parser:"| @@"`
}

// gGroup is "(" elements ")" with an optional power.
type gGroup struct {
	Pos   lexer.Position
	Elems []gElem `parser:"\"(\" @@+"`
	Close gClose  `parser:"@@"`
	Exp   *gExp   `parser:"( \"^\" @@ )?"`
}

type gClose struct {
	Pos   lexer.Position
	Paren string `parser:"@\")\""`
}

// gElem is one element inside parentheses: a sign or an item.
type gElem struct {
	Pos  lexer.Position
	Sign string `parser:"@(\"+\" | \"-\")"`
	Item *gItem `parser:"| @@"`
}

// gBPow is B with an optional power.
type gBPow struct {
	Pos lexer.Position
	B   string `parser:"@\"B\""`
	Exp *gExp  `parser:"( \"^\" @@ )?"`
}

// gExp is a signed number: a power, a shorthand order or a clause value.
type gExp struct {
	Pos lexer.Position
	Neg bool   `parser:"@\"-\"?"`
	Num string `parser:"@Number"`
}

// gShort is a noise shorthand: AR(p), MA(q) or ARMA(p, q).
type gShort struct {
	Pos  lexer.Position
	Kind string  `parser:"@(\"AR\" | \"MA\" | \"ARMA\")"`
	Args []*gExp `parser:"\"(\" @@ ( \",\" @@ )* \")\""`
}

type gClause struct {
	Pos   lexer.Position
	Where []gBind `parser:"\"where\" @@ ( \",\" @@ )*"`
	Every *gEvery `parser:"| \"every\" @@"`
}

// gBind gives a named coefficient a start value (~) or holds it (=).
type gBind struct {
	Pos  lexer.Position
	Name gName  `parser:"@@"`
	Op   string `parser:"@(\"=\" | \"~\")"`
	Val  gExp   `parser:"@@"`
}

type gEvery struct {
	Pos  lexer.Position
	Val  gExp  `parser:"@@"`
	Unit gName `parser:"@@"`
}

var specParser = participle.MustBuild[gSpec](
	participle.Lexer(specLexer{}),
	participle.UseLookahead(1),
)
