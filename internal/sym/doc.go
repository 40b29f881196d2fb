// Package sym holds polynomials in B whose coefficients may be named model
// parameters: the shared vocabulary of the spec parser (parse), the model
// types (tf, arma) and the estimators.
//
// A Poly is a product of factors; a factor is a sum of signed terms
// c B^k raised to a whole power, exactly as written in a spec, so that
// (1 - p1 B)(1 - P1 B^12) keeps its two factors and (1 - B)^2 its power.
// Signs are kept as written: the term "- d1 B" is {Neg: true, Coef: d1,
// Power: 1} and contributes -d1 to the coefficient of B.
//
// The types are exported to users through aliases in package tf
// (tf.Coef, tf.Poly, ...); users never import this package.
package sym
