// Package est is the estimate vocabulary shared by tf and arma: the type
// of one estimated parameter, the covariance representation and the
// variance convention. tf and arma re-export Param by type alias.
//
// # Variance convention
//
// Every fit of the library estimates the innovation variance as
//
//	sigma^2 = SSQ / (N - k),
//
// N residuals summed and k free coefficients, and the covariance of the
// estimates as sigma^2 (J'J)^-1, J the Jacobian of the residuals with
// respect to the free coefficients at the estimate. The other common
// convention, the conditional maximum-likelihood estimate SSQ / N (which
// the likelihood, AIC and BIC use), gives standard errors smaller by the
// factor MLScale(N, k) = sqrt((N - k) / N); multiply by it to compare with
// a program that divides by N.
//
// # Covariance
//
// A covariance or correlation matrix is a [][]float64, square, in the
// order of the Params it belongs to, with NaN entries when it does not
// exist (a singular J'J).
package est
