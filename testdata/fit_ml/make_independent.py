#!/usr/bin/python3
"""make_independent.py: reference values for tf/fit's exact-likelihood fit (fit.ExactML) of
models with a transfer-function denominator and a gap in the output, from an independent
implementation written here: a hand-written Kalman filter (numpy; the stationary start from
scipy.linalg.solve_discrete_lyapunov) maximised by scipy.optimize.minimize.

Run from the repository root:   /usr/bin/python3 testdata/fit_ml/make_independent.py

Our own simulated data (numpy default_rng(20261208), scipy.signal.lfilter), n = 300,
output samples 100..111 and 250 (0-based) set to NaN. Two models, in the library's spec:

  "tf":   y = c + w0 / (1 - d1 B) B^2 x + (1 + t1 B) / (1 - p1 B) a
          truth c = 1, w0 = 0.8, d1 = 0.6, t1 = 0.3, p1 = 0.5, sigma = 0.5, x AR(1) (0.5).
  "diff": (1 - B) y = w0 / (1 - d1 B) B ((1 - B) x) + 1 / (1 - p1 B) a
          truth w0 = 1.2, d1 = 0.5, p1 = 0.4, sigma = 0.3, x a random walk.

The likelihood written out (the library's convention, tf/fit doc "Methods"):
  * the transfer term from index 0: an input without differencing held at its first
    value x_0 before the record (u = omega/delta B^b (x - x_0) from rest + omega(1)/delta(1)
    x_0), a differenced input zero before its differencing degree;
  * S solves D(B) S_t = sum of the transfer terms (S = 0 before deg D), z_t = y_t - S_t;
  * the likelihood is that of z_t from NoiseStart = max(deg D, d_i + b_i + s_i) on
    (2 in both models);
  * the noise phi(B) (D(B) z_t - c) = theta(B) a_t in state space (Harvey's form for the
    ARMA block, the lags of z for D), the ARMA block from its stationary distribution, the
    differencing conditioned on the first deg D observed samples of z (zero variance), NaN
    samples skipped (prediction only);
  * sigma^2 concentrated out: logL = -N/2 (log(2 pi SSQ/N) + 1) - 1/2 sum log F_t.

Fitted with Nelder-Mead (xatol 1e-10, fatol 1e-12) from the truth, then BFGS (gtol 1e-9);
the estimates, the maximised log-likelihood, and the log-likelihood at the truth.
Writes testdata/fit_ml/independent.json.
"""
import json

import numpy as np
from scipy.linalg import solve_discrete_lyapunov
from scipy.optimize import minimize
from scipy.signal import lfilter


def loglik(z, ar, ma, diff, mu):
    """Exact concentrated log-likelihood of z (NaN missing): phi(B)(D(B) z - mu) = theta(B) a."""
    p, q, dd = len(ar) - 1, len(ma) - 1, len(diff) - 1
    r = max(p, q + 1)
    m = r + dd
    phi = np.zeros(r)
    phi[:p] = -np.asarray(ar[1:])
    R = np.zeros(m)
    R[:q + 1] = ma
    T = np.zeros((m, m))
    T[:r, 0] = phi
    for i in range(r - 1):
        T[i, i + 1] = 1.0
    Z = np.zeros(m)
    Z[0] = 1.0
    for k in range(1, dd + 1):
        Z[r + k - 1] = -diff[k]
    if dd > 0:
        T[r, :] = Z  # z_t = Z alpha_t + mu goes into the first lag slot
        for k in range(1, dd):
            T[r + k, r + k - 1] = 1.0
    Tr = T[:r, :r]
    Rr = R[:r]
    P0 = solve_discrete_lyapunov(Tr, np.outer(Rr, Rr))
    # start: the first dd consecutive observed samples
    run, s = 0, None
    for t, v in enumerate(z):
        if run == dd:
            s = t
            break
        run = 0 if np.isnan(v) else run + 1
    a = np.zeros(m)
    P = np.zeros((m, m))
    P[:r, :r] = P0
    for k in range(1, dd + 1):
        a[r + k - 1] = z[s - k]
    c = np.zeros(m)
    if dd > 0:
        c[r] = mu
    ssq, slf, nobs = 0.0, 0.0, 0
    for t in range(s, len(z)):
        F = Z @ P @ Z
        pz = P @ Z
        if not np.isnan(z[t]):
            v = z[t] - Z @ a - mu
            ssq += v * v / F
            slf += np.log(F)
            nobs += 1
            a = a + pz * v / F
            P = P - np.outer(pz, pz) / F
        a = T @ a + c
        P = T @ P @ T.T + np.outer(R, R)
    return -0.5 * nobs * (np.log(2 * np.pi * ssq / nobs) + 1) - 0.5 * slf


