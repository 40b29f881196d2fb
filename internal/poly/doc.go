// Package poly holds real polynomials in the backshift operator B.
//
// A polynomial is a plain []float64 in ascending powers of B: index k holds
// the coefficient of B^k, so {1, -0.5} is 1 - 0.5 B. Functions never modify
// their arguments and always return fresh slices, except the ...To forms,
// which write into a buffer the caller owns.
package poly
