#!/usr/bin/python3
"""Reference values for package tf, written to golden.json.

How to run (from the repository root; Debian's interpreter, which has scipy):

    /usr/bin/python3 testdata/scipy/make_golden.py

Versions used for the committed file: Python 3 with scipy 1.10.1 and numpy
from Debian. Every model below is our own; polynomials are in ascending
powers of B (= z^-1), the dead time is a count of leading zero numerator
coefficients. Functions used:

- scipy.signal.lfilter: impulse and step responses, a filtered random input
- scipy.signal.dimpulse, dstep: the same responses from a state-space form
- scipy.signal.tf2zpk: zeros and poles in the z-plane
- scipy.signal.freqz: frequency response on a grid in rad/sample, with
  numpy.unwrap for the phase
- scipy.signal.cont2discrete(method='zoh'): zero-order-hold equivalents of
  continuous first- and second-order lags (no dead time)
- numpy (dense frequency grid): stability margins of open loops
- scipy.linalg.expm: continuous step responses of the state-space form
  (scipy.signal.tf2ss), y(u) = C A^-1 (e^{A u} - I) B, sampled at
  t = kT - theta for dead times that are not a whole number of samples
"""
import json
import os
import sys

import numpy as np
import scipy
import scipy.linalg
import scipy.signal as sig

