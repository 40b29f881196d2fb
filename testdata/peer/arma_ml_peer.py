#!/usr/bin/python3
"""arma_ml_peer.py: side-by-side timing of exact maximum-likelihood ARMA(2,1) fits:
R's stats::arima(method = "ML"), statsmodels' SARIMAX and package arma's Fit with
FitSettings.Method = arma.ExactML, on the same simulated series.

How to run (from the repository root; Debian's python3-numpy, python3-statsmodels,
r-base-core and the Go toolchain on PATH):

    /usr/bin/python3 testdata/peer/arma_ml_peer.py             # n = 1e4, 1e5
    /usr/bin/python3 testdata/peer/arma_ml_peer.py 100000      # chosen sizes
    /usr/bin/python3 testdata/peer/arma_ml_peer.py --no-sarimax 1000000

Each series is simulated here (numpy default_rng(1), scipy.signal.lfilter; phi = (0.6, -0.3), R's ma1 = 0.4,
mean 10, unit innovations, 500 samples of burn-in) and written to a temporary CSV file.
Timed, each the best of -reps (R and Go 3, SARIMAX 1) wall-clock runs, data in memory:
  R:        arima(x, order = c(2, 0, 1), method = "ML") with R's default settings
            (CSS start, then exact likelihood by its Kalman filter, optim BFGS);
  SARIMAX:  SARIMAX(x, order=(2, 0, 1), trend="c").fit(disp=False) with statsmodels'
            defaults (exact likelihood by its Kalman filter, L-BFGS-B);
  Go:       go run ./testdata/peer/armamlpeer FILE (arma.Fit with ExactML).
The log-likelihoods are printed, not asserted, to show that the three fitted the same
problem; the optimisers stop at different points (R's reltol 1.5e-8).
"""
import os
import subprocess
import sys
import tempfile
import time

import numpy as np


def simulate(n, seed=1):
    from scipy.signal import lfilter
    rng = np.random.default_rng(seed)
    a = rng.standard_normal(n + 500)
    u = lfilter([1.0, 0.4], [1.0, -0.6, 0.3], a)
    return u[500:] + 10


def time_r(path, reps=3):
    code = (
        'x <- scan("%s", quiet = TRUE); best <- Inf\n'
        "for (i in 1:%d) { tm <- system.time(f <- arima(x, order = c(2, 0, 1), method = \"ML\"))[[\"elapsed\"]]; best <- min(best, tm) }\n"
        'cat(sprintf("R %%.6f %%.12g\\n", best, f$loglik))\n' % (path, reps)
    )
    out = subprocess.run(["Rscript", "-e", code], capture_output=True, text=True, check=True).stdout
    _, sec, ll = [l for l in out.splitlines() if l.startswith("R ")][0].split()
    return float(sec), float(ll)


def time_sarimax(x):
    from statsmodels.tsa.statespace.sarimax import SARIMAX
    t0 = time.perf_counter()
    res = SARIMAX(x, order=(2, 0, 1), trend="c").fit(disp=False)
    return time.perf_counter() - t0, res.llf


def main():
    args = [a for a in sys.argv[1:] if not a.startswith("--")]
    sarimax = "--no-sarimax" not in sys.argv
    sizes = [int(float(a)) for a in args] or [10_000, 100_000]
    rows = []
    files = []
    for n in sizes:
        x = simulate(n)
        f = tempfile.NamedTemporaryFile("w", suffix=".csv", delete=False)
        f.write("\n".join("%.17g" % v for v in x))
        f.close()
        files.append(f.name)
        rt, rll = time_r(f.name)
        st, sll = time_sarimax(x) if sarimax else (float("nan"), float("nan"))
        rows.append((n, rt, rll, st, sll))
    out = subprocess.run(["go", "run", "./testdata/peer/armamlpeer"] + files,
                         capture_output=True, text=True, check=True).stdout
    go = [l.split() for l in out.splitlines() if l.startswith("PEER ")]
    print("%-9s %9s %11s %9s %8s %11s %18s %18s %18s" % (
        "n", "R (s)", "SARIMAX (s)", "Go (s)", "R/Go", "SARIMAX/Go", "loglik R", "loglik SARIMAX", "loglik Go"))
    for (n, rt, rll, st, sll), g in zip(rows, go):
        gt = float(g[2].split("=")[1])
        gll = float(g[3].split("=")[1])
        print("%-9d %9.3f %11.3f %9.4f %8.1f %11.1f %18.10g %18.10g %18.10g" % (
            n, rt, st, gt, rt / gt, st / gt, rll, sll, gll))
    for f in files:
        os.unlink(f)


if __name__ == "__main__":
    main()
