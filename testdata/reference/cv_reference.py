#!/usr/bin/python3
"""Reference cross-validation curve for the cv package tests, from scikit-learn.

Run from the repository root with Debian's python3 (bookworm: scikit-learn
1.2.1, numpy 1.24):
    /usr/bin/python3 testdata/reference/cv_reference.py
It writes testdata/reference/cv.json: the fold id of each diabetes row, the
penalty grid, scikit-learn LassoCV's mse_path_ (held-out mean squared error
per penalty and fold) and its chosen alpha_.

Data: the diabetes data of Efron, Hastie, Johnstone & Tibshirani (2004),
columns centred and scaled to unit Euclidean norm, raw response. LassoCV
minimises (1/(2n))||y - Xw - b||^2 + alpha ||w||_1 on each training set, which
is package lasso's objective with lambda = alpha and no standardisation.
"""
import csv
import json
import os
import sys

import numpy as np
import sklearn
from sklearn.linear_model import LassoCV

root = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
with open(os.path.join(root, "testdata", "diabetes.csv")) as f:
    d = np.array(list(csv.reader(f))[1:], dtype=float)
X, y = d[:, :10], d[:, 10]
X = X - X.mean(axis=0)
X = X / np.sqrt((X ** 2).sum(axis=0))
n, k = len(y), 10
rng = np.random.default_rng(7)
fold = np.empty(n, dtype=int)
fold[rng.permutation(n)] = np.arange(n) % k
lmax = np.max(np.abs(X.T @ (y - y.mean()))) / n
grid = lmax * np.power(1e-3, np.arange(100) / 99)
splits = [(np.where(fold != f)[0], np.where(fold == f)[0]) for f in range(k)]
m = LassoCV(alphas=grid, cv=splits, tol=1e-14, max_iter=10_000_000).fit(X, y)
assert np.allclose(m.alphas_, grid)
out = {
    "generator": "testdata/reference/cv_reference.py",
    "tool": "scikit-learn %s, numpy %s, python %s" % (sklearn.__version__, np.__version__, sys.version.split()[0]),
    "folds": fold.tolist(),
    "penalties": grid.tolist(),
    "mse_path": m.mse_path_.tolist(),
    "alpha": float(m.alpha_),
}
with open(os.path.join(root, "testdata", "reference", "cv.json"), "w") as f:
    json.dump(out, f)
    f.write("\n")
print("wrote testdata/reference/cv.json with", out["tool"])
