# make_tfma1.R: reference values for tf/fit's exact-likelihood fits of a regression with
# MA(1) noise near the invertibility boundary (tf/fit/ml_boundary_test.go), from R's base
# stats::arima(method = "ML") with xreg.
#
# Run from the repository root:   Rscript testdata/arma_maboundary/make_tfma1.R
# (R 4.2.2, Debian r-base-core; base package stats only.)
#
# Writes testdata/arma_maboundary/tfma1.json: short records (n = 40 and 60) of our own,
# drawn with set.seed(seed) and rnorm: y_t = 5 + 2 x_t + e_t + theta e_{t-1}, x_t a random
# walk, theta = -0.95 and -1, half of them with samples 9 and 10 of y set to NA. For each:
# y, x, R's coefficients (ma1, intercept, x), loglik and nobs. In the library's spec
# language the model is y = c + w x + (1 + t1 B) a. The optimiser runs tighter than R's
# default (reltol 1e-14, ndeps 1e-5, maxit 1000), as in ../arma_ml/make_ml.R.

num <- function(x) {
  x <- as.numeric(x)
  s <- ifelse(is.na(x), "null", sprintf("%.17g", x))
  paste0("[", paste(s, collapse = ","), "]")
}

one <- function(seed, n, theta, gaps) {
  set.seed(seed)
  x <- cumsum(rnorm(n))
  e <- rnorm(n + 1)
  y <- 5 + 2 * x + e[-1] + theta * e[-(n + 1)]
  if (gaps) y[c(9, 10)] <- NA
  fit <- arima(y, order = c(0, 0, 1), xreg = x, include.mean = TRUE, method = "ML",
               optim.control = list(reltol = 1e-14, maxit = 1000, ndeps = rep(1e-5, 3)))
  sprintf("{\"seed\":%d,\"theta\":%.17g,\"y\":%s,\"x\":%s,\"coef\":%s,\"loglik\":%.17g,\"nobs\":%d}",
          seed, theta, num(y), num(x), num(coef(fit)), fit$loglik, fit$nobs)
}

rows <- character()
seed <- 100
for (theta in c(-0.95, -1)) for (n in c(40, 60)) for (gaps in c(FALSE, TRUE)) {
  seed <- seed + 1
  rows <- c(rows, one(seed, n, theta, gaps))
}
writeLines(paste0("[", paste(rows, collapse = ",\n"), "]"),
           file.path("testdata", "arma_maboundary", "tfma1.json"))
