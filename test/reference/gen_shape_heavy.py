"""Exact reference fits for shaped knot fits with one heavy row (test/core/shape-heavy.test.ts).

A row 1e13 or 1e15 times heavier than the others is beyond what a floating-point QP solver such as
quadprog or cvxopt resolves (its share of the normal equations rounds the light rows away), so this
generator solves the same problems in exact rational arithmetic (Python's fractions module) on the
exact binary values of the inputs, and rounds only the answer:
  minimise sum w (y - B theta)^2 subject to the shape rows A theta >= 0,
with B the hat-function basis (degree 1) or the quadratic B-spline basis on the clamped knot
sequence t0, t0, t0, t1, ..., t_{K-1}, t_{K-1}, t_{K-1} (degree 2; Cox-de Boor recursion in exact
arithmetic), x clamped to the end knots, and the shape rows of docs/shapes.md: rising differences
(curvature 0), or curvature * (changes of slope) >= 0 plus the one sign row (curvature -1
concave, 1 convex). Every subset of shape rows is tried as the active set; its equality-
constrained least-squares problem is solved exactly (KKT system), and the one whose solution is
feasible with non-negative multipliers (the KKT conditions, which identify the unique optimum) is
kept. As a cross-check of the method, each problem is also solved with weight ratio 1 (all
weights 1) by cvxopt.solvers.qp and must agree to 1e-7 (interior-point accuracy).
Writes fixtures/shape_heavy.json. Command: /usr/bin/python3 test/reference/gen_shape_heavy.py
(working directory: the repository root). Deterministic output.
"""

import itertools
import json
import os
import sys
from fractions import Fraction as F

import cvxopt
import numpy as np
from cvxopt import matrix, solvers

OUT = os.path.join("test", "reference", "fixtures")
COMMAND = "/usr/bin/python3 test/reference/gen_shape_heavy.py"
VERSIONS = {"python": sys.version.split()[0], "numpy": np.__version__, "cvxopt": cvxopt.__version__}


def bspline_row(xi, t, degree):
    """Exact values of the m basis functions at xi (clamped), by Cox-de Boor (0/0 = 0)."""
    tau = [t[0]] * degree + list(t) + [t[-1]] * degree
    x = min(max(xi, t[0]), t[-1])
    # Degree 0 on the half-open intervals; the right end belongs to the last non-empty one.
    nb = len(tau) - 1
    b = [F(0)] * nb
    last = max(i for i in range(nb) if tau[i] < tau[i + 1])
    for i in range(nb):
        if tau[i] <= x < tau[i + 1] or (i == last and x == tau[i + 1]):
            b[i] = F(1)
    for d in range(1, degree + 1):
        nxt = []
        for i in range(len(b) - 1):
            v = F(0)
            if tau[i + d] != tau[i]:
                v += (x - tau[i]) / (tau[i + d] - tau[i]) * b[i]
            if tau[i + d + 1] != tau[i + 1]:
                v += (tau[i + d + 1] - x) / (tau[i + d + 1] - tau[i + 1]) * b[i + 1]
            nxt.append(v)
        b = nxt
    return b


def spans(t, degree):
    K = len(t)
    if degree == 1:
        return [t[k + 1] - t[k] for k in range(K - 1)]
    return [(t[min(k + 1, K - 1)] - t[max(k - 1, 0)]) / 2 for k in range(K)]


def shape_rows(m, g, curv):
    rows = []
    if curv == 0:
        for k in range(m - 1):
            r = [F(0)] * m
            r[k], r[k + 1] = F(-1), F(1)
            rows.append(r)
        return rows
    for k in range(m - 2):
        a, b = 1 / g[k], 1 / g[k + 1]
        r = [F(0)] * m
        r[k], r[k + 1], r[k + 2] = curv * a, -curv * (a + b), curv * b
        rows.append(r)
    s = 0 if curv > 0 else m - 2
    r = [F(0)] * m
    r[s], r[s + 1] = F(-1), F(1)
    rows.append(r)
    return rows


def solve(a, b):
    """Exact Gauss-Jordan elimination; None when singular."""
    n = len(a)
    mat = [row[:] + [b[i]] for i, row in enumerate(a)]
    for c in range(n):
        p = next((r for r in range(c, n) if mat[r][c] != 0), None)
        if p is None:
            return None
        mat[c], mat[p] = mat[p], mat[c]
        for r in range(n):
            if r != c and mat[r][c] != 0:
                f = mat[r][c] / mat[c][c]
                mat[r] = [mat[r][k] - f * mat[c][k] for k in range(n + 1)]
    return [mat[i][n] / mat[i][i] for i in range(n)]


