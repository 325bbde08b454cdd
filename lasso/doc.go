// Package lasso fits penalised generalised linear models along a path of
// penalties: the lasso, the elastic net, and L1-penalised logistic
// regression, with room for a loss of the caller's own.
//
// For a response y, predictors x_i (rows i = 1…n), observation weights w_i
// with sum W, mixing a in (0, 1] and penalty factors v_j ≥ 0, it minimises
// over the intercept b0 and the coefficients b
//
//	(1/W) Σ_i w_i · ½·Deviance(y_i, Mean(b0 + x_i·b))  +  λ Σ_j v_j·( a·|b_j| + (1−a)/2·b_j² )
//
// where ½·Deviance is ½(y − η)² for the Gaussian family and
// log(1 + e^η) − y·η for the binomial one. By default each predictor is
// scaled to unit weighted standard deviation before it is penalised, so the
// penalty applies to b_j·s_j; coefficients are always reported on the
// original scale. A factor v_j = 0 leaves predictor j unpenalised.
//
// The method is pathwise coordinate descent (Friedman, Hastie & Tibshirani
// 2010, "Regularization paths for generalized linear models via coordinate
// descent", Journal of Statistical Software 33(1)): the penalty runs from
// the smallest value that zeroes every penalised coefficient down a
// log-spaced sequence, each fit warm-started from the previous one, each
// coordinate updated by soft-thresholding
//
//	b_j ← S(g_j + h_j·b_j, λ·a·v_j) / (h_j + λ·(1−a)·v_j),   S(u, t) = sign(u)·max(|u| − t, 0)
//
// with g_j the negative gradient and h_j the curvature along coordinate j.
// Sequential strong rules (Tibshirani, Bien, Friedman, Hastie, Simon,
// Taylor & Tibshirani 2012, JRSS-B 74(2):245–266) screen predictors out
// before each penalty, and a check of the Karush–Kuhn–Tucker conditions
// afterwards re-admits any that should not have been, so screening saves
// time without changing the answer. Coordinate descent cycles on the active
// set to convergence, then makes one full sweep over the screened set.
//
// Each fit stops on a bound on its distance to the optimum rather than on
// the size of the last changes, which on collinear data stop shrinking long
// before the fit is close. The Karush–Kuhn–Tucker residual of coordinate j,
//
//	ρ_j = min |g_j − λ(1−a)v_j·b_j − λ·a·v_j·s|  over s in ∂|b_j|,
//
// is zero at the optimum, and for an objective of smallest curvature μ the
// fit is within ‖ρ‖/μ of it. A coordinate update leaves ρ_j = 0 and later
// updates d_k move g_j by at most √(h_j h_k)·|d_k| (h the curvatures), so a
// sweep bounds every ρ_j/√h_j by Σ_k √h_k·|d_k| at no extra cost; the fit
// is accepted when that bound, or the exact residual where the gradient is
// at hand, is below Tolerance times the response's scale (see
// Settings.Tolerance). Coordinate descent converges slowly when predictors
// are collinear, so once the signs of the active coefficients settle the
// solver takes a Newton step on the active set, which solves the
// sign-fixed equations of the active-set method of Osborne, Presnell &
// Turlach (2000, IMA Journal of Numerical Analysis 20:389–403) and lands
// on the optimum when the signs are right; it stops where a coefficient
// would cross zero otherwise. A step is taken only when the sweeps it
// replaces have cost as much as forming it.
//
// Gaussian paths run in one of two modes: GramMode works from the weighted
// cross-products of the variables (see Moments), so after one pass over the
// data each update costs O(p) whatever the number of rows; ResidualMode
// updates a residual vector, costing O(n) per update. Other families are
// fitted by iteratively reweighted least squares: at each outer step the
// loss is replaced by its quadratic approximation and that weighted problem
// is solved by coordinate descent in ResidualMode, until the KKT residuals
// at weights formed at the current fit, where the working residuals are
// the gradient of the loss itself, are within the tolerance (or the first
// sweep there ends within it). Each penalty starts from the fits at the two before,
// extrapolated linearly in λ when that lowers the objective, which
// usually saves a reweighting step. Binomial working weights
// keep fitted probabilities away from 0 and 1; a path whose deviance
// explained reaches SaturationLimit (perfect separation, for instance) ends
// early with Status Saturated instead of diverging.
//
// A Stepper (Start, Next) fits the same path one penalty at a time, so a
// caller such as cross-validation can stop it once the rest is of no use.
// The strong rule and the KKT check need the gradient of every predictor
// outside the screened set after each penalty; the residual engine bounds
// in one pass over the rows how far all of them can have moved since they
// were last formed (Cauchy–Schwarz with the observation weights), and forms
// only those whose decision the bound leaves open, so the answer is that of
// the exact check.
//
// Inputs are never modified and never copied: Data refers to the caller's
// columns and selects rows and predictors by index, so cross-validation and
// graph discovery fit many folds and nodes from one dataset.
//
// A 0/1 predictor is held by the rows of its rarer value, and its updates
// touch only those rows. Each fit lists them for itself, unless Data
// carries an Index: then a fit in rows (not one from moments) on a subset
// of the index's rows reads its one listing, and runs over all the
// index's rows with weight zero on those it leaves out, which saves
// memory on large tables at some cost in time. (A mostly-one column in a
// fit without an intercept is then passed over in full.)
//
// A custom loss implements Family; package familytest checks an
// implementation against finite differences of its deviance.
package lasso
