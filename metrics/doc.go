// Package metrics scores predictions.
//
// It gives the area under the ROC curve, the ROC curve's
// points, log-loss, binomial and Gaussian deviance, mean squared and mean
// absolute error, the Brier score, the misclassification rate and R², each
// with optional observation weights. The AUC is the Mann–Whitney statistic
// with ties counted one half,
//
//	AUC = Σ_{i positive} Σ_{k negative} w_i w_k · ( [s_i > s_k] + ½·[s_i = s_k] ) / (W₊ · W₋)
//
// computed in O(n log n) by sorting the scores once. HanleyMcNeilSE gives
// the standard error of Hanley & McNeil (1982), Radiology 143:29–36.
//
// Graphs are compared by package dag, next to the graph type.
//
// Inputs are never modified. Bad input (empty, mismatched lengths, NaN,
// labels other than 0/1, one class only where two are needed) gives an
// error that names the problem and the first offending index.
package metrics
