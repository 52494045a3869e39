"""Reference values for the surface sample coating-cure.xlsx, computed outside the project.

Reads the invented inputs of the sample from samples/expected.json ("inputs": A oven temperature
= x1, B dwell time = x2, C hardness = y; N, O the new settings) and computes:

  - the classic case (knots 0, 0): R's Iso::biviso (r-cran-iso) on the matrix of cell means
    (rows = the distinct temperatures, columns = the distinct dwell times) with the replicate
    counts as weights — rising along rows and columns. Every cell of the 7 x 6 grid holds data, so
    this is the weighted least-squares fit of the raw rows (the objective splits by cell);
  - the 4 x 3 knot lattice: knots evenly spaced over each input's range (numpy.linspace), a
    bilinear design built here (x clamped to the knot range, the hat functions of each axis
    multiplied), and the monotone lattice QP (values rising along both axes) solved by Debian's
    python3-cvxopt (cvxopt.solvers.qp, tolerances 1e-13);
  - both surfaces at the new settings by the same bilinear design (flat beyond the knots);
  - the directions that 0, 0 choose: the signs of scipy.stats.spearmanr of each input with y;
  - the 4 x 3 lattice rising along x1 only, no constraint along x2 (directions 1, 2), by the same
    QP with the x2 constraints left out.

Writes test/runner/fixtures/surface_sample.json: the two lattices (K2 rows of K1 values, as
RATCHET.GRID lays them out), their knots, the values at the new settings, the package versions
and the command.

Command: /usr/bin/python3 test/runner/reference/gen_surface_sample.py   (working directory: the
repository root). Deterministic output (floats by json repr, no time stamps).
"""

import json
import os
import subprocess
import sys

import cvxopt
import numpy as np
import scipy
from cvxopt import matrix, solvers
from scipy.stats import spearmanr

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..", "reference"))
from lattice_design import design  # noqa: E402

RSCRIPT = "/usr/bin/Rscript"
COMMAND = "/usr/bin/python3 test/runner/reference/gen_surface_sample.py"
FILE = "coating-cure.xlsx"

solvers.options["show_progress"] = False
solvers.options["abstol"] = 1e-13
solvers.options["reltol"] = 1e-13
solvers.options["feastol"] = 1e-13
solvers.options["maxiters"] = 200

with open(os.path.join("samples", "expected.json"), encoding="utf-8") as f:
    INPUTS = json.load(f)["samples"][FILE]["inputs"]

x1 = np.array(INPUTS["A"], dtype=float)
x2 = np.array(INPUTS["B"], dtype=float)
y = np.array(INPUTS["C"], dtype=float)
new1 = np.array(INPUTS["N"], dtype=float)
new2 = np.array(INPUTS["O"], dtype=float)


def monotone_qp(B, y, K1, K2, along2=True):
    """min ||B theta - y||^2 subject to theta rising along x1 and (along2) along x2 (cvxopt)."""
    rows = []
    for b in range(K2):
        for a in range(K1):
            n = b * K1 + a
            if a + 1 < K1:
                r = np.zeros(K1 * K2)
                r[n], r[n + 1] = 1.0, -1.0  # theta[n] - theta[n+1] <= 0
                rows.append(r)
            if along2 and b + 1 < K2:
                r = np.zeros(K1 * K2)
                r[n], r[n + K1] = 1.0, -1.0
                rows.append(r)
    G = np.array(rows)
    P = 2 * B.T @ B
    q = -2 * B.T @ y
    sol = solvers.qp(matrix(P), matrix(q), matrix(G), matrix(np.zeros(len(rows))))
    if sol["status"] != "optimal":
        raise RuntimeError(f"cvxopt: {sol['status']}")
    return np.array(sol["x"]).ravel()


def biviso(means, weights):
    """Iso::biviso of a matrix of means with weights, through Rscript; returns the fitted matrix."""
    nr, nc = means.shape
    fmt = lambda m: ",".join(repr(float(v)) for v in m.ravel(order="F"))
    code = (
        f"y <- matrix(c({fmt(means)}), nrow = {nr}); w <- matrix(c({fmt(weights)}), nrow = {nr}); "
        "f <- Iso::biviso(y, w, eps2 = 1e-14, ncycle = 1e6); "
        "cat(sprintf('%.17g', as.vector(f)), sep = '\\n'); "
        "cat('version', as.character(packageVersion('Iso')), '\\n')"
    )
    out = subprocess.run([RSCRIPT, "--vanilla", "-e", code], check=True, capture_output=True, text=True).stdout.split("\n")
    version = next(l for l in out if l.startswith("version")).split()[1]
    vals = [float(l) for l in out if l and not l.startswith("version")]
    return np.array(vals).reshape((nr, nc), order="F"), version


out = {
    "about": "Reference values for samples/coating-cure.xlsx: classic case by Iso::biviso on cell means with replicate weights, 4 x 3 lattice by the monotone bilinear QP in cvxopt, surfaces read at the new settings (N, O) by bilinear interpolation, flat beyond the knots.",
    "command": COMMAND,
    "versions": {"cvxopt": cvxopt.__version__, "numpy": np.__version__},
    "file": FILE,
}

# Classic: one value per distinct (x1, x2).
t1 = np.unique(x1)
t2 = np.unique(x2)
means = np.zeros((len(t1), len(t2)))
counts = np.zeros((len(t1), len(t2)))
for a, b, v in zip(x1, x2, y):
    i, j = np.searchsorted(t1, a), np.searchsorted(t2, b)
    means[i, j] += v
    counts[i, j] += 1
if (counts == 0).any():
    raise RuntimeError("an empty cell: biviso on cell means is not the raw-row fit")
means /= counts
fit, iso_version = biviso(means, counts)
out["versions"]["Iso"] = iso_version
classic = fit.T  # rows = x2 levels, columns = x1 levels (GRID layout)
out["classic"] = {
    "knots1": t1.tolist(),
    "knots2": t2.tolist(),
    "values": classic.tolist(),
    "at_new": (design(new1, new2, t1, t2) @ classic.ravel()).tolist(),
}

# The 4 x 3 lattice.
K1, K2 = 4, 3
s1 = np.linspace(x1.min(), x1.max(), K1)
s2 = np.linspace(x2.min(), x2.max(), K2)
theta = monotone_qp(design(x1, x2, s1, s2), y, K1, K2)
out["lattice_4x3"] = {
    "knots1": s1.tolist(),
    "knots2": s2.tolist(),
    "values": theta.reshape(K2, K1).tolist(),
    "at_new": (design(new1, new2, s1, s2) @ theta).tolist(),
}

# Directions 0, 0: the sign of Spearman's rank correlation of each input with y (scipy).
out["versions"]["scipy"] = scipy.__version__
out["spearman"] = {"x1": float(spearmanr(x1, y).correlation), "x2": float(spearmanr(x2, y).correlation)}

# The 4 x 3 lattice rising along x1, no constraint along x2 (directions 1, 2).
free = monotone_qp(design(x1, x2, s1, s2), y, K1, K2, along2=False)
out["lattice_4x3_free_x2"] = {
    "knots1": s1.tolist(),
    "knots2": s2.tolist(),
    "values": free.reshape(K2, K1).tolist(),
    "at_new": (design(new1, new2, s1, s2) @ free).tolist(),
}

path = os.path.join("test", "runner", "fixtures", "surface_sample.json")
with open(path, "w", encoding="utf-8") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
print(f"wrote {path}")
