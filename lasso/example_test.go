package lasso_test

import (
	"context"
	"fmt"
	"log"

	"github.com/antecedent-lab/antecedent/lasso"
)

func ExampleFit() {
	// Three predictors; the response depends on the first two.
	x := [][]float64{
		{1, 2, 3, 4, 5, 6, 7, 8},
		{0, 1, 0, 1, 1, 0, 1, 0},
		{5, 3, 4, 1, 2, 2, 3, 1},
	}
	y := []float64{2.1, 4.9, 6.2, 9.1, 10.8, 11.9, 15.2, 15.8}
	path, err := lasso.Fit(context.Background(), lasso.Data{Columns: x, Response: y}, &lasso.Settings{NumPenalties: 20})
	if err != nil {
		log.Fatal(err)
	}
	last := path.Len() - 1
	b0, b := path.Dense(last)
	// The path ends once 99.9% of the deviance is explained.
	fmt.Printf("%d penalties, first has %d non-zero, last has %d\n", path.Len(), path.NonZero[0], path.NonZero[last])
	fmt.Printf("intercept %.2f, slopes %.2f %.2f %.2f, explained %.3f\n", b0, b[0], b[1], b[2], path.Explained[last])
	// Output:
	// 16 penalties, first has 0 non-zero, last has 3
	// intercept 0.04, slopes 1.98 0.98 0.02, explained 0.999
}

func ExampleFit_binomial() {
	x := [][]float64{{0.5, 1.2, 2.3, 0.1, 3.1, 2.2, 0.7, 2.9, 1.8, 0.3}}
	y := []float64{0, 0, 1, 0, 1, 1, 0, 1, 0, 1}
	s := &lasso.Settings{Family: lasso.Binomial{}, Penalties: []float64{0.05}}
	path, err := lasso.Fit(context.Background(), lasso.Data{Columns: x, Response: y}, s)
	if err != nil {
		log.Fatal(err)
	}
	p := make([]float64, 2)
	path.MeanTo(p, 0, [][]float64{{0.2, 3.0}}, nil)
	fmt.Printf("P(y=1) at x=0.2: %.2f, at x=3.0: %.2f\n", p[0], p[1])
	// Output:
	// P(y=1) at x=0.2: 0.18, at x=3.0: 0.86
}

func ExampleFitMoments() {
	// Moments of three variables serve every regression among them.
	cols := [][]float64{
		{1, 2, 3, 4, 5, 6},
		{2, 1, 4, 3, 6, 5},
		{1.1, 2.3, 2.8, 4.2, 5.1, 5.8},
	}
	m := lasso.NewMoments(lasso.ColumnMeans(cols, nil, nil))
	if err := m.Accumulate(cols, nil, nil); err != nil {
		log.Fatal(err)
	}
	path, err := lasso.FitMoments(context.Background(), m, 2, []int{0, 1}, &lasso.Settings{Penalties: []float64{0.01}})
	if err != nil {
		log.Fatal(err)
	}
	_, b := path.Dense(0)
	fmt.Printf("variable 2 on 0 and 1: %.3f %.3f\n", b[0], b[1])
	// Output:
	// variable 2 on 0 and 1: 0.985 -0.047
}

func ExampleIndex() {
	// Two 0/1 predictors listed once, then fitted on two subsets of the
	// rows (as the folds of a cross-validation would be), each also
	// without the index: the fits agree.
	x := [][]float64{
		{0, 1, 0, 1, 1, 0, 1, 0, 1, 1, 0, 0},
		{1, 1, 0, 0, 1, 1, 1, 0, 1, 0, 1, 0},
	}
	y := []float64{0, 1, 0, 1, 0, 0, 1, 1, 1, 0, 0, 1}
	index, err := lasso.NewIndex(x, nil)
	if err != nil {
		log.Fatal(err)
	}
	s := &lasso.Settings{Family: lasso.Binomial{}, Penalties: []float64{0.05}}
	for _, rows := range [][]int{{0, 1, 2, 3, 4, 5, 6, 7, 8}, {3, 4, 5, 6, 7, 8, 9, 10, 11}} {
		for _, ix := range []*lasso.Index{index, nil} {
			d := lasso.Data{Columns: x, Response: y, Rows: rows, Index: ix}
			path, err := lasso.Fit(context.Background(), d, s)
			if err != nil {
				log.Fatal(err)
			}
			b0, b := path.Dense(0)
			fmt.Printf("rows %d–%d, index %t: intercept %.3f, slopes %.3f %.3f\n", rows[0], rows[len(rows)-1], ix != nil, b0, b[0], b[1])
		}
	}
	// Output:
	// rows 0–8, index true: intercept -0.238, slopes 2.510 -1.339
	// rows 0–8, index false: intercept -0.238, slopes 2.510 -1.339
	// rows 3–11, index true: intercept 0.767, slopes 0.106 -1.053
	// rows 3–11, index false: intercept 0.767, slopes 0.106 -1.053
}
