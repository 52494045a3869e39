"""Reference fixtures for the Ratchet core, computed with Debian's scikit-learn, SciPy and NumPy.

Run by test/reference/generate.sh (npm run refs) AFTER gen_core.R, whose core_inputs.json (open
datasets from R's datasets package and seeded random cases) it reads, so both languages use the
same numbers. Writes:
  fixtures/core_sklearn.json  sklearn.isotonic.IsotonicRegression (up, down, auto, weights, ties,
                              y_min/y_max, predict with out_of_bounds="clip"), numpy.quantile knots,
                              and the documentation examples of scikit-learn and SciPy
  fixtures/core_bvls.json     the knot model by scipy.optimize.lsq_linear(method="bvls") on the
                              cumulative-step form theta = a + L d, d >= 0
Command: /usr/bin/python3 test/reference/gen_core.py   (working directory: the repository root)
Output is deterministic (no time stamps; floats written by json with repr, which round-trips).
"""

import json
import os
import sys

import numpy as np
import scipy
import sklearn
from scipy.optimize import lsq_linear
from sklearn.datasets import make_regression
from sklearn.isotonic import IsotonicRegression, isotonic_regression

OUT = os.path.join("test", "reference", "fixtures")
COMMAND = "/usr/bin/python3 test/reference/gen_core.py"
VERSIONS = {
    "python": sys.version.split()[0],
    "numpy": np.__version__,
    "scipy": scipy.__version__,
    "scikit-learn": sklearn.__version__,
}


def floats(a):
    return [float(v) for v in np.asarray(a, dtype=float).ravel()]


def write(obj, name):
    path = os.path.join(OUT, name)
    with open(path, "w", encoding="utf-8") as f:
        json.dump(obj, f, indent=1, ensure_ascii=False, allow_nan=False)
        f.write("\n")
    print("wrote", path)


with open(os.path.join(OUT, "core_inputs.json"), encoding="utf-8") as f:
    INPUTS = json.load(f)
CASES = {c["name"]: c for c in INPUTS["datasets"] + INPUTS["random"]}


def case_arrays(name):
    c = CASES[name]
    x = np.array(c["x"], dtype=float)
    y = np.array(c["y"], dtype=float)
    w = np.array(c["w"], dtype=float) if "w" in c else None
    return x, y, w


# ------------------------------------------------------------------ classic fits with scikit-learn
def sk_case(name, increasing=True, y_min=None, y_max=None):
    x, y, w = case_arrays(name)
    model = IsotonicRegression(increasing=increasing, y_min=y_min, y_max=y_max, out_of_bounds="clip")
    model.fit(x, y, sample_weight=w)
    lo, hi = float(x.min()), float(x.max())
    span = hi - lo
    grid = np.concatenate([[lo - span, lo - 0.1 * span], np.linspace(lo, hi, 9), [hi + 0.1 * span, hi + span]])
    entry = {
        "case": name,
        "increasing": increasing,
        "command": (
            f"IsotonicRegression(increasing={increasing!r}, y_min={y_min!r}, y_max={y_max!r}, "
            f"out_of_bounds='clip').fit(x, y, sample_weight={'w' if w is not None else None})"
        ),
        "fitted": floats(model.predict(x)),
        "predict_x": floats(grid),
        "predict_y": floats(model.predict(grid)),
        "X_thresholds": floats(model.X_thresholds_),
        "y_thresholds": floats(model.y_thresholds_),
    }
    if increasing == "auto":
        entry["increasing_used"] = bool(model.increasing_)
    if y_min is not None:
        entry["y_min"] = y_min
    if y_max is not None:
        entry["y_max"] = y_max
    return entry


classic = []
for name in CASES:
    classic.append(sk_case(name, True))
    classic.append(sk_case(name, False))
    classic.append(sk_case(name, "auto"))
classic.append(sk_case("cars", True, y_min=10.0, y_max=70.0))
classic.append(sk_case("mtcars", False, y_min=15.0))
classic.append(sk_case("weights_with_zeros", True, y_min=1.0, y_max=4.0))
classic.append(sk_case("falling_weighted", False, y_max=3.0))
classic.append(sk_case("noisy_200", True, y_min=-0.5, y_max=0.75))

# ------------------------------------------------------------------ quantile knots with numpy
quantiles = []
for name in ["cars", "Puromycin", "mtcars", "ties_unit_weights", "clustered_gaps", "noisy_200"]:
    x, _, _ = case_arrays(name)
    for K in [2, 3, 5, 8, 13]:
        p = np.arange(K) / (K - 1)
        q = np.quantile(x, p, method="linear")
        quantiles.append({
            "case": name, "K": K,
            "command": "numpy.unique(numpy.quantile(x, numpy.arange(K) / (K - 1), method='linear'))",
            "knots": floats(np.unique(q)),
        })

