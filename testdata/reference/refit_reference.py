#!/usr/bin/python3
"""Reference unpenalised refits for the root package tests, from statsmodels.

Run from the repository root with Debian's python3 (bookworm: statsmodels
0.13.5, numpy 1.24):
    /usr/bin/python3 testdata/reference/refit_reference.py
It writes testdata/reference/refit.json:
  ols:   diabetes progression on bmi, bp and s5 (raw values), statsmodels OLS
  logit: breast-cancer "benign" on mean_radius, mean_texture and
         worst_smoothness (raw values), statsmodels Logit
with coefficients, standard errors and 95% confidence intervals.
"""
import csv
import json
import os
import sys

import numpy as np
import statsmodels
import statsmodels.api as sm

root = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))


def read(name):
    with open(os.path.join(root, "testdata", name)) as f:
        rows = list(csv.reader(f))
    head = rows[0]
    data = np.array(rows[1:], dtype=float)
    return {h: data[:, j] for j, h in enumerate(head)}


def summary(fit, names):
    ci = np.asarray(fit.conf_int(0.05))
    return {
        "terms": ["const"] + names,
        "params": [float(v) for v in np.asarray(fit.params)],
        "bse": [float(v) for v in np.asarray(fit.bse)],
        "lower": [float(v) for v in ci[:, 0]],
        "upper": [float(v) for v in ci[:, 1]],
    }


d = read("diabetes.csv")
xs = ["bmi", "bp", "s5"]
ols = sm.OLS(d["progression"], sm.add_constant(np.column_stack([d[x] for x in xs]))).fit()
b = read("breast_cancer.csv")
xb = ["mean_radius", "mean_texture", "worst_smoothness"]
logit = sm.Logit(b["benign"], sm.add_constant(np.column_stack([b[x] for x in xb]))).fit(disp=0, tol=1e-12, maxiter=200)
out = {
    "generator": "testdata/reference/refit_reference.py",
    "tool": "statsmodels %s, numpy %s, python %s" % (statsmodels.__version__, np.__version__, sys.version.split()[0]),
    "ols": summary(ols, xs),
    "logit": summary(logit, xb),
}
with open(os.path.join(root, "testdata", "reference", "refit.json"), "w") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
print("wrote testdata/reference/refit.json with", out["tool"])
