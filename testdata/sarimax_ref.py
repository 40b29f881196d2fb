"""sarimax_ref.py: the statsmodels SARIMAX fit shared by testdata/arma_ml/make_sarimax.py and
testdata/fit_ml/make_sarimax.py (Debian python3-statsmodels 0.13.5): a regression on a constant
and two inputs with ARMA(1,1) errors, and the figures both scripts write.

SARIMAX(y, exog=[1, x1, x2], order=(1, 0, 1), trend="n", concentrate_scale=True): the constant
enters as a column of ones, so its coefficient is the mean of the noise; the regression
coefficients are estimated by maximum likelihood with the ARMA ones (mle_regression), the ARMA
state starts from its stationary distribution, NaN samples are skipped by the filter. Fitted by
BFGS with gtol 1e-10 (tight, so that the optimiser's stopping point is far below the tests'
tolerances), standard errors from the observed information (cov_type="approx"). Smoothed values
of the missing samples: smoother_results.smoothed_forecasts (observation intercept included)
and smoothed_forecasts_error_cov times the concentrated scale.

A script in a folder of testdata/ imports it after putting testdata/ on sys.path.
"""
import numpy as np
from statsmodels.tsa.statespace.sarimax import SARIMAX


def fit(y, x1, x2):
    """Returns the model and its fit for output y and inputs x1, x2 (NaN in y: missing)."""
    exog = np.column_stack([np.ones_like(y), x1, x2])
    mod = SARIMAX(y, exog=exog, order=(1, 0, 1), trend="n", concentrate_scale=True)
    res = mod.fit(method="bfgs", gtol=1e-10, maxiter=2000, disp=False, cov_type="approx")
    return mod, res


def estimates(mod, res, y, order):
    """The estimates and their standard errors in the order given as (name written,
    statsmodels name) pairs, the log-likelihood, the concentrated scale and the number of
    samples of y that are not NaN."""
    p = dict(zip(mod.param_names, res.params))
    b = dict(zip(mod.param_names, res.bse))
    return {
        "names": [k for k, _ in order],
        "params": [float(p[s]) for _, s in order],
        "bse": [float(b[s]) for _, s in order],
        "llf": float(res.llf),
        "scale": float(res.scale),
        "nobs_effective": int(np.sum(~np.isnan(y))),
    }


def smoothed_missing(res, y):
    """The indices of the NaN samples of y, their smoothed values and standard errors."""
    miss = np.where(np.isnan(y))[0]
    sr = res.smoother_results
    return {
        "missing": [int(i) for i in miss],
        "smooth": [float(sr.smoothed_forecasts[0, i]) for i in miss],
        "smooth_se": [float(np.sqrt(sr.smoothed_forecasts_error_cov[0, 0, i])) for i in miss],
    }
