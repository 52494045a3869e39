"""Reference values for the sample workbooks, computed outside the project.

Reads the invented input data of each sample from samples/expected.json ("inputs") and computes,
with Debian's scikit-learn, SciPy and NumPy:

  - the classic fits: sklearn.isotonic.IsotonicRegression(increasing=...) with sample_weight,
    on the rows where x, y (and the weight) are present;
  - the knot fits: the knot model (K knots evenly spaced over the x range, or given positions;
    monotone knot values; straight lines between knots) as a least-squares problem in the
    cumulative-step form theta = a + s * L d, d >= 0, solved by
    scipy.optimize.lsq_linear(method="bvls"), rows scaled by sqrt(weight);
  - knots at data quantiles: numpy.quantile (linear interpolation, Hyndman & Fan type 7).

Writes test/runner/fixtures/sklearn_samples.json: per sample file, per formula cell, the values
of the first result column, plus the package versions and the command.

Command: /usr/bin/python3 test/runner/reference/gen_samples.py   (working directory: the
repository root). Deterministic output (floats by json repr, no time stamps).
"""

import json
import os
import sys

import numpy as np
import scipy
import sklearn
from scipy.optimize import lsq_linear
from sklearn.isotonic import IsotonicRegression

ROOT = os.getcwd()
with open(os.path.join(ROOT, "samples", "expected.json"), encoding="utf-8") as f:
    EXPECTED = json.load(f)["samples"]


def rows(inputs, weights_col=None):
    """Indices of the rows where x, y (and the weight) are present."""
    x, y = inputs["A"], inputs["B"]
    w = inputs[weights_col] if weights_col else None
    keep = [i for i in range(len(y)) if x[i] is not None and y[i] is not None and (w is None or w[i] is not None)]
    xs = np.array([x[i] for i in keep], dtype=float)
    ys = np.array([y[i] for i in keep], dtype=float)
    ws = np.array([w[i] for i in keep], dtype=float) if w else np.ones(len(keep))
    return keep, len(y), xs, ys, ws


def back(keep, n, fitted):
    """Fitted values in row order; rows left out are "" as in the workbook."""
    out = [""] * n
    for k, i in enumerate(keep):
        out[i] = float(fitted[k])
    return out


def isotonic(inputs, increasing, weights_col=None):
    keep, n, x, y, w = rows(inputs, weights_col)
    fit = IsotonicRegression(increasing=increasing).fit(x, y, sample_weight=w).predict(x)
    return back(keep, n, fit)


def hat_basis(x, knots):
    """Row i: the weights of the knot values in the straight-line curve at x_i (flat beyond)."""
    B = np.zeros((len(x), len(knots)))
    for i, v in enumerate(x):
        if v <= knots[0]:
            B[i, 0] = 1.0
        elif v >= knots[-1]:
            B[i, -1] = 1.0
        else:
            j = int(np.searchsorted(knots, v, side="right")) - 1
            t = (v - knots[j]) / (knots[j + 1] - knots[j])
            B[i, j] = 1.0 - t
            B[i, j + 1] = t
    return B


def knot_fit(inputs, knots_spec, sign, weights_col=None):
    keep, n, x, y, w = rows(inputs, weights_col)
    if isinstance(knots_spec, int):
        knots = np.linspace(x.min(), x.max(), knots_spec)
    else:
        knots = np.array(knots_spec, dtype=float)
    K = len(knots)
    B = hat_basis(x, knots)
    # theta = a * 1 + sign * L d, L[j, i] = 1 for i < j (d_i >= 0: steps between knots).
    T = np.zeros((K, K))
    T[:, 0] = 1.0
    for j in range(K):
        for i in range(1, j + 1):
            T[j, i] = sign
    M = (B @ T) * np.sqrt(w)[:, None]
    lo = np.concatenate([[-np.inf], np.zeros(K - 1)])
    res = lsq_linear(M, y * np.sqrt(w), bounds=(lo, np.full(K, np.inf)), method="bvls", tol=1e-14, lsmr_tol=None)
    theta = T @ res.x
    return back(keep, n, B @ theta), [float(v) for v in knots], [float(v) for v in theta]


out = {
    "about": __doc__.strip().splitlines()[0],
    "command": "/usr/bin/python3 test/runner/reference/gen_samples.py",
    "versions": {"python": sys.version.split()[0], "sklearn": sklearn.__version__, "scipy": scipy.__version__, "numpy": np.__version__},
    "samples": {},
}

kiln = EXPECTED["kiln-strength.xlsx"]["inputs"]
fit5, k5, t5 = knot_fit(kiln, 5, +1)
out["samples"]["kiln-strength.xlsx"] = {
    "D2": isotonic(kiln, True),
    "E2": fit5,
    "J2": k5,
    "K2": t5,
}

tack = EXPECTED["adhesive-tack.xlsx"]["inputs"]
fit4, k4, t4 = knot_fit(tack, 4, -1)
out["samples"]["adhesive-tack.xlsx"] = {
    "D2": isotonic(tack, False),
    "E2": isotonic(tack, False),
    "F2": fit4,
    "H2": k4,
    "I2": t4,
    "Q2": isotonic(tack, True),
}

cal = EXPECTED["lab-calibration.xlsx"]["inputs"]
fitc, kc, tc = knot_fit(cal, cal["H"], +1, "C")
out["samples"]["lab-calibration.xlsx"] = {
    "D2": isotonic(cal, True, "C"),
    "J2": kc,
    "K2": tc,
}

study = EXPECTED["knot-count-study.xlsx"]
suggested = study["formulas"][1]["expected"][0][0]  # M2: the suggested knot count
q = np.quantile(np.array(study["inputs"]["A"], dtype=float), np.linspace(0, 1, int(suggested)))
fitq, _, _ = knot_fit(study["inputs"], [float(v) for v in q], +1)
out["samples"]["knot-count-study.xlsx"] = {"O2": [float(v) for v in q], "S2": fitq, "suggested": suggested}

path = os.path.join(ROOT, "test", "runner", "fixtures", "sklearn_samples.json")
with open(path, "w", encoding="utf-8") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
print("wrote", os.path.relpath(path, ROOT))
