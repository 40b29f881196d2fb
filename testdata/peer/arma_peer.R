# arma_peer.R: side-by-side timing of CLS fitting, R's stats::arima(method = "CSS") against
# package arma's Fit, on the same simulated ARMA(2,1) series.
#
# How to run (from the repository root; R 4.2.2 base stats, Go toolchain on PATH):
#
#     Rscript testdata/peer/arma_peer.R            # n = 1e4, 1e5, 1e6
#     Rscript testdata/peer/arma_peer.R 100000     # chosen sizes
#
# The script simulates each series in R (arima.sim, set.seed(1), ar = c(0.6, -0.3), ma = 0.4,
# mean 10), writes it to a temporary CSV file, times arima(x, order = c(2, 0, 1),
# method = "CSS") with R's default optimiser settings (what users get), then runs
#     go run ./testdata/peer/armapeer <files>
# (a small program, not a test: timings are no business of go test), which fits the same files with arma.Fit(Order{P: 2, Q: 1}) (mean estimated, the same
# conditioning as R: residuals from index p with zero pre-sample innovations) and prints
# the best of three wall-clock times and the sum of squares. It prints both times, the
# ratio R/Go and both sums of squares. Machine load from other processes affects both.
#
# The sums of squares are printed, not asserted: they show both sides fitted the same
# problem. The conditioning is checked: with method = "CSS" R's residuals(fit) are 0 at the
# first p = 2 indices and fit$sigma2 * (n - 2) equals sum(residuals(fit)^2) (checked with
# R 4.2.2, n = 100). The two optimisers stop at different points: optim's default reltol is
# sqrt(.Machine$double.eps) = 1.49e-8 (R ?optim), so agreement to roughly 1e-8 relative is
# what to expect; n = 1e4 gave 10238.2122202856 (R) and 10238.2121296497 (Go), 8.9e-9.

args <- commandArgs(trailingOnly = TRUE)
sizes <- if (length(args)) as.numeric(args) else c(1e4, 1e5, 1e6)
files <- character(0)
rt <- numeric(0); rssq <- numeric(0)
for (n in sizes) {
  set.seed(1)
  x <- as.numeric(arima.sim(list(ar = c(0.6, -0.3), ma = 0.4), n = n)) + 10
  f <- tempfile(fileext = ".csv")
  writeLines(sprintf("%.17g", x), f)
  files <- c(files, f)
  tm <- system.time(fit <- arima(x, order = c(2, 0, 1), method = "CSS"))[["elapsed"]]
  rt <- c(rt, tm)
  rssq <- c(rssq, sum(residuals(fit)^2))
}
out <- system2("go", c("run", "./testdata/peer/armapeer", files), stdout = TRUE)
go <- grep("^PEER ", trimws(out), value = TRUE)
if (length(go) != length(sizes)) { cat(out, sep = "\n"); stop("go side failed") }
cat(sprintf("%-9s %10s %10s %8s %22s %22s\n", "n", "R (s)", "Go (s)", "R/Go", "SSQ R", "SSQ Go"))
for (i in seq_along(sizes)) {
  v <- strsplit(go[i], " +")[[1]]
  gt <- as.numeric(sub("seconds=", "", v[3])); gs <- as.numeric(sub("ssq=", "", v[4]))
  cat(sprintf("%-9.0f %10.3f %10.4f %8.1f %22.15g %22.15g\n", sizes[i], rt[i], gt, rt[i] / gt, rssq[i], gs))
}
unlink(files)