def exact_fit(x, y, w, t, degree, curv):
    m = len(t) + degree - 1
    B = [bspline_row(xi, t, degree) for xi in x]
    H = [[sum(w[i] * B[i][a] * B[i][b] for i in range(len(x))) for b in range(m)] for a in range(m)]
    c = [sum(w[i] * B[i][a] * y[i] for i in range(len(x))) for a in range(m)]
    A = shape_rows(m, spans(t, degree), curv)
    found = None
    for size in range(len(A) + 1):
        for act in itertools.combinations(range(len(A)), size):
            n = m + size
            K = [[F(0)] * n for _ in range(n)]
            rhs = [F(0)] * n
            for i in range(m):
                for j in range(m):
                    K[i][j] = H[i][j]
                rhs[i] = c[i]
            for q, r in enumerate(act):
                for j in range(m):
                    K[m + q][j] = -A[r][j]
                    K[j][m + q] = -A[r][j]
            sol = solve(K, rhs)
            if sol is None:
                continue
            theta, lam = sol[:m], sol[m:]
            if any(lv < 0 for lv in lam):
                continue
            if any(sum(A[r][j] * theta[j] for j in range(m)) < 0 for r in range(len(A))):
                continue
            if found is not None:
                assert found == theta, "two active sets satisfy the KKT conditions with different fits"
                continue
            found = theta
    assert found is not None, "no active set satisfies the KKT conditions"
    fitted = [sum(B[i][a] * found[a] for a in range(m)) for i in range(len(x))]
    return found, fitted, (H, c, A)


def cvxopt_fit(H, c, A):
    solvers.options.update({"show_progress": False, "abstol": 1e-14, "reltol": 1e-14, "feastol": 1e-14, "maxiters": 200})
    P = matrix(np.array([[float(v) for v in r] for r in H]))
    q = matrix(-np.array([float(v) for v in c]))
    G = matrix(-np.array([[float(v) for v in r] for r in A]))
    h = matrix(np.zeros(len(A)))
    return np.array(solvers.qp(P, q, G, h)["x"]).ravel()


X = [1.0, 2.0, 3.0, 4.0, 5.0, 6.0]
Y = [10.0, 14.0, 12.0, 17.0, 16.0, 21.0]
X8 = [1.0, 2.0, 3.0, 4.0, 5.0, 6.0, 7.0, 8.0]
Y8 = [10.0, 14.0, 12.0, 17.0, 16.0, 21.0, 22.0, 22.5]
SHAPES = [("concave", 1, -1), ("convex", 1, 1), ("smooth", 2, 0), ("smooth concave", 2, -1), ("smooth convex", 2, 1)]


def cases():
    out = []
    for shape, degree, curv in SHAPES:
        for pos, label in ((0, "first"), (5, "last"), (2, "third")):
            for ratio in (1e13, 1e15):
                w = [1.0] * 6
                w[pos] = ratio
                out.append((f"{shape}, {label} row weight {ratio:.0e}", X, Y, w, [1.0, 3.5, 6.0], degree, curv))
        # (the third row, x = 3, lies strictly between the knots 1 and 3.5)
        # Four knots on eight rows, the heavy row on the inner knot x = 4 (hat and B-spline rows
        # both non-zero around it).
        w = [1.0] * 8
        w[3] = 1e15
        out.append((f"{shape}, 4 knots, row at x = 4 weight 1e+15", X8, Y8, w, [1.0, 4.0, 6.0, 8.0], degree, curv))
    return out


def main():
    fits = []
    for name, x, y, w, t, degree, curv in cases():
        theta, fitted, _ = exact_fit([F(v) for v in x], [F(v) for v in y], [F(v) for v in w], [F(v) for v in t], degree, curv)
        # Cross-check of the exact method against cvxopt with unit weights.
        ones = [F(1)] * len(x)
        th1, _, (H, c, A) = exact_fit([F(v) for v in x], [F(v) for v in y], ones, [F(v) for v in t], degree, curv)
        ref = cvxopt_fit(H, c, A)
        assert np.allclose(ref, [float(v) for v in th1], rtol=1e-7, atol=1e-7), (name, ref, th1)
        fits.append({
            "name": name, "x": x, "y": y, "w": w, "knots": t, "degree": degree, "curvature": curv,
            "coefficients": [float(v) for v in theta], "fitted": [float(v) for v in fitted],
            "unit_weight_fitted_cvxopt": [float(v) for v in
                                          (np.array([[float(b) for b in bspline_row(F(xi), [F(v) for v in t], degree)] for xi in x]) @ ref)],
        })
    out = {
        "command": COMMAND,
        "versions": VERSIONS,
        "method": "exact rational KKT enumeration (fractions) over the shape rows' active sets; unit-weight cross-check with cvxopt.solvers.qp",
        "cases": fits,
    }
    path = os.path.join(OUT, "shape_heavy.json")
    with open(path, "w", encoding="utf-8") as f:
        json.dump(out, f, indent=1, ensure_ascii=False, allow_nan=False)
        f.write("\n")
    print("wrote", path)


main()
