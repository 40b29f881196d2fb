# make_ma1.R: reference values for the exact-likelihood MA(1) fits near the invertibility
# boundary (arma/exact_boundary_test.go), from R's base stats::arima(method = "ML").
#
# Run from the repository root:   Rscript testdata/arma_maboundary/make_ma1.R
# (R 4.2.2, Debian r-base-core; base package stats only.)
#
# Writes testdata/arma_maboundary/ma1.json: short series (n = 30 to 60) of our own, drawn
# with set.seed(seed) and rnorm: y_t = mu + e_t + theta e_{t-1} with theta = -0.9, -0.95 and
# -1 (the last is over-differenced white noise, where the ML estimate often sits on the
# circle: Davis & Dunsmuir 1996, "Maximum likelihood estimation for MA(1) processes with a
# root on or near the unit circle"), some with two samples set to NA. For each: the series,
# whether a mean is fitted, R's coefficients, loglik and nobs. The optimiser runs tighter
# than R's default (reltol 1e-14, ndeps 1e-5, maxit 1000), as in ../arma_ml/make_ml.R.
# R's arima inverts non-invertible MA roots at the end (maInvert), so its ma1 is in
# [-1, 1].

num <- function(x) {
  x <- as.numeric(x)
  s <- ifelse(is.na(x), "null", sprintf("%.17g", x))
  paste0("[", paste(s, collapse = ","), "]")
}

one <- function(seed, n, theta, mean, gaps) {
  set.seed(seed)
  e <- rnorm(n + 1)
  y <- 10 * mean + e[-1] + theta * e[-(n + 1)]
  if (gaps) y[c(7, 8)] <- NA
  k <- 1 + mean
  fit <- arima(y, order = c(0, 0, 1), include.mean = mean, method = "ML",
               optim.control = list(reltol = 1e-14, maxit = 1000, ndeps = rep(1e-5, k)))
  sprintf("{\"seed\":%d,\"theta\":%.17g,\"mean\":%s,\"y\":%s,\"coef\":%s,\"loglik\":%.17g,\"nobs\":%d}",
          seed, theta, if (mean) "true" else "false", num(y), num(coef(fit)), fit$loglik, fit$nobs)
}

rows <- character()
seed <- 0
for (theta in c(-0.9, -0.95, -1)) for (n in c(30, 60)) for (mean in c(TRUE, FALSE)) {
  seed <- seed + 1
  rows <- c(rows, one(seed, n, theta, mean, gaps = (seed %% 3 == 0)))
}
writeLines(paste0("[", paste(rows, collapse = ",\n"), "]"),
           file.path("testdata", "arma_maboundary", "ma1.json"))
