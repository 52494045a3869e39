"""Exact reference fits for the scale and heavy-weight checks (test/core/scale.test.ts).

Heavy rows (weight ratios up to 1e15), weights from 1e-300 to 1e100 and y near 1e-100 are beyond
what a floating-point QP solver such as quadprog or lsq_linear resolves, so this generator solves
the same problems in exact rational arithmetic (Python's fractions module) on the exact binary
values of the inputs, and rounds only the answer:
  - the knot model: minimise sum w (y - B theta)^2 subject to theta_1 <= ... <= theta_K, with B the
    hat-function basis on the knots; every working set of chain constraints is tried, its equality-
    constrained least-squares problem solved exactly, and the one whose solution is feasible with
    non-negative multipliers (the KKT conditions, which identify the unique optimum) is kept;
  - the classic fit: pool-adjacent-violators on exact fractions (ties do not occur here).
As a cross-check of the method, the unit-weight knot case is also solved with
scipy.optimize.lsq_linear(method="bvls") on the cumulative-step form theta = a + L d, d >= 0, and
must agree to 1e-9.
Writes fixtures/scale.json. Command: /usr/bin/python3 test/reference/gen_scale.py (working
directory: the repository root). Deterministic output.
"""

import itertools
import json
import os
import sys
from fractions import Fraction as F

import numpy as np
import scipy
from scipy.optimize import lsq_linear

OUT = os.path.join("test", "reference", "fixtures")
COMMAND = "/usr/bin/python3 test/reference/gen_scale.py"
VERSIONS = {"python": sys.version.split()[0], "numpy": np.__version__, "scipy": scipy.__version__}


def hat_rows(x, t):
    """Rows of the hat basis (exact): x clamped to [t_1, t_K], two adjacent non-zeros."""
    rows = []
    for xi in x:
        r = [F(0)] * len(t)
        if xi <= t[0]:
            r[0] = F(1)
        elif xi >= t[-1]:
            r[-1] = F(1)
        else:
            j = max(k for k in range(len(t) - 1) if t[k] <= xi)
            u = (xi - t[j]) / (t[j + 1] - t[j])
            r[j] = 1 - u
            r[j + 1] = u
        rows.append(r)
    return rows


def solve(a, b):
    """Exact Gaussian elimination with pivoting on a non-zero entry."""
    n = len(a)
    m = [row[:] + [b[i]] for i, row in enumerate(a)]
    for c in range(n):
        p = next(r for r in range(c, n) if m[r][c] != 0)
        m[c], m[p] = m[p], m[c]
        for r in range(n):
            if r != c and m[r][c] != 0:
                f = m[r][c] / m[c][c]
                m[r] = [m[r][k] - f * m[c][k] for k in range(n + 1)]
    return [m[i][n] / m[i][i] for i in range(n)]


def knot_fit(x, y, w, t):
    """Exact monotone (up) knot fit by enumeration of working sets; returns theta and fitted."""
    K = len(t)
    B = hat_rows(x, t)
    H = [[sum(w[i] * B[i][a] * B[i][b] for i in range(len(x))) for b in range(K)] for a in range(K)]
    c = [sum(w[i] * B[i][a] * y[i] for i in range(len(x))) for a in range(K)]
    found = None
    for joins in itertools.product([0, 1], repeat=K - 1):
        groups = [[0]]
        for k, j in enumerate(joins):
            if j:
                groups[-1].append(k + 1)
            else:
                groups.append([k + 1])
        G = len(groups)
        gH = [[sum(H[a][b] for a in ga for b in gb) for gb in groups] for ga in groups]
        gc = [sum(c[a] for a in ga) for ga in groups]
        v = solve(gH, gc)
        theta = [v[g] for g, grp in enumerate(groups) for _ in grp]
        if any(theta[k + 1] <= theta[k] for k in range(K - 1) if not joins[k]):
            continue
        g = [c[a] - sum(H[a][b] * theta[b] for b in range(K)) for a in range(K)]
        lam = [sum(g[: k + 1]) for k in range(K - 1)]
        if sum(g) != 0 or any(lam[k] < 0 for k in range(K - 1)) or any(lam[k] != 0 for k in range(K - 1) if not joins[k]):
            continue
        assert found is None, "two working sets satisfy the KKT conditions"
        found = theta
    assert found is not None, "no working set satisfies the KKT conditions"
    fitted = [sum(B[i][a] * found[a] for a in range(K)) for i in range(len(x))]
    return found, fitted


