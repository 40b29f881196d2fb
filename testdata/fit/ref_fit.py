#!/usr/bin/python3
"""Independent conditional-least-squares fits of transfer-function-noise models.

Run with Debian's interpreter (scipy 1.10.1, numpy 1.24.2):

    cd testdata/fit && /usr/bin/python3 ref_fit.py

It simulates three datasets of our own (sim1.csv, sim2.csv with two inputs,
sim3.csv with differencing and a product of MA factors; fixed seeds), reads
the BJsales export (../bjsales/bjsales.csv, R datasets package, Series M of
Box, Jenkins & Reinsel), fits every model with scipy.optimize.least_squares
(method "lm", MINPACK, finite-difference Jacobian) on residuals computed
with scipy.signal.lfilter, and writes ref_fit.json: for each case the model
description (read by the Go tests to build the same tf.Model), the data
file, the estimates, the sum of squares, the number of residuals and the
first residual index, and the diagnostic statistics at the scipy
estimates: the Ljung-Box Q of the residuals (K = max(min(24, N/4), noise
parameters + 1), df K - noise parameters, scipy.stats.chi2) and, per
input, S = M sum_{k=0..K} r_k^2 of the residuals against the input
prewhitened by a Yule-Walker autoregression with AIC order choice
(Durbin-Levinson written here with numpy), df K + 1 - (r + s + 1); and
10-step forecasts from origin n - 10 with their standard errors, once with
the future inputs known and once with every input forecast from a
Yule-Walker/AIC autoregression of its differenced series (its forecast
errors added to the variance through omega B^b / (delta phi_x D)).

Conditioning (the same as fit.Model, written independently here):
  w_t = D(B) y_t for t >= d (zero before), z_i,t = D_i(B) x_i,t for t >= d_i;
  an input without differencing is held at its first value z0 = x_i,0 before
  the record (the process settled at the input's first level), a differenced
  one is zero before (z0 = 0): u_i = lfilter(omega_i, delta_i, B^b_i (z_i - z0))
  from rest plus omega_i(1)/delta_i(1) z0;
  n_t = w_t - c - sum_i u_i,t used from ts = max(d, max_i d_i + b_i + s_i);
  a_t = 0 for t < t0 = ts + p; for t >= t0, theta(B) a_t = phi(B) n_t with the
  actual n_{t-1..t-p} and a pre-sample of zeros.
"""
import json
import os

import numpy as np
from scipy.optimize import least_squares
from scipy.signal import lfilter
from scipy.stats import chi2

HERE = os.path.dirname(os.path.abspath(__file__))


# A polynomial is a list of factors {"exp": e, "terms": [{"power", "neg", "name", "value"}]}.
def T(power, name="", value=1.0, neg=False):
    return {"power": power, "neg": neg, "name": name, "value": value}


def F(*terms, exp=1):
    return {"exp": exp, "terms": list(terms)}


ONE_MINUS_B = [F(T(0), T(1, neg=True))]


def coeffs(p, par):
    c = np.array([1.0])
    for f in p:
        deg = max(t["power"] for t in f["terms"])
        base = np.zeros(deg + 1)
        for t in f["terms"]:
            v = par[t["name"]] if t["name"] else t["value"]
            base[t["power"]] += -v if t["neg"] else v
        for _ in range(f["exp"]):
            c = np.convolve(c, base)
    return c


def degree(p):
    return sum(max(t["power"] for t in f["terms"]) * f["exp"] for f in p)


def names_of(model):
    out = []

    def add(p):
        for f in p:
            for t in f["terms"]:
                if t["name"] and t["name"] not in out:
                    out.append(t["name"])

    if model["const"]:
        out.append(model["const"])
    for inp in model["inputs"]:
        add(inp["num"])
        add(inp["den"])
    add(model["ma"])
    add(model["ar"])
    return out


def diffed(x, p):
    d = degree(p)
    w = lfilter(coeffs(p, {}), [1.0], x)
    w[:d] = 0.0
    return w


