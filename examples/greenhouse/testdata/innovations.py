#!/usr/bin/python3
"""Reference values for greenhouse_test.go: the innovations a_t of the demo
record, recovered with scipy.signal.lfilter from the CSV that
`go run ./examples/identify -write-data greenhouse.csv` writes, using the
true model of package greenhouse:

    temp = 6 + 0.01 B^3/(1 - 0.95 B) valve + 0.05 B/(1 - 0.9 B) outdoor
           + (1 + 0.3 B)/(1 - 0.8 B) a

The input paths are filtered on deviations from the first sample (the record
starts after a settled warm-up), so the noise carries an unknown constant;
the innovations are taken from sample 300 on and their mean removed.

Run:  go run ./examples/identify -write-data /tmp/greenhouse.csv
      /usr/bin/python3 examples/greenhouse/testdata/innovations.py /tmp/greenhouse.csv
Writes innovations.json next to this script (scipy 1.10.1, numpy 1.24).
"""
import json
import os
import sys

import numpy as np
import scipy
from scipy import signal

path = sys.argv[1] if len(sys.argv) > 1 else "/tmp/greenhouse.csv"
d = np.genfromtxt(path, delimiter=",", names=True)
n = len(d)
u = d["valve"] - d["valve"][0]
o = d["outdoor"] - d["outdoor"][0]
vp = signal.lfilter([0, 0, 0, 0.01], [1, -0.95], u)
op = signal.lfilter([0, 0.05], [1, -0.9], o)
noise = d["temp"] - vp - op
a = signal.lfilter([1, -0.8], [1, 0.3], noise)[300:]
a = a - a.mean()
out = {
    "source": "scipy.signal.lfilter %s on the CSV written by -write-data" % scipy.__version__,
    "n": int(n),
    "sd": float(a.std()),
    "r1": float(np.mean(a[1:] * a[:-1]) / a.var()),
    "first": [float(v) for v in a[:10]],
}
with open(os.path.join(os.path.dirname(os.path.abspath(__file__)), "innovations.json"), "w") as f:
    json.dump(out, f, indent=1)
print(out)
