#!/usr/bin/python3
"""Side-by-side timing: tf.Rational.Filter against scipy.signal.lfilter.

How to run (from the repository root; Debian's interpreter, which has scipy):

    /usr/bin/python3 testdata/peer/lfilter_peer.py             # runs go test -bench itself
    /usr/bin/python3 testdata/peer/lfilter_peer.py bench.txt   # or reads saved output of
        go test ./tf -run '^$' -bench '^BenchmarkFilter$' -benchtime 0.5s -count 3 > bench.txt

Both sides filter the same sizes (10^3..10^7 samples of standard normal
noise) through the same (s, r) = (1,1), (2,2), (4,4) terms with the same
coefficients (see benchTerms in tf/rational_bench_test.go), each allocating
its output. scipy is timed by the best of five rounds of repeated
scipy.signal.lfilter(b, a, x) calls; Go by testing.B, best of -count 3.
Printed: ns/sample for each and the ratio Go/scipy (target for (2,2) at
10^7: <= 0.5).
Machines are shared: run it when the machine is quiet, and expect a few
per cent of noise.
"""
import os
import re
import subprocess
import sys
import time

import numpy as np
import scipy
import scipy.signal as sig

TERMS = {
    "1,1": ([0.4, 0.2], [1, -0.7]),
    "2,2": ([0.2, 0.1, 0.05], [1, -1.2, 0.5]),
    "4,4": ([0.1, 0.05, -0.02, 0.01, 0.003], [1, -1.9, 1.35, -0.42, 0.048]),
}
SIZES = [10**3, 10**4, 10**5, 10**6, 10**7]


def time_lfilter(b, a, x):
    n = len(x)
    reps = max(3, min(2000, int(3e6 // n)))
    best = float("inf")
    for _ in range(5):
        t0 = time.perf_counter()
        for _ in range(reps):
            sig.lfilter(b, a, x)
        best = min(best, (time.perf_counter() - t0) / reps)
    return best * 1e9 / n


def go_bench(path):
    if path:
        with open(path) as f:
            text = f.read()
    else:
        root = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..")
        cmd = ["go", "test", "./tf", "-run", "^$", "-bench", "^BenchmarkFilter$", "-benchtime", "0.5s", "-count", "3"]
        print("running:", " ".join(cmd), file=sys.stderr)
        text = subprocess.run(cmd, cwd=root, check=True, capture_output=True, text=True).stdout
    out = {}
    for m in re.finditer(r"BenchmarkFilter/(\S+?)/(\d+)(?:-\d+)?\s+\d+\s+[\d.]+ ns/op\s+([\d.]+) ns/sample", text):
        key, v = (m.group(1), int(m.group(2))), float(m.group(3))
        out[key] = min(v, out.get(key, v))  # best of -count runs
    if not out:
        sys.exit("no BenchmarkFilter lines with ns/sample found")
    return out


def main():
    go = go_bench(sys.argv[1] if len(sys.argv) > 1 else None)
    rng = np.random.default_rng(1)
    x_all = rng.standard_normal(SIZES[-1])
    print(f"scipy {scipy.__version__}, numpy {np.__version__}")
    print(f"{'order':>6} {'samples':>9} {'scipy ns/sample':>16} {'go ns/sample':>13} {'go/scipy':>9}")
    for name, (b, a) in TERMS.items():
        for n in SIZES:
            s = time_lfilter(b, a, x_all[:n])
            g = go.get((name, n))
            ratio = f"{g / s:9.2f}" if g else "      n/a"
            gs = f"{g:13.2f}" if g else "          n/a"
            print(f"{name:>6} {n:>9} {s:16.2f} {gs} {ratio}")


if __name__ == "__main__":
    main()