def input_term(inp, x, par):
    """u = omega/delta B^b z. An input without differencing is held at its
    first value z0 before the record: omega/delta B^b (z - z0) from rest
    plus omega(1)/delta(1) z0; a differenced one is zero before (z0 = 0)."""
    d = degree(inp["diff"])
    z = diffed(x, inp["diff"])
    z0 = z[0] if d == 0 else 0.0
    zc = z - z0
    zc[:d] = 0.0
    b = inp["delay"]
    n = len(x)
    zb = np.concatenate([np.zeros(b), zc[: n - b]])
    num, den = coeffs(inp["num"], par), coeffs(inp["den"], par)
    return lfilter(num, den, zb) + num.sum() / den.sum() * z0


def conditioning(model):
    ts = degree(model["diff"])
    for inp in model["inputs"]:
        ts = max(ts, degree(inp["diff"]) + inp["delay"] + degree(inp["num"]))
    return ts, ts + degree(model["ar"])


def residuals(model, data, par, want_noise=False):
    y = data[model["output"]]
    n = len(y)
    ts, t0 = conditioning(model)
    nn = diffed(y, model["diff"])
    if model["const"]:
        nn = nn - par[model["const"]]
    for inp in model["inputs"]:
        nn = nn - input_term(inp, data[inp["series"]], par)
    phi = coeffs(model["ar"], par)
    theta = coeffs(model["ma"], par)
    v = np.zeros(n - t0)
    for k, c in enumerate(phi):
        v += c * nn[t0 - k : n - k]
    a = lfilter([1.0], theta, v)
    if want_noise:
        return a, nn
    return a


def yule_walker_aic(x, diff):
    """The AR model of x differenced by diff, fitted by Yule-Walker (divisor
    n, mean removed) with the AIC order choice over orders 0..10 log10 n, as
    R's ar() does. Returns the differencing degree d, the centred
    differenced series zc, its mean, the chosen coefficients phi, the order
    p and the innovation variances v of orders 0..m (Levinson-Durbin)."""
    d = degree(diff)
    z = diffed(x, diff)[d:]
    n = len(z)
    mean = z.mean()
    zc = z - mean
    m = min(n - 1, int(np.floor(10 * np.log10(n))))
    acov = np.array([np.dot(zc[: n - k], zc[k:]) / n for k in range(m + 1)])
    phis, v = levinson(acov, m)
    aic = [n * np.log(v[k]) + 2 * k for k in range(m + 1)]
    p = int(np.argmin(aic))
    return d, zc, mean, phis[p], p, v


def ar_input_forecast(x, diff, h):
    """Forecast an input h steps from an AR model of its differenced series
    fitted by Yule-Walker with AIC order choice (as R's ar(): divisor n,
    var.pred = c0 prod(1 - pacf^2) n / (n - (p + 1)))."""
    d, zc, mean, phi, p, v = yule_walker_aic(x, diff)
    n = len(zc)
    var_pred = v[p] * n / (n - (p + 1))
    ext = list(zc)
    for _ in range(h):
        ext.append(sum(phi[k] * ext[-1 - k] for k in range(p)))
    zf = np.array(ext[n:]) + mean
    dc = coeffs(diff, {})
    xe = list(x)
    for j in range(h):
        xe.append((zf[j] - sum(dc[k] * xe[-k] for k in range(1, len(dc)))) / dc[0])
    return np.array(xe[len(x):]), np.concatenate([[1.0], -phi]), var_pred


