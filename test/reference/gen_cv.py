"""Reference fixtures for cross-validation of knot counts (src/core/cross-validate.ts).

Computed fold by fold with Debian's scikit-learn, SciPy and NumPy on open datasets from R's
datasets package (exported here by calling Rscript), with a SplitMix64 / Fisher-Yates
implementation written independently in Python for the seeded splits. Writes:

  fixtures/cv_prng.json      SplitMix64 outputs (incl. the published Rosetta Code sequence for
                             state 1234567), derived repeat states, permutations and fold labels
  fixtures/cv_datasets.json  cvRmse, cvSe, cvR2, cvMae, trainRmse and the per-fold RMSEs of every
                             candidate for K-fold (seed 0: sklearn.model_selection.KFold with
                             shuffle=False; seeded: folds from the Python permutation) and hold-out
                             (seed 0: sklearn.model_selection.train_test_split with shuffle=False)

Models: candidate 0 = sklearn.isotonic.IsotonicRegression(out_of_bounds="clip"); candidate K >= 2 =
the knot model (K knots evenly spaced over each TRAINING x range, monotone knot values) solved by
scipy.optimize.lsq_linear(method="bvls") on the cumulative-step form theta = a + L d, d >= 0, with
the knots that no training row touches filled by linear interpolation between their identified
neighbours (flat beyond), as documented for knotRegression; predictions by numpy.interp (flat beyond
the end knots). Candidates whose reduced design is rank-deficient (knot values not unique) are
left out of the fixture and listed under "skipped".

Command: /usr/bin/python3 test/reference/gen_cv.py   (working directory: the repository root;
run by test/reference/generate.sh). Deterministic output (floats by json repr, no time stamps).
"""

import csv
import io
import json
import math
import os
import subprocess
import sys
import warnings

import numpy as np
import scipy
import sklearn
from scipy.optimize import lsq_linear
from scipy.stats import spearmanr
from sklearn.isotonic import IsotonicRegression
from sklearn.metrics import r2_score
from sklearn.model_selection import KFold, train_test_split

# sklearn warns when the Spearman confidence interval of an 'auto' fit spans zero; that is the point
# of the mtcars case (the direction differs between training sets), so the warning is expected.
warnings.filterwarnings("ignore", message="Confidence interval of the Spearman correlation")

OUT = os.path.join("test", "reference", "fixtures")
COMMAND = "/usr/bin/python3 test/reference/gen_cv.py"
RSCRIPT = "/usr/bin/Rscript"

M64 = (1 << 64) - 1


# ---------------------------------------------------------------- SplitMix64 (independent Python)
class SplitMix64:
    """Steele, Lea & Flood (2014); state += 0x9E3779B97F4A7C15, then the two xor-shift-multiply
    rounds and a final xor-shift. Python integers, masked to 64 bits."""

    def __init__(self, state):
        self.state = state & M64

    def next(self):
        self.state = (self.state + 0x9E3779B97F4A7C15) & M64
        z = self.state
        z = ((z ^ (z >> 30)) * 0xBF58476D1CE4E5B9) & M64
        z = ((z ^ (z >> 27)) * 0x94D049BB133111EB) & M64
        return z ^ (z >> 31)

    def below(self, m):
        """Uniform on 0..m-1: r = high 32 bits; reject r < 2**32 mod m; return r mod m."""
        threshold = (1 << 32) % m
        while True:
            r = self.next() >> 32
            if r >= threshold:
                return r % m


def repeat_state(seed, r):
    g = SplitMix64(seed)
    out = None
    for _ in range(r + 1):
        out = g.next()
    return out


def permutation(n, seed, r=0):
    g = SplitMix64(repeat_state(seed, r))
    p = list(range(n))
    for i in range(n - 1, 0, -1):
        j = g.below(i + 1)
        p[i], p[j] = p[j], p[i]
    return p


