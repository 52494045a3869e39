"""Reference fixtures for the shaped knot fits, solved with cvxopt.

Run by test/reference/generate.sh (npm run refs) AFTER gen_shapes.R, whose shapes_r.json cases
(inputs, knots, direction, curvature, degree, bounds) it reads, so both references solve the same
problems. The design is built here independently: scipy.interpolate.BSpline.design_matrix on the
clamped knot sequence (hat functions for degree 1, quadratic B-splines for degree 2), x clamped to
the end knots; the constraints follow docs/shapes.md. The QP min 1/2 t'Ht - c't s.t. A t >= b is
solved by cvxopt.solvers.qp with tight tolerances, then polished on the active set it identifies
(see solve()); the raw interior-point fitted values are kept beside the polished ones. Writes:
  fixtures/shapes_cvxopt.json  coefficients, fitted values and SSE per case
Command: /usr/bin/python3 test/reference/gen_shapes.py   (working directory: the repository root)
Output is deterministic (no time stamps; floats written by json with repr, which round-trips).
"""

import json
import os
import sys

import cvxopt
import numpy as np
import scipy
from cvxopt import matrix, solvers
from scipy.interpolate import BSpline

OUT = os.path.join("test", "reference", "fixtures")
COMMAND = "/usr/bin/python3 test/reference/gen_shapes.py"
VERSIONS = {
    "python": sys.version.split()[0],
    "numpy": np.__version__,
    "scipy": scipy.__version__,
    "cvxopt": cvxopt.__version__,
}


def floats(a):
    return [float(v) for v in np.asarray(a, dtype=float).ravel()]


def design(x, t, degree):
    t = np.asarray(t, dtype=float)
    xc = np.clip(np.asarray(x, dtype=float), t[0], t[-1])
    tau = np.concatenate([[t[0]] * degree, t, [t[-1]] * degree])
    return BSpline.design_matrix(xc, tau, degree).toarray()


def spans(t, degree):
    t = np.asarray(t, dtype=float)
    if degree == 1:
        return np.diff(t)
    tau = np.concatenate([[t[0]] * 2, t, [t[-1]] * 2])
    m = len(t) + 1
    return np.array([(tau[k + 3] - tau[k + 1]) / 2 for k in range(m - 1)])


def constraints(m, g, curv, lo, hi):
    rows, b = [], []
    if curv == 0:
        for k in range(m - 1):
            r = np.zeros(m)
            r[k], r[k + 1] = -1, 1
            rows.append(r)
            b.append(0)
    else:
        for k in range(m - 2):
            r = np.zeros(m)
            r[k] = curv / g[k]
            r[k + 1] = -curv * (1 / g[k] + 1 / g[k + 1])
            r[k + 2] = curv / g[k + 1]
            rows.append(r)
            b.append(0)
        s = 0 if curv > 0 else m - 2
        r = np.zeros(m)
        r[s], r[s + 1] = -1, 1
        rows.append(r)
        b.append(0)
    if np.isfinite(lo):
        r = np.zeros(m)
        r[0] = 1
        rows.append(r)
        b.append(lo)
    if np.isfinite(hi):
        r = np.zeros(m)
        r[m - 1] = -1
        rows.append(r)
        b.append(-hi)
    return np.array(rows), np.array(b, dtype=float)


solvers.options.update({"show_progress": False, "abstol": 1e-13, "reltol": 1e-13, "feastol": 1e-13, "maxiters": 200, "refinement": 3})


def solve(case):
    x = np.asarray(case["x"], dtype=float)
    y = np.asarray(case["y"], dtype=float)
    w = np.asarray(case["w"], dtype=float) if case.get("w") is not None else np.ones_like(x)
    s = 1.0 if case["direction"] == "up" else -1.0
    lo = case["lower"] if case.get("lower") is not None else -np.inf
    hi = case["upper"] if case.get("upper") is not None else np.inf
    los, his = (lo, hi) if s > 0 else (-hi, -lo)
    B = design(x, case["knots"], case["degree"])
    m = B.shape[1]
    H = B.T @ (w[:, None] * B)
    c = B.T @ (w * s * y)
    A, b = constraints(m, spans(case["knots"], case["degree"]), s * case["curvature"], los, his)
    # Solve for phi = theta / sigma with the objective scaled to order 1 (sigma = max |y|), so that
    # cvxopt's absolute tolerances mean the same for every case.
    scale = np.max(np.abs(np.diag(H)))
    sigma = np.max(np.abs(y))
    sol = solvers.qp(matrix(H / scale), matrix(-c / (scale * sigma)), matrix(-A), matrix(-b / sigma))
    phi = np.array(sol["x"]).ravel()
    raw = s * sigma * phi
    # Polish: the interior-point answer identifies the active constraints (slack below 1e-7); the
    # equality-constrained QP on them is solved by numpy (KKT system, least squares). Kept only when
    # the polished point is feasible and its multipliers are non-negative (to 1e-9 of the scale).
    slack = A @ phi - b / sigma
    act = np.where(slack <= 1e-7 * max(1.0, np.max(np.abs(b / sigma))))[0]
    Aa = A[act]
    P = H / scale
    q = c / (scale * sigma)
    K = np.block([[P, -Aa.T], [-Aa, np.zeros((len(act), len(act)))]])
    rhs = np.concatenate([q, -b[act] / sigma])
    z = np.linalg.lstsq(K, rhs, rcond=None)[0]
    phi_p, lam = z[:m], z[m:]
    tol = 1e-9 * max(1.0, np.max(np.abs(q)))
    polished = bool(np.all(A @ phi_p - b / sigma >= -tol) and np.all(lam >= -tol))
    theta = s * sigma * (phi_p if polished else phi)
    fitted = B @ theta
    return {
        "name": case["name"],
        "cvxopt_status": sol["status"],
        "polished": polished,
        "cvxopt_raw_fitted": floats(B @ raw),
        "cvxopt_coefficients": floats(theta),
        "cvxopt_fitted": floats(fitted),
        "cvxopt_sse": float(np.sum(w * (y - fitted) ** 2)),
    }


with open(os.path.join(OUT, "shapes_r.json"), encoding="utf-8") as f:
    R = json.load(f)

out = {
    "description": "The shaped knot fits of shapes_r.json solved by cvxopt.solvers.qp on a design from scipy.interpolate.BSpline.design_matrix.",
    "command": COMMAND,
    "versions": VERSIONS,
    "cases": [solve(c) for c in R["cases"]],
}
path = os.path.join(OUT, "shapes_cvxopt.json")
with open(path, "w", encoding="utf-8") as f:
    json.dump(out, f, indent=1, ensure_ascii=False, allow_nan=False)
    f.write("\n")
print("wrote", path)
