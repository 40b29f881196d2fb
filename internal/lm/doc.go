// Package lm minimises a sum of squared residuals by the
// Levenberg-Marquardt method, with an analytic Jacobian supplied by the
// caller column by column (or, for long problems, as J'J and J'r summed
// by the caller a block of rows at a time, so that the Jacobian is never
// stored), and returns (J'J)^-1 at the solution for standard errors. The
// products are summed in blocks of NormalBlock rows in a fixed order, so
// results are deterministic and independent of the number of goroutines.
//
// References:
//
//	Marquardt, D. W. (1963). An algorithm for least-squares estimation of
//	nonlinear parameters. J. SIAM 11(2), 431-441. doi:10.1137/0111030
//	Nielsen, H. B. (1999). Damping parameter in Marquardt's method.
//	IMM-REP-1999-05, Technical University of Denmark.
package lm
