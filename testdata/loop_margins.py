"""loop_margins.py: the gain crossovers of an open loop on a frequency grid, shared by
testdata/control/make_reference.py and testdata/scipy/make_golden.py (numpy, Debian's
python3-numpy 1.24.2).

A script in a folder of testdata/ imports it after putting testdata/ on sys.path.
"""
import numpy as np


def gain_crossovers(w, mag, ph):
    """Yields (wc, margin) for each place where |L| crosses 1 between neighbouring points of
    the grid w (rad/sample), in grid order: wc located by linear interpolation of mag = |L|
    between the two points, and the phase margin there, the unwrapped phase ph interpolated
    alike, plus pi, wrapped into [-pi, pi)."""
    s = np.sign(mag - 1)
    for i in np.nonzero(s[:-1] * s[1:] < 0)[0]:
        f = (1 - mag[i]) / (mag[i + 1] - mag[i])
        wc = w[i] + f * (w[i + 1] - w[i])
        p = ph[i] + f * (ph[i + 1] - ph[i])
        yield wc, np.remainder(p + np.pi + np.pi, 2 * np.pi) - np.pi
