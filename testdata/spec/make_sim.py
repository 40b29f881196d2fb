#!/usr/bin/python3
"""Reference outputs of whole models given as spec text, written to sim.json.

How to run (from the repository root; Debian's interpreter, which has scipy):

    /usr/bin/python3 testdata/spec/make_sim.py

Each case holds a spec (our own scenarios), its polynomials written out
by hand here in ascending powers of B (scipy.signal.lfilter takes b, a in
ascending powers of z^-1 = B), input series and innovations drawn from
numpy's default_rng with fixed seeds, and the output computed with
scipy.signal.lfilter stage by stage, all pre-sample values zero:

    w_t = c + sum_i lfilter(B^b num_i, den_i, lfilter(diff_i, [1], x_i))_t
              + lfilter(theta, phi, a)_t
    y   = lfilter([1], D, w)

The Go test parses the spec, simulates it with the given innovations and
compares with y.
"""
import json
import os

import numpy as np
import scipy
import scipy.signal as sig

N = 300


def poly_mul(*ps):
    out = np.array([1.0])
    for p in ps:
        out = np.convolve(out, np.array(p, dtype=float))
    return out


def case(name, spec, c, inputs, noise, diff, seed):
    rng = np.random.default_rng(seed)
    w = np.full(N, float(c))
    series = {}
    for inp in inputs:
        x = np.cumsum(rng.standard_normal(N)) * 0.3 + inp.get("level", 0.0)
        series[inp["series"]] = x.tolist()
        dx = sig.lfilter(np.array(inp.get("diff", [1.0])), [1.0], x)
        b = np.concatenate([np.zeros(inp["delay"]), np.array(inp["num"], dtype=float)])
        w += sig.lfilter(b, np.array(inp["den"], dtype=float), dx)
    a = rng.standard_normal(N) * 0.1
    if noise is not None:
        w += sig.lfilter(np.array(noise[0], dtype=float), np.array(noise[1], dtype=float), a)
    y = sig.lfilter([1.0], np.array(diff, dtype=float), w)
    return {"name": name, "spec": spec, "inputs": series, "innovations": a.tolist(), "output": y.tolist()}


cases = [
    case("kiln", "temp = 21.5 + (0.8 + 0.3 B) / (1 - 0.7 B) B^4 burner + (1 - 0.4 B) / (1 - 0.6 B) a",
         21.5, [{"series": "burner", "num": [0.8, 0.3], "den": [1, -0.7], "delay": 4}],
         ([1, -0.4], [1, -0.6]), [1], 11),
    # Named coefficients held or started in the where clause take their values.
    case("two inputs, ARMA(2, 1) by shorthand",
         "flow = w0 B^2 rain + (v0 - v1 B) / ((1 - d1 B)(1 - d2 B)) B melt + ARMA(2, 1) "
         "where w0 = 0.5, v0 ~ 1.2, v1 ~ 0.4, d1 = 0.5, d2 ~ -0.3, phi1 = 0.5, phi2 = -0.25, theta1 ~ 0.3",
         0.0, [{"series": "rain", "num": [0.5], "den": [1], "delay": 2},
               {"series": "melt", "num": [1.2, -0.4], "den": poly_mul([1, -0.5], [1, 0.3]).tolist(), "delay": 1}],
         ([1, -0.3], [1, -0.5, 0.25]), [1], 12),
    # Differenced output and a differenced input; the constant integrates to a drift.
    case("integrated", "(1 - B) level = 0.01 + 0.2 B ((1 - B) valve) + 0.05 / (1 - 0.9 B) B^3 feed + 1 / (1 - 0.5 B) a",
         0.01, [{"series": "valve", "num": [0.2], "den": [1], "delay": 1, "diff": [1, -1]},
                {"series": "feed", "num": [0.05], "den": [1, -0.9], "delay": 3}],
         ([1], [1, -0.5]), [1, -1], 13),
    # Seasonal differencing and a squared factor.
    case("seasonal", "(1 - B)(1 - B^4) sales = (1.5 - 0.5 B)^2 B ((1 - B)(1 - B^4) lead) + (1 - 0.6 B)(1 - 0.5 B^4) a",
         0.0, [{"series": "lead", "num": poly_mul([1.5, -0.5], [1.5, -0.5]).tolist(), "den": [1], "delay": 1,
                "diff": poly_mul([1, -1], [1, 0, 0, 0, -1]).tolist()}],
         (poly_mul([1, -0.6], [1, 0, 0, 0, -0.5]).tolist(), [1]), poly_mul([1, -1], [1, 0, 0, 0, -1]).tolist(), 14),
    case("noise free, unit gain and grouped denominator",
         "y = -2 + 1 x + 0.4 / ((1 - 0.5 B)(1 + 0.2 B)) B^2 z",
         -2.0, [{"series": "x", "num": [1], "den": [1], "delay": 0},
                {"series": "z", "num": [0.4], "den": poly_mul([1, -0.5], [1, 0.2]).tolist(), "delay": 2}],
         None, [1], 15),
]

out = {"source": "scipy %s, numpy %s: testdata/spec/make_sim.py" % (scipy.__version__, np.__version__),
       "cases": cases}
here = os.path.dirname(os.path.abspath(__file__))
with open(os.path.join(here, "sim.json"), "w") as f:
    json.dump(out, f)
