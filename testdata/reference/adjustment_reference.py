#!/usr/bin/python3
"""Reference adjustment-set regressions for package intervention, from statsmodels.

Run from the repository root with Debian's python3 (bookworm: statsmodels
0.13.5, numpy 1.24):
    /usr/bin/python3 testdata/reference/adjustment_reference.py
It writes testdata/reference/adjustment.json. Each case is one regression of
an outcome on a cause and an adjustment set, on the raw columns of an open
dataset in testdata/, with the cause's coefficient, standard error and 95%
confidence interval, and the difference in the mean fitted outcome with the
cause set to a rather than to b in every row (regression standardisation).
The sets are those that the hand-written networks in
intervention/adjust_test.go imply; the test checks that package
intervention names the same sets and computes the same numbers.
  diabetes_parents:  progression ~ bmi + age + sex   (OLS; parents of bmi)
  diabetes_optimal:  progression ~ bmi + age         (OLS; optimal set)
  cancer_parents:    benign ~ mean_radius + mean_texture (Logit; parents and optimal set)
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


def case(data, outcome, cause, adjust, logit, a, b):
    names = [cause] + adjust
    x = sm.add_constant(np.column_stack([data[n] for n in names]))
    y = data[outcome]
    if logit:
        fit = sm.Logit(y, x).fit(disp=0, tol=1e-12, maxiter=200)
    else:
        fit = sm.OLS(y, x).fit()
    ci = np.asarray(fit.conf_int(0.05))
    xa, xb = x.copy(), x.copy()
    xa[:, 1], xb[:, 1] = a, b
    diff = float(np.mean(fit.predict(xa) - fit.predict(xb)))
    return {
        "outcome": outcome, "cause": cause, "set": adjust, "model": "Logit" if logit else "OLS",
        "a": a, "b": b,
        "coefficient": float(np.asarray(fit.params)[1]), "se": float(np.asarray(fit.bse)[1]),
        "lower": float(ci[1, 0]), "upper": float(ci[1, 1]), "difference": diff,
    }


d = read("diabetes.csv")
c = read("breast_cancer.csv")
out = {
    "generator": "testdata/reference/adjustment_reference.py",
    "tool": "statsmodels %s, numpy %s, python %s" % (statsmodels.__version__, np.__version__, sys.version.split()[0]),
    "diabetes_parents": case(d, "progression", "bmi", ["age", "sex"], False, 30.0, 25.0),
    "diabetes_optimal": case(d, "progression", "bmi", ["age"], False, 30.0, 25.0),
    "cancer_parents": case(c, "benign", "mean_radius", ["mean_texture"], True, 15.0, 12.0),
}
with open(os.path.join(root, "testdata", "reference", "adjustment.json"), "w") as f:
    json.dump(out, f, indent=1)
    f.write("\n")
print("wrote testdata/reference/adjustment.json with", out["tool"])
