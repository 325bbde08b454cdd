#!/usr/bin/python3
"""scikit-learn side of the whole-job benchmark (go run ./bench/discover).

Reads the data (float64, one column after another), the per-node
candidates, penalty grids and fold ids written by the Go harness, and runs
one of two pipelines that do the same per-node work as antecedent:

  plain  what a practitioner writes: per node, standardise the candidates,
         LassoCV (continuous) or LogisticRegressionCV(penalty="l1",
         solver="saga") (binary) on the node's grid and folds, apply the
         one-standard-error rule to the stored CV scores and refit at the
         chosen penalty;
  tuned  the strongest version we could build: per-fold cross-products of
         every variable formed once with BLAS, each continuous node solved
         with lasso_path on a precomputed standardised training Gram (warm
         starts along the grid) and scored from the held-out fold's
         cross-products; binary nodes with liblinear's L1 solver (newGLMNET,
         the fastest L1 logistic solver scikit-learn has), intercept_scaling
         large so the intercept is effectively unpenalised.

Both apply the one-standard-error rule as antecedent does: for continuous
nodes the standard error is the spread of the fold means, for binary nodes
(stratified folds) it comes from every held-out row's own log loss.

Prints JSON: seconds, peak resident memory (KiB), nodes run, and the
selected parents of each node run. A third argument names a CSV file of
the same data to read instead (pandas), for the end-to-end comparison;
load_seconds is then the CSV read. Run with Debian's /usr/bin/python3
(scikit-learn 1.2.1, numpy 1.24, pandas 1.5.3: Debian's python3-sklearn
and python3-pandas).
"""
import json
import resource
import sys
import time
import warnings

import numpy as np
import sklearn
from sklearn.exceptions import ConvergenceWarning
from sklearn.linear_model import (Lasso, LassoCV, LogisticRegression,
                                  LogisticRegressionCV, lasso_path)

warnings.simplefilter("ignore", ConvergenceWarning)
warnings.simplefilter("ignore", UserWarning)


def one_se(mean, se, larger_better=False):
    """Largest penalty (first index, grids decrease) within one SE of the best."""
    best = int(np.nanargmax(mean) if larger_better else np.nanargmin(mean))
    bound = mean[best] - se[best] if larger_better else mean[best] + se[best]
    for k in range(best + 1):
        if (mean[k] >= bound) if larger_better else (mean[k] <= bound):
            return k
    return best


def binary_curve(m, X, y, splits):
    """Mean held-out log loss per C (the mean over folds of each fold's mean,
    as scores_ holds it) and its standard error as antecedent forms it for
    binary nodes: the standard deviation of every held-out row's own loss
    (divisor n) over the square root of n - 1, so that stratified folds,
    which make the fold means alike, do not shrink it."""
    paths = m.coefs_paths_[1.0]  # folds x Cs x (features + intercept)
    K, C = paths.shape[0], paths.shape[1]
    fold_means = np.empty((K, C))
    rows = []
    for f, (_, te) in enumerate(splits):
        eta = X[te] @ paths[f, :, :-1].T + paths[f, :, -1]  # rows x Cs
        p = np.clip(1 / (1 + np.exp(-eta)), 1e-15, 1 - 1e-15)
        yt = y[te][:, None]
        loss = -(yt * np.log(p) + (1 - yt) * np.log(1 - p))
        fold_means[f] = loss.mean(axis=0)
        rows.append(loss)
    if not np.allclose(fold_means, -m.scores_[1.0], rtol=1e-6, atol=1e-9):
        sys.exit("held-out losses recomputed from coefs_paths_ do not match scores_")
    rows = np.vstack(rows)
    return fold_means.mean(axis=0), rows.std(axis=0) / np.sqrt(len(rows) - 1)


def standardise(X):
    m = X.mean(axis=0)
    s = X.std(axis=0)
    s[s == 0] = 1
    return (X - m) / s, s


