// Package filter is the recursive filter kernel behind simulation,
// residuals and Jacobian columns: the difference equation
//
//	a_0 y_t + a_1 y_{t-1} + ... + a_p y_{t-p} = b_0 x_t + ... + b_q x_{t-q}
//
// run forward over a series, with values before the start taken as zero.
// It allocates nothing and modifies only dst.
package filter
