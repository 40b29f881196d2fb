#!/usr/bin/python3
"""Reference values for tf/statespace: scipy.signal.tf2ss of each input
path and scipy.signal.dlsim of the whole model, realised independently of
the Go code.

Each case gives the model as a spec (parsed by the Go test) and, written
out by hand beside it, each input path's transfer function to y in B
(numerator, denominator, dead time: omega D_i / (delta D) B^b with the
differencing the input shares with the output cancelled) and the noise
part theta / (phi D) with the constant's part c / D. The script turns each
into z (B = 1/z), realises it with tf2ss (scipy's controller canonical
form), records its matrices' Markov parameters D, CB, CAB, ... and
characteristic polynomial (both independent of the realisation chosen),
then puts the blocks side by side into one system with inputs
(x_1, ..., x_m, a, 1) and runs dlsim from a zero state on seeded inputs
and innovations (the constant as a unit input from t = 0).

Run: /usr/bin/python3 testdata/statespace/make_reference.py
(scipy 1.10.1, numpy 1.24.2 from Debian).
"""
import json
import os
import warnings

import numpy as np
from scipy import signal

N = 300

# (name, spec, paths [(num_B, den_B, delay)], noise (num_B, den_B) or None,
#  constant part (num_B, den_B) or None)
CASES = [
    ("fopdt_arma",
     "y = 20 + 0.5 / (1 - 0.8 B) B^3 x + (1 - 0.3 B) / (1 - 0.5 B) a",
     [([0.5], [1, -0.8], 3)],
     ([1, -0.3], [1, -0.5]),
     ([20.0], [1.0])),
    ("two_inputs",
     "y = (1 + 0.5 B - 0.3 B^2) / (1 - 0.6 B) B x + (0.3 - 0.1 B) / (1 - 1.2 B + 0.35 B^2) v + (1 - 0.4 B) / ((1 - 0.5 B)(1 - 0.4 B^4)) a",
     [([1, 0.5, -0.3], [1, -0.6], 1),
      ([0.3, -0.1], [1, -1.2, 0.35], 0)],
     ([1, -0.4], list(np.polymul([1, -0.5][::-1], [1, 0, 0, 0, -0.4][::-1])[::-1])),
     None),
    ("arima",
     "(1 - B) y = 0.7 / (1 - 0.5 B) B^2 ((1 - B) x) + (1 - 0.3 B) / (1 - 0.6 B) a",
     [([0.7], [1, -0.5], 2)],
     ([1, -0.3], [1, -1.6, 0.6]),
     None),
    ("drift_integrating",
     "(1 - B) y = 0.1 + 0.3 / (1 - 0.5 B) B x + (1 + 0.2 B) a",
     [([0.3], [1, -1.5, 0.5], 1)],
     ([1, 0.2], [1, -1]),
     ([0.1], [1, -1])),
]


def to_z(num, den, delay):
    """num(B) B^delay / den(B) as descending-power polynomials in z of one
    degree n = max(len(num) - 1 + delay, len(den) - 1)."""
    n = max(len(num) - 1 + delay, len(den) - 1)
    nz = [0.0] * delay + list(num) + [0.0] * (n - delay - (len(num) - 1))
    dz = list(den) + [0.0] * (n - (len(den) - 1))
    return nz, dz


def block(num, den, delay):
    nz, dz = to_z(num, den, delay)
    if len(dz) == 1:  # a static gain: no states
        return (np.zeros((0, 0)), np.zeros((0, 1)), np.zeros((1, 0)),
                np.array([[nz[0] / dz[0]]]))
    return signal.tf2ss(nz, dz)


def markov(a, b, c, d, k):
    out = [float(d[0, 0])]
    v = b
    for _ in range(k):
        out.append(float((c @ v)[0, 0]))
        v = a @ v
    return out


def case(name, spec, paths, noise, const, seed):
    rng = np.random.RandomState(seed)
    blocks = [block(*p) for p in paths]
    if noise is not None:
        blocks.append(block(noise[0], noise[1], 0))
    if const is not None:
        blocks.append(block(const[0], const[1], 0))
    nin = len(blocks)
    ns = sum(bk[0].shape[0] for bk in blocks)
    A = np.zeros((ns, ns))
    B = np.zeros((ns, nin))
    C = np.zeros((1, ns))
    D = np.zeros((1, nin))
    f = 0
    for j, (a, b, c, d) in enumerate(blocks):
        k = a.shape[0]
        A[f:f + k, f:f + k] = a
        B[f:f + k, j:j + 1] = b
        C[0, f:f + k] = c
        D[0, j] = d[0, 0]
        f += k
    xs = [rng.standard_normal(N) for _ in paths]
    cols = list(xs)
    innov = None
    if noise is not None:
        innov = 0.3 * rng.standard_normal(N)
        cols.append(innov)
    if const is not None:
        cols.append(np.ones(N))
    u = np.column_stack(cols)
    _, y, _ = signal.dlsim((A, B, C, D, 1), u)
    out = {"name": name, "spec": spec, "inputs": [x.tolist() for x in xs],
           "innovations": None if innov is None else innov.tolist(),
           "output": y[:, 0].tolist(), "paths": []}
    for p, (a, b, c, d) in zip(paths, blocks):
        out["paths"].append({
            "states": int(a.shape[0]),
            "markov": markov(a, b, c, d, 2 * a.shape[0] + 10),
            "charpoly": np.poly(a).tolist() if a.shape[0] else [1.0],
        })
    return out


def main():
    # tf2ss warns of "badly conditioned" numerators when a dead time puts
    # leading zeros in front of the z-numerator; it strips them exactly,
    # so the warning says nothing about these cases.
    warnings.simplefilter("ignore", signal.BadCoefficients)
    here = os.path.dirname(os.path.abspath(__file__))
    cases = [case(*c, seed=100 + i) for i, c in enumerate(CASES)]
    with open(os.path.join(here, "reference.json"), "w") as fh:
        json.dump({"source": "scipy.signal.tf2ss and dlsim (scipy %s, numpy %s)"
                   % (__import__("scipy").__version__, np.__version__),
                   "cases": cases}, fh, indent=1)


if __name__ == "__main__":
    main()
