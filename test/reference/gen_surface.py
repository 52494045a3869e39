"""Reference fixtures for cross-validation of the monotone surface (src/core/surface-cv.ts).

Computed fold by fold with Debian's python3-cvxopt, scikit-learn and NumPy on two open datasets
from R's datasets package (exported here by calling Rscript):

  trees      Girth (x1), Height (x2) -> Volume         31 rows, both rising
  stackloss  Air.Flow (x1), Water.Temp (x2) -> stack.loss   21 rows, both rising

Folds: seed 0 = sklearn.model_selection.KFold(n_splits=F, shuffle=False) (the fold rule of the
one-predictor cross-validation for seed 0). Model for a pair (K1, K2): K1 x K2 knots evenly spaced
over each TRAINING range (numpy.linspace), bilinear design built here with x clamped to the knot
range, the monotone lattice QP (theta rising along both axes) solved by cvxopt.solvers.qp with tight
tolerances; predictions at the held-out rows by the same bilinear design. Pairs whose training
design is rank-deficient in some fold are left out and listed under "skipped".

Writes fixtures/surface_cv.json with cvRmse, cvSe, cvR2, cvMae, trainRmse and per-fold RMSEs.
Command: /usr/bin/python3 test/reference/gen_surface.py   (working directory: the repository root;
run by test/reference/generate.sh). Deterministic output (floats by json repr, no time stamps).
"""

import csv
import io
import json
import math
import os
import subprocess

import cvxopt
import numpy as np
import sklearn
from cvxopt import matrix, solvers
from sklearn.model_selection import KFold

from lattice_design import design

OUT = os.path.join("test", "reference", "fixtures")
COMMAND = "/usr/bin/python3 test/reference/gen_surface.py"
RSCRIPT = "/usr/bin/Rscript"

solvers.options["show_progress"] = False
solvers.options["abstol"] = 1e-13
solvers.options["reltol"] = 1e-13
solvers.options["feastol"] = 1e-13
solvers.options["maxiters"] = 200


def r_dataset(name, cols):
    code = f"write.csv(datasets::{name}[, c({', '.join(repr(c) for c in cols)})], stdout(), row.names = FALSE)"
    out = subprocess.run([RSCRIPT, "--vanilla", "-e", code], check=True, capture_output=True, text=True).stdout
    rows = list(csv.reader(io.StringIO(out)))[1:]
    return [[float(v) for v in r] for r in rows]


def order_matrix(K1, K2):
    rows = []
    for b in range(K2):
        for a in range(K1):
            p = b * K1 + a
            if a + 1 < K1:
                r = np.zeros(K1 * K2)
                r[p], r[p + 1] = 1.0, -1.0  # theta_p - theta_{p+1} <= 0
                rows.append(r)
            if b + 1 < K2:
                r = np.zeros(K1 * K2)
                r[p], r[p + K1] = 1.0, -1.0
                rows.append(r)
    return np.array(rows)


def fit(x1, x2, y, K1, K2):
    t1 = np.linspace(x1.min(), x1.max(), K1)
    t2 = np.linspace(x2.min(), x2.max(), K2)
    B = design(x1, x2, t1, t2)
    H = B.T @ B
    if np.linalg.eigvalsh(H).min() < 1e-9 * np.trace(H):
        return None
    Gm = order_matrix(K1, K2)
    sol = solvers.qp(matrix(H), matrix(-(B.T @ y)), matrix(Gm), matrix(np.zeros(len(Gm))))
    if sol["status"] != "optimal":
        raise RuntimeError("cvxopt did not converge")
    theta = np.array(sol["x"]).ravel()
    return t1, t2, theta


def cv_case(name, data, pairs, folds):
    X = np.array(data)
    x1, x2, y = X[:, 0], X[:, 1], X[:, 2]
    n = len(y)
    sst = float(np.sum((y - y.mean()) ** 2))
    splits = list(KFold(n_splits=folds, shuffle=False).split(np.zeros(n)))
    scores, skipped = [], []
    for K1, K2 in pairs:
        sse = sae = 0.0
        fold_rmse, train_rmse = [], []
        ok = True
        for tr, te in splits:
            f = fit(x1[tr], x2[tr], y[tr], K1, K2)
            if f is None:
                ok = False
                break
            t1, t2, theta = f
            pred = design(x1[te], x2[te], t1, t2) @ theta
            e = y[te] - pred
            sse += float(np.sum(e**2))
            sae += float(np.sum(np.abs(e)))
            fold_rmse.append(math.sqrt(float(np.mean(e**2))))
            ftr = design(x1[tr], x2[tr], t1, t2) @ theta
            train_rmse.append(math.sqrt(float(np.mean((y[tr] - ftr) ** 2))))
        if not ok:
            skipped.append([K1, K2])
            continue
        k = len(fold_rmse)
        m = sum(fold_rmse) / k
        se = math.sqrt(sum((r - m) ** 2 for r in fold_rmse) / (k - 1)) / math.sqrt(k)
        scores.append(
            {
                "knots1": K1,
                "knots2": K2,
                "cvRmse": math.sqrt(sse / n),
                "cvSe": se,
                "cvR2": 1 - sse / sst,
                "cvMae": sae / n,
                "trainRmse": sum(train_rmse) / k,
                "foldRmse": fold_rmse,
            }
        )
    return {"name": name, "x1": x1.tolist(), "x2": x2.tolist(), "y": y.tolist(), "folds": folds, "seed": 0, "scores": scores, "skipped": skipped}


def main():
    pairs = [(2, 2), (2, 3), (3, 2), (3, 3), (4, 2)]
    r_version = subprocess.run([RSCRIPT, "--vanilla", "-e", "cat(R.version.string)"], check=True, capture_output=True, text=True).stdout
    cases = [
        cv_case("trees: Girth, Height -> Volume (R datasets)", r_dataset("trees", ["Girth", "Height", "Volume"]), pairs, 5),
        cv_case("stackloss: Air.Flow, Water.Temp -> stack.loss (R datasets)", r_dataset("stackloss", ["Air.Flow", "Water.Temp", "stack.loss"]), pairs, 3),
    ]
    out = {
        "description": "Cross-validation of the monotone surface, fold by fold: sklearn KFold(shuffle=False) folds, lattice QP per training set by cvxopt.solvers.qp (design built in Python, knots by numpy.linspace over the training range), pooled scores.",
        "command": COMMAND,
        "versions": {"cvxopt": cvxopt.__version__, "scikit-learn": sklearn.__version__, "numpy": np.__version__, "R": r_version},
        "cases": cases,
    }
    path = os.path.join(OUT, "surface_cv.json")
    with open(path, "w", encoding="utf-8") as fh:
        json.dump(out, fh, indent=1)
        fh.write("\n")
    print("wrote", path)


if __name__ == "__main__":
    main()
