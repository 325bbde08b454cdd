package antecedent

import (
	"context"
	"fmt"
	"math"
	"slices"

	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/internal/refit"
	"github.com/antecedent-lab/antecedent/lasso"
	"github.com/antecedent-lab/antecedent/metrics"
)

// cvOut is a node's cross-validated path with what produced it.
type cvOut struct {
	res   *cv.Result
	rows  []int     // rows used (nil: every row)
	cols  []int     // design columns of the predictors
	owner []int     // variable of each design column
	scale []float64 // penalty factor of each design column
	folds *cv.Folds
	oof   *foldScores
}

// chosen returns the variables with a non-zero coefficient at the selected
// penalty.
func (o cvOut) chosen() map[int]bool {
	_, b := o.res.Model()
	out := map[int]bool{}
	for t, x := range b {
		if x != 0 {
			out[o.owner[t]] = true
		}
	}
	return out
}

// tooFewRows reports a node with too few usable rows to cross-validate.
type tooFewRows struct{ rows, folds int }

func (e *tooFewRows) Error() string {
	return fmt.Sprintf("antecedent: %d usable rows for %d folds", e.rows, e.folds)
}

// crossValidate runs node p's cross-validated path on the design columns
// cols (of variables owner) over rows, with penalty factors scale. Gaussian nodes are solved from the
// shared moments when there are some; other nodes get folds of their own,
// stratified by the response for binomial nodes.
func (r *run) crossValidate(ctx context.Context, p *nodePlan, cols, owner, rows []int, scale []float64, foldScales [][]float64) (cvOut, error) {
	s := r.cfg.CV
	s.Path, s.Workers, s.FoldScales = r.pathSettings(p, scale), max(r.foldWorkers, 1), foldScales
	if p.role != binomial && (s.Measure == cv.AreaUnderCurve || s.Measure == cv.Misclassification) {
		s.Measure = cv.Deviance // a measure for 0/1 responses applies to binary nodes only
	}
	out := cvOut{rows: rows, cols: cols, owner: owner, scale: scale}
	if r.total != nil && p.role == gaussian && s.Measure != cv.MeanAbsoluteError {
		res, err := cv.FitMoments(ctx, r.total, r.held, r.heldRows, r.d.Terms(p.v)[0], cols, &s)
		out.res, out.folds = res, r.folds
		return out, err
	}
	n := len(p.y)
	if rows != nil {
		n = len(rows)
	}
	if n < 2*r.cfg.Folds {
		return out, &tooFewRows{rows: n, folds: r.cfg.Folds}
	}
	folds, err := r.nodeFolds(p, rows, n)
	if err != nil {
		return out, err
	}
	res, err := cv.Fit(ctx, lasso.Data{Columns: r.cols, Response: p.y, Rows: rows, Predictors: cols, Index: r.listsFor(rows)}, folds, &s)
	if err != nil {
		return out, err
	}
	out.res, out.folds = res, folds
	out.oof = outOfFold(res, p.y, r.cols, rows, folds)
	return out, nil
}

// nodeFolds returns node p's folds over its n rows, seeded by the run's
// seed and the node.
func (r *run) nodeFolds(p *nodePlan, rows []int, n int) (*cv.Folds, error) {
	seed := r.cfg.Seed + uint64(p.v)*0x9e3779b97f4a7c15
	var folds *cv.Folds
	var err error
	if p.role == binomial {
		labels := make([]float64, n)
		for t := range labels {
			labels[t] = p.y[rowAt(rows, t)]
		}
		folds, err = cv.Stratified(labels, r.cfg.Folds, seed)
	} else {
		folds, err = cv.Random(n, r.cfg.Folds, seed)
	}
	if err != nil {
		return nil, err
	}
	return &cv.Folds{K: folds.K, ID: spreadIDs(folds.ID, rows, len(p.y))}, nil
}

// foldScores holds out-of-fold predictions at the selected penalty, by
// fold.
type foldScores struct {
	pred, y [][]float64
}

// outOfFold returns the out-of-fold means at the selected penalty, from
// which binary nodes get their AUC.
func outOfFold(res *cv.Result, y []float64, cols [][]float64, rows []int, folds *cv.Folds) *foldScores {
	if res.FoldPaths == nil {
		return nil
	}
	fs := &foldScores{pred: make([][]float64, len(res.FoldPaths)), y: make([][]float64, len(res.FoldPaths))}
	for f, path := range res.FoldPaths {
		held := folds.Held(f, rows)
		fs.pred[f] = make([]float64, len(held))
		path.MeanTo(fs.pred[f], min(res.Selected, path.Len()-1), cols, held)
		for _, i := range held {
			fs.y[f] = append(fs.y[f], y[i])
		}
	}
	return fs
}

// scoreName is the measure a node of role ro is scored by.
func scoreName(ro role) string {
	switch ro {
	case binomial:
		return "auc"
	case gaussian:
		return "r2"
	}
	return "deviance explained"
}

