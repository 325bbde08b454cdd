#!/usr/bin/python3
"""scikit-learn side of the path and cross-validation benchmark.

Called by `go run ./bench/paths`, which writes the data and the penalty grid
and passes their files; prints JSON with the wall time of each task (best of
the given repeats) and the coefficients of the last fit for an agreement
check. Run with Debian's /usr/bin/python3 (scikit-learn 1.2.1, numpy 1.24).

Equivalences with package lasso (its objective is in lasso/doc.go):
  lasso_path / LassoCV alpha           = lambda (mixing 1)
  LogisticRegression C                 = 1 / (n * lambda), solver "saga"
Both sides standardise the predictors (sklearn explicitly, inside the timing;
lasso internally) and fit an unpenalised intercept.
"""
import json
import sys
import time
import warnings

import numpy as np
import sklearn
from sklearn.exceptions import ConvergenceWarning
from sklearn.linear_model import LassoCV, LogisticRegression, LogisticRegressionCV, lasso_path

warnings.simplefilter("ignore", ConvergenceWarning)


def load(spec):
    x = np.fromfile(spec["x"], dtype="<f8").reshape(spec["p"], spec["n"]).T.copy()
    y = np.fromfile(spec["y"], dtype="<f8")
    return x, y


def timed(f, repeats):
    best, out = None, None
    for _ in range(repeats):
        t = time.perf_counter()
        out = f()
        d = time.perf_counter() - t
        best = d if best is None else min(best, d)
    return best, out


def gaussian_path(x, y, grid, precompute, tol):
    xm, ym = x.mean(axis=0), y.mean()
    xs = (x - xm) / x.std(axis=0)
    _, coefs, _ = lasso_path(xs, y - ym, alphas=grid, precompute=precompute, tol=tol)
    return coefs[:, -1] / x.std(axis=0)


def binomial_path(x, y, grid, tol):
    xs = (x - x.mean(axis=0)) / x.std(axis=0)
    n = len(y)
    m = LogisticRegression(penalty="l1", solver="saga", warm_start=True, tol=tol, max_iter=10_000)
    for lam in grid:
        m.set_params(C=1 / (n * lam))
        m.fit(xs, y)
    return m.coef_[0] / x.std(axis=0)


def gaussian_cv(x, y, grid, folds, tol, jobs):
    xs = (x - x.mean(axis=0)) / x.std(axis=0)
    splits = [(np.where(folds != f)[0], np.where(folds == f)[0]) for f in range(folds.max() + 1)]
    m = LassoCV(alphas=grid, cv=splits, tol=tol, n_jobs=jobs).fit(xs, y)
    return {"alpha": float(m.alpha_)}


def binomial_cv(x, y, grid, folds, tol, jobs):
    xs = (x - x.mean(axis=0)) / x.std(axis=0)
    splits = [(np.where(folds != f)[0], np.where(folds == f)[0]) for f in range(folds.max() + 1)]
    n = len(y)
    cs = 1 / (n * np.asarray(grid))
    m = LogisticRegressionCV(Cs=cs, cv=splits, penalty="l1", solver="saga", tol=tol, max_iter=10_000,
                             scoring="neg_log_loss", n_jobs=jobs).fit(xs, y)
    return {"alpha": float(1 / (n * m.C_[0]))}


def main():
    spec = json.load(open(sys.argv[1]))
    x, y = load(spec)
    grid = np.array(spec["penalties"])
    tol = spec["tol"]
    kind = spec["task"]
    repeats = spec.get("repeats", 1)
    if kind == "gaussian-gram":
        t, out = timed(lambda: gaussian_path(x, y, grid, True, tol), repeats)
    elif kind == "gaussian-residual":
        t, out = timed(lambda: gaussian_path(x, y, grid, False, tol), repeats)
    elif kind == "binomial":
        t, out = timed(lambda: binomial_path(x, y, grid, tol), repeats)
    elif kind == "gaussian-cv":
        folds = np.fromfile(spec["folds"], dtype="<i8")
        t, out = timed(lambda: gaussian_cv(x, y, grid, folds, tol, spec["jobs"]), repeats)
    elif kind == "binomial-cv":
        folds = np.fromfile(spec["folds"], dtype="<i8")
        t, out = timed(lambda: binomial_cv(x, y, grid, folds, tol, spec["jobs"]), repeats)
    else:
        raise SystemExit("unknown task " + kind)
    if isinstance(out, np.ndarray):
        out = {"coef": out.tolist()}
    out["seconds"] = t
    out["tool"] = "scikit-learn %s, numpy %s" % (sklearn.__version__, np.__version__)
    json.dump(out, sys.stdout)


main()
