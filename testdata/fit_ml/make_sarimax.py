#!/usr/bin/python3
"""make_sarimax.py: reference values for tf/fit's exact-likelihood fit (fit.ExactML) of a
regression with ARMA(1,1) errors (two inputs without dynamics), from statsmodels' SARIMAX
(Debian python3-statsmodels 0.13.5).

Run from the repository root:   /usr/bin/python3 testdata/fit_ml/make_sarimax.py

Our own simulated data (numpy default_rng(20261207), scipy.signal.lfilter), n = 250:
    y_t = 1 + 0.8 x1_t - 0.5 x2_t + u_t,   (1 - 0.5 B) u_t = (1 + 0.4 B) a_t,  a_t ~ N(0, 1),
x1 an AR(1) series (0.7, unit innovations), x2 a square wave of period 30 (+-1). The
"gaps" case sets output samples 30..37, 120, 200..203 and 249 (the last) to NaN.
Forecasts 6 steps past the record with the inputs' next 6 values known (the simulation
continued): res.get_forecast(6, exog=...).predicted_mean and .se_mean.

In the library's spec:  y = c + w1 x1 + w2 x2 + (1 + t1 B) / (1 - p1 B) a,  that is
SARIMAX(y, exog=[1, x1, x2], order=(1, 0, 1), trend="n", concentrate_scale=True) with
c, w1, w2 = the exog coefficients, p1 = ar.L1, t1 = ma.L1, fitted as testdata/sarimax_ref.py
says (exact likelihood with the regression, BFGS with gtol 1e-10, standard errors from the
observed information, smoothed values of the missing samples).

Writes testdata/fit_ml/sarimax.json.
"""
import json
import os
import sys

import numpy as np
from scipy.signal import lfilter

sys.path.insert(0, os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
import sarimax_ref  # noqa: E402 (testdata/sarimax_ref.py)


def data():
    rng = np.random.default_rng(20261207)
    n = 256  # 250 in the record, 6 for the forecasts
    a = rng.standard_normal(n + 200)
    u = lfilter([1.0, 0.4], [1.0, -0.5], a)[200:]
    x1 = lfilter([1.0], [1.0, -0.7], rng.standard_normal(n + 100))[100:]
    x2 = np.where((np.arange(n) // 15) % 2 == 0, 1.0, -1.0)
    y = 1 + 0.8 * x1 - 0.5 * x2 + u
    return y, x1, x2


def fit(y, x1, x2, f1, f2):
    mod, res = sarimax_ref.fit(y, x1, x2)
    order = [("c", "const"), ("w1", "x1"), ("w2", "x2"), ("t1", "ma.L1"), ("p1", "ar.L1")]
    out = sarimax_ref.estimates(mod, res, y, order)
    fc = res.get_forecast(len(f1), exog=np.column_stack([np.ones_like(f1), f1, f2]))
    out["forecast"] = [float(v) for v in fc.predicted_mean]
    out["forecast_se"] = [float(v) for v in fc.se_mean]
    out.update(sarimax_ref.smoothed_missing(res, y))
    return out


def main():
    y, x1, x2 = data()
    f1, f2 = x1[250:], x2[250:]
    y, x1, x2 = y[:250], x1[:250], x2[:250]
    yg = y.copy()
    yg[list(range(30, 38)) + [120] + list(range(200, 204)) + [249]] = np.nan
    ref = {"y": list(map(float, y)), "x1": list(map(float, x1)), "x2": list(map(float, x2)),
           "future_x1": list(map(float, f1)), "future_x2": list(map(float, f2)),
           "full": fit(y, x1, x2, f1, f2), "gaps": fit(yg, x1, x2, f1, f2),
           "y_gaps": [None if np.isnan(v) else float(v) for v in yg]}
    with open("testdata/fit_ml/sarimax.json", "w") as f:
        json.dump(ref, f, indent=0)


if __name__ == "__main__":
    main()