def plain_node(data, node, folds, tol, jobs):
    X, s = standardise(data[:, node["candidates"]])
    y = data[:, node["index"]]
    grid = np.asarray(node["penalties"])
    K = folds.max() + 1
    splits = [(np.where(folds != f)[0], np.where(folds == f)[0]) for f in range(K)]
    if node["binary"]:
        ntr = len(y) * (K - 1) / K
        cs = 1 / (ntr * grid)
        m = LogisticRegressionCV(Cs=cs, cv=splits, penalty="l1", solver="saga", tol=tol, max_iter=1000,
                                 scoring="neg_log_loss", n_jobs=jobs, refit=False).fit(X, y)
        k = one_se(*binary_curve(m, X, y, splits))
        # The full-data refit has n rows, so its C is 1/(n·λ).
        fit = LogisticRegression(penalty="l1", solver="saga", C=1 / (len(y) * grid[k]), tol=tol, max_iter=1000).fit(X, y)
        coef = fit.coef_[0]
    else:
        m = LassoCV(alphas=grid, cv=splits, tol=tol, n_jobs=jobs).fit(X, y)
        mse = m.mse_path_  # alphas x folds, alphas decreasing
        k = one_se(mse.mean(axis=1), mse.std(axis=1, ddof=1) / np.sqrt(K))
        coef = Lasso(alpha=m.alphas_[k], tol=tol).fit(X, y).coef_
    return [node["candidates"][j] for j in np.nonzero(coef)[0]]


class FoldGrams:
    """Per-fold sums and cross-products of every column, about the global mean."""

    def __init__(self, data, folds):
        self.shift = data.mean(axis=0)
        K = folds.max() + 1
        self.n, self.sum, self.cross = [], [], []
        for f in range(K):
            Z = data[folds == f] - self.shift
            self.n.append(len(Z))
            self.sum.append(Z.sum(axis=0))
            self.cross.append(Z.T @ Z)
        self.N = sum(self.n)
        self.Sum = sum(self.sum)
        self.Cross = sum(self.cross)


def tuned_gaussian(g, node, tol):
    c, yi = np.asarray(node["candidates"]), node["index"]
    idx = np.append(c, yi)
    grid = np.asarray(node["penalties"])
    K = len(g.n)
    losses = np.empty((K, len(grid)))
    for f in range(K):
        n = g.N - g.n[f]
        S = (g.Sum - g.sum[f])[idx]
        C = (g.Cross - g.cross[f])[np.ix_(idx, idx)] - np.outer(S, S) / n  # centred
        sd = np.sqrt(np.diag(C)[:-1] / n)
        sd[sd == 0] = 1
        G = np.ascontiguousarray(C[:-1, :-1] / np.outer(sd, sd))
        Xy = np.ascontiguousarray(C[:-1, -1] / sd)
        Xfake = np.broadcast_to(np.zeros(1), (n, len(c)))
        yfake = np.array([np.sqrt(C[-1, -1])])
        _, coefs, _ = lasso_path(Xfake, yfake, alphas=grid, precompute=G, Xy=Xy, tol=tol, check_input=False)
        B = coefs / sd[:, None]  # original scale, p x alphas
        mean = S / n + g.shift[idx]
        b0 = mean[-1] - mean[:-1] @ B
        # Held-out squared error from the fold's cross-products.
        nf, sf, cf = g.n[f], g.sum[f][idx], g.cross[f][np.ix_(idx, idx)]
        cc = g.shift[yi] - b0 - g.shift[c] @ B  # constant part per alpha
        quad = cf[-1, -1] - 2 * cf[:-1, -1] @ B + np.einsum("ia,ij,ja->a", B, cf[:-1, :-1], B)
        lin = 2 * cc * (sf[-1] - sf[:-1] @ B)
        losses[f] = (quad + lin + nf * cc * cc) / nf
    k = one_se(losses.mean(axis=0), losses.std(axis=0, ddof=1) / np.sqrt(K))
    # Full-data fit at the chosen penalty from the total cross-products.
    S = g.Sum[idx]
    C = g.Cross[np.ix_(idx, idx)] - np.outer(S, S) / g.N
    sd = np.sqrt(np.diag(C)[:-1] / g.N)
    sd[sd == 0] = 1
    G = np.ascontiguousarray(C[:-1, :-1] / np.outer(sd, sd))
    Xy = np.ascontiguousarray(C[:-1, -1] / sd)
    _, coefs, _ = lasso_path(np.broadcast_to(np.zeros(1), (g.N, len(c))), np.array([np.sqrt(C[-1, -1])]),
                             alphas=grid[: k + 1], precompute=G, Xy=Xy, tol=tol, check_input=False)
    return [int(c[j]) for j in np.nonzero(coefs[:, -1])[0]]


