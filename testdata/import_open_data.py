#!/usr/bin/python3
"""Copies the open datasets that the tests check against into testdata/.

Source: the data files that scikit-learn 1.2.1 ships (Debian bookworm package
python3-sklearn), read from the installed package:

  diabetes.csv       sklearn/datasets/data/diabetes_data_raw.csv.gz and
                     diabetes_target.csv.gz: the 442 patients of Efron, Hastie,
                     Johnstone & Tibshirani (2004), "Least angle regression",
                     Annals of Statistics 32:407-499; raw (unscaled) values.
  breast_cancer.csv  sklearn/datasets/data/breast_cancer.csv: the UCI Breast
                     Cancer Wisconsin (Diagnostic) data of Wolberg, Street &
                     Mangasarian (1995), 569 x 30; target 1 = benign,
                     0 = malignant, as scikit-learn codes it.

Run with Debian's /usr/bin/python3 from the repository root:
    /usr/bin/python3 testdata/import_open_data.py
"""
import csv
import gzip
import os

import sklearn
from sklearn.datasets import load_breast_cancer

here = os.path.dirname(os.path.abspath(__file__))
src = os.path.join(os.path.dirname(sklearn.__file__), "datasets", "data")

with gzip.open(os.path.join(src, "diabetes_data_raw.csv.gz"), "rt") as f:
    xs = [line.split() for line in f if line.strip()]
with gzip.open(os.path.join(src, "diabetes_target.csv.gz"), "rt") as f:
    ys = [line.strip() for line in f if line.strip()]
assert len(xs) == len(ys) == 442
with open(os.path.join(here, "diabetes.csv"), "w", newline="") as f:
    w = csv.writer(f, lineterminator="\n")
    w.writerow(["age", "sex", "bmi", "bp", "s1", "s2", "s3", "s4", "s5", "s6", "progression"])
    for x, y in zip(xs, ys):
        w.writerow(x + [repr(float(y))])

names = [n.replace(" ", "_") for n in load_breast_cancer().feature_names]
with open(os.path.join(src, "breast_cancer.csv")) as f:
    rows = list(csv.reader(f))[1:]
assert len(rows) == 569 and all(len(r) == 31 for r in rows)
with open(os.path.join(here, "breast_cancer.csv"), "w", newline="") as f:
    w = csv.writer(f, lineterminator="\n")
    w.writerow(names + ["benign"])
    w.writerows(rows)
print("scikit-learn", sklearn.__version__, "->", here)
