# make_golden.R: reference values for package arma from R's base stats.
#
# Run from the repository root:   Rscript testdata/arma/make_golden.R
# (R 4.2.2, Debian r-base-core; base packages stats and datasets only.)
#
# Writes into testdata/arma/:
#   datasets.json   the series lh, LakeHuron, Nile, WWWusage and log(AirPassengers) exactly
#                   as shipped in R's "datasets" package (documented sources: lh, Diggle
#                   1990; LakeHuron, Brockwell & Davis 1991; Nile, Cobb 1978 / Balke 1993;
#                   WWWusage, Durbin & Koopman 2001; AirPassengers, Box & Jenkins 1976
#                   Series G), and one simulated ARMA(2,1) series "sim" (arima.sim with
#                   set.seed(20261201)).
#   corr.json       stats::acf, stats::pacf, stats::Box.test(type = "Ljung-Box") values.
#   ar.json         stats::ar(method = "yule-walker", aic = TRUE) fits.
#   weights.json    stats::ARMAtoMA psi weights, polyroot AR roots, stats::filter output for
#                   a given innovation series.
#   css.json        stats::arima(method = "CSS") fits rerun with a tight optimiser
#                   tolerance, a Gauss-Newton polish of the same CSS objective, Gauss-Newton
#                   standard errors sigma^2 (J'J)^-1 with J by central differences of the CSS
#                   residuals, and stats::predict forecasts with standard errors.
#
# R's CSS conventions (stats::arima): the MA polynomial is 1 + ma1 B + ...; the series
# (minus xreg %*% beta, the intercept being one xreg column when include.mean) is
# differenced, residuals are computed from index ncond = d + D s + p + P s (0-based) with
# pre-sample innovations zero; sigma2 = SSQ / (n - ncond). Its standard errors come from a
# numerical Hessian of 0.5 log(SSQ/nu) scaled by n.used = n - d - D s; predict() runs a
# Kalman filter over the data with the fitted coefficients.

num <- function(x) {
  x <- as.numeric(x)
  s <- ifelse(is.na(x), "null", sprintf("%.17g", x))
  paste0("[", paste(s, collapse = ","), "]")
}
obj <- function(...) {
  a <- list(...)
  paste0("{", paste(sprintf("\"%s\":%s", names(a), unlist(a)), collapse = ","), "}")
}
str <- function(s) sprintf("\"%s\"", s)
out <- function(file, txt) writeLines(txt, file.path("testdata", "arma", file))

set.seed(20261201)
sim <- as.numeric(arima.sim(list(ar = c(0.6, -0.3), ma = 0.4), n = 400)) + 10
series <- list(lh = as.numeric(lh), LakeHuron = as.numeric(LakeHuron),
               Nile = as.numeric(Nile), WWWusage = as.numeric(WWWusage), sim = sim,
               logAirPassengers = log(as.numeric(AirPassengers)))
out("datasets.json", paste0("{", paste(sprintf("\"%s\":%s", names(series),
    sapply(series, num)), collapse = ","), "}"))

# ---- correlation functions and Ljung-Box -------------------------------------------
corr <- c()
for (nm in names(series)) {
  x <- series[[nm]]
  L <- 20
  a <- acf(x, lag.max = L, plot = FALSE, demean = TRUE)$acf[, 1, 1]
  cv <- acf(x, lag.max = L, type = "covariance", plot = FALSE, demean = TRUE)$acf[, 1, 1]
  p <- pacf(x, lag.max = L, plot = FALSE)$acf[, 1, 1]
  b0 <- Box.test(x, lag = 10, type = "Ljung-Box", fitdf = 0)
  b2 <- Box.test(x, lag = 15, type = "Ljung-Box", fitdf = 2)
  corr <- c(corr, sprintf("\"%s\":%s", nm, obj(lag_max = L, acf = num(a), acov = num(cv),
    pacf = num(p),
    box = paste0("[", obj(lag = 10, fitdf = 0, q = num(b0$statistic), df = num(b0$parameter),
                          p = num(b0$p.value)), ",",
                      obj(lag = 15, fitdf = 2, q = num(b2$statistic), df = num(b2$parameter),
                          p = num(b2$p.value)), "]"))))
}
out("corr.json", paste0("{", paste(corr, collapse = ","), "}"))

# ---- Yule-Walker AR with AIC order choice ------------------------------------------
ars <- c()
for (nm in names(series)) {
  for (om in c(0, 10)) {
    x <- series[[nm]]
    f <- if (om == 0) ar(x, method = "yule-walker", aic = TRUE) else
      ar(x, method = "yule-walker", aic = TRUE, order.max = om)
    ars <- c(ars, obj(series = str(nm), order_max_arg = om, order_max = f$order.max,
      order = f$order, ar = num(f$ar), var_pred = num(f$var.pred), x_mean = num(f$x.mean),
      aic = num(f$aic), partialacf = num(f$partialacf), resid = num(f$resid)))
  }
}
out("ar.json", paste0("[", paste(ars, collapse = ","), "]"))