def kfold_indices(n, folds, seed, r):
    """(train, test) index arrays per fold; seed 0 straight from sklearn's KFold(shuffle=False)."""
    if seed == 0:
        return [(tr, te) for tr, te in KFold(n_splits=folds, shuffle=False).split(np.zeros(n))]
    order = permutation(n, seed, r)
    sizes = [n // folds + (1 if f < n % folds else 0) for f in range(folds)]
    out = []
    start = 0
    for f in range(folds):
        te = np.array(sorted(order[start : start + sizes[f]]), dtype=int)
        mask = np.ones(n, dtype=bool)
        mask[te] = False
        out.append((np.nonzero(mask)[0], te))
        start += sizes[f]
    return out


def holdout_indices(n, test_fraction, seed):
    if seed == 0:
        tr, te = train_test_split(np.arange(n), test_size=test_fraction, shuffle=False)
        return np.array(tr), np.array(te)
    order = permutation(n, seed, 0)
    m = math.ceil(test_fraction * n)
    te = np.array(sorted(order[n - m :]), dtype=int)
    mask = np.ones(n, dtype=bool)
    mask[te] = False
    return np.nonzero(mask)[0], te


# ---------------------------------------------------------------- data from R's datasets package
def r_dataset(expr, xname, yname):
    code = f'd <- {expr}; write.csv(data.frame(x = d${xname}, y = d${yname}), stdout(), row.names = FALSE)'
    text = subprocess.run([RSCRIPT, "--vanilla", "-e", code], check=True, capture_output=True, text=True).stdout
    rows = list(csv.DictReader(io.StringIO(text)))
    return np.array([float(r["x"]) for r in rows]), np.array([float(r["y"]) for r in rows])


R_VERSION = subprocess.run(
    [RSCRIPT, "--vanilla", "-e", 'cat(R.version.string)'], check=True, capture_output=True, text=True
).stdout.strip()


# ---------------------------------------------------------------- models
def fit_predict_isotonic(xtr, ytr, wtr, xte, direction):
    """direction 'up' / 'down' / 'auto' = sklearn's increasing=True / False / 'auto' (Spearman sign
    of the training rows, decided by sklearn.isotonic.check_increasing)."""
    inc = {"up": True, "down": False, "auto": "auto"}[direction]
    m = IsotonicRegression(out_of_bounds="clip", increasing=inc)
    m.fit(xtr, ytr, sample_weight=wtr)
    return m.predict(xtr), m.predict(xte), True, "up" if m.increasing_ else "down"


def fit_predict_knots(xtr, ytr, wtr, K, xte, direction):
    """Knot model reference; returns (train fit, test prediction, unique?, direction used).
    'auto' = up when scipy.stats.spearmanr of the training rows is >= 0 (sklearn's rule);
    'down' fits -y upwards and negates."""
    if direction == "auto":
        direction = "up" if spearmanr(xtr, ytr)[0] >= 0 else "down"
    if direction == "down":
        ftr, fte, unique, _ = fit_predict_knots(xtr, -ytr, wtr, K, xte, "up")
        return -ftr, -fte, unique, "down"
    t = np.linspace(xtr.min(), xtr.max(), K)
    # Hat (interpolation) basis, flat beyond the ends: H[i, j] = weight of knot j at x_i.
    def hats(x):
        H = np.zeros((len(x), K))
        for i, xi in enumerate(x):
            if xi <= t[0]:
                H[i, 0] = 1.0
            elif xi >= t[-1]:
                H[i, K - 1] = 1.0
            else:
                j = int(np.searchsorted(t, xi, side="right") - 1)
                u = (xi - t[j]) / (t[j + 1] - t[j])
                H[i, j] += 1.0 - u
                H[i, j + 1] += u
        return H

    H = hats(xtr)
    ident = np.nonzero(H.sum(axis=0) > 0)[0]
    Hr = H[:, ident]
    m = len(ident)
    L = np.tril(np.ones((m, m)))  # theta_r = L @ [a, d_1, ..., d_{m-1}]
    A = (Hr @ L) * np.sqrt(wtr)[:, None]
    b = ytr * np.sqrt(wtr)
    unique = np.linalg.matrix_rank(A) == m
    lb = np.r_[-np.inf, np.zeros(m - 1)]
    res = lsq_linear(A, b, bounds=(lb, np.full(m, np.inf)), method="bvls", tol=1e-15, max_iter=10000)
    theta_r = L @ res.x
    # Fill the knots without data by linear interpolation in t between identified ones (flat beyond).
    theta = np.interp(t, t[ident], theta_r)
    return np.interp(xtr, t, theta), np.interp(xte, t, theta), unique, "up"


def run_case(name, x, y, w, folds, repeats, seed, candidates, holdout=None, direction="up"):
    n_all = len(x)
    wfull = np.ones(n_all) if w is None else np.asarray(w, dtype=float)
    keep = wfull > 0  # zero-weight rows are left out before the split
    xs, ys, ws = x[keep], y[keep], wfull[keep]
    n = len(xs)
    if holdout is None:
        tasks = []
        for r in range(repeats):
            tasks += kfold_indices(n, folds, seed, r)
    else:
        tasks = [holdout_indices(n, holdout, seed)]
    sst_all = float(np.sum(ws * (ys - np.average(ys, weights=ws)) ** 2))
    scores, skipped = [], []
    for K in candidates:
        sse = sae = sw = 0.0
        train_rmse, fold_rmse, unique, used = [], [], True, []
        for tr, te in tasks:
            if K == 0:
                ftr, fte, u, d = fit_predict_isotonic(xs[tr], ys[tr], ws[tr], xs[te], direction)
            else:
                ftr, fte, u, d = fit_predict_knots(xs[tr], ys[tr], ws[tr], K, xs[te], direction)
            used.append(d)
            unique = unique and u
            e = ys[te] - fte
            sse += float(np.sum(ws[te] * e**2))
            sae += float(np.sum(ws[te] * np.abs(e)))
            sw += float(np.sum(ws[te]))
            fold_rmse.append(math.sqrt(np.sum(ws[te] * e**2) / np.sum(ws[te])))
            train_rmse.append(math.sqrt(np.sum(ws[tr] * (ys[tr] - ftr) ** 2) / np.sum(ws[tr])))
        if not unique:
            skipped.append(K)
            continue
        cv_rmse = math.sqrt(sse / sw)
        if holdout is None:
            k = len(fold_rmse)
            cv_se = float(np.std(fold_rmse, ddof=1) / math.sqrt(k))
            cv_r2 = 1 - sse / (repeats * sst_all)
        else:
            tr, te = tasks[0]
            e2 = (ys[te] - fte) ** 2
            mse = sse / sw
            mt = len(te)
            se_mse = math.sqrt(np.sum((ws[te] * (e2 - mse)) ** 2) * mt / (mt - 1)) / sw
            cv_se = se_mse / (2 * cv_rmse)
            cv_r2 = float(r2_score(ys[te], fte, sample_weight=ws[te]))
        scores.append(
            {
                "knots": K,
                "cvRmse": cv_rmse,
                "cvSe": cv_se,
                "cvR2": cv_r2,
                "cvMae": sae / sw,
                "trainRmse": float(np.mean(train_rmse)),
                "foldRmse": fold_rmse,
                "foldDirections": used,
            }
        )
    case = {
        "name": name,
        "x": [float(v) for v in x],
        "y": [float(v) for v in y],
        "w": None if w is None else [float(v) for v in wfull],
        "seed": seed,
        "direction": direction,
        "candidates": [s["knots"] for s in scores],
        "skipped": skipped,
        "scores": scores,
    }
    if holdout is None:
        case.update({"method": "k-fold", "folds": folds, "repeats": repeats})
    else:
        case.update({"method": "holdout", "testFraction": holdout, "testRows": int(len(tasks[0][1]))})
    return case


def write(obj, name):
    path = os.path.join(OUT, name)
    with open(path, "w", encoding="utf-8") as f:
        json.dump(obj, f, indent=1, ensure_ascii=False, allow_nan=False)
        f.write("\n")
    print("wrote", path)


def main():
    versions = {
        "python": sys.version.split()[0],
        "numpy": np.__version__,
        "scipy": scipy.__version__,
        "scikit-learn": sklearn.__version__,
        "R": R_VERSION,
    }
    # ---- PRNG fixture
    g = SplitMix64(1234567)
    rosetta = [str(g.next()) for _ in range(5)]
    seqs = {}
    for s in [0, 1, 42, 2**53 - 1]:
        g = SplitMix64(s)
        seqs[str(s)] = [str(g.next()) for _ in range(8)]
    states = {str(s): [str(repeat_state(s, r)) for r in range(4)] for s in [1, 42, 2**53 - 1]}
    perms = [{"n": n, "seed": s, "repeat": r, "perm": permutation(n, s, r)} for n, s, r in [(10, 1, 0), (10, 1, 1), (50, 42, 0), (50, 42, 3), (7, 2**53 - 1, 2), (1000, 9, 0)]]
    labels = []
    for n, F, s, r in [(10, 3, 0, 0), (11, 4, 1, 0), (50, 5, 42, 1), (23, 7, 5, 2)]:
        lab = [0] * n
        for f, (_, te) in enumerate(kfold_indices(n, F, s, r)):
            for i in te:
                lab[int(i)] = f
        labels.append({"n": n, "folds": F, "seed": s, "repeat": r, "fold": lab})
    holds = []
    for n, p, s in [(10, 0.25, 0), (10, 0.25, 1), (37, 0.3, 11), (25, 0.28, 0)]:
        _, te = holdout_indices(n, p, s)
        holds.append({"n": n, "testFraction": p, "seed": s, "test": [int(i) for i in te]})
    write(
        {
            "source": "independent Python implementation of SplitMix64 (Steele, Lea & Flood 2014) and Fisher-Yates in "
            + COMMAND
            + "; seed-0 folds from sklearn.model_selection.KFold(shuffle=False) and train_test_split(shuffle=False)",
            "published": {
                "source": "Rosetta Code task 'Pseudo-random numbers/Splitmix64': first five outputs for state 1234567",
                "state": "1234567",
                "outputs": rosetta,
            },
            "versions": versions,
            "command": COMMAND,
            "sequences": seqs,
            "repeatStates": states,
            "permutations": perms,
            "kfold": labels,
            "holdout": holds,
        },
        "cv_prng.json",
    )

    # ---- dataset fixture
    cars_x, cars_y = r_dataset("cars", "speed", "dist")
    pres_x, pres_y = r_dataset("pressure", "temperature", "pressure")
    air_x, air_y = r_dataset('airquality[complete.cases(airquality[, c("Temp", "Ozone")]), ]', "Temp", "Ozone")
    # Invented weights (not part of the dataset): 0, 1, 2 repeating, so some rows have weight 0.
    # mtcars qsec -> drat: Spearman rho 0.09 overall, and the sign differs between training sets.
    mt_x, mt_y = r_dataset("mtcars", "qsec", "drat")
    cars_w = np.array([i % 3 for i in range(len(cars_x))], dtype=float)
    upto = lambda x, top: [0] + list(range(2, min(top, len(np.unique(x))) + 1))  # noqa: E731
    cases = [
        run_case("cars speed->dist, 5 folds", cars_x, cars_y, None, 5, 1, 0, upto(cars_x, 20)),
        run_case("cars speed->dist, 10 folds", cars_x, cars_y, None, 10, 1, 0, upto(cars_x, 12)),
        run_case("pressure temperature->pressure, 5 folds", pres_x, pres_y, None, 5, 1, 0, upto(pres_x, 19)),
        run_case("airquality Temp->Ozone (complete cases), 5 folds", air_x, air_y, None, 5, 1, 0, upto(air_x, 20)),
        run_case("airquality Temp->Ozone (complete cases), 10 folds", air_x, air_y, None, 10, 1, 0, upto(air_x, 12)),
        run_case("cars with invented weights 0,1,2, 5 folds", cars_x, cars_y, cars_w, 5, 1, 0, upto(cars_x, 10)),
        run_case("cars, seed 1, 5 folds, 2 repeats", cars_x, cars_y, None, 5, 2, 1, upto(cars_x, 10)),
        run_case("airquality, seed 42, 4 folds, 3 repeats", air_x, air_y, None, 4, 3, 42, upto(air_x, 8)),
        run_case("mtcars qsec->drat, direction auto, 5 folds", mt_x, mt_y, None, 5, 1, 0, upto(mt_x, 10), direction="auto"),
        run_case("mtcars qsec->drat, direction down, seed 3, 4 folds", mt_x, mt_y, None, 4, 1, 3, upto(mt_x, 8), direction="down"),
        run_case("pressure hold-out 0.25, seed 0", pres_x, pres_y, None, None, None, 0, upto(pres_x, 8), holdout=0.25),
        run_case("airquality hold-out 0.3, seed 7", air_x, air_y, None, None, None, 7, upto(air_x, 10), holdout=0.3),
    ]
    write(
        {
            "source": "scikit-learn IsotonicRegression(out_of_bounds='clip') for candidate 0; SciPy lsq_linear bvls knot "
            + "model for K >= 2; folds from sklearn KFold(shuffle=False) / train_test_split(shuffle=False) for seed 0, "
            + "from the Python SplitMix64 permutation otherwise; data from R's datasets package (cars, pressure, "
            + "airquality complete cases of Temp and Ozone, mtcars qsec and drat)",
            "versions": versions,
            "command": COMMAND,
            "cases": cases,
        },
        "cv_datasets.json",
    )


if __name__ == "__main__":
    main()
