package cv

import (
	"context"
	"fmt"
	"math"

	"github.com/antecedent-lab/antecedent/lasso"
)

// FitMoments cross-validates a Gaussian path from moments alone: total
// holds the moments of every row in the folds and held[f] those of fold
// f's held-out rows, all about one shift. Training moments are total minus
// held[f], and the held-out mean squared error is a quadratic form in
// held[f], so no step touches the rows: one pass over the data (forming
// the moments) serves every response, predictor set, fold and penalty.
// The measure must be Deviance or MeanSquaredError.
//
// rows, when not nil, gives the rows behind the moments; the
// PairedDifference rule then pairs the held-out rows' own losses (see
// Point.PairSE), a pass over the held-out rows at each penalty from the
// strongest to the best. Without rows it pairs the folds' values.
func FitMoments(ctx context.Context, total *lasso.Moments, held []*lasso.Moments, rows *HeldRows, response int, predictors []int, s *Settings) (*Result, error) {
	c, fam, err := resolveSettings(s)
	if err != nil {
		return nil, err
	}
	if _, ok := fam.(lasso.Gaussian); !ok {
		return nil, fmt.Errorf("%w: moments serve Gaussian responses only", ErrMeasure)
	}
	if c.Measure != Deviance && c.Measure != MeanSquaredError {
		return nil, fmt.Errorf("%w: %v cannot be computed from moments", ErrMeasure, c.Measure)
	}
	if len(held) < 2 {
		return nil, fmt.Errorf("%w: %d folds, need at least 2", ErrFolds, len(held))
	}
	for f, h := range held {
		if !(h.Weight > 0) {
			return nil, fmt.Errorf("%w: fold %d holds no rows", ErrFolds, f)
		}
		if h.Vars != total.Vars {
			return nil, fmt.Errorf("%w: fold %d has moments of %d variables, total %d", ErrLength, f, h.Vars, total.Vars)
		}
	}
	if err := checkFoldScales(&c, len(held)); err != nil {
		return nil, err
	}
	if rows != nil {
		if err := rows.check(held, response, predictors); err != nil {
			return nil, err
		}
	}
	full, err := lasso.StartMoments(ctx, total, response, predictors, &c.Path)
	if err != nil {
		return nil, err
	}
	grid := full.Penalties()
	folder := make([]foldPath, len(held))
	stop, err := lockstep(ctx, &c, full, folder, func(ctx context.Context, f int) (foldPath, error) {
		if !(total.Weight-held[f].Weight > 0) {
			return nil, fmt.Errorf("%w: fold %d leaves no training rows", ErrFolds, f)
		}
		ps := foldScale(&c, f)
		ps.Penalties = grid
		st, err := lasso.StartMomentsExcluding(ctx, total, held[f], response, predictors, &ps)
		if err != nil {
			return nil, fmt.Errorf("cv: fold %d: %w", f, err)
		}
		return &foldMoments{stepper: st, held: held[f], response: response, predictors: predictors,
			b: make([]float64, len(predictors)), vals: make([]float64, 0, len(grid))}, nil
	})
	if err != nil {
		return nil, err
	}
	r := &Result{Full: full.Path(), Measure: c.Measure, Rule: c.Rule, FoldValues: make([][]float64, len(held)),
		paths: make([]*lasso.Path, len(held))}
	for f, fp := range folder {
		r.FoldValues[f] = fp.scores()[:stop]
		r.paths[f] = fp.path().Path()
	}
	if rows != nil {
		r.pairRows = func(best int) []rowSums {
			return rows.pairSums(r.paths, c.Measure, response, predictors, best)
		}
	}
	r.finish(r.Full.Penalties, r.Full.NonZero)
	return r, nil
}

// foldMoments is one fold's path fitted from moments, scored from its
// held-out moments.
type foldMoments struct {
	stepper    *lasso.Stepper
	held       *lasso.Moments
	response   int
	predictors []int
	b          []float64
	vals       []float64
}

func (fm *foldMoments) scores() []float64    { return fm.vals }
func (fm *foldMoments) path() *lasso.Stepper { return fm.stepper }

func (fm *foldMoments) advance(ctx context.Context, f, end int) error {
	if err := stepTo(ctx, fm.stepper, end, f); err != nil {
		return err
	}
	path := fm.stepper.Path()
	for k := len(fm.vals); k < end; k++ {
		b0 := path.CoefficientsTo(fm.b, min(k, path.Len()-1))
		fm.vals = append(fm.vals, heldOutMSE(fm.held, fm.response, fm.predictors, b0, fm.b))
	}
	return nil
}