def tuned_binary(data, node, folds, tol, jobs):
    X, s = standardise(data[:, node["candidates"]])
    y = data[:, node["index"]]
    grid = np.asarray(node["penalties"])
    K = folds.max() + 1
    splits = [(np.where(folds != f)[0], np.where(folds == f)[0]) for f in range(K)]
    ntr = len(y) * (K - 1) / K
    cs = 1 / (ntr * grid)
    m = LogisticRegressionCV(Cs=cs, cv=splits, penalty="l1", solver="liblinear", intercept_scaling=100, tol=tol,
                             scoring="neg_log_loss", n_jobs=jobs, refit=False).fit(X, y)
    k = one_se(*binary_curve(m, X, y, splits))
    fit = LogisticRegression(penalty="l1", solver="liblinear", intercept_scaling=100, C=1 / (len(y) * grid[k]),
                             tol=tol).fit(X, y)
    return [node["candidates"][j] for j in np.nonzero(fit.coef_[0])[0]]


def vm_hwm():
    with open("/proc/self/status") as f:
        for line in f:
            if line.startswith("VmHWM:"):
                return int(line.split()[1])
    return -1


def main():
    spec = json.load(open(sys.argv[1]))
    pipeline = sys.argv[2]
    n, p = spec["n"], spec["p"]
    start = time.perf_counter()
    if len(sys.argv) > 3:
        # End to end: the table read from its CSV file as a practitioner
        # would, with pandas' C parser.
        import pandas as pd
        data = pd.read_csv(sys.argv[3], engine="c", dtype=np.float64).to_numpy()
        if data.shape != (n, p):
            sys.exit("%s: %s values, want %d x %d" % (sys.argv[3], data.shape, n, p))
    else:
        data = np.fromfile(spec["data"], dtype="<f8").reshape(p, n).T.copy()
    load = time.perf_counter() - start
    nodes = [nd for nd in spec["nodes"] if nd["run"]]
    folds_all = np.fromfile(spec["folds"], dtype="<i1").reshape(len(spec["nodes"]), n)
    start = time.perf_counter()
    parents = {}
    grams = None
    fixed = 0.0  # work shared by all nodes (the tuned pipeline's fold cross-products)
    node_seconds = {}  # each node's own time, shared work excluded
    for nd in nodes:
        t_node = time.perf_counter()
        shared = fixed
        folds = folds_all[nd["slot"]].astype(int)
        if pipeline == "plain":
            parents[nd["index"]] = plain_node(data, nd, folds, spec["tol"], spec["jobs"])
        elif nd["binary"]:
            parents[nd["index"]] = tuned_binary(data, nd, folds, spec["tol"], spec["jobs"])
        else:
            if grams is None:
                t0 = time.perf_counter()
                grams = FoldGrams(data, folds)
                fixed = time.perf_counter() - t0
            parents[nd["index"]] = tuned_gaussian(grams, nd, spec["tol"])
        node_seconds[str(nd["index"])] = time.perf_counter() - t_node - (fixed - shared)
    seconds = time.perf_counter() - start
    # VmHWM: getrusage's maximum survives fork and exec, so it would count
    # the Go parent's memory; worker processes add their own peaks.
    rss = vm_hwm() + resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss
    json.dump({"seconds": seconds, "fixed_seconds": fixed, "load_seconds": load, "peak_kib": rss, "nodes": len(nodes),
               "parents": {str(k): [int(x) for x in v] for k, v in parents.items()}, "node_seconds": node_seconds,
               "tool": "scikit-learn %s, numpy %s" % (sklearn.__version__, np.__version__)}, sys.stdout)


main()
