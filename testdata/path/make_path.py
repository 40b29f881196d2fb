#!/usr/bin/python3
"""Reference step responses of whole input paths (tf.Model.Path), written to path.json.

How to run (from the repository root; Debian's interpreter, which has scipy):

    /usr/bin/python3 testdata/path/make_path.py

Versions used for the committed file: scipy 1.10.1, numpy (Debian).
Each case is a model equation of our own,

    D(B) y_t = Num(B)/Den(B) B^b D_i(B) u_t,

polynomials in ascending powers of B (= z^-1). The response of y to a unit
step of u from rest is computed as the equation reads, one filter after the
other with scipy.signal.lfilter (which starts from rest): the input's
differencing D_i (FIR), then the term Num B^b / Den, then the inverse of
the output's differencing, 1/D(B). No factor is cancelled here, so the file
checks the cancellations tf.Model.Path makes as well as its product.
"""
import json
import os

import numpy as np
import scipy
import scipy.signal as sig

N = 200

# name, spec (for the Go test to parse), Num, Den, b, D_i, D
CASES = [
    ("output differenced (review's model)", "(1 - B) y = 0.05 / (1 - 0.5 B) B^2 u",
     [0.05], [1, -0.5], 2, [1], [1, -1]),
    ("input differenced", "y = 0.5 / (1 - 0.5 B) B ((1 - B) u)",
     [0.5], [1, -0.5], 1, [1, -1], [1]),
    ("both differenced once", "(1 - B) y = 0.3 / (1 - 0.8 B) B^3 ((1 - B) u)",
     [0.3], [1, -0.8], 3, [1, -1], [1, -1]),
    ("output twice, input once", "(1 - B)^2 y = (0.2 - 0.1 B) / (1 - 0.6 B) B ((1 - B) u)",
     [0.2, -0.1], [1, -0.6], 1, [1, -1], [1, -2, 1]),
    ("seasonal output", "(1 - B^4) y = 0.1 / (1 - 0.7 B) B^2 u",
     [0.1], [1, -0.7], 2, [1], [1, 0, 0, 0, -1]),
    ("seasonal both", "(1 - B^4) y = 0.4 B ((1 - B^4) u)",
     [0.4], [1], 1, [1, 0, 0, 0, -1], [1, 0, 0, 0, -1]),
    ("seasonal output, input once", "(1 - B^4) y = 0.25 / (1 - 0.9 B) ((1 - B) u)",
     [0.25], [1, -0.9], 0, [1, -1], [1, 0, 0, 0, -1]),
    ("output and seasonal output", "(1 - B) (1 - B^4) y = 0.1 / (1 - 0.5 B) B^2 u",
     [0.1], [1, -0.5], 2, [1], np.convolve([1, -1], [1, 0, 0, 0, -1]).tolist()),
]


def main():
    out = {"source": "scipy.signal.lfilter " + scipy.__version__ + ", cascade D_i, Num B^b / Den, 1 / D", "n": N, "cases": []}
    u = np.ones(N)
    for name, spec, num, den, b, di, d in CASES:
        v = sig.lfilter(di, [1.0], u)
        w = sig.lfilter(np.concatenate([np.zeros(b), num]), den, v)
        y = sig.lfilter([1.0], d, w)
        out["cases"].append({"name": name, "spec": spec, "step": y.tolist()})
    path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "path.json")
    with open(path, "w") as f:
        json.dump(out, f, indent=1)
        f.write("\n")


main()
