#!/usr/bin/python3
"""Reference fits for the lasso package tests, from scikit-learn.

Run from the repository root with Debian's python3 (bookworm: scikit-learn
1.2.1, numpy 1.24):
    /usr/bin/python3 testdata/reference/lasso_reference.py
It writes testdata/reference/lasso.json, which the Go tests read.

Mappings to the objective of package lasso (see its doc comment):
  Lasso(alpha):                  lambda = alpha, mixing 1, no standardisation
  ElasticNet(alpha, l1_ratio):   lambda = alpha, mixing = l1_ratio
  LogisticRegression(penalty="l1", C): C = 1 / (n * lambda)
"""
import csv
import json
import os
import sys

import numpy as np
import sklearn
from sklearn.linear_model import ElasticNet, Lasso, LogisticRegression

root = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))


def read(name):
    with open(os.path.join(root, "testdata", name)) as f:
        rows = list(csv.reader(f))
    return rows[0], np.array(rows[1:], dtype=float)


out = {
    "generator": "testdata/reference/lasso_reference.py",
    "tool": "scikit-learn %s, numpy %s, python %s" % (sklearn.__version__, np.__version__, sys.version.split()[0]),
}

# Diabetes: columns centred and scaled to unit Euclidean norm (Efron et al. 2004).
_, d = read("diabetes.csv")
X, y = d[:, :10], d[:, 10]
X = X - X.mean(axis=0)
X = X / np.sqrt((X ** 2).sum(axis=0))
n = len(y)
lmax = np.max(np.abs(X.T @ (y - y.mean()))) / n
gauss = []
for ratio in [0.5, 0.1, 0.02, 0.005, 0.001]:
    alpha = lmax * ratio
    for l1 in [1.0, 0.5]:
        if l1 == 1.0:
            m = Lasso(alpha=alpha, tol=1e-15, max_iter=10_000_000)
        else:
            m = ElasticNet(alpha=alpha, l1_ratio=l1, tol=1e-15, max_iter=10_000_000)
        m.fit(X, y)
        gauss.append({"lambda": alpha, "mixing": l1, "intercept": float(m.intercept_),
                      "coef": [float(c) for c in m.coef_]})
out["diabetes"] = {"scaling": "centred, unit Euclidean norm", "lambda_max": lmax, "fits": gauss}

# Breast cancer: columns standardised with the population standard deviation.
_, b = read("breast_cancer.csv")
X, y = b[:, :30], b[:, 30]
X = (X - X.mean(axis=0)) / X.std(axis=0)
n = len(y)
lmax = np.max(np.abs(X.T @ (y - y.mean()))) / n
fits = []
for ratio in [0.5, 0.2, 0.1, 0.05, 0.02]:
    lam = lmax * ratio
    m = LogisticRegression(penalty="l1", C=1 / (n * lam), solver="saga", tol=1e-13, max_iter=10_000_000)
    m.fit(X, y)
    fits.append({"lambda": lam, "C": 1 / (n * lam), "intercept": float(m.intercept_[0]),
                 "coef": [float(c) for c in m.coef_[0]], "iterations": int(m.n_iter_[0])})
out["breast_cancer"] = {"scaling": "standardised, population SD", "lambda_max": lmax, "fits": fits}

with open(os.path.join(root, "testdata", "reference", "lasso.json"), "w") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
print("wrote testdata/reference/lasso.json with", out["tool"])
