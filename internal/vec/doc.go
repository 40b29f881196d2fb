// Package vec holds the inner-product kernels shared by the hot loops of
// the estimators and correlation functions. Each sums with four partial
// sums in a fixed order, so results are deterministic and Dot2's two
// products are bit-identical to two calls of Dot.
package vec
