// Package cv chooses a penalty by cross-validation and reports the curve.
//
// Rows are assigned to K folds (Random, Stratified for 0/1 responses,
// Grouped to keep related rows together, or Given by the caller), all
// seeded and reproducible. Fit fits the penalty path on every row to fix
// the grid, fits each fold's training rows on that grid, and scores each
// fold's held-out rows at every penalty with the chosen Measure. For each
// penalty the curve holds the mean over folds and its standard error: from
// the held-out rows' own losses when the measure is a mean of per-row
// losses (so stratified folds, which make fold means alike, do not shrink
// it), otherwise from the spread of the fold values,
//
//	SE = sd(fold values, divisor K−1) / √K,
//
// and the penalty is chosen by the minimum mean (MinimumLoss), by the
// one-standard-error rule (OneStandardError, the default): the largest
// penalty whose mean is within one SE of the best (Breiman, Friedman,
// Olshen & Stone 1984; Hastie, Tibshirani & Friedman, The Elements of
// Statistical Learning, 2nd ed., sec. 7.10), by the same with half or a
// quarter of an SE (HalfStandardError, QuarterStandardError: not published
// rules; see their comments), whose standard error for a binomial
// deviance is at least √(2/(n−1)), that of a Gaussian node's mean deviance
// at unit variance (Rule.Yardstick, Result.RuleSE), or by the
// paired-difference rule (PairedDifference): the largest penalty whose mean
// exceeds the best by at most PairedMargin standard errors of that
// difference, from the held-out rows' paired losses (each row's loss at the
// penalty minus its loss at the best penalty; the folds' paired values for
// AUC, and under FitMoments when it is not given the rows), so that the
// yardstick is the noise of the comparison rather than how well the best
// mean is known. For AUC larger is better and the rules are mirrored.
//
// The full-data path and the folds' paths are fitted in step, in blocks
// of ten penalties, and all stop once the mean held-out loss has risen at
// each of the last ten penalties: the minimum then lies before that
// stretch, and the penalties past it, which cost the most (the most
// predictors are active there), would not change the choice. The rule is
// a heuristic checked on simulated networks (bench/pathcut), not a
// guarantee; Settings.WholePath fits every penalty. The curve then ends
// where the paths stopped, and the full path's Status is lasso.Stopped.
//
// FitMoments does the same for Gaussian responses from moments alone (see
// lasso.Moments): training sets are totals minus held-out folds and the
// held-out squared error is a quadratic form, so after one pass over the
// data nothing depends on the number of rows, except the paired rule's
// per-row pairs (HeldRows), a pass over the held-out rows at each penalty
// from the strongest to the best.
//
// Folds run in parallel on a bounded number of goroutines and the result is
// the same for any number of workers. A cancelled context stops the work
// and returns its error.
package cv
