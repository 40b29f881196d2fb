#!/usr/bin/python3
"""Reference roots for internal/poly, written to roots.json.

How to run (from the repository root; Debian's interpreter):

    /usr/bin/python3 testdata/scipy/make_roots.py

numpy.roots (companion-matrix eigenvalues via LAPACK) on polynomials of our
own in ascending powers of B: for each degree, one with standard normal
coefficients (fixed seed) and one with roots we choose (well separated,
near a circle of radius 1.2, conjugate pairs), whose exact roots are stored too
(coefficients expanded with mpmath at 60 digits, then rounded once).
"""
import json
import os

import mpmath
import numpy as np

mpmath.mp.dps = 60


def expand(roots):
    """prod (B - r) in 60-digit arithmetic (mpmath), rounded once to float.

    np.poly in double precision would lose the small middle coefficients
    to cancellation for high degrees; rounding once keeps each coefficient
    within half an ulp, so the chosen roots stay roots to ~1e-15.
    """
    c = [mpmath.mpc(1)]
    for r in roots:
        r = mpmath.mpc(complex(r).real, complex(r).imag)
        n = [mpmath.mpc(0)] * (len(c) + 1)
        for k, v in enumerate(c):  # c descending
            n[k] += v
            n[k + 1] -= r * v
        c = n
    return [float(mpmath.re(v)) for v in c][::-1]

DEGREES = [1, 2, 3, 4, 5, 6, 8, 10, 12, 16, 20, 24, 32, 40, 48, 56, 64]
rng = np.random.default_rng(64)
cases = []
for n in DEGREES:
    c = rng.standard_normal(n + 1)
    r = np.roots(c[::-1])
    cases.append({"name": f"random normal degree {n}", "coef": c.tolist(),
                  "roots_re": np.real(r).tolist(), "roots_im": np.imag(r).tolist(), "exact": False})
    # Chosen roots: near-uniform on a circle (radii 1.2 +- 5 %, angles
    # jittered by up to a fifth of the spacing), in conjugate pairs, plus
    # one real root for odd n. Roots spread around a circle keep the
    # expanded polynomial well conditioned at every degree (a spread of
    # radii would not), so rounding the coefficients moves them < 1e-13.
    roots = []
    m = n // 2
    for k in range(m):
        rad = 1.2 * (1 + 0.05 * np.sin(3.0 * k + 1.0))
        ang = np.pi * (k + 0.5 + 0.2 * np.cos(5.0 * k)) / (m + 0.5 * (n % 2))
        z = rad * np.exp(1j * ang)
        roots += [z, np.conj(z)]
    if n % 2:
        roots.append(-1.2)
    c2 = expand(roots)  # ascending; leading (B^n) coefficient 1
    r2 = np.roots(np.array(c2)[::-1])
    cases.append({"name": f"chosen roots degree {n}", "coef": c2,
                  "roots_re": np.real(r2).tolist(), "roots_im": np.imag(r2).tolist(),
                  "chosen_re": np.real(roots).tolist(), "chosen_im": np.imag(roots).tolist(), "exact": True})

path = os.path.join(os.path.dirname(os.path.abspath(__file__)), "roots.json")
with open(path, "w") as f:
    json.dump({"source": f"numpy {np.__version__} numpy.roots: testdata/scipy/make_roots.py", "cases": cases}, f, indent=1)
    f.write("\n")
print("wrote", path)
