package parse

import (
	"github.com/alecthomas/participle/v2"
	"github.com/alecthomas/participle/v2/lexer"
)

// The participle grammar: the one parser of the spec language. Each type
// below is one production of the grammar printed in the package doc (the
// production's name is the type's name with an upper-case first letter;
// TestGrammarDoc checks that the doc and the grammar agree). What the
// grammar cannot say (signs of terms, the constant term of a
// denominator, whole numbers, ...) is checked in build.go.

// specText is a whole spec: the equation, then its clauses.
type specText struct {
	Eq      equation `parser:"@@"`
	Clauses []clause `parser:"( \";\" | @@ )*"`
}

// equation is the model: the output with its differencing, '=', and the
// terms of the right-hand side.
type equation struct {
	Diff   []*factor    `parser:"@@*"`
	Output lexer.Token  `parser:"@Ident \"=\""`
	First  leadTerm     `parser:"@@"`
	Rest   []signedTerm `parser:"@@*"`
}

// leadTerm is the first term, with an optional sign.
type leadTerm struct {
	Pos  lexer.Position
	Sign string `parser:"@Sign?"`
	Term term   `parser:"@@"`
}

// signedTerm is a term after '+' or '-'.
type signedTerm struct {
	Pos  lexer.Position
	Sign string `parser:"@Sign"`
	Term term   `parser:"@@"`
}

// term is one summand: a noise shorthand, or a run of operators ending in
// what they act on (a series, the noise symbol a, or a lone number or
// name, which is the constant).
type term struct {
	Pos   lexer.Position
	Short *shorthand `parser:"  @@"`
	Ops   []operator `parser:"| @@*"`
	End   *operand   `parser:"  @@"`
}

// operator is one factor of a term: a coefficient, a power of B, a
// polynomial in parentheses or one after '/', with an optional '*'
// after it.
type operator struct {
	Pos       lexer.Position
	Coef      *coefficient `parser:"( @@"`
	Delay     *delay       `parser:"| @@"`
	Den       *factor      `parser:"| \"/\" @@"`
	NotSeries *diffSeries  `parser:"| (?! @@)"`
	Factor    *factor      `parser:"  @@ ) \"*\"?"`
}

// coefficient is a number or a name with more of its term after it
// (a number or a name that ends a term is the operand).
type coefficient struct {
	Pos    lexer.Position
	Number string `parser:"( @Number"`
	Name   string `parser:"| @Ident ) (?= Ident | Number | Event | \"(\" | \"B\" | \"/\" | \"*\" | \"a\")"`
}

// operand ends a term.
type operand struct {
	Pos    lexer.Position
	Event  *event      `parser:"  @@"`
	Name   string      `parser:"| @Ident"`
	Noise  bool        `parser:"| @\"a\""`
	Series *diffSeries `parser:"| @@"`
	Number string      `parser:"| @Number"`
}

// event is a known event, an input that needs no data column: step(T)
// or pulse(T), T a sample index or a time.
type event struct {
	Kind  string      `parser:"@Event \"(\""`
	Time  lexer.Token `parser:"( @Time"`
	Index *value      `parser:"| @@ ) \")\""`
}

// diffSeries is a differenced input series, ((1 - B) x).
type diffSeries struct {
	Factors []*factor   `parser:"\"(\" @@ ( \"*\"? @@ )*"`
	Series  lexer.Token `parser:"\"*\"? @Ident \")\""`
}

// delay is B or B^k.
type delay struct {
	Exp *value `parser:"\"B\" ( \"^\" @@ )?"`
}

// factor is a polynomial in parentheses, or a product of factors in
// parentheses, with an optional whole power.
type factor struct {
	Pos     lexer.Position
	Poly    *polynomial `parser:"\"(\" ( @@"`
	Product *product    `parser:"      | @@ ) \")\""`
	Exp     *value      `parser:"( \"^\" @@ )?"`
}

// product is a product of factors, with an optional '*' between them.
type product struct {
	First *factor   `parser:"@@"`
	Rest  []*factor `parser:"( \"*\"? @@ )*"`
}

// polynomial is a sum of monomials, each after its sign (the first
// one's sign is optional).
type polynomial struct {
	Sign  string       `parser:"@Sign?"`
	First monomial     `parser:"@@"`
	Rest  []signedMono `parser:"@@*"`
}

// signedMono is a monomial after its sign.
type signedMono struct {
	Sign string   `parser:"@Sign"`
	Mono monomial `parser:"@@"`
}

// monomial is one term of a polynomial: c, c B^k or B^k.
type monomial struct {
	Pos    lexer.Position
	Number string `parser:"( ( @Number"`
	Name   string `parser:"  | @Ident )"`
	Power  *delay `parser:"  ( \"*\"? @@ )?"`
	Bare   *delay `parser:"| @@ )"`
}

// value is a number with an optional '-': a power, an order, a start
// or held value, a sample interval. A power or an order is written with
// the '-' only so that a negative one gets a message of its own.
type value struct {
	Pos lexer.Position
	Neg bool   `parser:"@\"-\"?"`
	Num string `parser:"@Number"`
}

// shorthand is a noise shorthand: AR(p), MA(q) or ARMA(p, q).
type shorthand struct {
	Pos  lexer.Position
	Kind string   `parser:"@Short"`
	Args []*value `parser:"\"(\" @@ ( \",\" @@ )* \")\""`
}

// clause is a where or an every clause.
type clause struct {
	Pos   lexer.Position
	Where []binding `parser:"  \"where\" @@ ( \",\" @@ )*"`
	Every *every    `parser:"| \"every\" @@"`
}

// binding gives a named coefficient a start value (~) or holds it (=).
type binding struct {
	Name lexer.Token `parser:"@Ident"`
	Op   string      `parser:"@( \"~\" | \"=\" )"`
	Val  value       `parser:"@@"`
}

// every is the sample interval: a number and a unit.
type every struct {
	Val  value       `parser:"@@"`
	Unit lexer.Token `parser:"@Ident"`
}

var specParser = participle.MustBuild[specText](
	participle.Lexer(specLexer{}),
	participle.UseLookahead(1),
)
