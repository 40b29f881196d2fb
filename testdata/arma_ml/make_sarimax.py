#!/usr/bin/python3
"""make_sarimax.py: reference values for arma's exact-likelihood fit of a regression with
ARMA(1,1) errors, from statsmodels' SARIMAX (Debian python3-statsmodels 0.13.5).

Run from the repository root:   /usr/bin/python3 testdata/arma_ml/make_sarimax.py

Our own simulated data (numpy default_rng(20261205), scipy.signal.lfilter):
    y_t = 2 + 0.5 x1_t - 1.2 x2_t + u_t,   (1 - 0.6 B) u_t = (1 + 0.3 B) a_t,  a_t ~ N(0, 1),
x1 a random walk, x2 = sin(2 pi t / 25), n = 300. The "gaps" case sets samples 40..51,
150 and 299 (0-based) to NaN.

SARIMAX(y, exog=[1, x1, x2], order=(1, 0, 1), trend="n", concentrate_scale=True): the
constant enters as a column of ones, so its coefficient is the mean c of the noise, as
in arma; the regression coefficients are estimated by maximum likelihood with the ARMA
ones (mle_regression), the ARMA state starts from its stationary distribution, NaN
samples are skipped by the filter. Fitted by BFGS with gtol 1e-10 (tight, so that the
optimiser's stopping point is far below the test tolerance), standard errors from the
observed information (cov_type="approx"). Smoothed values of the missing samples:
smoother_results.smoothed_forecasts (observation intercept included) and
smoothed_forecasts_error_cov times the concentrated scale.

Writes testdata/arma_ml/sarimax.json.
"""
import json

import numpy as np
from scipy.signal import lfilter
from statsmodels.tsa.statespace.sarimax import SARIMAX


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
    exog = np.column_stack([np.ones_like(y), x1, x2])
    mod = SARIMAX(y, exog=exog, order=(1, 0, 1), trend="n", concentrate_scale=True)
    res = mod.fit(method="bfgs", gtol=1e-10, maxiter=2000, disp=False, cov_type="approx")
    out = {
        "names": list(mod.param_names),
        "params": [float(v) for v in res.params],
        "bse": [float(v) for v in res.bse],
        "llf": float(res.llf),
        "scale": float(res.scale),
        "nobs_effective": int(np.sum(~np.isnan(y))),
    }
    miss = np.where(np.isnan(y))[0]
    sr = res.smoother_results
    out["missing"] = [int(i) for i in miss]
    out["smooth"] = [float(sr.smoothed_forecasts[0, i]) for i in miss]
    out["smooth_se"] = [float(np.sqrt(sr.smoothed_forecasts_error_cov[0, 0, i])) for i in miss]
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
