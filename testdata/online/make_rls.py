#!/usr/bin/python3
"""Reference values for tf/online: recursive least squares on a plain ARX
regression, written as the batch weighted least-squares solution.

The record is an ARX process simulated here with numpy (seeded):

    y_t = a1 y_(t-1) + a2 y_(t-2) + w0 x_(t-1) + w1 x_(t-2) + e_t,

x a random two-level signal, e Gaussian. Before the record, x and y are
taken as held at their first values (the Estimator's settled start), so
the regressor of sample t is psi_t = (x_(t-1), x_(t-2), y_(t-1), y_(t-2))
with indices below 0 read as index 0.

The recursive least-squares estimate with forgetting lambda, started
after a warm-up of W samples from theta0 with P = R_W^-1,
R_W = sum_(s<W) lambda^(W-1-s) psi_s psi_s' + ridge I (ridge = 1e-9 of the
largest diagonal entry), equals at every t >= W the weighted
least-squares solution

    theta_t = (lambda^(t-W+1) R_W + sum_(s=W..t) lambda^(t-s) psi_s psi_s')^-1
              (lambda^(t-W+1) R_W theta0 + sum_(s=W..t) lambda^(t-s) psi_s y_s),

which this script computes directly with numpy.linalg.solve for every t
(no recursion), for lambda = 1 and lambda = 0.98.

Run: /usr/bin/python3 testdata/online/make_rls.py  (numpy 1.24.2)
Writes testdata/online/rls.json.
"""
import json
import os

import numpy as np

N, W = 400, 40
A1, A2, W0, W1 = 1.2, -0.5, 0.8, 0.4
THETA0 = [0.5, 0.0, 1.0, -0.3]  # start values: w0, w1, a1, a2

rng = np.random.default_rng(20261205)
x = np.empty(N)
level = 0.0
for t in range(N):
    if rng.random() < 0.15:
        level = 1.0 - level
    x[t] = level * 2.0 - 0.5
e = 0.2 * rng.standard_normal(N)
y = np.empty(N)
for t in range(N):
    xm1, xm2 = x[max(t - 1, 0)], x[max(t - 2, 0)]
    if t == 0:
        # near the steady state of x_0 (any y_0 will do: the regression
        # takes y_(-1) = y_(-2) = y_0 as given)
        y[0] = (W0 + W1) * x[0] / (1 - A1 - A2) + e[0]
        continue
    ym1, ym2 = y[t - 1], y[max(t - 2, 0)]
    y[t] = A1 * ym1 + A2 * ym2 + W0 * xm1 + W1 * xm2 + e[t]

psi = np.array([[x[max(t - 1, 0)], x[max(t - 2, 0)], y[max(t - 1, 0)], y[max(t - 2, 0)]] for t in range(N)])

cases = []
for lam in (1.0, 0.98):
    R = np.zeros((4, 4))
    for s in range(W):
        R = lam * R + np.outer(psi[s], psi[s])
    R += 1e-9 * np.max(np.diag(R)) * np.eye(4)
    th0 = np.array(THETA0)
    traj = []
    for t in range(W, N):
        wprior = lam ** (t - W + 1)
        A = wprior * R
        b = wprior * R @ th0
        for s in range(W, t + 1):
            ws = lam ** (t - s)
            A = A + ws * np.outer(psi[s], psi[s])
            b = b + ws * psi[s] * y[s]
        traj.append(list(np.linalg.solve(A, b)))
    cases.append({"lambda": lam, "theta": traj})

out = {
    "source": "numpy 1.24.2: batch weighted least squares (numpy.linalg.solve) of the ARX regression, see make_rls.py",
    "warmup": W,
    "start": THETA0,
    "names": ["w0", "w1", "a1", "a2"],
    "x": list(x),
    "y": list(y),
    "cases": cases,
}
with open(os.path.join(os.path.dirname(os.path.abspath(__file__)), "rls.json"), "w") as f:
    json.dump(out, f)
