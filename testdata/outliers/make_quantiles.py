#!/usr/bin/python3
"""Critical values of the outlier search of package arma (arma.Outliers).

The Bonferroni bound over `tests` two-sided tests at family-wise rate
`rate`: the quantile q(1 - rate / (2 tests)) of the standard normal
(scale known) or of Student's t with 0.37 m degrees of freedom (scale
estimated by the MAD, whose asymptotic efficiency is 37 %), m the number
of residuals and tests = 4 m (four kinds).

Run with Debian's python3-scipy (1.10.1):

    /usr/bin/python3 testdata/outliers/make_quantiles.py

It writes testdata/outliers/quantiles.json.
"""
import json
import os

from scipy.stats import norm, t

rows = []
for m in [200, 1000, 10000, 100000, 1000000]:
    p = 0.05 / (2 * 4 * m)
    rows.append({"m": m, "tests": 4 * m, "rate": 0.05, "robust": True,
                 "value": float(t.isf(p, 0.37 * m))})
    rows.append({"m": m, "tests": 4 * m, "rate": 0.05, "robust": False,
                 "value": float(norm.isf(p))})

out = os.path.join(os.path.dirname(os.path.abspath(__file__)), "quantiles.json")
with open(out, "w") as f:
    json.dump(rows, f, indent=1)
    f.write("\n")
