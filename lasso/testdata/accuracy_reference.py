#!/usr/bin/python3
"""Optimal coefficients along default penalty paths, from scikit-learn.

Run from the repository root with Debian's python3 (bookworm: scikit-learn
1.2.1, numpy 1.24):
    /usr/bin/python3 lasso/testdata/accuracy_reference.py
It writes lasso/testdata/accuracy.json, which TestDefaultAccuracy reads.

Each case reproduces the path that package lasso fits with default settings:
predictors standardised to unit population standard deviation, an
unpenalised intercept, and 100 penalties from just above the smallest
all-zero penalty, lambda_max = max_j |x_j'(y - mean y)| / (n sd_j) times
(1 + 1e-9), down to 1e-3 of it on a log scale. scikit-learn then solves
every penalty of that grid far tighter than its defaults:
  Gaussian: lasso_path (alpha = lambda), duality gap below 1e-14 of |y|^2;
  binomial: LogisticRegression(penalty="l1", solver="saga", C = 1/(n lambda),
            tol 1e-11), at a few grid points, each from a cold start.
The file records, per case, the largest KKT residual of the reference
solutions relative to the penalty, computed here from the data.

The two simulated cases are drawn here with numpy's PCG64 generator and
fixed seeds, rounded to six decimals and written to lasso/testdata/*.csv,
which both sides then read.
"""
import csv
import json
import os
import sys

import numpy as np
import sklearn
from sklearn.linear_model import LogisticRegression, lasso_path

here = os.path.dirname(os.path.abspath(__file__))
root = os.path.dirname(os.path.dirname(here))


def read(name):
    with open(os.path.join(root, "testdata", name)) as f:
        rows = list(csv.reader(f))
    return np.array(rows[1:], dtype=float)


def grid(xs, y, num=100, floor=1e-3):
    n = len(y)
    lmax = np.max(np.abs(xs.T @ (y - y.mean()))) / n * (1 + 1e-9)
    return lmax * floor ** (np.arange(num) / (num - 1))


def kkt(xs, resid, b, lam):
    """Largest violation of the lasso optimality conditions over lam."""
    n = len(resid)
    g = xs.T @ resid / n
    r = np.where(b != 0, np.abs(g - lam * np.sign(b)), np.maximum(0, np.abs(g) - lam))
    return max(r.max(), abs(resid.mean())) / lam


def gaussian_case(name, source, x, y):
    m, s = x.mean(axis=0), x.std(axis=0)
    xs = (x - m) / s
    yc = y - y.mean()
    lams = grid(xs, y)
    _, coefs, gaps, iters = lasso_path(xs, yc, alphas=lams, tol=1e-14, max_iter=10_000_000,
                                       return_n_iter=True)
    fits, worst = [], 0.0
    for k, lam in enumerate(lams):
        b = coefs[:, k]
        worst = max(worst, kkt(xs, yc - xs @ b, b, lam))
        c = b / s
        fits.append({"lambda": lam, "intercept": float(y.mean() - c @ m), "coef": [float(v) for v in c]})
    return {"name": name, "family": "gaussian", "source": source, "max_iterations": int(max(iters)),
            "max_gap": float(max(gaps) / (yc @ yc)), "max_kkt": worst, "fits": fits}


def binomial_case(name, source, x, y, points):
    m, s = x.mean(axis=0), x.std(axis=0)
    xs = (x - m) / s
    lams = grid(xs, y)
    n = len(y)
    fits, worst = [], 0.0
    for k in points:
        lam = lams[k]
        f = LogisticRegression(penalty="l1", C=1 / (n * lam), solver="saga", tol=1e-11,
                               max_iter=10_000_000).fit(xs, y)
        b, b0 = f.coef_[0], f.intercept_[0]
        mu = 1 / (1 + np.exp(-(xs @ b + b0)))
        worst = max(worst, kkt(xs, y - mu, b, lam))
        c = b / s
        fits.append({"index": k, "lambda": lam, "intercept": float(b0 - c @ m), "coef": [float(v) for v in c]})
        print(name, k, "done", file=sys.stderr, flush=True)
    return {"name": name, "family": "binomial", "source": source, "max_kkt": worst, "fits": fits}


def simulated(file, seed, n, groups, size, spread, beta):
    """Predictors in groups sharing a common factor (within a group the
    correlation is 1/(1 + spread^2)) and a linear response with unit noise,
    written to file and read back."""
    rng = np.random.Generator(np.random.PCG64(seed))
    cols = []
    for _ in range(groups):
        f = rng.standard_normal(n)
        for _ in range(size):
            cols.append(np.exp(rng.standard_normal()) * (f + spread * rng.standard_normal(n)) + 3 * rng.standard_normal())
    x = np.column_stack(cols)
    y = x @ np.asarray(beta) + rng.standard_normal(n)
    path = os.path.join(here, file)
    with open(path, "w") as f:
        w = csv.writer(f, lineterminator="\n")
        w.writerow(["x%d" % (j + 1) for j in range(x.shape[1])] + ["y"])
        for row in np.column_stack([x, y]):
            w.writerow(["%.6f" % v for v in row])
    with open(path) as f:
        d = np.array(list(csv.reader(f))[1:], dtype=float)
    return d[:, :-1], d[:, -1]


cases = []

# Diabetes (Efron, Hastie, Johnstone & Tibshirani 2004): the ten baseline
# variables centred and scaled to unit Euclidean norm, as in the paper.
d = read("diabetes.csv")
x, y = d[:, :10], d[:, 10]
x = x - x.mean(axis=0)
x = x / np.sqrt((x ** 2).sum(axis=0))
cases.append(gaussian_case("diabetes", "diabetes.csv, unit-norm columns", x, y))

# Pairs of nearly equal predictors: correlation 1/(1 + 0.05^2) = 0.9975.
x, y = simulated("collinear_pairs.csv", 12, 150, 5, 2, 0.05, [1, 0, 0.5, 0, 0, 0, -0.8, 0, 0, 0.3])
cases.append(gaussian_case("pairs", "collinear_pairs.csv: 5 pairs, correlation 0.9975, seed 12", x, y))

# Three groups of five sharing a factor: correlation 1/(1 + 0.3^2) = 0.92.
x, y = simulated("collinear_groups.csv", 13, 250, 3, 5, 0.3,
                 [0.4, 0, 0, 0.2, 0, 0, 0, -0.5, 0, 0, 0.3, 0, 0, 0, 0.1])
cases.append(gaussian_case("groups", "collinear_groups.csv: 3 groups of 5, correlation 0.92, seed 13", x, y))

# Breast cancer (Wolberg, Street & Mangasarian 1995): 30 standardised
# features, many nearly collinear (radius, perimeter, area).
b = read("breast_cancer.csv")
x, y = b[:, :30], b[:, 30]
x = (x - x.mean(axis=0)) / x.std(axis=0)
cases.append(binomial_case("breast_cancer", "breast_cancer.csv, standardised columns", x, y,
                           [10, 30, 50, 70, 85, 99]))

out = {
    "generator": "lasso/testdata/accuracy_reference.py",
    "tool": "scikit-learn %s, numpy %s, python %s" % (sklearn.__version__, np.__version__, sys.version.split()[0]),
    "cases": cases,
}
with open(os.path.join(here, "accuracy.json"), "w") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
print("wrote lasso/testdata/accuracy.json with", out["tool"])
