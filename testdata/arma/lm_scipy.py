#!/usr/bin/python3
"""Reference solutions for internal/lm from scipy.optimize.least_squares.

Run from the repository root with Debian's interpreter (scipy 1.10.1, numpy 1.24.2):

    /usr/bin/python3 testdata/arma/lm_scipy.py

Writes testdata/arma/lm.json: for each problem the data, the start point, scipy's solution
(method="lm", i.e. MINPACK lmder, with ftol = xtol = gtol = 1e-15), the sum of squares, and
(J'J)^-1 at the solution from scipy's analytic Jacobian. The data are generated here with a
fixed numpy seed (our own scenarios).
"""
import json

import numpy as np
import scipy
from scipy.optimize import least_squares

rng = np.random.default_rng(20261201)
problems = []


def add(name, x, y, f, jac, x0):
    res = least_squares(lambda b: f(b, x) - y, x0, jac=lambda b: jac(b, x), method="lm",
                        ftol=1e-15, xtol=1e-15, gtol=1e-15, max_nfev=100000)
    J = jac(res.x, x)
    cov = np.linalg.inv(J.T @ J)
    problems.append({"name": name, "x": x.tolist(), "y": y.tolist(), "x0": list(x0),
                     "sol": res.x.tolist(), "ssq": float(np.sum(res.fun ** 2)),
                     "jtj_inv": cov.tolist(), "status": int(res.status)})


# 1. Exponential decay with offset (a process step response): y = a exp(-b t) + c.
t = np.linspace(0, 10, 60)
y = 3.0 * np.exp(-0.7 * t) + 1.5 + 0.05 * rng.standard_normal(t.size)
add("expdecay", t, y,
    lambda b, x: b[0] * np.exp(-b[1] * x) + b[2],
    lambda b, x: np.column_stack([np.exp(-b[1] * x), -b[0] * x * np.exp(-b[1] * x), np.ones_like(x)]),
    [1.0, 0.2, 0.0])

# 2. Badly scaled saturation curve: y = b1 (1 - exp(-b2 x)), b1 ~ 240, b2 ~ 5e-4.
x = np.linspace(70, 800, 14)
y = 240.0 * (1 - np.exp(-5.5e-4 * x)) * (1 + 0.002 * rng.standard_normal(x.size))
add("saturation", x, y,
    lambda b, x: b[0] * (1 - np.exp(-b[1] * x)),
    lambda b, x: np.column_stack([1 - np.exp(-b[1] * x), b[0] * x * np.exp(-b[1] * x)]),
    [500.0, 1e-4])

# 3. Two-exponential mixture, strongly correlated parameters.
t = np.linspace(0, 8, 80)
y = 2.0 * np.exp(-0.5 * t) + 1.0 * np.exp(-2.0 * t) + 0.01 * rng.standard_normal(t.size)
add("twoexp", t, y,
    lambda b, x: b[0] * np.exp(-b[1] * x) + b[2] * np.exp(-b[3] * x),
    lambda b, x: np.column_stack([np.exp(-b[1] * x), -b[0] * x * np.exp(-b[1] * x),
                                  np.exp(-b[3] * x), -b[2] * x * np.exp(-b[3] * x)]),
    [1.0, 0.3, 1.0, 3.0])

with open("testdata/arma/lm.json", "w") as fh:
    json.dump({"scipy": scipy.__version__, "numpy": np.__version__, "problems": problems}, fh, indent=1)
print("wrote testdata/arma/lm.json")