# ------------------------------------------------------------------ documentation examples
docs = {}
Xr, yr = make_regression(n_samples=10, n_features=1, random_state=41)
reg = IsotonicRegression().fit(Xr, yr)
docs["sklearn_IsotonicRegression"] = {
    "source": "scikit-learn 1.2.1 docstring of sklearn.isotonic.IsotonicRegression (Examples section)",
    "command": "X, y = make_regression(n_samples=10, n_features=1, random_state=41); "
               "IsotonicRegression().fit(X, y).predict([.1, .2])",
    "published": "array([1.8628..., 3.7256...])",
    "x": floats(Xr), "y": floats(yr), "predict_x": [0.1, 0.2], "predict_y": floats(reg.predict([0.1, 0.2])),
}
y_doc = [5, 3, 1, 2, 8, 10, 7, 9, 6, 4]
docs["sklearn_isotonic_regression"] = {
    "source": "scikit-learn documentation of sklearn.isotonic.isotonic_regression, Examples (newer than 1.2.1; "
              "https://scikit-learn.org/stable/modules/generated/sklearn.isotonic.isotonic_regression.html)",
    "command": "sklearn.isotonic.isotonic_regression([5, 3, 1, 2, 8, 10, 7, 9, 6, 4])",
    "published": "array([2.75, 2.75, 2.75, 2.75, 7.33, 7.33, 7.33, 7.33, 7.33, 7.33])",
    "y": y_doc, "fitted": floats(isotonic_regression(y_doc)),
}
y_sp = [1.5, 1.0, 4.0, 6.0, 5.7, 5.0, 7.8, 9.0, 7.5, 9.5, 9.0]
docs["scipy_isotonic_regression"] = {
    "source": "SciPy documentation of scipy.optimize.isotonic_regression (SciPy >= 1.12), Examples; the "
              "installed SciPy 1.10.1 predates that function, so the fit is recomputed with scikit-learn",
    "command": "sklearn.isotonic.isotonic_regression([1.5, 1.0, 4.0, 6.0, 5.7, 5.0, 7.8, 9.0, 7.5, 9.5, 9.0])",
    "published": "array([1.25, 1.25, 4., 5.56666667, 5.56666667, 5.56666667, 7.8, 8.25, 8.25, 9.25, 9.25])",
    "y": y_sp, "fitted": floats(isotonic_regression(y_sp)),
}
# Pituitary-fissure sizes of 11 girls (Potthoff & Roy 1964, as used in Robertson, Wright & Dykstra
# 1988); the values are from memory, see test/core/worked-examples.test.ts.
pit_age = [8, 8, 8, 10, 10, 10, 12, 12, 12, 14, 14]
pit_size = [21, 23.5, 23, 24, 21, 25, 21.5, 22, 19, 23.5, 25]
docs["pituitary"] = {
    "source": "Potthoff & Roy (1964); Robertson, Wright & Dykstra (1988); data layout (memory)",
    "command": "IsotonicRegression().fit(age, size).predict(age)",
    "x": pit_age, "y": pit_size, "fitted": floats(IsotonicRegression().fit(pit_age, pit_size).predict(pit_age)),
}

write({
    "description": (
        "scikit-learn reference results for the classic (isotonic) fit of the Ratchet core on core_inputs.json; "
        "fitted = predict(x) at every row (zero-weight rows are interpolated by sklearn as by Ratchet), "
        "predict_y = predict(predict_x) with out_of_bounds='clip' (flat beyond the ends); numpy quantile knots "
        "(type 7, duplicates collapsed); documentation examples."
    ),
    "command": COMMAND, "versions": VERSIONS,
    "classic": classic, "quantile_knots": quantiles, "docs": docs,
}, "core_sklearn.json")


# ------------------------------------------------------------------ knot model with lsq_linear (bvls)
def hat_matrix(x, t):
    """Design matrix of hat functions on knots t, x clamped to [t_0, t_{K-1}]."""
    K = len(t)
    B = np.zeros((len(x), K))
    for i, xi in enumerate(np.clip(x, t[0], t[-1])):
        j = min(int(np.searchsorted(t, xi, side="right")) - 1, K - 2)
        u = (xi - t[j]) / (t[j + 1] - t[j])
        B[i, j] = 1 - u
        B[i, j + 1] = u
    return B


