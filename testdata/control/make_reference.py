#!/usr/bin/python3
"""Reference values for tf/control (run: /usr/bin/python3 testdata/control/make_reference.py).

Writes loops.json: for fixed plants and controllers (polynomials in the
backshift operator B, ascending powers, with a dead time in samples)
  - the closed-loop poles: numpy.roots of the characteristic polynomial
    delta_c delta_p + omega_c omega_p B^(b_c+b_p), whose coefficients in
    ascending powers of B are those of the z-plane polynomial in
    descending powers of z;
  - gain, phase and delay margins and the peaks of |S| and |T| from a
    dense scipy.signal.freqz sweep (2^20 points on [0, pi]), crossovers
    located by linear interpolation between grid points;
  - set-point, control and load step responses by scipy.signal.lfilter of
    the closed-loop transfer functions.
and pid.json: PID controllers discretised by scipy.signal.cont2discrete
(methods 'backward_diff' and 'bilinear'), and quantiles.json:
numpy.quantile (method 'linear') of a fixed vector.
Needs Debian's python3-scipy (scipy 1.10.1, numpy 1.24.2).
"""
import json
import os
import sys

import numpy as np
from scipy import signal

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.dirname(HERE))
import loop_margins  # noqa: E402 (testdata/loop_margins.py)


def shift(c, d):
    return [0.0] * d + list(c)


def padd(a, b):
    n = max(len(a), len(b))
    return [(a[i] if i < len(a) else 0.0) + (b[i] if i < len(b) else 0.0) for i in range(n)]


def pmul(a, b):
    return list(np.convolve(a, b))


def pi_bd(kc, ti, T):
    # PI by backward difference s = (1 - B)/T: Kc (1 + T/Ti - B)/(1 - B)
    return [kc * (1 + T / ti), -kc], [1.0, -1.0], 0


def zoh_fo(k, tau, d, T=1.0):
    a = np.exp(-T / tau)
    return [k * (1 - a)], [1.0, -a], d + 1


CASES = {
    # SIMC-like PI on a first-order lag with 3 samples of dead time.
    "fopdt_pi": (zoh_fo(2.0, 10.0, 3), pi_bd(0.72, 11.5, 1.0)),
    # Second-order plant with a numerator zero, PID-like controller.
    "sopdt_pid": (([0.05, 0.03], [1.0, -1.5, 0.56], 2),
                  ([3.38, -5.62, 2.31], [1.0, -1.23, 0.23], 0)),
    # Integrating plant under proportional control.
    "integrating_p": (([0.1], [1.0, -1.0], 3), ([0.8], [1.0], 0)),
    # The first loop with too much gain: unstable.
    "fopdt_unstable": (zoh_fo(2.0, 10.0, 3), pi_bd(4.0, 5.0, 1.0)),
    # Long dead time (20 samples), slow PI.
    "long_delay": (zoh_fo(1.5, 30.0, 19), pi_bd(0.4, 30.0, 1.0)),
}