// chance is the score of a model with no parents: AUC ½, R² 0 and no
// deviance explained, exactly, rather than the slightly worse value that
// cross-validation gives an intercept-only model (each training fold's
// mean moves away from its held-out rows).
func chance(ro role) Score {
	s := Score{Measure: scoreName(ro), SE: 0, Note: "no parents: chance level"}
	if ro == binomial {
		s.Value = 0.5
	}
	return s
}

// foldAUC returns the mean of the folds' held-out AUCs, each fold weighted
// by its number of positive–negative pairs, with the Hanley–McNeil
// standard error for the pooled counts. Averaging within folds, rather than
// pooling predictions across folds, keeps a model without information at
// ½: pooled scores from different training folds are not on one scale
// (Forman & Scholz 2010, SIGKDD Explorations 12(1):49–57, from memory).
// Folds without both classes are skipped.
func foldAUC(pred, y [][]float64) (auc, se float64) {
	var sum, pairs float64
	var pos, neg int
	for f := range pred {
		a, err := metrics.AUC(pred[f], y[f], nil)
		if err != nil {
			continue
		}
		p := 0
		for _, v := range y[f] {
			if v == 1 {
				p++
			}
		}
		w := float64(p) * float64(len(y[f])-p)
		sum += w * a
		pairs += w
		pos += p
		neg += len(y[f]) - p
	}
	if pairs == 0 {
		return math.NaN(), math.NaN()
	}
	auc = sum / pairs
	return auc, metrics.HanleyMcNeilSE(auc, pos, neg)
}

// penalisedScore computes the penalised fit's cross-validated score at the
// selected penalty, the figure its penalty was chosen on: the fold-averaged
// AUC for binary nodes, R² = 1 − CV mean squared error / variance for
// continuous ones, deviance explained for other families.
func (r *run) penalisedScore(p *nodePlan, out cvOut) Score {
	res := out.res
	sel := res.Selected
	s := Score{Measure: scoreName(p.role), Value: nan(), SE: nan()}
	switch p.role {
	case binomial:
		if fs := out.oof; fs != nil {
			a, se := foldAUC(fs.pred, fs.y)
			s.Value, s.SE = Number(a), Number(se)
		}
	case gaussian:
		_, vy := meanVar(p.y, out.rows)
		if res.Measure == cv.Deviance || res.Measure == cv.MeanSquaredError {
			s.Value, s.SE = Number(1-res.Curve[sel].Mean/vy), Number(res.Curve[sel].SE/vy)
		} else if fs := out.oof; fs != nil {
			if r2, err := metrics.RSquared(slices.Concat(fs.pred...), slices.Concat(fs.y...), nil); err == nil {
				s.Value = Number(r2)
			}
		}
	default:
		null := res.Full.NullDeviance / res.Full.Weight
		if res.Measure == cv.Deviance && null > 0 {
			s.Value, s.SE = Number(1-res.Curve[sel].Mean/null), Number(res.Curve[sel].SE/null)
		}
	}
	return s
}

// refitScore is the cross-validated score of the model whose effects are
// shown: the parents refitted without penalty on each training fold and
// scored on its held-out rows, over the same folds as the penalty choice.
// Gaussian nodes served by shared moments are refitted and scored from the
// fold moments alone; other nodes from their rows.
func (r *run) refitScore(ctx context.Context, p *nodePlan, parents []int, out cvOut) (Score, error) {
	if len(parents) == 0 {
		return chance(p.role), nil
	}
	cols, _ := r.design(parents)
	if out.res.FoldPaths == nil && r.total != nil && p.role == gaussian {
		mse, vy := r.foldMSE(p, cols)
		m, se := meanSE(mse)
		return Score{Measure: "r2", Value: Number(1 - m/vy), SE: Number(se / vy)}, nil
	}
	pred, ys, err := r.foldPredictions(ctx, p, cols, out)
	if err != nil {
		return Score{}, err
	}
	return rowScore(p, pred, ys), nil
}

// refitLoss returns the cross-validated loss of the unpenalised refit on
// the design columns cols, with its standard error: mean squared error for
// Gaussian nodes (from the fold moments when they are shared), the mean
// unit deviance otherwise.
func (r *run) refitLoss(ctx context.Context, p *nodePlan, cols []int, out cvOut) (mean, se float64, folds []float64, err error) {
	if out.res.FoldPaths == nil && r.total != nil && p.role == gaussian {
		mse, _ := r.foldMSE(p, cols)
		m, se := meanSE(mse)
		return m, se, mse, nil
	}
	pred, ys, err := r.foldPredictions(ctx, p, cols, out)
	if err != nil {
		return 0, 0, nil, err
	}
	var s rowLoss
	folds = make([]float64, len(pred))
	for f := range pred {
		var fl rowLoss
		for i, y := range ys[f] {
			d := p.family.Deviance(y, pred[f][i])
			s.add(d)
			fl.add(d)
		}
		folds[f] = fl.mean()
	}
	return s.mean(), s.se(), folds, nil
}

