# Reference values for ccf.DistributedLag (the linear transfer function
# approach) from R's base stats.
#
#   cd testdata/ccf && Rscript ltf.R
#
# Two correlated inputs (x2 = 0.6 x1 + AR(1)), output
#   y = 2 + 1.5 B^2 / (1 - 0.5 B) x1 + (0.8 + 0.4 B) B x2 + n,
#   n AR(1) with phi = 0.6, innovation sd 0.5,
# n = 400, generated with set.seed(7). The regression on lags 0..K = 8 of
# both inputs (rows t = K+1..n in R's 1-based indexing) with AR(1) errors is
# fitted by stats::arima(order = c(1, 0, 0), xreg = lags, method = "CSS",
# include.mean = TRUE): conditional least squares, conditioned on the first
# residual, the same objective as DistributedLag.
#
# Writes ltf_series.csv (x1, x2, y) and ltf_fit.csv (name, estimate, se):
# names "ar1", "intercept", "x1_k", "x2_k" for k = 0..8, and "sigma2".
set.seed(7)
n <- 400
K <- 8
x1 <- as.numeric(arima.sim(list(ar = 0.7), n = n))
x2 <- 0.6 * x1 + as.numeric(arima.sim(list(ar = 0.5), n = n))
s1 <- stats::filter(c(0, 0, 1.5 * x1[1:(n - 2)]), 0.5, method = "recursive")
s2 <- c(0, 0.8 * x2[1:(n - 1)]) + c(0, 0, 0.4 * x2[1:(n - 2)])
e <- as.numeric(arima.sim(list(ar = 0.6), n = n, sd = 0.5))
y <- 2 + as.numeric(s1) + s2 + e
f17 <- function(v) sprintf("%.17g", v)
write.csv(data.frame(x1 = f17(x1), x2 = f17(x2), y = f17(y)), "ltf_series.csv",
          row.names = FALSE, quote = FALSE)
rows <- (K + 1):n
X <- NULL
nm <- NULL
for (i in 1:2) {
  x <- list(x1, x2)[[i]]
  for (k in 0:K) {
    X <- cbind(X, x[rows - k])
    nm <- c(nm, sprintf("x%d_%d", i, k))
  }
}
colnames(X) <- nm
fit <- arima(y[rows], order = c(1, 0, 0), xreg = X, method = "CSS",
             include.mean = TRUE,
             optim.control = list(maxit = 2000, reltol = 1e-14))
est <- coef(fit)
se <- sqrt(diag(fit$var.coef))
out <- data.frame(name = c(names(est), "sigma2"),
                  estimate = f17(c(est, fit$sigma2)),
                  se = f17(c(se, NA)))
write.csv(out, "ltf_fit.csv", row.names = FALSE, quote = FALSE)
cat("wrote ltf_fit.csv with", R.version.string, "\n")