# ---- CSS fits ----------------------------------------------------------------------
# Plain-R CSS residuals, written from the definition above (checked below against
# residuals() of the arima fit). ord = c(p, d, q), sea = c(P, D, Q), period s; par holds
# ar, ma, sar, sma, then the xreg coefficients (R's order of coef()).
css_resid <- function(par, x, ord, sea, s, xreg) {
  n <- length(x); p <- ord[1]; d <- ord[2]; q <- ord[3]
  P <- sea[1]; D <- sea[2]; Q <- sea[3]
  narma <- p + q + P + Q
  if (!is.null(xreg)) x <- x - drop(xreg %*% par[narma + seq_len(ncol(xreg))])
  w <- x
  if (d > 0) for (i in seq_len(d)) w <- c(NA, diff(w))
  if (D > 0) for (i in seq_len(D)) w <- c(rep(NA, s), diff(w, lag = s))
  ar <- par[seq_len(p)]; ma <- par[p + seq_len(q)]
  sar <- par[p + q + seq_len(P)]; sma <- par[p + q + P + seq_len(Q)]
  # full polynomials as coefficients of B^1.. in R's convention
  phi <- c(1, -ar); if (P > 0) { sp <- numeric(P * s + 1); sp[1] <- 1; sp[1 + s * seq_len(P)] <- -sar; phi <- convolve(phi, rev(sp), type = "open") }
  theta <- c(1, ma); if (Q > 0) { sq <- numeric(Q * s + 1); sq[1] <- 1; sq[1 + s * seq_len(Q)] <- sma; theta <- convolve(theta, rev(sq), type = "open") }
  phi <- -phi[-1]; theta <- theta[-1]
  pp <- length(phi); qq <- length(theta)
  ncond <- d + D * s + pp
  e <- numeric(n)
  for (l in (ncond + 1):n) {
    tmp <- w[l]
    if (pp > 0) for (j in 1:pp) tmp <- tmp - phi[j] * w[l - j]
    if (qq > 0) for (j in seq_len(min(l - ncond - 1, qq))) tmp <- tmp - theta[j] * e[l - j]
    e[l] <- tmp
  }
  e[(ncond + 1):n]
}
fd_jac <- function(par, ...) {
  h <- 1e-6 * pmax(abs(par), 1e-2)
  J <- sapply(seq_along(par), function(k) {
    up <- par; dn <- par; up[k] <- up[k] + h[k]; dn[k] <- dn[k] - h[k]
    (css_resid(up, ...) - css_resid(dn, ...)) / (2 * h[k])
  })
  J
}
cases <- list(
  list(name = "lh_100", series = "lh", order = c(1, 0, 0), xreg = "mean", h = 12),
  list(name = "LakeHuron_200_trend", series = "LakeHuron", order = c(2, 0, 0), xreg = "trend", h = 10),
  list(name = "Nile_101", series = "Nile", order = c(1, 0, 1), xreg = "mean", h = 10),
  list(name = "WWWusage_111", series = "WWWusage", order = c(1, 1, 1), xreg = "none", h = 10),
  list(name = "logAirPassengers_011x011_12", series = "logAirPassengers", order = c(0, 1, 1),
       seasonal = c(0, 1, 1), period = 12, xreg = "none", h = 24),
  list(name = "logAirPassengers_110x110_12", series = "logAirPassengers", order = c(1, 1, 0),
       seasonal = c(1, 1, 0), period = 12, xreg = "none", h = 24)
)
fits <- c()
for (cs in cases) {
  x <- series[[cs$series]]
  n <- length(x); p <- cs$order[1]; d <- cs$order[2]; q <- cs$order[3]
  sea <- if (is.null(cs$seasonal)) c(0, 0, 0) else cs$seasonal
  s <- if (is.null(cs$period)) 1 else cs$period
  ctl <- list(reltol = 1e-14, maxit = 10000)
  sl <- list(order = sea, period = if (is.null(cs$period)) NA else s)
  if (cs$xreg == "trend") {
    tt <- seq_len(n)
    fit <- arima(x, order = cs$order, seasonal = sl, xreg = tt, method = "CSS", optim.control = ctl)
    fit0 <- arima(x, order = cs$order, seasonal = sl, xreg = tt, method = "CSS")
    X <- cbind(1, tt)
    pr <- predict(fit, n.ahead = cs$h, newxreg = n + seq_len(cs$h))
  } else {
    im <- cs$xreg == "mean"
    fit <- arima(x, order = cs$order, seasonal = sl, include.mean = im, method = "CSS", optim.control = ctl)
    fit0 <- arima(x, order = cs$order, seasonal = sl, include.mean = im, method = "CSS")
    X <- if (im) matrix(1, n, 1) else NULL
    pr <- predict(fit, n.ahead = cs$h)
  }
  par <- as.numeric(coef(fit))
  ncond <- d + sea[2] * s + p + sea[1] * s
  e <- css_resid(par, x, cs$order, sea, s, X)
  rres <- as.numeric(residuals(fit))[(ncond + 1):n]
  stopifnot(max(abs(e - rres)) < 1e-8 * max(abs(rres)))
  ssq_r <- sum(e^2)
  # Gauss-Newton polish of the same objective (finite-difference Jacobian).
  gp <- par
  for (it in 1:50) {
    J <- fd_jac(gp, x, cs$order, sea, s, X)
    r <- css_resid(gp, x, cs$order, sea, s, X)
    step <- -qr.solve(J, r)
    trial <- gp + step
    if (sum(css_resid(trial, x, cs$order, sea, s, X)^2) > sum(r^2)) break
    gp <- trial
    if (max(abs(step) / pmax(abs(gp), 1e-8)) < 1e-13) break
  }
  eg <- css_resid(gp, x, cs$order, sea, s, X)
  ssq_gn <- sum(eg^2)
  J <- fd_jac(gp, x, cs$order, sea, s, X)
  nu <- n - ncond
  s2 <- ssq_gn / nu
  cov_gn <- s2 * solve(crossprod(J))
  fits <- c(fits, obj(name = str(cs$name), series = str(cs$series), p = p, d = d, q = q,
    sp = sea[1], sd = sea[2], sq = sea[3], period = if (is.null(cs$period)) 0 else s,
    xreg = str(cs$xreg), coef_names = paste0("[", paste(str(names(coef(fit))), collapse = ","), "]"),
    coef_tight = num(par), ssq_tight = num(ssq_r), sigma2_tight = num(fit$sigma2),
    coef_default = num(coef(fit0)), ssq_default = num(sum(css_resid(as.numeric(coef(fit0)), x, cs$order, sea, s, X)^2)),
    se_r = num(sqrt(diag(fit$var.coef))), loglik_r = num(fit$loglik),
    coef_gn = num(gp), ssq_gn = num(ssq_gn), sigma2_gn = num(s2), se_gn = num(sqrt(diag(cov_gn))),
    ncond = ncond, nu = nu, n_used = n - d - sea[2] * s, resid_tight = num(rres),
    h = cs$h, pred = num(pr$pred), pred_se = num(pr$se),
    box10 = num(Box.test(rres, lag = 10, type = "Ljung-Box", fitdf = length(par) - ncol(rbind(X, NULL)))$statistic)))
}
out("css.json", paste0("[", paste(fits, collapse = ","), "]"))

