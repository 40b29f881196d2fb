#!/usr/bin/python3
"""Reference average run lengths (ARL) of the CUSUM statistics of tf/monitor.

Writes arl.json next to this script. Run: /usr/bin/python3 make_arl.py
(Debian python3-scipy 1.10.1, numpy 1.24.2).

Two independent computations, neither shared with the Go code:

1. "normal": the one-sided CUSUM S_t = max(0, S_{t-1} + X_t - k) on
   X_t ~ N(mu, 1), alarm when S_t > h, started at 0. Its ARL L(0) solves
   Page's integral equation
       L(u) = 1 + L(0) Phi(k - mu - u) + int_0^h L(y) phi(y - u + k - mu) dy
   (Page 1954; solved here by the Nystrom method with Gauss-Legendre
   nodes, numpy.polynomial.legendre.leggauss, scipy.stats.norm), at 64
   and 128 nodes (the file keeps the 128-node value and the difference).

2. "variance": the CUSUM on squared standardised errors z_t^2,
   z_t ~ N(0, ratio): up side S = max(0, S + z^2 - k), down side
   S = max(0, S + k - z^2), alarm when S > h. The density of z^2 is
   unbounded at 0, so the integral equation is solved instead as the
   Markov chain of Brook and Evans (1972, Biometrika 59:539-549) with
   scipy.stats.chi2.cdf transition probabilities at m = 1500 and 3000
   states, and Richardson-extrapolated to m -> infinity assuming an error
   O(1/m) (the file keeps both and the extrapolation).
"""
import json
import math
import os

import numpy as np
from scipy.stats import chi2, norm


def normal_arl(k, h, mu, n):
    x, w = np.polynomial.legendre.leggauss(n)
    y = (x + 1) * h / 2
    w = w * h / 2
    # L(u_i) - sum_j w_j phi(y_j - u_i + k - mu) L(y_j) - Phi(k - mu - u_i) L(0) = 1
    # with L(0) = 1 + Phi(k - mu) L(0) + sum_j w_j phi(y_j + k - mu) L(y_j).
    nodes = np.concatenate(([0.0], y))
    a = np.zeros((n + 1, n + 1))
    for i, u in enumerate(nodes):
        a[i, 0] -= norm.cdf(k - mu - u)
        a[i, 1:] -= w * norm.pdf(y - u + k - mu)
        a[i, i] += 1
    sol = np.linalg.solve(a, np.ones(n + 1))
    return float(sol[0])


def chain_arl(cdf, h, m):
    wd = 2 * h / (2 * m - 1)
    c = np.arange(m) * wd
    up = (np.arange(m) + 0.5) * wd
    lo = np.concatenate(([-np.inf], up[:-1]))
    p = np.empty((m, m))
    for i in range(m):
        hi_c = cdf(up - c[i])
        lo_c = np.where(np.isinf(lo), 0.0, cdf(lo - c[i]))
        p[i] = hi_c - lo_c
    return float(np.linalg.solve(np.eye(m) - p, np.ones(m))[0])


def variance_arl(k, h, ratio, up, m):
    if up:
        cdf = lambda x: chi2.cdf((x + k) / ratio, 1)
    else:
        cdf = lambda x: chi2.sf((k - x) / ratio, 1)
    return chain_arl(cdf, h, m)


def main():
    out = {"normal": [], "variance": []}
    for k, h, mu in [(0.5, 4, 0), (0.5, 4, 1), (0.5, 5, 0), (0.5, 5, 1),
                     (0.5, 4, -1), (0.5, 8, 0), (0.25, 10, 0), (0.25, 10, 0.5)]:
        a = normal_arl(k, h, mu, 128)
        b = normal_arl(k, h, mu, 64)
        out["normal"].append({"k": k, "h": h, "mean": mu, "arl": a, "diff64": abs(a - b)})
    r = 2.0
    kup = r * math.log(r) / (r - 1)
    kdn = math.log(r) / (r - 1)
    for up, k, h, ratio in [(True, kup, 6, 1), (True, kup, 6, 2), (True, kup, 12, 1),
                            (True, kup, 12, 2), (False, kdn, 4, 1), (False, kdn, 4, 0.5),
                            (False, kdn, 8, 1), (False, kdn, 8, 0.5),
                            # the thresholds of the default settings (ratio 2,
                            # each side at twice the target of 10080 samples)
                            (True, kup, 27.4, 1), (True, kup, 27.4, 2),
                            (False, kdn, 14.6, 1), (False, kdn, 14.6, 0.5)]:
        a = variance_arl(k, h, ratio, up, 3000)
        b = variance_arl(k, h, ratio, up, 1500)
        out["variance"].append({"up": up, "k": k, "h": h, "ratio": ratio,
                                "arl3000": a, "arl1500": b, "arl": 2 * a - b})
    with open(os.path.join(os.path.dirname(os.path.abspath(__file__)), "arl.json"), "w") as f:
        json.dump(out, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
