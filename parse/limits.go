package parse

import "github.com/backshift/backshift/tf"

// Limits of the spec language. A spec over any of them is rejected with
// an *Error that wraps ErrLimit. They keep the work of Model linear in
// the length of the text whatever it holds.
const (
	// MaxSpecLen is the longest spec accepted, in bytes (64 KiB). Longer
	// texts are rejected before lexing.
	MaxSpecLen = 64 << 10
	// MaxTokens is the largest number of tokens (names, numbers,
	// symbols and keywords; comments and spaces are not tokens) of a
	// spec. Lexing stops
	// at the first token over it, before the parser runs, so that the
	// parser's memory (2 to 4 KB per token: at most about 16 MB, for
	// texts at the limit made of factors nested MaxNesting deep) stays
	// bounded whatever the text. The largest sensible model is well inside it: MaxInputs
	// inputs, each a second-order term with a dead time,
	// (w0 + w1 B + w2 B^2) / (1 - d1 B - d2 B^2) B^3 x (28 tokens), and a
	// start value for each of their 320 coefficients in the where clause
	// (4 tokens each) take about 3,100 tokens.
	MaxTokens = 4096
	// MaxDegree is the highest degree of any polynomial of a model
	// (numerator, denominator, differencing, noise), as written: the
	// sum over its factors of the highest power times the exponent.
	MaxDegree = tf.MaxDegree
	// MaxDelay is the longest dead time, in samples.
	MaxDelay = tf.MaxDelay
	// MaxInputs is the largest number of input terms of one model.
	MaxInputs = 64
	// MaxNesting is the deepest nesting of parentheses.
	MaxNesting = 8
)