def pava(y, w):
    """Exact weighted pool-adjacent-violators (up) on distinct, sorted x."""
    blocks = []  # [sum w, sum w y, count]
    for yi, wi in zip(y, w):
        blocks.append([wi, wi * yi, 1])
        while len(blocks) > 1 and blocks[-2][1] / blocks[-2][0] >= blocks[-1][1] / blocks[-1][0]:
            top = blocks.pop()
            blocks[-1] = [blocks[-1][0] + top[0], blocks[-1][1] + top[1], blocks[-1][2] + top[2]]
    out = []
    for sw, swy, n in blocks:
        out += [swy / sw] * n
    return out


def exact(values):
    return [F(v) for v in values]  # the exact binary value of each double


def even_knots(x, k):
    lo, hi = min(x), max(x)
    return [float(lo + (hi - lo) * j / (k - 1)) for j in range(k)]


X = [1.0, 2.0, 3.0, 4.0, 5.0, 6.0]
Y = [10.0, 14.0, 12.0, 17.0, 16.0, 21.0]
CASES = [
    ("unit weights", X, Y, [1.0] * 6),
    ("first row weight 1e12", X, Y, [1e12] + [1.0] * 5),
    ("first row weight 1e13", X, Y, [1e13] + [1.0] * 5),
    ("first row weight 1e15", X, Y, [1e15] + [1.0] * 5),
    ("third row weight 1e6", X, Y, [1.0, 1.0, 1e6, 1.0, 1.0, 1.0]),
    ("third row weight 1e15", X, Y, [1.0, 1.0, 1e15, 1.0, 1.0, 1.0]),
    ("last row weight 1e15", X, Y, [1.0] * 5 + [1e15]),
    ("first row weight 1e100, the others 1e-300", X, Y, [1e100] + [1e-300] * 5),
    ("y times 1e-100, all weights 1e-250", X, [v * 1e-100 for v in Y], [1e-250] * 6),
]


def main():
    fits = []
    for name, x, y, w in CASES:
        t = even_knots(x, 3)
        theta, fitted = knot_fit(exact(x), exact(y), exact(w), exact(t))
        classic = pava(exact(y), exact(w))
        fits.append({
            "name": name, "x": x, "y": y, "w": w, "knots": 3, "knot_x": t,
            "knot_y": [float(v) for v in theta], "fitted": [float(v) for v in fitted],
            "classic_fitted": [float(v) for v in classic],
        })
    # Cross-check of the exact method against SciPy on the unit-weight case.
    t = even_knots(X, 3)
    B = np.array([[float(v) for v in r] for r in hat_rows(exact(X), exact(t))])
    L = np.tril(np.ones((3, 3)))
    A = B @ L
    sol = lsq_linear(A, np.array(Y), bounds=([-np.inf, 0, 0], [np.inf, np.inf, np.inf]), method="bvls")
    scipy_theta = L @ sol.x
    assert np.allclose(scipy_theta, fits[0]["knot_y"], rtol=1e-9, atol=0), (scipy_theta, fits[0]["knot_y"])
    out = {
        "command": COMMAND,
        "versions": VERSIONS,
        "method": "exact rational KKT enumeration (fractions) for the knot model, exact PAVA for the classic fit",
        "scipy_bvls_unit_knot_y": [float(v) for v in scipy_theta],
        "cases": fits,
    }
    path = os.path.join(OUT, "scale.json")
    with open(path, "w", encoding="utf-8") as f:
        json.dump(out, f, indent=1, ensure_ascii=False, allow_nan=False)
        f.write("\n")
    print("wrote", path)


main()
