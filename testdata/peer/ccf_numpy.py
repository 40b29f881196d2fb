#!/usr/bin/python3
"""Peer timing for backshift's ccf.Cross: numpy on the same problem sizes.

How to run (Debian's interpreter, which has numpy):

    /usr/bin/python3 testdata/peer/ccf_numpy.py
    go test ./ccf -run '^$' -bench 'Cross$' -benchtime 10x

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


def main():
    rng = np.random.default_rng(12)
    n = 1_000_000
    x = rng.standard_normal(n)
    y = rng.standard_normal(n)
    x[1:] += 0.5 * x[:-1]
    a = ccf_direct(x[:5000], y[:5000], 40)
    b = ccf_fft(x[:5000], y[:5000], 40)
    assert np.max(np.abs(a - b)) < 1e-12, np.max(np.abs(a - b))
    print("numpy", np.__version__)
    print("direct K=40   n=1e6: %.1f ms" % (1e3 * best(ccf_direct, x, y, 40)))
    print("fft    K=2000 n=1e6: %.1f ms" % (1e3 * best(ccf_fft, x, y, 2000)))


if __name__ == "__main__":
    main()