def even_knots(x, w, K):
    xs = x[w > 0]
    t = xs.min() + np.arange(K) * (xs.max() - xs.min()) / (K - 1)
    t[-1] = xs.max()
    return t


def bvls_fit(B, y, w, lower, upper):
    """Non-decreasing knot values by NNLS on theta = a + L d (d >= 0), L[j, i] = 1 for i < j.

    A lower bound is the box a >= lower. An upper bound alone uses the mirrored form
    theta = b - U e (e >= 0, U[j, i] = 1 for i >= j) with the box b <= upper.
    """
    K = B.shape[1]
    sw = np.sqrt(w)
    if np.isfinite(upper) and not np.isfinite(lower):
        M = np.zeros((K, K))
        M[:, 0] = 1
        for j in range(K):
            M[j, 1 + j:] = 0
            for i in range(j, K - 1):
                M[j, 1 + i] = -1
        lb = np.r_[-np.inf, np.zeros(K - 1)]
        ub = np.r_[upper, np.full(K - 1, np.inf)]
    else:
        M = np.zeros((K, K))
        M[:, 0] = 1
        for j in range(K):
            M[j, 1:1 + j] = 1
        lb = np.r_[lower, np.zeros(K - 1)]
        ub = np.full(K, np.inf)
    A = (B * sw[:, None]) @ M
    res = lsq_linear(A, sw * y, bounds=(lb, ub), method="bvls", tol=1e-15, max_iter=10000)
    return M @ res.x, res


knot_cases = []
with open(os.path.join(OUT, "core_r.json"), encoding="utf-8") as f:
    R_KNOTS = json.load(f)["knots"]
for kc in R_KNOTS:
    x, y, w = case_arrays(kc["case"])
    w = np.ones_like(x) if w is None else w
    t = np.array(kc["knot_x"], dtype=float)
    lower = kc.get("lower", -np.inf)
    upper = kc.get("upper", np.inf)
    entry = {"id": kc["id"], "case": kc["case"], "direction": kc["direction"], "knot_x": floats(t)}
    if np.isfinite(lower):
        entry["lower"] = lower
    if np.isfinite(upper):
        entry["upper"] = upper
    if np.isfinite(lower) and np.isfinite(upper):
        entry["bvls"] = "not run: two-sided bounds are not a box in the cumulative-step form (quadprog covers it)"
        knot_cases.append(entry)
        continue
    B = hat_matrix(x, t)
    if kc["direction"] == "up":
        theta, res = bvls_fit(B, y, w, lower, upper)
    else:
        theta, res = bvls_fit(B, -y, w, -upper, -lower)
        theta = -theta
    fitted = B @ theta
    # Which knot values are unique. The fitted values B theta are unique, so theta_j is unique when
    # the unit vector e_j is orthogonal to the null space of W^(1/2) B (theta_j is then a linear
    # function of the fitted values). A knot outside that test is still unique when it lies between
    # two unique knots with equal values (the order pins it).
    Aw = B * np.sqrt(w)[:, None]
    _, sv, vt = np.linalg.svd(Aw)
    rank = int(np.sum(sv > 1e-12 * sv[0]))
    null = vt[rank:].T  # K x (K - rank)
    by_rows = [bool(np.linalg.norm(null[j]) < 1e-9) for j in range(len(t))]
    unique = []
    for j in range(len(t)):
        if by_rows[j]:
            unique.append(True)
            continue
        left = [i for i in range(j) if by_rows[i]]
        right = [i for i in range(j + 1, len(t)) if by_rows[i]]
        pinned = bool(left and right and theta[left[-1]] == theta[right[0]])
        unique.append(pinned)
    entry.update({
        "command": "scipy.optimize.lsq_linear(W^(1/2) B M, W^(1/2) y, bounds, method='bvls', tol=1e-15)",
        "bvls_status": int(res.status),
        "theta": floats(theta),
        "unique": unique,
        "fitted": floats(fitted),
        "sse": float(np.sum(w * (y - fitted) ** 2)),
    })
    knot_cases.append(entry)

write({
    "description": (
        "The knot model of the Ratchet core solved by scipy.optimize.lsq_linear(method='bvls') on the "
        "cumulative-step form theta = a + L d, d >= 0 (design of hat functions built in numpy, x clamped to "
        "the end knots, rows weighted by sqrt(w)); same cases and knots as the quadprog entries of core_r.json. "
        "Compare theta only where unique is true; fitted values always."
    ),
    "command": COMMAND, "versions": VERSIONS, "knots": knot_cases,
}, "core_bvls.json")
