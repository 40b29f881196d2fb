#!/usr/bin/python3
"""Peer timing for backshift's fit.Model: scipy least_squares on the same data.

How to run, from the repository root (Debian's interpreter: scipy 1.10.1):

    /usr/bin/python3 testdata/peer/fit_scipy.py          # n = 1e5 and 1e6
    /usr/bin/python3 testdata/peer/fit_scipy.py 100000   # one size

The script simulates the benchmark model of tf's BenchmarkFit (b = 3,
s = 2, r = 1, AR(2) noise and a constant),

    y_t = 1 + (1.2 + 0.6 B - 0.3 B^2)/(1 - 0.7 B) B^3 x_t + a_t/(1 - 0.9 B + 0.2 B^2),

with x an AR(1) series (phi 0.6) and sigma = 0.5, writes it to a CSV file
in a temporary directory, fits it by conditional least squares with
scipy.optimize.least_squares (default trust-region method, 2-point
finite-difference Jacobian, default tolerances) on residuals computed with
scipy.signal.lfilter under the same conditioning as fit.Model (x held at its
first value before the record, residuals from index 7; see
testdata/fit/ref_fit.py), started from a fixed point near the truth, and
then runs `go run ./testdata/peer/fitpeer FILE` on the same file (fit.Model
from its own computed start values). It prints both times (best of 5
runs), both sums of squares and the ratio of the times.
"""
import json
import os
import subprocess
import sys
import tempfile
import time

import numpy as np
from scipy.optimize import least_squares
from scipy.signal import lfilter

NAMES = ["c", "w0", "w1", "w2", "d1", "p1", "p2"]
START = np.array([0.5, 1.0, 0.5, -0.2, 0.5, 0.7, -0.1])


def simulate(n, seed):
    rng = np.random.default_rng(seed)
    burn = 500
    x = lfilter([1.0], [1, -0.6], rng.standard_normal(n + burn))[burn:]
    u = lfilter([1.2, 0.6, -0.3], [1, -0.7], np.concatenate([np.zeros(3), x[: n - 3]]))
    e = lfilter([1.0], [1, -0.9, 0.2], 0.5 * rng.standard_normal(n + burn))[burn:]
    return 1.0 + u + e, x


def residuals(p, y, xb, x0):
    c, w0, w1, w2, d1, p1, p2 = p
    # x held at its first value x0 before the record (fit.Model's default for
    # an input without differencing): filter x - x0 from rest, add the
    # steady state omega(1)/delta(1) x0.
    nn = y - c - lfilter([w0, w1, w2], [1.0, -d1], xb) - (w0 + w1 + w2) / (1 - d1) * x0
    # ts = b + s = 5, t0 = ts + 2
    t0 = 7
    return nn[t0:] - p1 * nn[t0 - 1 : -1] - p2 * nn[t0 - 2 : -2]


def scipy_fit(y, x):
    x0 = x[0]
    xb = np.concatenate([np.zeros(3), x[: len(x) - 3] - x0])
    res = least_squares(residuals, START, args=(y, xb, x0))
    r = residuals(res.x, y, xb, x0)
    return res, float(r @ r)


def main():
    sizes = [int(a) for a in sys.argv[1:]] or [100_000, 1_000_000]
    root = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..")
    with tempfile.TemporaryDirectory() as tmp:
        for n in sizes:
            y, x = simulate(n, 42)
            path = os.path.join(tmp, f"fit_{n}.csv")
            with open(path, "w") as fh:
                fh.write("y,x\n")
                for a, b in zip(y, x):
                    fh.write(f"{a!r},{b!r}\n")
            times = []
            for _ in range(5):
                t0 = time.perf_counter()
                res, ssq = scipy_fit(y, x)
                times.append(time.perf_counter() - t0)
            ts = min(times)
            out = subprocess.run(["go", "run", "./testdata/peer/fitpeer", "-reps", "5", path], cwd=root,
                                 capture_output=True, text=True, check=True)
            g = json.loads(out.stdout.strip().splitlines()[-1])
            print(f"n = {n}: scipy least_squares {ts:.3f} s (nfev {res.nfev}, SSQ {ssq:.10g}); "
                  f"fit.Model {g['seconds']:.4f} s (iter {g['iter']}, SSQ {g['ssq']:.10g}); "
                  f"ratio {ts / g['seconds']:.1f}x; SSQ tf - scipy = {g['ssq'] - ssq:.3g}")
            print("   scipy:", dict(zip(NAMES, np.round(res.x, 6).tolist())))
            print("   tf:   ", {k: round(v, 6) for k, v in g["params"].items()})


if __name__ == "__main__":
    main()
