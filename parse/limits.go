package parse

import "github.com/backshift/backshift/tf"

// Limits of the spec language. A spec over any of them is rejected with
// an *Error that wraps ErrLimit. They keep the work of Model linear in
// the length of the text whatever it holds.
const (
	// MaxSpecLen is the longest spec accepted, in bytes (64 KiB). Longer
	// texts are rejected before lexing.
	MaxSpecLen = 64 << 10
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
