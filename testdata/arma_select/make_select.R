# make_select.R: reference values for arma.Select with Method ExactML, from R's base
# stats::arima(method = "ML").
#
# Run from the repository root:   Rscript testdata/arma_select/make_select.R
# (R 4.2.2, Debian r-base-core; base packages stats and datasets only.)
#
# Writes testdata/arma_select/select.json: for R's datasets lh and presidents (6 NAs, as
# shipped) and for lh with samples 10..14 and 40 (1-based) set to NA, every order
# ARMA(p, q) with a mean, 0 <= p <= 2, 0 <= q <= 1, fitted by exact maximum likelihood:
# R's loglik, aic (-2 loglik + 2 (k + 1), k the coefficients with the mean), bic
# (BIC(fit): -2 loglik + (k + 1) log(n.used)), n.used, and "inside": whether every root of
# the fitted AR and MA polynomials has modulus above 1 + 1e-6 (polyroot; the library flags
# a fit whose z-plane roots reach 1 - 1e-6, arma.Boundary). The optimiser runs tighter
# than R's default (reltol 1e-14, ndeps 1e-5, maxit 1000), as in ../arma_ml/make_ml.R.

num <- function(x) {
  x <- as.numeric(x)
  s <- ifelse(is.na(x), "null", sprintf("%.17g", x))
  paste0("[", paste(s, collapse = ","), "]")
}

grid <- function(y) {
  rows <- character()
  for (p in 0:2) for (q in 0:1) {
    k <- p + q + 1
    fit <- arima(y, order = c(p, 0, q), include.mean = TRUE, method = "ML",
                 optim.control = list(reltol = 1e-14, maxit = 1000, ndeps = rep(1e-5, k)))
    cf <- coef(fit)
    roots <- c(if (p > 0) polyroot(c(1, -cf[seq_len(p)])), if (q > 0) polyroot(c(1, cf[p + seq_len(q)])))
    inside <- is.null(roots) || all(Mod(roots) > 1 + 1e-6)
    rows <- c(rows, sprintf("{\"p\":%d,\"q\":%d,\"loglik\":%.17g,\"aic\":%.17g,\"bic\":%.17g,\"nobs\":%d,\"inside\":%s}",
                            p, q, fit$loglik, fit$aic, BIC(fit), fit$nobs, if (inside) "true" else "false"))
  }
  paste0("{\"y\":", num(y), ",\"fits\":[", paste(rows, collapse = ","), "]}")
}

lh_ <- as.numeric(lh)
lh_gaps <- lh_; lh_gaps[c(10:14, 40)] <- NA
cases <- c(lh = grid(lh_), presidents = grid(as.numeric(presidents)), lh_gaps = grid(lh_gaps))
writeLines(paste0("{", paste(sprintf("\"%s\":%s", names(cases), cases), collapse = ",\n"), "}"),
           file.path("testdata", "arma_select", "select.json"))