sys.path.insert(0, os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
import loop_margins  # noqa: E402 (testdata/loop_margins.py)

N_RESP = 60
N_INPUT = 200
W = np.linspace(0.0, np.pi, 64)


def model(name, num, den, delay):
    num = [float(v) for v in num]
    den = [float(v) for v in den]
    b = [0.0] * delay + num
    a = den
    imp = np.zeros(N_RESP)
    imp[0] = 1.0
    rng = np.random.default_rng(len(name) * 7919)  # fixed seed per model
    x = rng.standard_normal(N_INPUT)
    out = {
        "name": name,
        "num": num,
        "den": den,
        "delay": delay,
        "impulse": sig.lfilter(b, a, imp).tolist(),
        "step": sig.lfilter(b, a, np.ones(N_RESP)).tolist(),
        "input": x.tolist(),
        "output": sig.lfilter(b, a, x).tolist(),
    }
    # The same responses by scipy.signal.dimpulse/dstep, which simulate a
    # state-space realisation (an algorithm independent of lfilter's):
    # H(z) = z^-L B(z)/z^-L A(z) with both padded to L + 1 = max length.
    L = max(len(b), len(a))
    sysd = (b + [0.0] * (L - len(b)), a + [0.0] * (L - len(a)), 1.0)
    out["dimpulse"] = np.ravel(sig.dimpulse(sysd, n=N_RESP)[1][0]).tolist()
    out["dstep"] = np.ravel(sig.dstep(sysd, n=N_RESP)[1][0]).tolist()
    # Zeros and poles in z: omega and delta read as descending powers of z
    # are z^s omega(1/z) and z^r delta(1/z).
    z, p, _ = sig.tf2zpk(num, den)
    out["zeros_re"] = np.real(z).tolist()
    out["zeros_im"] = np.imag(z).tolist()
    out["poles_re"] = np.real(p).tolist()
    out["poles_im"] = np.imag(p).tolist()
    if abs(np.polyval(den[::-1], 1.0)) > 1e-12:
        out["gain"] = float(np.sum(num) / np.sum(den))
    else:
        out["gain"] = None
    if not np.any(np.isclose(np.abs(p), 1.0)):
        _, h = sig.freqz(b, a, worN=W)
        out["w"] = W.tolist()
        out["mag"] = np.abs(h).tolist()
        out["phase"] = np.unwrap(np.angle(h)).tolist()
    return out


def high_order():
    # Order 10 denominator from our own pole set, numerator of degree 5.
    poles = [0.9, 0.8 + 0.3j, 0.8 - 0.3j, 0.5 + 0.6j, 0.5 - 0.6j, -0.4,
             0.2 + 0.1j, 0.2 - 0.1j, -0.6 + 0.5j, -0.6 - 0.5j]
    den_z = np.real(np.poly(poles))  # descending z = ascending B
    num = [0.05, -0.02, 0.03, 0.01, -0.015, 0.004]
    return num, den_z.tolist()


models = [
    model("first order", [0.4], [1, -0.6], 1),
    model("second order real poles", [0.2, 0.1], [1, -1.1, 0.28], 2),
    model("complex poles", [0.3, 0.15], [1, -1.2, 0.72], 1),
    model("non-minimum-phase zero", [-0.5, 0.9], [1, -1.3, 0.42], 0),
    model("pure dead time", [1.5], [1], 7),
    model("integrator", [0.25], [1, -1], 2),
    model("unstable", [1, 0.5], [1, -2.1, 1.04], 0),
    model("order 4 lead-lag", [0.1, 0.05, -0.02, 0.01, 0.003], [1, -1.9, 1.35, -0.42, 0.048], 1),
    model("moving average only", [0.25, 0.25, 0.25, 0.25], [1], 0),
    model("unnormalised denominator", [0.8, -0.2], [2.0, -1.0, 0.3], 1),
    model("high order", *high_order(), 3),
]

# Zero-order-hold equivalents without dead time (scipy.signal.cont2discrete).
c2d = []


def add_c2d(name, kind, params, cnum, cden, T):
    num, den, _ = sig.cont2discrete((cnum, cden), T, method="zoh")
    c2d.append({"name": name, "kind": kind, "params": params, "T": T,
                "num_z": np.ravel(num).tolist(), "den_z": np.ravel(den).tolist()})


add_c2d("fopdt K=2 tau=5 T=1", "fopdt", {"K": 2.0, "tau": 5.0}, [2.0], [5.0, 1.0], 1.0)
add_c2d("fopdt K=-0.7 tau=0.3 T=0.25", "fopdt", {"K": -0.7, "tau": 0.3}, [-0.7], [0.3, 1.0], 0.25)
add_c2d("sopdt K=1.5 tau 4, 1.5 T=0.5", "sopdt", {"K": 1.5, "tau1": 4.0, "tau2": 1.5},
        [1.5], np.polymul([4.0, 1.0], [1.5, 1.0]).tolist(), 0.5)
add_c2d("sopdt double pole K=3 tau 2 T=0.4", "sopdt", {"K": 3.0, "tau1": 2.0, "tau2": 2.0},
        [3.0], np.polymul([2.0, 1.0], [2.0, 1.0]).tolist(), 0.4)
for K, wn, zeta, T in [(1.2, 0.8, 0.3, 0.5), (0.9, 2.0, 0.05, 0.1), (2.0, 1.5, 1.0, 0.3), (1.0, 0.6, 2.5, 1.0)]:
    add_c2d(f"second order K={K} wn={wn} zeta={zeta} T={T}", "second",
            {"K": K, "wn": wn, "zeta": zeta}, [K * wn * wn], [1.0, 2 * zeta * wn, wn * wn], T)

# Continuous step responses with dead time, via the matrix exponential.
steps = []


def cont_step(cnum, cden, times):
    A, B, C, D = sig.tf2ss(cnum, cden)
    Ainv = np.linalg.inv(A)
    I = np.eye(A.shape[0])
    out = []
    for u in times:
        if u <= 0:
            out.append(0.0)
        else:
            out.append(float((C @ Ainv @ (scipy.linalg.expm(A * u) - I) @ B + D).item()))
    return out


def add_step(name, kind, params, cnum, cden, T, theta, n=40):
    t = np.arange(n) * T
    steps.append({"name": name, "kind": kind, "params": params, "T": T, "theta": theta,
                  "y": cont_step(cnum, cden, t - theta)})


add_step("fopdt fractional dead time", "fopdt", {"K": 2.0, "tau": 5.0}, [2.0], [5.0, 1.0], 1.0, 2.3)
add_step("fopdt short tau", "fopdt", {"K": -0.7, "tau": 0.3}, [-0.7], [0.3, 1.0], 0.25, 0.6)
add_step("sopdt fractional dead time", "sopdt", {"K": 1.5, "tau1": 4.0, "tau2": 1.5},
         [1.5], np.polymul([4.0, 1.0], [1.5, 1.0]).tolist(), 0.5, 1.85)
add_step("sopdt double pole", "sopdt", {"K": 3.0, "tau1": 2.0, "tau2": 2.0},
         [3.0], np.polymul([2.0, 1.0], [2.0, 1.0]).tolist(), 0.4, 0.9)
add_step("second order underdamped", "second", {"K": 1.2, "wn": 0.8, "zeta": 0.3},
         [1.2 * 0.64], [1.0, 0.48, 0.64], 0.5, 3.3)
add_step("second order overdamped", "second", {"K": 1.0, "wn": 0.6, "zeta": 2.5},
         [0.36], [1.0, 3.0, 0.36], 1.0, 0.25)

# Stability margins of open loops, from numpy on a dense grid (2^21 points
# in (0, pi]) with linear interpolation of the crossings: the phase
# crossover (unwrapped phase = -pi mod 2 pi) with the smallest gain margin
# 1/|L|, and the gain crossover (|L| = 1) with the smallest phase margin.
margins = []


def add_margins(num, den, delay):
    w = np.linspace(0, np.pi, 2**21 + 1)[1:]
    z = np.exp(-1j * w)
    L = np.polyval(num[::-1], z) / np.polyval(den[::-1], z) * z**delay
    mag = np.abs(L)
    ph = np.unwrap(np.angle(np.polyval(num[::-1], z) / np.polyval(den[::-1], z))) - delay * w
    out = {"num": num, "den": den, "delay": delay}
    gm, wpc = None, None
    # Levels -pi - 2 pi k crossed between neighbours.
    for k in range(-2, 2 + int(delay) + 2 * len(den)):
        lev = -np.pi - 2 * np.pi * k
        s = np.sign(ph - lev)
        idx = np.nonzero(s[:-1] * s[1:] < 0)[0]
        for i in idx:
            t = (lev - ph[i]) / (ph[i + 1] - ph[i])
            wc = w[i] + t * (w[i + 1] - w[i])
            m = mag[i] + t * (mag[i + 1] - mag[i])
            if gm is None or 1 / m < gm:
                gm, wpc = 1 / m, wc
        # A crossing exactly at the Nyquist frequency (L(-1) real negative).
        if abs(ph[-1] - lev) < 1e-9 and (gm is None or 1 / mag[-1] < gm):
            gm, wpc = 1 / mag[-1], np.pi
    pm, wgc = None, None
    for wc, v in loop_margins.gain_crossovers(w, mag, ph):
        if pm is None or v < pm:
            pm, wgc = v, wc
    out.update({"gain_margin": gm, "phase_crossover": wpc, "phase_margin": pm, "gain_crossover": wgc})
    margins.append(out)


add_margins([0.5], [1.0, -0.8], 3)
add_margins([0.2, 0.1], [1.0, -1.3, 0.42], 2)
add_margins([0.05], [1.0, -1.9, 0.9], 1)
add_margins([0.3, -0.2], [1.0, -1.2, 0.72], 4)

doc = {
    "source": f"scipy {scipy.__version__}, numpy {np.__version__}: testdata/scipy/make_golden.py",
    "models": models,
    "c2d": c2d,
    "steps": steps,
    "margins": margins,
}
path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "golden.json")
with open(path, "w") as f:
    json.dump(doc, f, indent=1)
    f.write("\n")
print("wrote", path)