def noise_tf(y, x, th):
    c, w0, d1, t1, p1 = th
    n = len(y)
    x0 = x[0]
    u = np.zeros(n)
    u[2:] = lfilter([w0], [1.0, -d1], x[:n - 2] - x0)
    u += w0 / (1 - d1) * x0
    z = (y - u)[2:]
    return z, [1.0, -p1], [1.0, t1], [1.0], c


def noise_diff(y, x, th):
    w0, d1, p1 = th
    n = len(y)
    zx = np.zeros(n)
    zx[1:] = np.diff(x)
    u = np.zeros(n)
    u[1:] = lfilter([w0], [1.0, -d1], zx[:n - 1])
    S = np.zeros(n)
    S[1:] = np.cumsum(u[1:])
    z = (y - S)[2:]
    return z, [1.0, -p1], [1.0], [1.0, -1.0], 0.0


def fit(noise, y, x, th0):
    def f(th):
        try:
            z, ar, ma, diff, mu = noise(y, x, th)
            if np.any(np.abs(np.roots(ar[::-1])) <= 1.0) if len(ar) > 1 else False:
                return 1e10
            v = -loglik(z, ar, ma, diff, mu)
            return v if np.isfinite(v) else 1e10
        except Exception:
            return 1e10
    r1 = minimize(f, th0, method="Nelder-Mead", options={"xatol": 1e-10, "fatol": 1e-12, "maxiter": 40000, "maxfev": 40000})
    r2 = minimize(f, r1.x, method="BFGS", options={"gtol": 1e-9})
    best = r2 if r2.fun <= r1.fun else r1
    return {"params": [float(v) for v in best.x], "llf": float(-best.fun), "llf_truth": float(-f(np.asarray(th0)))}


def main():
    rng = np.random.default_rng(20261208)
    n = 300
    gaps = list(range(100, 112)) + [250]
    # "tf"
    x = lfilter([1.0], [1.0, -0.5], rng.standard_normal(n + 100))[100:]
    u = np.zeros(n)
    u[2:] = lfilter([0.8], [1.0, -0.6], x[:n - 2] - x[0])
    u += 0.8 / 0.4 * x[0]
    e = lfilter([1.0, 0.3], [1.0, -0.5], 0.5 * rng.standard_normal(n + 200))[200:]
    y = 1 + u + e
    y[gaps] = np.nan
    ref = {"tf": {"names": ["c", "w0", "d1", "t1", "p1"], "x": list(map(float, x)),
                  "y": [None if np.isnan(v) else float(v) for v in y]}}
    ref["tf"].update(fit(noise_tf, y, x, [1.0, 0.8, 0.6, 0.3, 0.5]))
    # "diff"
    x = np.cumsum(rng.standard_normal(n))
    zx = np.zeros(n)
    zx[1:] = np.diff(x)
    u = np.zeros(n)
    u[1:] = lfilter([1.2], [1.0, -0.5], zx[:n - 1])
    nz = lfilter([1.0], [1.0, -0.4], 0.3 * rng.standard_normal(n + 200))[200:]
    y = np.cumsum(u + nz) + 10.0
    y[gaps] = np.nan
    ref["diff"] = {"names": ["w0", "d1", "p1"], "x": list(map(float, x)),
                   "y": [None if np.isnan(v) else float(v) for v in y]}
    ref["diff"].update(fit(noise_diff, y, x, [1.2, 0.5, 0.4]))
    with open("testdata/fit_ml/independent.json", "w") as f:
        json.dump(ref, f, indent=0)


if __name__ == "__main__":
    main()
