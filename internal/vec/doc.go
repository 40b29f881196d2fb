// Package vec holds the inner-product kernels shared by the hot loops of
// the estimators and correlation functions, and the CPU feature checks
// that select their assembly versions on amd64.
//
// Dot, Dot2 and Dot4 sum with four partial sums in a fixed order, without
// fused multiply-adds, so their results are deterministic and the same
// bit for bit on every path: Dot2's two products and Dot4's four equal
// separate calls of Dot. LagSums, the lag products of a cross-correlation,
// uses fused multiply-adds where the processor has them (an AVX2/FMA
// kernel) and rounds differently from its Go loops (LagSumsGo); both are
// within the error bound of a sum of products (tested against exact sums).
//
// The purego build tag leaves out every assembly kernel; the Go loops
// then do all the work.
package vec
