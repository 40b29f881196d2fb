// Package filter is the recursive filter kernel behind simulation,
// residuals and Jacobian columns: the difference equation
//
//	a_0 y_t + a_1 y_{t-1} + ... + a_p y_{t-p} = b_0 x_t + ... + b_q x_{t-q}
//
// run forward over a series (Run, with values before the start taken as
// zero; RunInit, continuing from given past inputs and outputs;
// RunChecked, which also reports non-finite inputs), or fed one sample at
// a time (Stream, with an optional input delay). Diff applies a
// differencing operator D(B) to a series (the non-recursive case, with
// zeros where the operator would reach before the record), the one
// differencing of estimation and identification.
//
// Orders up to 4 with a_0 = 1 run in specialised loops that keep the
// recursion state in registers and have no bounds checks; other filters
// run a general loop over the non-zero coefficients only (seasonal
// polynomials are sparse), or the Stream loop when filtering in place
// with a numerator of degree above 4. Every path forms the sums in the
// same order (numerator terms by rising power, then denominator terms by
// falling power), so batch and streaming results agree bit for bit. The
// batch functions modify only dst and allocate at most two small buffers
// per call (none for orders up to 4); Stream.Step never allocates.
package filter
