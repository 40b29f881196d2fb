#!/usr/bin/python3
"""Peer timing for backshift's ccf.Cross: numpy on the same problem sizes.

How to run (Debian's interpreter, which has numpy), from the repository root:

    /usr/bin/python3 testdata/peer/ccf_numpy.py          # numpy only
    /usr/bin/python3 testdata/peer/ccf_numpy.py --go     # side by side

With --go the script alternates numpy and `go test ./ccf -run '^$' -bench
'^BenchmarkCross$/(direct/K=40|fft/K=2000)/n=1000000$'` three times (so
that both see the same machine load) and prints the best time of each and
the ratio Go/numpy. Targets (issue 5): direct <= 0.5, fft <= 1.

Both compute the sample cross-correlation r_xy(k), k = -K..K, divisor n,
means removed, normalised by sqrt(c_xx(0) c_yy(0)), on n = 10^6 samples:
  direct: K = 40 with np.correlate in 'valid' mode against y padded by K
          zeros on both sides (2K+1 dot products of length n, numpy's own
          direct loop);
  fft:    K = 2000 with np.fft.rfft / irfft on the zero-padded series
          (length the next power of two >= n + K).
Each figure is the best of 5 runs, including mean removal and
normalisation, as in Cross. The script also checks that both numpy paths
agree with each other.
"""
import time

import numpy as np


def ccf_direct(x, y, K):
    xc = x - x.mean()
    yc = y - y.mean()
    ypad = np.concatenate([np.zeros(K), yc, np.zeros(K)])
    # out[j] = sum_t ypad[t + j] * xc[t] = sum_t xc[t] yc[t + j - K]: lag k = j - K
    c = np.correlate(ypad, xc, mode="valid")
    return c / np.sqrt(np.dot(xc, xc) * np.dot(yc, yc))


def ccf_fft(x, y, K):
    n = len(x)
    xc = x - x.mean()
    yc = y - y.mean()
    m = 1 << int(np.ceil(np.log2(n + K)))
    X = np.fft.rfft(xc, m)
    Y = np.fft.rfft(yc, m)
    cc = np.fft.irfft(np.conj(X) * Y, m)
    c = np.concatenate([cc[m - K:], cc[: K + 1]])
    return c / np.sqrt(np.dot(xc, xc) * np.dot(yc, yc))


def best(f, *args, reps=5):
    t = []
    for _ in range(reps):
        t0 = time.perf_counter()
        f(*args)
        t.append(time.perf_counter() - t0)
    return min(t)


def go_bench(sub, benchtime):
    """Runs one Go sub-benchmark of BenchmarkCross, returns seconds per op."""
    import re
    import subprocess
    out = subprocess.run(
        ["go", "test", "./ccf", "-run", "^$", "-bench", "^BenchmarkCross$/" + sub,
         "-benchtime", benchtime, "-count", "1"],
        check=True, capture_output=True, text=True).stdout
    m = re.search(r"\s(\d+(?:\.\d+)?) ns/op", out)
    return float(m.group(1)) * 1e-9


def main():
    import sys
    rng = np.random.default_rng(12)
    n = 1_000_000
    x = rng.standard_normal(n)
    y = rng.standard_normal(n)
    x[1:] += 0.5 * x[:-1]
    a = ccf_direct(x[:5000], y[:5000], 40)
    b = ccf_fft(x[:5000], y[:5000], 40)
    assert np.max(np.abs(a - b)) < 1e-12, np.max(np.abs(a - b))
    print("numpy", np.__version__)
    if "--go" not in sys.argv:
        print("direct K=40   n=1e6: %.1f ms" % (1e3 * best(ccf_direct, x, y, 40)))
        print("fft    K=2000 n=1e6: %.1f ms" % (1e3 * best(ccf_fft, x, y, 2000)))
        return
    res = {"direct": [[], []], "fft": [[], []]}
    for _ in range(3):
        res["direct"][0].append(best(ccf_direct, x, y, 40))
        res["direct"][1].append(go_bench("direct/K=40/n=1000000$", "20x"))
        res["fft"][0].append(best(ccf_fft, x, y, 2000))
        res["fft"][1].append(go_bench("fft/K=2000/n=1000000$", "5x"))
    for name, K in (("direct", 40), ("fft", 2000)):
        a, b = min(res[name][0]), min(res[name][1])
        print("%-6s K=%-4d n=1e6: numpy %7.1f ms   go %7.1f ms   go/numpy %.2f"
              % (name, K, 1e3 * a, 1e3 * b, b / a))


if __name__ == "__main__":
    main()
