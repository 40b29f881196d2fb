# make_ml.R: reference values for the exact-likelihood fits of package arma, from R's
# base stats (stats::arima(method = "ML"), stats::makeARIMA, stats::KalmanSmooth).
#
# Run from the repository root:   Rscript testdata/arma_ml/make_ml.R
# (R 4.2.2, Debian r-base-core; base packages stats and datasets only.)
#
# Writes testdata/arma_ml/ml.json: one entry per case with the series (null = NA), the
# model, R's estimates (coef, in R's signs: MA polynomial 1 + ma1 B), their standard
# errors sqrt(diag(var.coef)) (R: inverse of optimHess of the concentrated
# log-likelihood), sigma2 (R's ML value ssq/n.used), loglik, n.used, and for series with
# NAs the smoothed values of the missing samples with their standard errors
# (KalmanSmooth on the model rebuilt by makeARIMA at the estimates, variance times
# sigma2), and predict(fit, n.ahead = 5) forecasts with their standard errors (R's
# predict runs its Kalman filter over the data, missing samples skipped).
#
# The series are R's datasets lh, LakeHuron (with a linear trend 0, 1, ..., 97 as xreg),
# Nile, WWWusage, presidents (which has 6 NAs) and log(AirPassengers) (the airline model
# (0,1,1)x(0,1,1)_12 of Box & Jenkins' Series G), exactly as shipped; the "_gaps" cases
# set the stated stretches (1-based) to NA.
#
# The optimiser is run tighter than R's default (optim.control reltol = 1e-14,
# ndeps = 1e-5, maxit = 1000) so that R's estimates are accurate to well below the
# 1e-4 the tests ask; R's ML with differencing uses a diffuse prior of variance
# kappa = 1e6 for the differencing states and leaves out observations whose prediction
# variance is above 1e4 (the first d) - the exact diffuse likelihood up to O(1/kappa).
# For the airline model (13 diffuse states, innovations of sd 0.037) that error is 3e-3
# in the log-likelihood at R's default kappa = 1e6; the case uses kappa = 1e8 (3e-5;
# 1e10 gives 2e-6 but R's optimiser then loses digits, at 1e12 it breaks down); its
# standard errors come from the fit at kappa = 1e6, as R's optimHess is noise at 1e8.

num <- function(x) {
  x <- as.numeric(x)
  s <- ifelse(is.na(x), "null", sprintf("%.17g", x))
  paste0("[", paste(s, collapse = ","), "]")
}
str <- function(s) sprintf("\"%s\"", s)
strs <- function(s) paste0("[", paste(sprintf("\"%s\"", s), collapse = ","), "]")

cases <- list()
add <- function(name, y, order, xreg = NULL, mean = TRUE, seasonal = NULL, kappa = 1e6) {
  k <- order[1] + order[3] + mean * (order[2] == 0) + (if (is.null(xreg)) 0 else 1) +
    (if (is.null(seasonal)) 0 else seasonal[1] + seasonal[3])
  sea <- if (is.null(seasonal)) list(order = c(0, 0, 0)) else list(order = seasonal, period = 12)
  fit <- arima(y, order = order, seasonal = sea, xreg = xreg, include.mean = mean, method = "ML", kappa = kappa,
               optim.control = list(reltol = 1e-14, maxit = 1000, ndeps = rep(1e-5, k)))
  cf <- coef(fit)
  se <- sqrt(diag(fit$var.coef))
  if (kappa != 1e6) {
    # R's numerical Hessian is noise at a larger kappa: SEs from the default fit.
    fit6 <- arima(y, order = order, seasonal = sea, xreg = xreg, include.mean = mean, method = "ML",
                  optim.control = list(reltol = 1e-14, maxit = 1000, ndeps = rep(1e-5, k)))
    se <- sqrt(diag(fit6$var.coef))
  }
  p <- order[1]; q <- order[3]
  mod <- fit$model
  phi <- mod$phi; theta <- mod$theta; Delta <- mod$Delta   # expanded polynomials
  mod <- makeARIMA(phi, theta, Delta, kappa = 1e6)
  reg <- rep(0, length(y))
  if ("intercept" %in% names(cf)) reg <- reg + cf["intercept"]
  if (!is.null(xreg)) reg <- reg + cf[length(cf)] * xreg
  miss <- which(is.na(y))
  sm_val <- numeric(); sm_se <- numeric()
  if (length(miss) > 0) {
    sm <- KalmanSmooth(as.numeric(y) - reg, mod, nit = 0L)
    Z <- mod$Z
    sm_val <- sapply(miss, function(t) sum(Z * sm$smooth[t, ])) + reg[miss]
    sm_se <- sapply(miss, function(t) sqrt(drop(t(Z) %*% sm$var[t, , ] %*% Z) * fit$sigma2))
  }
  nx <- if (is.null(xreg)) NULL else length(y) - 1 + 1:5
  pr <- predict(fit, n.ahead = 5, newxreg = nx)
  cases[[name]] <<- paste0("{",
    "\"pred\":", num(pr$pred), ",",
    "\"pred_se\":", num(pr$se), ",",
    "\"y\":", num(y), ",",
    "\"order\":", num(order), ",",
    "\"mean\":", if (mean) "true" else "false", ",",
    "\"trend\":", if (is.null(xreg)) "false" else "true", ",",
    "\"seasonal\":", if (is.null(seasonal)) "[0,0,0]" else num(seasonal), ",",
    "\"names\":", strs(names(cf)), ",",
    "\"coef\":", num(cf), ",",
    "\"se\":", num(se), ",",
    "\"sigma2\":", num(fit$sigma2), ",",
    "\"loglik\":", num(fit$loglik), ",",
    "\"nobs\":", num(fit$nobs), ",",
    "\"missing\":", num(miss - 1), ",",
    "\"smooth\":", num(sm_val), ",",
    "\"smooth_se\":", num(sm_se), "}")
}

gaps <- function(y, idx) { y <- as.numeric(y); y[idx] <- NA; y }
lh_ <- as.numeric(lh); lake <- as.numeric(LakeHuron); nile <- as.numeric(Nile)
www <- as.numeric(WWWusage); pres <- as.numeric(presidents)
trend <- 0:(length(lake) - 1)

add("lh", lh_, c(1, 0, 0))
add("LakeHuron", lake, c(2, 0, 0), xreg = trend)
add("Nile", nile, c(1, 0, 1))
add("WWWusage", www, c(1, 1, 1))
add("presidents_ar1", pres, c(1, 0, 0))
add("presidents_arma11", pres, c(1, 0, 1))
add("airline", log(as.numeric(AirPassengers)), c(0, 1, 1), seasonal = c(0, 1, 1), kappa = 1e8)
add("lh_gaps", gaps(lh_, c(10:14, 40)), c(1, 0, 0))
add("LakeHuron_gaps", gaps(lake, c(50:55, 98)), c(2, 0, 0), xreg = trend)
add("Nile_gaps", gaps(nile, c(20:29, 60)), c(1, 0, 1))
add("WWWusage_gaps", gaps(www, c(30:34, 70)), c(1, 1, 1))

writeLines(paste0("{", paste(sprintf("\"%s\":%s", names(cases), unlist(cases)), collapse = ",\n"), "}"),
           file.path("testdata", "arma_ml", "ml.json"))