// foldPredictions refits node p on the design columns cols over each
// training fold of out and returns the held-out means and responses by
// fold.
func (r *run) foldPredictions(ctx context.Context, p *nodePlan, cols []int, out cvOut) (pred, ys [][]float64, err error) {
	x := make([][]float64, len(cols))
	for t, c := range cols {
		x[t] = r.cols[c]
	}
	pred = make([][]float64, out.folds.K)
	ys = make([][]float64, out.folds.K)
	for f := range out.folds.K {
		train, held := out.folds.Split(f, out.rows)
		fit, err := refit.Regress(ctx, p.family, x, p.y, train)
		if err != nil {
			return nil, nil, err
		}
		for _, i := range held {
			eta := fit.Intercept
			for t, c := range x {
				if !math.IsNaN(fit.Coef[t]) { // a term not estimable is left out
					eta += fit.Coef[t] * c[i]
				}
			}
			pred[f] = append(pred[f], p.family.Mean(eta))
			ys[f] = append(ys[f], p.y[i])
		}
	}
	return pred, ys, nil
}

// rowLoss accumulates losses for their mean and its standard error.
type rowLoss struct{ n, s, s2 float64 }

func (l *rowLoss) add(x float64) { l.n, l.s, l.s2 = l.n+1, l.s+x, l.s2+x*x }
func (l rowLoss) mean() float64  { return l.s / l.n }
func (l rowLoss) se() float64 {
	m := l.mean()
	return math.Sqrt(math.Max(l.s2/l.n-m*m, 0) / (l.n - 1))
}

// meanSE returns the mean of xs and the standard error of that mean.
func meanSE(xs []float64) (float64, float64) {
	var l rowLoss
	for _, x := range xs {
		l.add(x)
	}
	return l.mean(), l.se()
}

// rowScore scores held-out predictions by fold: fold-averaged AUC for
// binary nodes; for others 1 − mean loss / mean loss of the overall mean
// (squared error for Gaussian nodes, unit deviance otherwise), with the
// standard error of the rows' losses.
func rowScore(p *nodePlan, pred, y [][]float64) Score {
	s := Score{Measure: scoreName(p.role), Value: nan(), SE: nan()}
	if p.role == binomial {
		a, se := foldAUC(pred, y)
		s.Value, s.SE = Number(a), Number(se)
		return s
	}
	all, yy := slices.Concat(pred...), slices.Concat(y...)
	mean, _ := meanVar(yy, nil)
	var l, null rowLoss
	for i, v := range yy {
		l.add(p.family.Deviance(v, all[i]))
		null.add(p.family.Deviance(v, mean))
	}
	if !(null.mean() > 0) || l.n < 2 {
		return s
	}
	s.Value = Number(1 - l.mean()/null.mean())
	s.SE = Number(l.se() / null.mean())
	return s
}

// foldMSE refits a Gaussian node on the design columns cols from each
// training fold's moments (the total less the fold) and returns each
// fold's held-out mean squared error, from the fold's moments, and the
// response's variance over all rows.
func (r *run) foldMSE(p *nodePlan, cols []int) ([]float64, float64) {
	vars := append(slices.Clone(cols), r.d.Terms(p.v)[0])
	total := restrict(r.total, nil, vars)
	k := len(cols)
	mse := make([]float64, len(r.held))
	for f, h := range r.held {
		held := restrict(h, nil, vars)
		train := restrict(r.total, h, vars)
		fit := refit.LeastSquares(train, int(math.Round(train.Weight)))
		mse[f] = heldOutSSE(held, fit) / held.Weight
	}
	return mse, total.Covariance(k, k)
}

// restrict returns the moments of the variables vars taken from a, less b
// when b is not nil (a and b share their shift).
func restrict(a, b *lasso.Moments, vars []int) *lasso.Moments {
	shift := make([]float64, len(vars))
	for t, v := range vars {
		shift[t] = a.Shift[v]
	}
	m := lasso.NewMoments(shift)
	m.Weight = a.Weight
	if b != nil {
		m.Weight -= b.Weight
	}
	q := a.Vars
	for t, v := range vars {
		m.Sum[t] = a.Sum[v]
		if b != nil {
			m.Sum[t] -= b.Sum[v]
		}
		for u, w := range vars {
			c := a.Cross[v*q+w]
			if b != nil {
				c -= b.Cross[v*q+w]
			}
			m.Cross[t*len(vars)+u] = c
		}
	}
	return m
}

// heldOutSSE returns Σw(y − ŷ)² over the rows whose moments are h (the
// predictors first, the response last), for the predictions of fit.
func heldOutSSE(h *lasso.Moments, fit refit.Fit) float64 {
	k := h.Vars - 1
	q := h.Vars
	// u = (y − s_y) − Σ b_j (x_j − s_j); the residual is u − c.
	c := fit.Intercept - h.Shift[k]
	uu := h.Cross[k*q+k]
	u := h.Sum[k]
	for j, b := range fit.Coef {
		c += b * h.Shift[j]
		uu -= 2 * b * h.Cross[j*q+k]
		u -= b * h.Sum[j]
		for l, b2 := range fit.Coef {
			uu += b * b2 * h.Cross[j*q+l]
		}
	}
	return uu - 2*c*u + c*c*h.Weight
}
