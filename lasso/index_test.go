package lasso_test

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/antecedent-lab/antecedent/lasso"
)

// binaryProblem returns seeded columns, most of them 0/1 at different
// rates (some mostly ones, so that their zeros are listed), one
// continuous, one 0/1 column that is 1 only on the first rows, and a 0/1
// response from a logistic model of them (and a Gaussian one).
func binaryProblem(seed uint64, n int) (cols [][]float64, yBin, yGauss []float64) {
	rng := rand.New(rand.NewPCG(seed, 7))
	rates := []float64{0.5, 0.1, 0.9, 0.3, 0.97, 0.02, 0.6}
	for _, r := range rates {
		c := make([]float64, n)
		for i := range c {
			if rng.Float64() < r {
				c[i] = 1
			}
		}
		cols = append(cols, c)
	}
	cont := make([]float64, n)
	for i := range cont {
		cont[i] = 2 + rng.NormFloat64()
	}
	early := make([]float64, n)
	for i := range min(n, 5) {
		early[i] = 1
	}
	cols = append(cols, cont, early)
	beta := []float64{1, -1.5, 0.8, 0, 1.2, 2, -0.5, 0.4, 0}
	yBin, yGauss = make([]float64, n), make([]float64, n)
	for i := range yBin {
		eta := -0.3
		for j, b := range beta {
			eta += b * cols[j][i]
		}
		if rng.Float64() < 1/(1+math.Exp(-eta)) {
			yBin[i] = 1
		}
		yGauss[i] = eta + rng.NormFloat64()
	}
	return cols, yBin, yGauss
}

// TestIndexSameFit checks that a fit reading a shared Index gives the
// path the fit gives listing its own predictors: the same penalties and
// non-zero sets at every penalty, and coefficients that agree to rounding
// (the sums run over the listed rows in another grouping). The two ways
// compute the same quantity, so this is a check of the bookkeeping (the
// sink, the flipped lists, subsets of rows), not of the solver, whose
// checks against outside references are in reference_test.go.
func TestIndexSameFit(t *testing.T) {
	const n = 600
	cols, yBin, yGauss := binaryProblem(3, n)
	every := make([]int, n)
	for i := range every {
		every[i] = i
	}
	var odd, tail []int // a fold-like subset, and rows that omit the column's ones
	for i := range n {
		if i%7 != 3 {
			odd = append(odd, i)
		}
		if i >= 5 {
			tail = append(tail, i)
		}
	}
	weights := make([]float64, n)
	for i := range weights {
		weights[i] = 0.5 + float64(i%5)/4
	}
	weights[10], weights[11] = 0, 0
	cases := []struct {
		name      string
		y         []float64
		fam       lasso.Family
		rows      []int // the fit's rows
		indexRows []int // the index's rows
		weights   []float64
		noInt     bool
	}{
		{"binomial, every row", yBin, lasso.Binomial{}, nil, nil, nil, false},
		{"binomial, fold of all rows", yBin, lasso.Binomial{}, odd, nil, nil, false},
		{"binomial, fold of listed rows", yBin, lasso.Binomial{}, odd, every, nil, false},
		{"binomial, same rows as index", yBin, lasso.Binomial{}, odd, odd, nil, false},
		{"binomial, rows without a column's ones", yBin, lasso.Binomial{}, tail, nil, nil, false},
		{"binomial, zero weights", yBin, lasso.Binomial{}, odd, nil, weights, false},
		{"binomial, no intercept", yBin, lasso.Binomial{}, odd, nil, nil, true},
		{"gaussian residual, fold", yGauss, lasso.Gaussian{}, odd, nil, weights, false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s := &lasso.Settings{Family: c.fam, NoIntercept: c.noInt, Mode: lasso.ResidualMode, NumPenalties: 40}
			d := lasso.Data{Columns: cols, Response: c.y, Rows: c.rows, Weights: c.weights}
			own, err := lasso.Fit(context.Background(), d, s)
			if err != nil {
				t.Fatal(err)
			}
			x, err := lasso.NewIndex(cols, c.indexRows)
			if err != nil {
				t.Fatal(err)
			}
			d.Index = x
			// The first fit leaves its arrays to the index; the second
			// runs on them.
			if _, err := lasso.Fit(context.Background(), d, s); err != nil {
				t.Fatal(err)
			}
			shared, err := lasso.Fit(context.Background(), d, s)
			if err != nil {
				t.Fatal(err)
			}
			if len(own.Penalties) != len(shared.Penalties) {
				t.Fatalf("%d penalties listing its own rows, %d from the index", len(own.Penalties), len(shared.Penalties))
			}
			for k, a := range own.Penalties {
				if b := shared.Penalties[k]; math.Abs(a-b) > 1e-12*a {
					t.Fatalf("penalty %d: %v listing its own rows, %v from the index", k, a, b)
				}
			}
			for k := range own.Penalties {
				_, a := own.Dense(k)
				_, b := shared.Dense(k)
				for j := range a {
					if (a[j] == 0) != (b[j] == 0) {
						t.Fatalf("penalty %d: predictor %d is %v listing its own rows, %v from the index", k, j, a[j], b[j])
					}
					if d := math.Abs(a[j] - b[j]); d > 1e-6*(1+math.Abs(a[j])) {
						t.Errorf("penalty %d: predictor %d: %v against %v", k, j, a[j], b[j])
					}
				}
			}
		})
	}
}

// TestIndexErrors checks that an index that does not fit the data is
// refused with an error naming what is wrong.
func TestIndexErrors(t *testing.T) {
	cols, _, _ := binaryProblem(5, 50)
	yBin := make([]float64, 50)
	for i := range yBin {
		yBin[i] = float64(i % 2)
	}
	s := &lasso.Settings{Family: lasso.Binomial{}}
	other := make([][]float64, len(cols))
	for j := range cols {
		other[j] = slices.Clone(cols[j])
	}
	first := make([]int, 30)
	for i := range first {
		first[i] = i
	}
	some, _ := lasso.NewIndex(cols, first)
	outside := append(slices.Clone(first[:20]), 40)
	shuffled := slices.Clone(first[:20])
	shuffled[0], shuffled[1] = shuffled[1], shuffled[0]
	copied, _ := lasso.NewIndex(other, nil)
	cut := make([][]float64, len(cols))
	for j := range cols {
		cut[j] = cols[j][:40]
	}
	short, _ := lasso.NewIndex(cut, nil)
	for _, c := range []struct {
		name  string
		index *lasso.Index
		rows  []int
	}{
		{"index of other columns", copied, nil},
		{"fit row outside the index", some, outside},
		{"fit of every row, index of some", some, nil},
		{"rows not increasing", some, shuffled},
		{"index of shorter columns", short, nil},
	} {
		_, err := lasso.Fit(context.Background(), lasso.Data{Columns: cols, Response: yBin, Rows: c.rows, Index: c.index}, s)
		if !errors.Is(err, lasso.ErrIndex) {
			t.Errorf("%s: got %v, want ErrIndex", c.name, err)
		}
	}
	for _, c := range []struct {
		name string
		cols [][]float64
		rows []int
	}{
		{"columns of different lengths", [][]float64{{0, 1}, {1, 0, 1}}, nil},
		{"rows out of range", [][]float64{{0, 1}}, []int{0, 2}},
		{"rows repeated", [][]float64{{0, 1, 1}}, []int{0, 1, 1}},
	} {
		if _, err := lasso.NewIndex(c.cols, c.rows); err == nil {
			t.Errorf("%s: no error", c.name)
		}
	}
}
