#!/usr/bin/python3
"""Reference traces for examples/harness/pi.go (TestPIBackCalculation).

An independent simulation, written from the equations in pi.go's doc, of
the position-form PI with output limits and back-calculation (tracking
time Tt = Ti) closed around the valve path of the greenhouse spec,
P = 0.01 B^3 / (1 - 0.95 B), every 1 min, from rest at valve u0 = 45 %,
with a set-point step of `step` degC at sample 10 (deviation variables).
The output is read before the new valve position is applied (as
control.Analyze and the harness do). Writes pi_<name>.csv with columns
k, y, u (17 significant digits). Run: /usr/bin/python3 pi.py
"""
import csv

KC, TI, TS = 17.77, 19.46, 1.0   # SIMC tuning of the harness (rounded)
LO, HI, U0 = 0.0, 100.0, 45.0
N, AT = 120, 10


def pi_run(step, tt):
    f = min(TS / tt, 1.0)
    y = [0.0] * N
    u = [0.0] * N
    integral = None
    yk = 0.0
    for k in range(N):
        if k > 0:
            past = u[k - 3] if k >= 3 else U0
            yk = 0.95 * yk + 0.01 * (past - U0)
        e = (step if k >= AT else 0.0) - yk
        if integral is None:
            integral = U0 - KC * e
        i = integral + KC * TS / TI * e
        v = KC * e + i
        uk = min(max(v, LO), HI)
        integral = i + f * (uk - v)
        y[k], u[k] = yk, uk
    return y, u


def settle(y, step, band):
    last = max(k for k in range(N) if abs(y[k] - step) > band)
    return last + 1 - AT


if __name__ == "__main__":
    for name, step in (("small", 0.5), ("saturated", 4.0)):
        y, u = pi_run(step, TI)
        with open("pi_%s.csv" % name, "w", newline="") as fh:
            w = csv.writer(fh)
            w.writerow(["k", "y", "u"])
            for k in range(N):
                w.writerow([k, repr(y[k]), repr(u[k])])
        print(name, "settles to +-5 %% in %d min, valve at 100 %% for %d min"
              % (settle(y, step, 0.05 * step), sum(1 for x in u if x >= HI)))
    for tt in (TI / 4, 1.0):
        y, _ = pi_run(4.0, tt)
        print("saturated, Tt = %.4g: settles in %d min" % (tt, settle(y, 4.0, 0.2)))
