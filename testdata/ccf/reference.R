# Reference values for ccf/ and prewhiten/ from R's base stats.
#
#   cd testdata/ccf && Rscript reference.R
#
# Writes (all numbers with 17 significant digits):
#   series.csv  columns x, y, z: x an AR(2) input, y = a rational response
#               to x plus ARMA noise, z = x + 1000 (a large offset, to check
#               mean removal). Generated here with set.seed(20261201).
#   ccf.csv     columns pair, lag, r: stats::ccf(a, b, lag.max = 20,
#               plot = FALSE) for the pairs "xy" (a = x, b = y), "yx" and
#               "zy". R's lag k estimates cor(a[t+k], b[t]), the opposite
#               sign of backshift's convention; the file keeps R's lags.
#   ar.csv      columns series, order_max, order, var_pred, mean, coef...:
#               stats::ar(s, aic = TRUE, order.max = m,
#               method = "yule-walker") for s in x, diff(BJsales.lead) and
#               a white series w, and the order bounds listed below.
#   ar_resid.csv columns series, t, resid: the residuals of those fits
#               (NA before the order) for the checks of the filter output.
#   white.csv   column w: the white series used above.
set.seed(20261201)
n <- 200
x <- as.numeric(arima.sim(list(ar = c(0.6, -0.3)), n = n))
# y_t = 2 B^2 / (1 - 0.5 B) x_t + (1 + 0.4 B) / (1 - 0.7 B) a_t
v <- stats::filter(c(0, 0, 2 * x[1:(n - 2)]), 0.5, method = "recursive")
noise <- as.numeric(arima.sim(list(ar = 0.7, ma = 0.4), n = n, sd = 0.8))
y <- as.numeric(v) + noise
z <- x + 1000
w <- rnorm(n)
f17 <- function(v) sprintf("%.17g", v)
write.csv(data.frame(x = f17(x), y = f17(y), z = f17(z)), "series.csv",
          row.names = FALSE, quote = FALSE)
write.csv(data.frame(w = f17(w)), "white.csv", row.names = FALSE, quote = FALSE)

out <- NULL
for (p in list(list("xy", x, y), list("yx", y, x), list("zy", z, y))) {
  r <- ccf(p[[2]], p[[3]], lag.max = 20, plot = FALSE)
  out <- rbind(out, data.frame(pair = p[[1]], lag = as.numeric(r$lag),
                               r = f17(as.numeric(r$acf))))
}
write.csv(out, "ccf.csv", row.names = FALSE, quote = FALSE)

data(BJsales, package = "datasets")
dlead <- diff(as.numeric(BJsales.lead))
fits <- list(list("x", x, 10), list("x", x, 1), list("dlead", dlead, 10),
             list("w", w, 8))
lines <- "series,order_max,order,var_pred,mean,coef"
res <- NULL
for (f in fits) {
  a <- ar(f[[2]], aic = TRUE, order.max = f[[3]], method = "yule-walker")
  lines <- c(lines, paste(c(f[[1]], f[[3]], a$order, f17(a$var.pred),
                            f17(a$x.mean), f17(a$ar)), collapse = ","))
  res <- rbind(res, data.frame(series = f[[1]], order_max = f[[3]],
                               t = seq_along(a$resid) - 1,
                               resid = f17(as.numeric(a$resid))))
}
writeLines(lines, "ar.csv")
write.csv(res, "ar_resid.csv", row.names = FALSE, quote = FALSE)
cat("reference values written with", R.version.string, "\n")
