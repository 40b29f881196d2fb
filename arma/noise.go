package arma

import (
	"github.com/backshift/backshift/internal/est"
	"github.com/backshift/backshift/internal/sym"
)

// The polynomial vocabulary of the library (the same types as tf.Poly,
// tf.Factor, tf.Term, tf.Coef and tf.Pos), re-exported so that a Noise
// can be built from arma's exports alone.
type (
	// Poly is the product of its Factors; no factors is the constant 1.
	Poly = sym.Poly
	// Factor is (sum of Terms)^Exp, Exp >= 1.
	Factor = sym.Factor
	// Term is the summand Sign * Coef * B^Power of a factor, Sign being
	// -1 when Neg.
	Term = sym.Term
	// Coef is one coefficient: a number (Name empty) or a named
	// parameter, estimated when Free, with Value its start value or
	// estimate, and held at Value otherwise.
	Coef = sym.Coef
	// Pos is a position in a spec text; the zero Pos means "built in
	// code".
	Pos = sym.Pos
)

// Param is one estimated parameter (Name, Value, Start, SE, T), the type
// tf's estimates use too.
type Param = est.Param

// Noise is the rational noise term theta(B)/phi(B) a_t of a model, with
// a_t white noise. MA is theta(B) and AR is phi(B); each is a product of
// factors whose constant terms are 1 (an empty Poly is the constant 1, so
// the zero Noise is white noise). Signs are kept as written: the factor
// (1 - p1 B) stores p1 with a minus sign.
type Noise struct {
	MA Poly
	AR Poly
}

// Clone returns a deep copy of n.
func (n Noise) Clone() Noise { return Noise{MA: n.MA.Clone(), AR: n.AR.Clone()} }

// Equal reports whether n and m are written alike, ignoring positions.
func (n Noise) Equal(m Noise) bool { return n.MA.Equal(m.MA) && n.AR.Equal(m.AR) }

// IsWhite reports whether n is white noise as written (no factors).
func (n Noise) IsWhite() bool { return n.MA.IsOne() && n.AR.IsOne() }
