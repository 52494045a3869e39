"""Design matrices of the bilinear knot lattice, shared by the surface reference generators.

Built directly from the definition (hat functions, x clamped to the end knots), independently of
the TypeScript core. Not a generator itself (generate.sh runs only gen_*.py).
"""
import numpy as np


def hats(x, t):
    """Row i: the weights of the knots t in the linear interpolation at x[i] (clamped to t)."""
    K = len(t)
    xc = np.clip(x, t[0], t[-1])
    j = np.minimum(np.searchsorted(t, xc, side="right") - 1, K - 2)
    u = (xc - t[j]) / (t[j + 1] - t[j])
    M = np.zeros((len(x), K))
    M[np.arange(len(x)), j] += 1 - u
    M[np.arange(len(x)), j + 1] += u
    return M


def design(x1, x2, t1, t2):
    """Bilinear design: column b * K1 + a for knot a of x1 and knot b of x2 (row-major K2 x K1, as RATCHET.GRID)."""
    H1 = hats(x1, t1)
    H2 = hats(x2, t2)
    return np.einsum("ib,ia->iba", H2, H1).reshape(len(x1), len(t2) * len(t1))