// heldOutMSE returns Σ w (y − b0 − x·b)² / W over the rows behind m.
func heldOutMSE(m *lasso.Moments, y int, pred []int, b0 float64, b []float64) float64 {
	q := m.Vars
	c := m.Shift[y] - b0
	sy := m.Sum[y]
	quad := m.Cross[y*q+y]
	var nz [64]int
	idx := nz[:0]
	for t, j := range pred {
		if b[t] == 0 {
			continue
		}
		idx = append(idx, t)
		c -= b[t] * m.Shift[j]
		sy -= b[t] * m.Sum[j]
		quad -= 2 * b[t] * m.Cross[y*q+j]
	}
	// b'Gb over the non-zero coefficients, each pair once.
	for a, t := range idx {
		bt := b[t]
		row := m.Cross[pred[t]*q:]
		var s float64
		for _, u := range idx[a+1:] {
			s += b[u] * row[pred[u]]
		}
		quad += bt * (bt*row[pred[t]] + 2*s)
	}
	sse := quad + 2*c*sy + m.Weight*c*c
	return math.Max(sse, 0) / m.Weight
}

// HeldRows gives FitMoments the rows behind its moments, so that the
// paired-difference rule can pair the held-out rows' own losses.
type HeldRows struct {
	// Columns holds the values of the moments' variables: Columns[v] for
	// variable v, indexed by row.
	Columns [][]float64
	// Weights holds the rows' weights, as in the moments (nil: 1).
	Weights []float64
	// Held holds the held-out rows of each fold, as in the moments.
	Held [][]int
}

// check reports rows that cannot be those behind the folds' held-out
// moments held, for the response and predictors given: shapes, and each
// fold's total weight (its number of rows when unweighted).
func (h *HeldRows) check(held []*lasso.Moments, response int, predictors []int) error {
	if len(h.Held) != len(held) {
		return fmt.Errorf("%w: held-out rows of %d folds for moments of %d", ErrFolds, len(h.Held), len(held))
	}
	vars := append([]int{response}, predictors...)
	n := -1
	for _, v := range vars {
		if v < 0 || v >= len(h.Columns) {
			return fmt.Errorf("%w: variable %d of the moments has no column among %d", ErrLength, v, len(h.Columns))
		}
		if n >= 0 && len(h.Columns[v]) != n {
			return fmt.Errorf("%w: column %d has %d rows, column %d %d", ErrLength, v, len(h.Columns[v]), response, n)
		}
		n = len(h.Columns[v])
	}
	if h.Weights != nil && len(h.Weights) != n {
		return fmt.Errorf("%w: %d weights for %d rows", ErrLength, len(h.Weights), n)
	}
	for f, rows := range h.Held {
		var w float64
		for _, i := range rows {
			if i < 0 || i >= n {
				return fmt.Errorf("%w: fold %d holds row %d of %d", ErrLength, f, i, n)
			}
			if h.Weights == nil {
				w++
			} else {
				w += h.Weights[i]
			}
		}
		if math.Abs(w-held[f].Weight) > 1e-9*held[f].Weight {
			return fmt.Errorf("%w: fold %d's held-out rows weigh %g, its moments %g: not the rows behind them", ErrFolds, f, w, held[f].Weight)
		}
	}
	return nil
}

// pairSums returns, for every penalty index k up to best, the sums of the
// held-out rows' losses at k minus their losses at best, pooled over the
// folds' paths (see addPairs). Predictions are formed column by column
// over the non-zero coefficients, which are few on that side of the best
// penalty.
func (h *HeldRows) pairSums(paths []*lasso.Path, m Measure, response int, predictors []int, best int) []rowSums {
	out := make([]rowSums, best+1)
	b := make([]float64, len(predictors))
	for f, path := range paths {
		rows := h.Held[f]
		y, mu := make([]float64, len(rows)), make([]float64, len(rows))
		var w []float64
		if h.Weights != nil {
			w = make([]float64, len(rows))
		}
		for i, r := range rows {
			y[i] = h.Columns[response][r]
			if w != nil {
				w[i] = h.Weights[r]
			}
		}
		predict := func(k int) {
			b0 := path.CoefficientsTo(b, min(k, path.Len()-1))
			for i := range mu {
				mu[i] = b0
			}
			for t, x := range b {
				if x == 0 {
					continue
				}
				c := h.Columns[predictors[t]]
				for i, r := range rows {
					mu[i] += x * c[r]
				}
			}
		}
		addPairs(out, best, predict, m, lasso.Gaussian{}, y, mu, w)
	}
	return out
}
