#!/usr/bin/python3
"""Sum of squares of the LakeHuron AR(2) + trend CSS fit at three points, in 50-digit
arithmetic (mpmath 1.2.1), to settle which point is lower when double-precision rounding
(a series at level 580) blurs the comparison. Run from the repository root:

    /usr/bin/python3 testdata/arma/lakehuron_mp.py

Points: ours (arma.Fit, printed by the Go test TestFitCSSR's comment), the Gauss-Newton
polish and R's tight optimum from testdata/arma/css.json. Result at the time of writing:
ours 42.35450178555684650, Gauss-Newton 42.35450178555686693, R tight 42.35450178555688852.
"""
import json

import mpmath

mpmath.mp.dps = 50
y = json.load(open("testdata/arma/datasets.json"))["LakeHuron"]
ref = [c for c in json.load(open("testdata/arma/css.json")) if c["name"] == "LakeHuron_200_trend"][0]


def ssq(p):
    a1, a2, mu, b = [mpmath.mpf(v) for v in p]
    z = [mpmath.mpf(v) - mu - b * (i + 1) for i, v in enumerate(y)]
    return sum((z[t] - a1 * z[t - 1] - a2 * z[t - 2]) ** 2 for t in range(2, len(y)))


ours = [0.99974248957715306, -0.27877896220030396, 579.84704098900897, -0.017914642077902946]
for name, p in [("ours", ours), ("Gauss-Newton", ref["coef_gn"]), ("R tight", ref["coef_tight"])]:
    print(f"{name:13s} {mpmath.nstr(ssq(p), 20)}")
