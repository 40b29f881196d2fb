#!/usr/bin/python3
"""make_sarimax.py: reference values for arma's exact-likelihood fit of a regression with
ARMA(1,1) errors, from statsmodels' SARIMAX (Debian python3-statsmodels 0.13.5).

Run from the repository root:   /usr/bin/python3 testdata/arma_ml/make_sarimax.py

Our own simulated data (numpy default_rng(20261205), scipy.signal.lfilter):
    y_t = 2 + 0.5 x1_t - 1.2 x2_t + u_t,   (1 - 0.6 B) u_t = (1 + 0.3 B) a_t,  a_t ~ N(0, 1),
x1 a random walk, x2 = sin(2 pi t / 25), n = 300. The "gaps" case sets samples 40..51,
150 and 299 (0-based) to NaN.

The fit (testdata/sarimax_ref.py): SARIMAX(y, exog=[1, x1, x2], order=(1, 0, 1), trend="n",
concentrate_scale=True), the constant's coefficient being the mean c of the noise, as in
arma; exact likelihood with the regression, BFGS with gtol 1e-10, standard errors from the
observed information, smoothed values of the missing samples.

Writes testdata/arma_ml/sarimax.json.
"""
import json
import os
import sys

import numpy as np
from scipy.signal import lfilter

sys.path.insert(0, os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
import sarimax_ref  # noqa: E402 (testdata/sarimax_ref.py)


def data():
    rng = np.random.default_rng(20261205)
    n = 300
    a = rng.standard_normal(n + 200)
    u = lfilter([1.0, 0.3], [1.0, -0.6], a)[200:]
    x1 = np.cumsum(rng.standard_normal(n)) * 0.5
    x2 = np.sin(2 * np.pi * np.arange(n) / 25)
    y = 2 + 0.5 * x1 - 1.2 * x2 + u
    return y, x1, x2


def fit(y, x1, x2):
    mod, res = sarimax_ref.fit(y, x1, x2)
    out = sarimax_ref.estimates(mod, res, y, [(s, s) for s in mod.param_names])
    out.update(sarimax_ref.smoothed_missing(res, y))
    return out


def main():
    y, x1, x2 = data()
    yg = y.copy()
    yg[list(range(40, 52)) + [150, 299]] = np.nan
    ref = {"y": list(map(float, y)), "x1": list(map(float, x1)), "x2": list(map(float, x2)),
           "full": fit(y, x1, x2), "gaps": fit(yg, x1, x2),
           "y_gaps": [None if np.isnan(v) else float(v) for v in yg]}
    with open("testdata/arma_ml/sarimax.json", "w") as f:
        json.dump(ref, f, indent=0)


if __name__ == "__main__":
    main()
