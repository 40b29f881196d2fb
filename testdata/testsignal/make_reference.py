#!/usr/bin/python3
"""Reference values for tf/testsignal, computed with numpy 1.24 (Debian).

Run from the repository root: /usr/bin/python3 testdata/testsignal/make_reference.py
Writes testdata/testsignal/reference.json:

- "multisine": Schroeder-phase multisines built here by numpy.fft.irfft from
  their line spectra (the Go code sums cosines directly): for each case the
  period, inputs, lines per input, each input's lines, one period of each
  signal scaled to peak 1, and its crest factor (peak / rms over the samples).
  Phases: phi_n = -pi n (n-1) / L, n = 1..L, Schroeder (1970), equal powers.
  Input i (from 0) takes harmonics i+1, i+1+m, ... (m inputs).
- "periodogram": numpy.fft.rfft periodograms |X_k|^2 / N^2 of
  (a) one period of a 7-stage maximum-length sequence generated here by an
      independent shift-register implementation (taps 7, 6; all-ones start;
      output = last stage; +1 for bit 1, -1 for bit 0), and
  (b) a deterministic test series of odd length.
"""
import json
import os

import numpy as np


def schroeder_case(period, inputs, lines):
    out = {"period": period, "inputs": inputs, "lines": lines, "harmonics": [], "signals": [], "crest": []}
    n = np.arange(1, lines + 1)
    phases = -np.pi * n * (n - 1) / lines
    for i in range(inputs):
        ks = i + 1 + inputs * np.arange(lines)
        spec = np.zeros(period // 2 + 1, dtype=complex)
        # irfft of a line of complex amplitude (period/2) e^{j phi} at k gives cos(2 pi k t / P + phi)
        spec[ks] = period / 2 * np.exp(1j * phases)
        x = np.fft.irfft(spec, n=period)
        peak = np.max(np.abs(x))
        rms = np.sqrt(np.mean(x * x))
        out["harmonics"].append([int(k) for k in ks])
        out["signals"].append(list(x / peak))
        out["crest"].append(float(peak / rms))
    return out


def mls(stages, taps):
    state = (1 << stages) - 1
    mask = state
    tapmask = sum(1 << (k - 1) for k in taps)
    seq = []
    for _ in range(mask):
        seq.append(1.0 if (state >> (stages - 1)) & 1 else -1.0)
        fb = bin(state & tapmask).count("1") & 1
        state = ((state << 1) | fb) & mask
    return seq


def periodogram(x):
    x = np.asarray(x, dtype=float)
    X = np.fft.rfft(x)
    return list(np.abs(X) ** 2 / len(x) ** 2)


def main():
    cases = [schroeder_case(64, 1, 31), schroeder_case(256, 3, 40), schroeder_case(1000, 2, 200)]
    seq = mls(7, [7, 6])
    t = np.arange(101)
    series = np.sin(0.3 * t) + 0.5 * np.cos(1.7 * t + 0.2) + 0.01 * t
    ref = {
        "source": "numpy " + np.__version__ + " (numpy.fft.irfft, numpy.fft.rfft); make_reference.py",
        "multisine": cases,
        "periodogram": [
            {"name": "maxlength7", "x": seq, "power": periodogram(seq)},
            {"name": "series101", "x": list(series), "power": periodogram(series)},
        ],
    }
    path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "reference.json")
    with open(path, "w") as f:
        json.dump(ref, f, indent=0)
        f.write("\n")


main()