def forecast(model, hist, future, par, sigma2, h):
    """Forecasts of the output in its own units, with known future inputs
    (future given) or inputs forecast from their own AR models (future
    None), the latter adding their forecast errors to the variance."""
    y = hist[model["output"]]
    n = len(y)
    ts, t0 = conditioning(model)
    a, nn = residuals(model, hist, par, want_noise=True)
    L = n + h
    what = np.full(h, par[model["const"]] if model["const"] else 0.0)
    dc = coeffs(model["diff"], {})
    imp = np.zeros(h)
    imp[0] = 1.0
    extra = np.zeros(h)
    for inp in model["inputs"]:
        if future is None:
            xf, arx, vx = ar_input_forecast(hist[inp["series"]], inp["diff"], h)
            num = np.concatenate([np.zeros(inp["delay"]), coeffs(inp["num"], par)])
            den = np.convolve(np.convolve(coeffs(inp["den"], par), arx), dc)
            extra += vx * np.cumsum(lfilter(num, den, imp) ** 2)
        else:
            xf = future[inp["series"]][:h]
        xe = np.concatenate([hist[inp["series"]], xf])
        what += input_term(inp, xe, par)[n:]
    phi = coeffs(model["ar"], par)
    theta = coeffs(model["ma"], par)
    ne = np.zeros(L)
    ne[ts:n] = nn[ts:n]
    ae = np.zeros(L)
    ae[t0:n] = a
    for t in range(n, L):
        ne[t] = -sum(phi[k] * ne[t - k] for k in range(1, len(phi))) + sum(theta[k] * ae[t - k] for k in range(1, len(theta)))
        what[t - n] += ne[t]
    ye = np.concatenate([y, np.zeros(h)])
    for t in range(n, L):
        ye[t] = what[t - n] - sum(dc[k] * ye[t - k] for k in range(1, len(dc)))
    psi = lfilter(theta, np.convolve(phi, dc), imp)
    se = np.sqrt(sigma2 * np.cumsum(psi ** 2) + extra)
    return ye[n:].tolist(), se.tolist()


def fit(model, data, start):
    names = names_of(model)
    x0 = np.array([start[k] for k in names])

    def f(x):
        return residuals(model, data, dict(zip(names, x)))

    res = least_squares(f, x0, method="lm", xtol=1e-15, ftol=1e-15, gtol=1e-15, max_nfev=20000)
    r = f(res.x)
    return dict(zip(names, res.x.tolist())), float(r @ r), len(r), res


def levinson(acov, m):
    """Durbin-Levinson: AR coefficients and prediction variances up to order m."""
    phi = np.zeros(0)
    v = [acov[0]]
    out = [phi]
    for k in range(1, m + 1):
        a = (acov[k] - np.dot(phi, acov[1:k][::-1])) / v[-1]
        phi = np.concatenate([phi - a * phi[::-1], [a]])
        v.append(v[-1] * (1 - a * a))
        out.append(phi)
    return out, v


def prewhiten(x, diff):
    """AR prewhitening by Yule-Walker with AIC order choice (divisor n, mean removed)."""
    d, zc, _, phi, p, _ = yule_walker_aic(x, diff)
    alpha = np.full(len(x), np.nan)
    full = np.concatenate([np.zeros(d), zc])
    for t in range(d + p, len(x)):
        alpha[t] = full[t] - np.dot(phi, full[t - p : t][::-1]) if p else full[t]
    return alpha, d + p, p


