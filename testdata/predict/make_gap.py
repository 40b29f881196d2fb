"""Reference one-step prediction errors and their variances across gaps
in the output, for tf/predict's TestGapReference.

Each case is a transfer-function model y_t = 0.5 x_{t-1} + N_t with ARIMA
noise N_t; the output is missing over two stretches. The reference is
statsmodels' Kalman filter of the noise model (SARIMAX, parameters
fixed, no estimation) on N_t = y_t - 0.5 x_{t-1} with the missing
samples as NaN: forecasts_error and forecasts_error_cov, the one-step
prediction errors and their variances. The input term is known, so the
errors of y and of N are the same.

Run with Debian's python3 (python3-statsmodels 0.13.5, numpy 1.24.2,
scipy 1.10.1): /usr/bin/python3 make_gap.py
"""
import json
import warnings

import numpy as np
from scipy.signal import lfilter
from statsmodels.tsa.statespace.sarimax import SARIMAX

N = 400
MISSING = list(range(200, 260)) + list(range(300, 305))
SIGMA2 = 0.01

# name, spec (the model as backshift writes it), d, AR (phi_1..), MA
# (statsmodels' sign: 1 + ma_1 B + ...)
CASES = [
    ("ARIMA(0,1,1)", "(1 - B) y = 0.5 B (1 - B) x + (1 - 0.3 B) a", 1, [], [-0.3]),
    ("ARMA(1,1)", "y = 0.5 B x + (1 + 0.4 B) / (1 - 0.7 B) a", 0, [0.7], [0.4]),
    ("ARIMA(2,1,1)", "(1 - B) y = 0.5 B (1 - B) x + (1 + 0.5 B) / (1 - 0.5 B + 0.3 B^2) a", 1, [0.5, -0.3], [0.5]),
]


def main():
    warnings.simplefilter("ignore")  # the note on diffuse starts and burn-in
    out = {"source": "statsmodels SARIMAX filter (fixed parameters), forecasts_error and forecasts_error_cov",
           "sigma2": SIGMA2, "missing": MISSING, "cases": []}
    for k, (name, spec, d, ar, ma) in enumerate(CASES):
        rng = np.random.default_rng(20261205 + k)
        a = np.sqrt(SIGMA2) * rng.standard_normal(N)
        x = rng.standard_normal(N)
        w = lfilter(np.r_[1, ma], np.r_[1, -np.array(ar)], a) if ar or ma else a
        noise = np.cumsum(w) if d == 1 else w
        xlag = np.r_[0.0, x[:-1]]
        y = 0.5 * xlag + noise
        endog = noise.copy()
        endog[MISSING] = np.nan
        mod = SARIMAX(endog, order=(len(ar), d, len(ma)), trend="n")
        # Exact diffuse start (Durbin & Koopman), so that by sample 150
        # the filter has forgotten its start to rounding; the default
        # approximate diffuse start leaves some 4e-9 of sigma2.
        mod.ssm.initialize_diffuse()
        mod.ssm.tolerance = 0  # no steady-state shortcut: every step filtered in full
        res = mod.filter(np.r_[ar, ma, SIGMA2])
        fr = res.filter_results
        out["cases"].append({
            "name": name, "spec": spec,
            "x": x.tolist(), "y": y.tolist(),
            "error": [0.0 if np.isnan(v) else float(v) for v in fr.forecasts_error[0]],
            "variance": [float(v) for v in fr.forecasts_error_cov[0, 0]],
        })
    with open("gap.json", "w") as f:
        json.dump(out, f)


main()
