# make_ic.R: reference log-likelihoods and information criteria for package arma.
#
# Run from the repository root:   Rscript testdata/arma/make_ic.R
# (R 4.2.2, Debian r-base-core; base packages stats and datasets only.)
#
# Writes testdata/arma/ic.json. For a pure autoregression with a mean, conditional least
# squares is ordinary least squares of y_t on 1, y_{t-1}, ..., y_{t-p} over t = p+1..n
# (the intercept c = mu (1 - phi_1 - ... - phi_p) is a reparameterisation of the mean), so
# stats::lm on the lagged series gives the same minimum sum of squares, and stats::logLik,
# stats::AIC and stats::BIC on that fit use the conventions arma.Result documents: the
# Gaussian log-likelihood of the N = n - p residuals at sigma^2 = RSS/N, and K = the
# number of coefficients + 1 (sigma^2). AICc is computed from R's AIC with the usual
# correction 2K(K+1)/(N-K-1).
library(stats)
fits <- list()
add <- function(name, series, y, p) {
  n <- length(y)
  t <- (p + 1):n
  if (p == 0) {
    fit <- lm(y ~ 1)
  } else {
    X <- sapply(1:p, function(j) y[t - j])
    fit <- lm(y[t] ~ X)
  }
  ll <- logLik(fit)
  k <- attr(ll, "df")
  nn <- length(residuals(fit))
  aic <- AIC(fit)
  fits[[length(fits) + 1]] <<- list(name = name, series = series, p = p,
    ssq = sum(residuals(fit)^2), loglik = as.numeric(ll), k = k, nobs = nn,
    aic = aic, aicc = aic + 2 * k * (k + 1) / (nn - k - 1), bic = BIC(fit))
}
add("lh AR(1)", "lh", as.numeric(lh), 1)
add("LakeHuron AR(2)", "LakeHuron", as.numeric(LakeHuron), 2)
add("Nile mean only", "Nile", as.numeric(Nile), 0)
con <- file("testdata/arma/ic.json", "w")
writeLines("[", con)
for (i in seq_along(fits)) {
  f <- fits[[i]]
  writeLines(sprintf('  {"name": "%s", "series": "%s", "p": %d, "ssq": %.17g, "loglik": %.17g, "k": %d, "nobs": %d, "aic": %.17g, "aicc": %.17g, "bic": %.17g}%s',
    f$name, f$series, f$p, f$ssq, f$loglik, as.integer(f$k), f$nobs, f$aic, f$aicc, f$bic,
    if (i < length(fits)) "," else ""), con)
}
writeLines("]", con)
close(con)
cat("wrote testdata/arma/ic.json (", R.version.string, ")\n")
