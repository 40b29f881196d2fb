package arma

import "github.com/backshift/backshift/internal/sym"

// Noise is the rational noise term theta(B)/phi(B) a_t of a model, with
// a_t white noise. MA is theta(B) and AR is phi(B); each is a product of
// factors whose constant terms are 1 (an empty Poly is the constant 1, so
// the zero Noise is white noise). Signs are kept as written: the factor
// (1 - p1 B) stores p1 with a minus sign.
type Noise struct {
	MA sym.Poly
	AR sym.Poly
}

// Clone returns a deep copy of n.
func (n Noise) Clone() Noise { return Noise{MA: n.MA.Clone(), AR: n.AR.Clone()} }

// Equal reports whether n and m are written alike, ignoring positions.
func (n Noise) Equal(m Noise) bool { return n.MA.Equal(m.MA) && n.AR.Equal(m.AR) }

// IsWhite reports whether n is white noise as written (no factors).
func (n Noise) IsWhite() bool { return n.MA.IsOne() && n.AR.IsOne() }