def loop_case(plant, ctrl, n=150, grid=2 ** 20):
    (pn, pd, pb), (cn, cd, cb) = plant, ctrl
    b = pb + cb
    char = padd(pmul(cd, pd), shift(pmul(cn, pn), b))
    poles = np.roots(char)  # ascending in B = descending in z
    w = np.linspace(0, np.pi, grid + 1)[1:]
    _, L = signal.freqz(shift(pmul(cn, pn), b), pmul(cd, pd), worN=w)
    S = 1 / (1 + L)
    Tc = L / (1 + L)
    ms_i, mt_i = int(np.argmax(np.abs(S))), int(np.argmax(np.abs(Tc)))
    mag = np.abs(L)
    ph = np.unwrap(np.angle(L))
    # gain crossovers: |L| - 1 changes sign
    pm, wc_pm, dm = None, None, np.inf
    for wc, m in loop_margins.gain_crossovers(w, mag, ph):
        if pm is None or m < pm:
            pm, wc_pm = m, wc
        dm = min(dm, max(m, 0) / wc)
    # phase crossovers: phase crosses -pi - 2 pi k
    gm, wc_gm = None, None
    for i in range(len(w) - 1):
        lo, hi = min(ph[i], ph[i + 1]), max(ph[i], ph[i + 1])
        k = np.ceil((-np.pi - hi) / (2 * np.pi))
        while True:
            level = -np.pi - 2 * np.pi * k
            if level < lo:
                break
            if level <= hi and hi > lo:
                f = (level - ph[i]) / (ph[i + 1] - ph[i])
                m = mag[i] + f * (mag[i + 1] - mag[i])
                if gm is None or 1 / m < gm:
                    gm, wc_gm = 1 / m, w[i] + f * (w[i + 1] - w[i])
            k += 1
    step = np.ones(n)
    y_sp = signal.lfilter(shift(pmul(cn, pn), b), char, step)
    u_sp = signal.lfilter(shift(pmul(cn, pd), cb), char, step)
    y_ld = signal.lfilter(shift(pmul(pn, cd), pb), char, step)
    return {
        "plant": {"num": list(pn), "den": list(pd), "delay": pb},
        "controller": {"num": list(cn), "den": list(cd), "delay": cb},
        "char": list(map(float, char)),
        "poles_re": list(map(float, poles.real)),
        "poles_im": list(map(float, poles.imag)),
        "max_pole": float(np.max(np.abs(poles))),
        "ms": float(np.abs(S[ms_i])), "ms_at": float(w[ms_i]),
        "mt": float(np.abs(Tc[mt_i])), "mt_at": float(w[mt_i]),
        "gm": gm, "gm_at": wc_gm, "pm": pm, "pm_at": wc_pm,
        "dm": None if np.isinf(dm) else float(dm),
        "grid_step": float(w[1] - w[0]),
        "setpoint": list(map(float, y_sp)),
        "control": list(map(float, u_sp)),
        "load": list(map(float, y_ld)),
    }


def pid_cases():
    out = []
    for form, kc, ti, td, a, T in [("parallel", 1.5, 8.0, 2.0, 0.1, 1.0),
                                   ("series", 0.8, 12.0, 3.0, 0.2, 0.5),
                                   ("parallel", 2.0, 5.0, 0.0, 0.1, 1.0)]:
        tf_ = a * td
        if form == "series":
            num = np.polymul([td, 1], [ti, 1]) * kc  # descending in s
        else:
            num = kc * np.array([ti * tf_ + ti * td, ti + tf_, 1.0])
        den = np.polymul([tf_, 1], [ti, 0]) if td > 0 else np.array([ti, 0.0])
        num = np.trim_zeros(np.atleast_1d(num), "f")
        den = np.trim_zeros(np.atleast_1d(den), "f")
        for method in ("backward_diff", "bilinear"):
            nd, dd, _ = signal.cont2discrete((num, den), T, method=method)
            nd = np.atleast_1d(np.squeeze(nd))
            # z-domain, descending powers of z, equal lengths: the same
            # coefficients are ascending powers of B after dividing by z^n.
            out.append({"form": form, "kc": kc, "ti": ti, "td": td, "filter": a, "T": T,
                        "method": method, "num": list(map(float, nd / dd[0])),
                        "den": list(map(float, dd / dd[0]))})
    return out


def main():
    loops = {k: loop_case(p, c) for k, (p, c) in CASES.items()}
    with open(os.path.join(HERE, "loops.json"), "w") as f:
        json.dump(loops, f, indent=1)
    with open(os.path.join(HERE, "pid.json"), "w") as f:
        json.dump(pid_cases(), f, indent=1)
    x = [3.2, -1.0, 7.5, 0.25, 2.0, 9.0, 4.4, 1.1, -3.3, 5.0, 6.0]
    levels = [0.05, 0.25, 0.5, 0.9, 0.95]
    with open(os.path.join(HERE, "quantiles.json"), "w") as f:
        json.dump({"x": x, "levels": levels, "q": list(map(float, np.quantile(x, levels)))}, f, indent=1)


if __name__ == "__main__":
    main()
