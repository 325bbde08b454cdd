package antecedent

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"slices"

	"github.com/antecedent-lab/antecedent/lasso"
)

// StabilityBound returns the bound of Meinshausen & Bühlmann (2010),
// JRSS-B 72:417–473, Theorem 1, on the expected number of falsely selected
// variables among p candidates when q variables are selected on average per
// subsample and a variable is kept at selection frequency threshold π in
// (½, 1]:
//
//	E[V] ≤ q² / ((2π − 1)·p)
//
// It returns NaN for a threshold outside (½, 1] or p < 1.
func StabilityBound(q float64, p int, threshold float64) float64 {
	if !(threshold > 0.5 && threshold <= 1) || p < 1 {
		return math.NaN()
	}
	return q * q / ((2*threshold - 1) * float64(p))
}

// stability fits variable v on both halves of Pairs random splits of its
// rows at penalty lam and returns each penalised candidate variable's
// selection frequency, the mean number selected per fit and the number of
// penalised candidate variables.
func (r *run) stability(ctx context.Context, v int, lam float64, rows, cols, owner []int) (map[int]float64, float64, int, error) {
	if rows == nil {
		rows = make([]int, r.d.rows)
		for i := range rows {
			rows[i] = i
		}
	}
	required := r.plan.Required[v]
	var penalised []int
	for _, q := range r.plan.Candidates[v] {
		if !slices.Contains(required, q) {
			penalised = append(penalised, q)
		}
	}
	scale := make([]float64, len(cols))
	for t, q := range owner {
		if !slices.Contains(required, q) {
			scale[t] = 1
		}
	}
	s := r.pathSettings(v, scale)
	s.Penalties = []float64{lam}
	y := r.d.varCols[v][0]
	gaussian := r.isGaussian(v)
	local := make([][]float64, 0, len(cols)+1)
	for _, c := range cols {
		local = append(local, r.d.cols[c])
	}
	local = append(local, r.d.cols[y])
	preds := make([]int, len(cols))
	for t := range preds {
		preds[t] = t
	}
	var shift []float64
	var whole *lasso.Moments
	if gaussian {
		shift = lasso.ColumnMeans(local, nil, rows)
		whole = lasso.NewMoments(shift)
		if err := whole.Accumulate(local, nil, rows); err != nil {
			return nil, 0, 0, err
		}
	}
	counts := map[int]int{}
	selected := 0
	fits := 0
	h := len(rows) / 2
	perm := slices.Clone(rows)
	rng := rand.New(rand.NewPCG(r.cfg.Seed, 0x737461626c65^uint64(v)))
	record := func(path *lasso.Path, err error) error {
		fits++
		if err != nil {
			if errors.Is(err, lasso.ErrConstantResponse) {
				return nil // a half with no variation selects nothing
			}
			return err
		}
		if path.Len() == 0 {
			return nil
		}
		seen := map[int]bool{}
		for _, t := range path.Coefficients[0].Index {
			q := owner[t]
			if !slices.Contains(required, q) && !seen[q] {
				seen[q] = true
				counts[q]++
				selected++
			}
		}
		return nil
	}
	for range r.cfg.Stability.Pairs {
		if err := ctx.Err(); err != nil {
			return nil, 0, 0, err
		}
		rng.Shuffle(len(perm), func(a, b int) { perm[a], perm[b] = perm[b], perm[a] })
		a := slices.Clone(perm[:h])
		b := slices.Clone(perm[h : 2*h])
		slices.Sort(a)
		slices.Sort(b)
		if gaussian {
			ma := lasso.NewMoments(shift)
			if err := ma.Accumulate(local, nil, a); err != nil {
				return nil, 0, 0, err
			}
			mb := whole.Clone()
			if err := mb.Subtract(ma); err != nil {
				return nil, 0, 0, err
			}
			if len(rows)%2 == 1 {
				// Drop the row left over so both halves have h rows.
				odd := lasso.NewMoments(shift)
				if err := odd.Accumulate(local, nil, perm[2*h:]); err != nil {
					return nil, 0, 0, err
				}
				if err := mb.Subtract(odd); err != nil {
					return nil, 0, 0, err
				}
			}
			for _, m := range []*lasso.Moments{ma, mb} {
				if err := record(lasso.FitMoments(ctx, m, len(cols), preds, &s)); err != nil {
					return nil, 0, 0, err
				}
			}
			continue
		}
		for _, half := range [][]int{a, b} {
			d := lasso.Data{Columns: r.d.cols, Response: r.d.cols[y], Rows: half, Predictors: cols}
			if err := record(lasso.Fit(ctx, d, &s)); err != nil {
				if errors.Is(err, lasso.ErrResponse) || errors.Is(err, lasso.ErrNoRows) {
					continue
				}
				return nil, 0, 0, err
			}
		}
	}
	freq := make(map[int]float64, len(penalised))
	for _, q := range penalised {
		freq[q] = float64(counts[q]) / float64(fits)
	}
	return freq, float64(selected) / float64(fits), len(penalised), nil
}
