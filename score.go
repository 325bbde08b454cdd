package antecedent

import (
	"context"
	"fmt"

	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/lasso"
	"github.com/antecedent-lab/antecedent/metrics"
)

// cvOut is a node's cross-validated path with what produced it.
type cvOut struct {
	res   *cv.Result
	rows  []int // rows used (nil: every row)
	cols  []int // design columns of the predictors
	owner []int // variable of each design column
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
// cols (of variables owner) over rows. Gaussian nodes are solved from the
// shared moments when there are some; other nodes get folds of their own,
// stratified by the response for binomial nodes.
func (r *run) crossValidate(ctx context.Context, p *nodePlan, cols, owner, rows []int) (cvOut, error) {
	s := r.cfg.CV
	s.Path, s.Workers = r.pathSettings(p, p.penaltyScale(owner)), 1
	out := cvOut{rows: rows, cols: cols, owner: owner}
	if r.total != nil && p.role == gaussian && s.Measure != cv.MeanAbsoluteError {
		res, err := cv.FitMoments(ctx, r.total, r.held, r.d.Terms(p.v)[0], cols, &s)
		out.res = res
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
	res, err := cv.Fit(ctx, lasso.Data{Columns: r.cols, Response: p.y, Rows: rows, Predictors: cols}, folds, &s)
	if err != nil {
		return out, err
	}
	out.res = res
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

// foldScores holds out-of-fold predictions at the selected penalty.
type foldScores struct {
	pred, y []float64
}

// outOfFold returns the out-of-fold means at the selected penalty, from
// which binary nodes get their AUC.
func outOfFold(res *cv.Result, y []float64, cols [][]float64, rows []int, folds *cv.Folds) *foldScores {
	if res.FoldPaths == nil {
		return nil
	}
	var fs foldScores
	for f, path := range res.FoldPaths {
		held := folds.Held(f, rows)
		mu := make([]float64, len(held))
		path.MeanTo(mu, min(res.Selected, path.Len()-1), cols, held)
		fs.pred = append(fs.pred, mu...)
		for _, i := range held {
			fs.y = append(fs.y, y[i])
		}
	}
	return &fs
}

// score computes the node's cross-validated score at the selected
// penalty: pooled out-of-fold AUC with the Hanley–McNeil standard error for
// binary nodes, R² = 1 − CV mean squared error / variance for continuous
// ones, deviance explained for other families.
func (r *run) score(p *nodePlan, out cvOut) Score {
	res := out.res
	sel := res.Selected
	switch p.role {
	case binomial:
		s := Score{Measure: "auc", Value: nan(), SE: nan()}
		if fs := out.oof; fs != nil {
			a, err := metrics.AUC(fs.pred, fs.y, nil)
			if err == nil {
				pos := 0
				for _, y := range fs.y {
					if y == 1 {
						pos++
					}
				}
				s.Value = Number(a)
				s.SE = Number(metrics.HanleyMcNeilSE(a, pos, len(fs.y)-pos))
			}
		}
		return s
	case gaussian:
		_, vy := meanVar(p.y, out.rows)
		if res.Measure == cv.Deviance || res.Measure == cv.MeanSquaredError {
			return Score{Measure: "r2", Value: Number(1 - res.Curve[sel].Mean/vy), SE: Number(res.Curve[sel].SE / vy)}
		}
		s := Score{Measure: "r2", Value: nan(), SE: nan()}
		if fs := out.oof; fs != nil {
			if r2, err := metrics.RSquared(fs.pred, fs.y, nil); err == nil {
				s.Value = Number(r2)
			}
		}
		return s
	default:
		null := res.Full.NullDeviance / res.Full.Weight
		s := Score{Measure: "deviance explained", Value: nan(), SE: nan()}
		if res.Measure == cv.Deviance && null > 0 {
			s.Value = Number(1 - res.Curve[sel].Mean/null)
			s.SE = Number(res.Curve[sel].SE / null)
		}
		return s
	}
}
