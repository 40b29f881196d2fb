# make_curv.R: reference standard errors of exact-likelihood fits whose AR part is close to
# the unit circle, from R's base stats::arima(method = "ML").
#
# Run from the repository root:   Rscript testdata/arma_curv/make_curv.R
# (R 4.2.2, Debian r-base-core; base package stats only.)
#
# Writes testdata/arma_curv/curv.json: for each case the series (simulated here by
# stats::arima.sim with the stated seed, plus a level of 5), the order, the ML estimates
# (arima(method = "ML", SSinit = "Rossignol2011"), optimiser tightened as in
# ../arma_ml/make_ml.R, then three Newton steps on R's log-likelihood with the Hessian
# below, as optim stops short this close to the circle), R's exact log-likelihood there, and standard errors from the observed information: the inverse of
# minus the Hessian of R's exact log-likelihood (arima with every coefficient fixed,
# transform.pars = FALSE, which evaluates the exact concentrated log-likelihood) by
# central differences extrapolated by Richardson's rule from steps h and h/2
# (Abramowitz & Stegun 1964, 25.3.23 and 25.3.27; O(h^4)), h_k = 0.05 c_k with c_k the
# conditional standard error 1/sqrt(-d2L/dx_k^2) from a first pass of second differences
# with step 1e-5 max(|x_k|, 1). "se_half" repeats it with h/2 and h/4: the two agree to
# about 1e-6 relative, the accuracy of the reference. R's own var.coef is not used: its
# optim Hessian (steps ndeps on the raw or transformed scale) is off by up to orders of
# magnitude this close to the unit circle (it changes with ndeps). SSinit = "Rossignol2011"
# because R's default initial covariance (Gardner et al. 1980) is inaccurate near
# non-stationarity (R's ?arima says so): here its log-likelihood jumps by 4 for a change of
# 1e-6 in ar1.

num <- function(x) paste0("[", paste(sprintf("%.17g", as.numeric(x)), collapse = ","), "]")

loglik <- function(y, p, x) {
  arima(y, order = c(p, 0, 0), method = "ML", fixed = x, transform.pars = FALSE, SSinit = "Rossignol2011")$loglik
}

hessian <- function(L, x, h) {
  k <- length(x); H <- matrix(0, k, k); f0 <- L(x)
  e <- function(i, s) { v <- numeric(k); v[i] <- s * h[i]; v }
  for (i in 1:k) {
    H[i, i] <- (L(x + e(i, 1)) - 2 * f0 + L(x - e(i, 1))) / h[i]^2
    if (i < k) for (j in (i + 1):k) {
      H[i, j] <- (L(x + e(i, 1) + e(j, 1)) - L(x + e(i, 1) - e(j, 1)) -
                  L(x - e(i, 1) + e(j, 1)) + L(x - e(i, 1) - e(j, 1))) / (4 * h[i] * h[j])
      H[j, i] <- H[i, j]
    }
  }
  H
}

richardson <- function(L, x, h) (4 * hessian(L, x, h / 2) - hessian(L, x, h)) / 3

cases <- list()
add <- function(name, seed, ar, n) {
  set.seed(seed)
  y <- 5 + as.numeric(arima.sim(list(ar = ar), n = n))
  p <- length(ar); k <- p + 1
  fit <- arima(y, order = c(p, 0, 0), method = "ML", SSinit = "Rossignol2011",
               optim.control = list(reltol = 1e-14, maxit = 5000, ndeps = rep(1e-5, k)))
  x <- as.numeric(coef(fit))
  L <- function(v) loglik(y, p, v)
  d <- diag(hessian(L, x, 1e-5 * pmax(abs(x), 1)))
  h <- 0.05 / sqrt(-d)
  for (it in 1:3) { # Newton steps to the maximum (optim stops short this close to the circle)
    g <- sapply(1:k, function(i) { e <- numeric(k); e[i] <- h[i]; (L(x + e) - L(x - e)) / (2 * h[i]) })
    x <- x - solve(richardson(L, x, h), g)
  }
  se <- sqrt(diag(solve(-richardson(L, x, h))))
  se2 <- sqrt(diag(solve(-richardson(L, x, h / 2))))
  cases[[name]] <<- paste0("{\"y\":", num(y), ",\"p\":", p, ",\"coef\":", num(x),
                           ",\"loglik\":", num(L(x)), ",\"se\":", num(se), ",\"se_half\":", num(se2),
                           ",\"cond_se\":", num(1 / sqrt(-d)), "}")
}

add("ar2_near_unit", 16, c(0.99 + 0.9, -0.99 * 0.9), 2000)
add("ar1_near_unit", 15, 0.999, 5000)

writeLines(paste0("{", paste(sprintf("\"%s\":%s", names(cases), unlist(cases)), collapse = ",\n"), "}"),
           file.path("testdata", "arma_curv", "curv.json"))