def checks(model, data, par, first):
    """Ljung-Box Q of the residuals and the residual-input portmanteau S."""
    a = residuals(model, data, par)
    nres = len(a)
    noise_par = len([k for k in names_of({"const": "", "inputs": [], "ma": model["ma"], "ar": model["ar"]})])
    lags = max(min(24, nres // 4), noise_par + 1)
    ac = a - a.mean()
    c0 = ac @ ac / nres
    r = np.array([ac[: nres - k] @ ac[k:] / nres / c0 for k in range(1, lags + 1)])
    q = nres * (nres + 2) * np.sum(r ** 2 / (nres - np.arange(1, lags + 1)))
    out = {"lb_lags": lags, "lb_df": lags - noise_par, "lb_q": float(q),
           "lb_p": float(chi2.sf(q, lags - noise_par)), "cross": []}
    n = len(data[model["output"]])
    resid = np.concatenate([np.zeros(first), a])
    for inp in model["inputs"]:
        alpha, start, p = prewhiten(data[inp["series"]], inp["diff"])
        t0 = max(start, first)
        xa = alpha[t0:] - alpha[t0:].mean()
        ya = resid[t0:] - resid[t0:].mean()
        m = len(xa)
        k = min(lags, m - 2)
        den = np.sqrt((xa @ xa / m) * (ya @ ya / m))
        rr = np.array([xa[: m - j] @ ya[j:] / m / den for j in range(k + 1)])
        S = m * np.sum(rr ** 2)
        npar = len(names_of({"const": "", "inputs": [inp], "ma": [], "ar": []}))
        df = max(k + 1 - npar, 1)
        out["cross"].append({"input": inp["series"], "ar_order": p, "lags": k, "m": m, "S": float(S),
                             "df": df, "p": float(chi2.sf(S, df))})
    return out


FC_H = 10


def forecast_case(c, est, sigma2):
    """Forecast from origin n - FC_H of the data, future inputs known."""
    n = len(c["data"][c["model"]["output"]])
    hist = {k: v[: n - FC_H] for k, v in c["data"].items()}
    fut = {k: v[n - FC_H :] for k, v in c["data"].items()}
    mean, se = forecast(c["model"], hist, fut, est, sigma2, FC_H)
    mean_x, se_x = forecast(c["model"], hist, None, est, sigma2, FC_H)
    return {"origin": n - FC_H, "h": FC_H, "mean": mean, "se": se,
            "mean_ar_inputs": mean_x, "se_ar_inputs": se_x}


def write_csv(path, cols):
    keys = list(cols)
    with open(path, "w") as fh:
        fh.write(",".join(keys) + "\n")
        for i in range(len(cols[keys[0]])):
            fh.write(",".join(repr(float(cols[k][i])) for k in keys) + "\n")


def arma_noise(rng, n, ar, ma, sd, burn=500):
    e = sd * rng.standard_normal(n + burn)
    return lfilter(ma, ar, e)[burn:]


def simulate():
    sims = {}
    # sim1: one input, b=2, s=1, r=1, ARMA(1,1) noise, constant, n = 500.
    rng = np.random.default_rng(20261201)
    n = 500
    x = arma_noise(rng, n, [1, -0.5], [1], 1.0)
    u = lfilter([2.0, -0.8], [1, -0.6], np.concatenate([np.zeros(2), x[: n - 2]]))
    y = 10.0 + u + arma_noise(rng, n, [1, -0.7], [1, -0.4], 0.5)
    sims["sim1"] = {"y": y, "x": x}
    # sim2: two inputs, x1 b=1 s=0 r=1, x2 b=4 s=1 r=0, AR(2) noise, n = 600.
    rng = np.random.default_rng(20261202)
    n = 600
    x1 = arma_noise(rng, n, [1, -0.3], [1], 1.0)
    x2 = rng.standard_normal(n)
    u1 = lfilter([1.5], [1, -0.8], np.concatenate([np.zeros(1), x1[: n - 1]]))
    u2 = lfilter([-0.7, 0.5], [1], np.concatenate([np.zeros(4), x2[: n - 4]]))
    y = -3.0 + u1 + u2 + arma_noise(rng, n, [1, -1.1, 0.3], [1], 0.4)
    sims["sim2"] = {"y": y, "x1": x1, "x2": x2}
    # sim3: (1-B) y = w(B)/delta(B) B^2 (1-B) x + (1 - t1 B)(1 - T1 B^4) a,
    # s = 1, r = 2 (oscillatory poles), n = 800, no constant.
    rng = np.random.default_rng(20261203)
    n = 800
    x = np.cumsum(rng.standard_normal(n))
    z = np.concatenate([[0.0], np.diff(x)])
    u = lfilter([0.9, 0.4], [1, -1.2, 0.5], np.concatenate([np.zeros(2), z[: n - 2]]))
    noise = arma_noise(rng, n, [1], np.convolve([1, -0.5], [1, 0, 0, 0, -0.3]), 0.3)
    y = np.cumsum(u + noise)
    sims["sim3"] = {"y": y, "x": x}
    return sims


def main():
    cases = []
    # BJsales: (1 - B) sales = c + w0 B^3/(1 - d1 B) (1 - B) lead + (1 - t1 B) a.
    bj = np.loadtxt(os.path.join(HERE, "..", "bjsales", "bjsales.csv"), delimiter=",", skiprows=1)
    bjdata = {"sales": bj[:, 1], "lead": bj[:, 2]}
    cases.append({
        "name": "bjsales",
        "file": "../bjsales/bjsales.csv",
        "model": {"output": "sales", "diff": ONE_MINUS_B, "const": "c",
                  "inputs": [{"series": "lead", "diff": ONE_MINUS_B, "delay": 3,
                              "num": [F(T(0, "w0", 0.0))], "den": [F(T(0), T(1, "d1", 0.0, neg=True))]}],
                  "ma": [F(T(0), T(1, "t1", 0.0, neg=True))], "ar": []},
        "start": {"c": 0.03, "w0": 4.0, "d1": 0.6, "t1": 0.4},
        "data": bjdata,
    })
    sims = simulate()
    for name, cols in sims.items():
        write_csv(os.path.join(HERE, name + ".csv"), cols)
    cases.append({
        "name": "sim1", "file": "sim1.csv",
        "model": {"output": "y", "diff": [], "const": "c",
                  "inputs": [{"series": "x", "diff": [], "delay": 2,
                              "num": [F(T(0, "w0", 0.0), T(1, "w1", 0.0, neg=True))],
                              "den": [F(T(0), T(1, "d1", 0.0, neg=True))]}],
                  "ma": [F(T(0), T(1, "t1", 0.0, neg=True))], "ar": [F(T(0), T(1, "p1", 0.0, neg=True))]},
        "start": {"c": 9.0, "w0": 1.5, "w1": 0.5, "d1": 0.5, "t1": 0.2, "p1": 0.5},
        "data": sims["sim1"],
    })
    cases.append({
        "name": "sim2", "file": "sim2.csv",
        "model": {"output": "y", "diff": [], "const": "c",
                  "inputs": [{"series": "x1", "diff": [], "delay": 1,
                              "num": [F(T(0, "a0", 0.0))], "den": [F(T(0), T(1, "a1", 0.0, neg=True))]},
                             {"series": "x2", "diff": [], "delay": 4,
                              "num": [F(T(0, "b0", 0.0), T(1, "b1", 0.0))], "den": []}],
                  "ma": [], "ar": [F(T(0), T(1, "p1", 0.0, neg=True), T(2, "p2", 0.0, neg=True))]},
        "start": {"c": -2.0, "a0": 1.0, "a1": 0.5, "b0": -0.5, "b1": 0.3, "p1": 0.8, "p2": -0.1},
        "data": sims["sim2"],
    })
    cases.append({
        "name": "sim3", "file": "sim3.csv",
        "model": {"output": "y", "diff": ONE_MINUS_B, "const": "",
                  "inputs": [{"series": "x", "diff": ONE_MINUS_B, "delay": 2,
                              "num": [F(T(0, "w0", 0.0), T(1, "w1", 0.0))],
                              "den": [F(T(0), T(1, "d1", 0.0, neg=True), T(2, "d2", 0.0, neg=True))]}],
                  "ma": [F(T(0), T(1, "t1", 0.0, neg=True)), F(T(0), T(4, "T1", 0.0, neg=True))], "ar": []},
        "start": {"w0": 0.7, "w1": 0.2, "d1": 1.0, "d2": -0.4, "t1": 0.3, "T1": 0.1},
        "data": sims["sim3"],
    })
    out = []
    for c in cases:
        est, ssq, nres, res = fit(c["model"], c["data"], c["start"])
        ts, t0 = conditioning(c["model"])
        print(c["name"], est, "ssq", ssq, "N", nres, "status", res.status, "nfev", res.nfev)
        out.append({"name": c["name"], "file": c["file"], "model": c["model"], "estimates": est,
                    "ssq": ssq, "n_resid": nres, "first": t0, "noise_start": ts,
                    "checks": checks(c["model"], c["data"], est, t0),
                    "forecast": forecast_case(c, est, ssq / (nres - len(est))),
                    "source": "scipy 1.10.1 optimize.least_squares(method='lm') on signal.lfilter residuals"})
    with open(os.path.join(HERE, "ref_fit.json"), "w") as fh:
        json.dump(out, fh, indent=1)


if __name__ == "__main__":
    main()
