#!/usr/bin/python3
"""Reference values for the metrics package tests, from SciPy and scikit-learn.

Run from the repository root with Debian's python3 (bookworm: scipy 1.10,
scikit-learn 1.2.1, numpy 1.24):
    /usr/bin/python3 testdata/reference/metrics_reference.py
It writes testdata/reference/metrics.json: seeded random data with ties and,
for each case, the Mann-Whitney U statistic divided by n1*n0 (SciPy) and
weighted scores from scikit-learn's metrics.
"""
import json
import os
import sys

import numpy as np
import scipy
import sklearn
from scipy.stats import mannwhitneyu
from sklearn.metrics import (brier_score_loss, log_loss, mean_absolute_error,
                             mean_squared_error, r2_score, roc_auc_score)

root = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
rng = np.random.default_rng(20261202)
cases = []
for n, levels in [(40, 5), (200, 12), (1000, 1000)]:
    y = (rng.random(n) < 0.4).astype(float)
    # Scores on a coarse grid so that ties occur, shifted up for positives.
    s = np.round((rng.normal(size=n) + 0.8 * y) * levels / 4) / levels
    p = 1 / (1 + np.exp(-s * 3))
    w = rng.uniform(0.2, 2.0, size=n)
    u = mannwhitneyu(s[y == 1], s[y == 0], alternative="two-sided").statistic
    yc = rng.normal(size=n) + 2 * s
    cases.append({
        "labels": y.tolist(), "scores": s.tolist(), "probabilities": p.tolist(),
        "weights": w.tolist(), "continuous": yc.tolist(),
        "mann_whitney_auc": float(u) / (y.sum() * (n - y.sum())),
        "roc_auc_weighted": roc_auc_score(y, s, sample_weight=w),
        "log_loss_weighted": log_loss(y, p, sample_weight=w),
        "brier_weighted": brier_score_loss(y, p, sample_weight=w),
        "mse_weighted": mean_squared_error(yc, s, sample_weight=w),
        "mae_weighted": mean_absolute_error(yc, s, sample_weight=w),
        "r2_weighted": r2_score(yc, s, sample_weight=w),
        "r2": r2_score(yc, s),
    })
out = {
    "generator": "testdata/reference/metrics_reference.py",
    "tool": "scipy %s, scikit-learn %s, numpy %s, python %s" % (
        scipy.__version__, sklearn.__version__, np.__version__, sys.version.split()[0]),
    "cases": cases,
}
with open(os.path.join(root, "testdata", "reference", "metrics.json"), "w") as f:
    json.dump(out, f)
    f.write("\n")
print("wrote testdata/reference/metrics.json with", out["tool"])