# ---- psi weights, z-plane AR roots, filtering of given innovations ----------------
# stats::ARMAtoMA (R's MA sign: 1 + ma1 B), polyroot on phi(B) (z = 1/root), and
# stats::filter of a given innovation series (pre-sample values zero), cumsum for d = 1.
set.seed(7)
e <- rnorm(200)
wmods <- list(list(ar = c(0.6, -0.3), ma = 0.4, d = 0, mean = 10),
              list(ar = c(1.2, -0.5, 0.1), ma = c(-0.3, 0.2), d = 1, mean = 0.5),
              list(ar = 0.9, ma = numeric(0), d = 0, mean = 0))
ws <- c()
for (m in wmods) {
  psi <- ARMAtoMA(ar = m$ar, ma = m$ma, lag.max = 30)
  roots <- polyroot(c(1, -m$ar))
  q <- length(m$ma)
  xma <- if (q > 0) as.numeric(stats::filter(c(rep(0, q), e), c(1, m$ma), sides = 1))[-(1:q)] else e
  w <- as.numeric(stats::filter(xma, m$ar, method = "recursive")) + m$mean
  y <- if (m$d == 1) cumsum(w) else w
  ws <- c(ws, obj(ar = num(m$ar), ma = num(m$ma), d = m$d, mean = m$mean, psi = num(psi),
    zmod = num(sort(1 / Mod(roots))), y = num(y)))
}
out("weights.json", paste0("{\"innov\":", num(e), ",\"models\":[", paste(ws, collapse = ","), "]}"))
cat("wrote testdata/arma/{datasets,corr,ar,css,weights}.json\n")
