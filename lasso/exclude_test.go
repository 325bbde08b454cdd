package lasso_test

import (
	"context"
	"math"
	"testing"

	"github.com/antecedent-lab/antecedent/lasso"
)

// TestInfiniteFactor checks that an infinite penalty factor gives the path
// of the other predictors, in every engine: the same penalties (the
// largest one is set by the predictors that can enter), the same
// coefficients, and zero for the predictor kept out.
func TestInfiniteFactor(t *testing.T) {
	inf := math.Inf(1)
	for _, c := range []struct {
		name     string
		binomial bool
		mode     lasso.Mode
		moments  bool
	}{
		{"gaussian gram", false, lasso.GramMode, false},
		{"gaussian residual", false, lasso.ResidualMode, false},
		{"gaussian moments", false, lasso.AutoMode, true},
		{"binomial", true, lasso.AutoMode, false},
	} {
		pr := randomProblem(21, 400, 6, c.binomial, false)
		var fam lasso.Family = lasso.Gaussian{}
		if c.binomial {
			fam = lasso.Binomial{}
		}
		all := []int{0, 1, 2, 3, 4, 5}
		some := []int{0, 2, 3, 5}
		withInf := &lasso.Settings{Family: fam, Mode: c.mode, NumPenalties: 20, Tolerance: 1e-12,
			PenaltyScale: []float64{1, inf, 0.5, 2, inf, 1}}
		without := &lasso.Settings{Family: fam, Mode: c.mode, NumPenalties: 20, Tolerance: 1e-12,
			PenaltyScale: []float64{1, 0.5, 2, 1}}
		fit := func(pred []int, s *lasso.Settings) *lasso.Path {
			t.Helper()
			var p *lasso.Path
			var err error
			if c.moments {
				cols := append(append([][]float64{}, pr.x...), pr.y)
				m := lasso.NewMoments(lasso.ColumnMeans(cols, nil, nil))
				if err := m.Accumulate(cols, nil, nil); err != nil {
					t.Fatal(err)
				}
				p, err = lasso.FitMoments(context.Background(), m, len(pr.x), pred, s)
			} else {
				p, err = lasso.Fit(context.Background(), lasso.Data{Columns: pr.x, Response: pr.y, Predictors: pred}, s)
			}
			if err != nil {
				t.Fatalf("%s: %v", c.name, err)
			}
			return p
		}
		a, b := fit(all, withInf), fit(some, without)
		if a.Len() != b.Len() {
			t.Fatalf("%s: %d penalties with the infinite factors, %d without the predictors", c.name, a.Len(), b.Len())
		}
		for k := range a.Len() {
			if math.Abs(a.Penalties[k]/b.Penalties[k]-1) > 1e-12 {
				t.Errorf("%s: penalty %d is %g, want %g", c.name, k, a.Penalties[k], b.Penalties[k])
			}
			a0, ab := a.Dense(k)
			b0, bb := b.Dense(k)
			if math.Abs(a0-b0) > 1e-9 {
				t.Errorf("%s, penalty %d: intercept %g, want %g", c.name, k, a0, b0)
			}
			for t2, j := range some {
				if math.Abs(ab[j]-bb[t2]) > 1e-9 {
					t.Errorf("%s, penalty %d: predictor %d is %g, want %g", c.name, k, j, ab[j], bb[t2])
				}
			}
			if ab[1] != 0 || ab[4] != 0 {
				t.Errorf("%s, penalty %d: kept-out predictors are %g and %g", c.name, k, ab[1], ab[4])
			}
		}
	}
}
