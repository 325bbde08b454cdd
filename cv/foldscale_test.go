package cv_test

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/lasso"
)

// TestFoldScales checks that each fold's path uses its own penalty
// factors: fold f's path equals a direct fit of its training rows with
// FoldScales[f] on the same grid, for rows and for moments (Gaussian), and
// an infinite factor keeps its predictor out of that fold only.
func TestFoldScales(t *testing.T) {
	rng := rand.New(rand.NewPCG(4, 4))
	n, p, k := 300, 5, 4
	x := make([][]float64, p)
	for j := range x {
		x[j] = make([]float64, n)
		for i := range x[j] {
			x[j][i] = rng.NormFloat64()
		}
	}
	yg, yb := make([]float64, n), make([]float64, n)
	for i := range yg {
		yg[i] = x[0][i] - 0.5*x[1][i] + rng.NormFloat64()
		if rng.Float64() < 1/(1+math.Exp(-(x[0][i]-x[2][i]))) {
			yb[i] = 1
		}
	}
	folds, err := cv.Random(n, k, 9)
	if err != nil {
		t.Fatal(err)
	}
	inf := math.Inf(1)
	scales := [][]float64{{1, 1, 1, 1, 1}, {2, inf, 1, 0.5, 1}, {1, 1, inf, inf, 1}, {0.3, 3, 1, 1, inf}}
	for _, c := range []struct {
		name string
		y    []float64
		fam  lasso.Family
	}{{"gaussian", yg, lasso.Gaussian{}}, {"binomial", yb, lasso.Binomial{}}} {
		s := &cv.Settings{Path: lasso.Settings{Family: c.fam, NumPenalties: 15, Tolerance: 1e-12}, FoldScales: scales, WholePath: true}
		res, err := cv.Fit(context.Background(), lasso.Data{Columns: x, Response: c.y}, folds, s)
		if err != nil {
			t.Fatal(err)
		}
		for f := range k {
			train, _ := folds.Split(f, nil)
			direct, err := lasso.Fit(context.Background(), lasso.Data{Columns: x, Response: c.y, Rows: train},
				&lasso.Settings{Family: c.fam, Penalties: res.Full.Penalties, PenaltyScale: scales[f], Tolerance: 1e-12})
			if err != nil {
				t.Fatal(err)
			}
			got := res.FoldPath(f)
			if got.Len() != direct.Len() {
				t.Fatalf("%s fold %d: %d penalties, direct fit %d", c.name, f, got.Len(), direct.Len())
			}
			for q := range got.Len() {
				_, a := got.Dense(q)
				_, b := direct.Dense(q)
				for j := range a {
					if math.Abs(a[j]-b[j]) > 1e-7 {
						t.Errorf("%s fold %d penalty %d predictor %d: %g, direct fit %g", c.name, f, q, j, a[j], b[j])
					}
					if math.IsInf(scales[f][j], 1) && a[j] != 0 {
						t.Errorf("%s fold %d: kept-out predictor %d is %g", c.name, f, j, a[j])
					}
				}
			}
		}
	}
	bad := &cv.Settings{FoldScales: scales[:2]}
	if _, err := cv.Fit(context.Background(), lasso.Data{Columns: x, Response: yg}, folds, bad); !errors.Is(err, cv.ErrFolds) {
		t.Errorf("two factor vectors for four folds: error %v", err)
	}
}
