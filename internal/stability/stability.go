package stability

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"slices"

	"github.com/antecedent-lab/antecedent/lasso"
)

// Bound returns the bound of Meinshausen & Bühlmann (2010), JRSS-B
// 72:417–473, Theorem 1, on the expected number of falsely selected
// variables among p candidates when q variables are selected on average
// per subsample and a variable is kept at selection frequency threshold π
// in (½, 1]:
//
//	E[V] ≤ q² / ((2π − 1)·p)
//
// It returns NaN for a threshold outside (½, 1] or p < 1.
func Bound(q float64, p int, threshold float64) float64 {
	if !(threshold > 0.5 && threshold <= 1) || p < 1 {
		return math.NaN()
	}
	return q * q / ((2*threshold - 1) * float64(p))
}

// Problem is one response's subsampling problem. Predictors are grouped:
// a group (a variable with one or more design columns) is selected in a
// fit when any of its columns is non-zero.
type Problem struct {
	// Data holds every column, the response and the rows to split (nil
	// means every row of the response); Data.Predictors are the
	// candidate design columns.
	Data lasso.Data
	// Group gives the group of each predictor, in the order of
	// Data.Predictors; Counted lists the groups whose selections are
	// counted (the penalised ones).
	Group, Counted []int
	// Settings configures every fit; Settings.Penalties must hold the one
	// penalty to fit at.
	Settings lasso.Settings
	// Pairs is the number of complementary pairs; Seed and Stream seed
	// the random splits.
	Pairs        int
	Seed, Stream uint64
}

// Selection is the outcome of subsampling.
type Selection struct {
	// Frequency holds each counted group's share of fits selecting it.
	Frequency map[int]float64
	// MeanSelected is the mean number of counted groups selected per fit.
	MeanSelected float64
}

// Select fits both halves of p.Pairs random splits and returns the
// selection frequencies. Gaussian problems are solved from cross-products
// of each half, formed as the whole minus the other half. A half whose
// response does not vary selects nothing. It returns ctx.Err() when ctx is
// cancelled and the solver's error for other failures.
func Select(ctx context.Context, p Problem) (Selection, error) {
	rows := p.Data.Rows
	if rows == nil {
		rows = make([]int, len(p.Data.Response))
		for i := range rows {
			rows[i] = i
		}
	}
	counted := make(map[int]bool, len(p.Counted))
	for _, g := range p.Counted {
		counted[g] = true
	}
	counts := map[int]int{}
	selected, fits := 0, 0
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
			g := p.Group[t]
			if counted[g] && !seen[g] {
				seen[g] = true
				counts[g]++
				selected++
			}
		}
		return nil
	}
	fitHalves := p.residualHalves
	if _, ok := p.Settings.Family.(lasso.Gaussian); ok {
		var err error
		if fitHalves, err = p.momentHalves(rows); err != nil {
			return Selection{}, err
		}
	}
	h := len(rows) / 2
	perm := slices.Clone(rows)
	rng := rand.New(rand.NewPCG(p.Seed, 0x737461626c65^p.Stream))
	for range p.Pairs {
		if err := ctx.Err(); err != nil {
			return Selection{}, err
		}
		rng.Shuffle(len(perm), func(a, b int) { perm[a], perm[b] = perm[b], perm[a] })
		a := slices.Clone(perm[:h])
		b := slices.Clone(perm[h : 2*h])
		slices.Sort(a)
		slices.Sort(b)
		if err := fitHalves(ctx, a, b, perm[2*h:], record); err != nil {
			return Selection{}, err
		}
	}
	s := Selection{Frequency: make(map[int]float64, len(p.Counted)), MeanSelected: float64(selected) / float64(fits)}
	for _, g := range p.Counted {
		s.Frequency[g] = float64(counts[g]) / float64(fits)
	}
	return s, nil
}

// halves fits the two halves a and b of one split (rest holds the row
// left over from an odd count) and records each fit.
type halves func(ctx context.Context, a, b, rest []int, record func(*lasso.Path, error) error) error

// residualHalves fits each half from its rows.
func (p *Problem) residualHalves(ctx context.Context, a, b, _ []int, record func(*lasso.Path, error) error) error {
	for _, half := range [][]int{a, b} {
		d := p.Data
		d.Rows = half
		if err := record(lasso.Fit(ctx, d, &p.Settings)); err != nil {
			if errors.Is(err, lasso.ErrResponse) || errors.Is(err, lasso.ErrNoRows) {
				continue
			}
			return err
		}
	}
	return nil
}

// momentHalves returns a halves function that solves each half from its
// cross-products: the first half's accumulated, the second's as the
// whole's minus the first's (and minus the odd row).
func (p *Problem) momentHalves(rows []int) (halves, error) {
	local := make([][]float64, 0, len(p.Data.Predictors)+1)
	for _, c := range p.Data.Predictors {
		local = append(local, p.Data.Columns[c])
	}
	local = append(local, p.Data.Response)
	preds := make([]int, len(p.Data.Predictors))
	for t := range preds {
		preds[t] = t
	}
	shift := lasso.ColumnMeans(local, nil, rows)
	whole := lasso.NewMoments(shift)
	if err := whole.Accumulate(local, nil, rows); err != nil {
		return nil, err
	}
	return func(ctx context.Context, a, _, rest []int, record func(*lasso.Path, error) error) error {
		ma := lasso.NewMoments(shift)
		if err := ma.Accumulate(local, nil, a); err != nil {
			return err
		}
		mb := whole.Clone()
		if err := mb.Subtract(ma); err != nil {
			return err
		}
		if len(rest) > 0 {
			// Drop the row left over so both halves have the same size.
			odd := lasso.NewMoments(shift)
			if err := odd.Accumulate(local, nil, rest); err != nil {
				return err
			}
			if err := mb.Subtract(odd); err != nil {
				return err
			}
		}
		for _, m := range []*lasso.Moments{ma, mb} {
			if err := record(lasso.FitMoments(ctx, m, len(local)-1, preds, &p.Settings)); err != nil {
				return err
			}
		}
		return nil
	}, nil
}
