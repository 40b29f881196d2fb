#!/usr/bin/python3
"""Reference values for filtering from initial conditions, written to initial.json.

How to run (from the repository root; Debian's interpreter, which has scipy):

    /usr/bin/python3 testdata/scipy/make_initial.py

Versions used for the committed file: scipy 1.10.1, numpy 1.24.2 (Debian).
The terms are our own; polynomials are in ascending powers of B (= z^-1),
the dead time is a count of leading zero numerator coefficients. For each
term:

- "history": scipy.signal.lfiltic(b, a, y, x) builds the filter state from
  given past outputs and inputs (lfiltic takes them newest first: y[0] is
  y_{-1}; the JSON stores them oldest first, as tf.Past does), then
  scipy.signal.lfilter(b, a, x, zi=zi) filters a random input from there.
- "steady": scipy.signal.lfilter_zi(b, a) * u is the state of the steady
  response to the constant input u; lfilter continues from it, first on
  the constant u (the output must stay at gain * u), then on u plus noise.
"""
import json
import os

import numpy as np
import scipy
import scipy.signal as sig

TERMS = [
    ("first order, dead time 2", [0.5], [1, -0.8], 2),
    ("second order, complex poles, zero", [0.2, -0.1], [1, -1.2, 0.6], 1),
    ("non-minimum phase, no dead time", [-0.4, 0.9, 0.1], [1, -0.5, 0.06], 0),
    ("order 4, dead time 5", [0.1, 0.05, -0.02], [1, -1.9, 1.35, -0.42, 0.048], 5),
    ("moving average, dead time 3", [0.3, 0.3, 0.4], [1], 3),
]

rng = np.random.default_rng(20261201)
out = {"source": f"scipy {scipy.__version__}, numpy {np.__version__}: testdata/scipy/make_initial.py", "cases": []}
for name, num, den, delay in TERMS:
    b = np.array([0.0] * delay + num, dtype=float)
    a = np.array(den, dtype=float)
    nb, na = len(b) - 1, len(a) - 1
    # History: as many past values as the filter uses (b+s inputs, r outputs).
    past_in = rng.standard_normal(nb) if nb > 0 else np.zeros(0)
    past_out = rng.standard_normal(na) if na > 0 else np.zeros(0)
    x = rng.standard_normal(40)
    nz = max(nb, na)
    if nz > 0:
        zi = sig.lfiltic(b, a, past_out[::-1], past_in[::-1])
        y = sig.lfilter(b, a, x, zi=zi)[0]
    else:
        y = sig.lfilter(b, a, x)
    u = 1.7
    xs = u + 0.1 * rng.standard_normal(40)
    if nz > 0:
        zs = sig.lfilter_zi(b, a) * u
        ysc = sig.lfilter(b, a, np.full(40, u), zi=zs)[0]
        ysn = sig.lfilter(b, a, xs, zi=zs)[0]
    else:
        ysc = sig.lfilter(b, a, np.full(40, u))
        ysn = sig.lfilter(b, a, xs)
    out["cases"].append({
        "name": name, "num": num, "den": den, "delay": delay,
        "past_input": past_in.tolist(), "past_output": past_out.tolist(),
        "input": x.tolist(), "output": y.tolist(),
        "u": u, "steady_const_output": ysc.tolist(),
        "steady_input": xs.tolist(), "steady_output": ysn.tolist(),
    })

path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "initial.json")
with open(path, "w") as f:
    json.dump(out, f, indent=1)
print("wrote", path)
