package cv_test

import (
	"context"
	"fmt"
	"log"
	"math/rand/v2"

	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/lasso"
)

func ExampleFit() {
	// Simulated: y depends on the first two of six predictors.
	rng := rand.New(rand.NewPCG(1, 2))
	n := 300
	x := make([][]float64, 6)
	for j := range x {
		x[j] = make([]float64, n)
		for i := range x[j] {
			x[j][i] = rng.NormFloat64()
		}
	}
	y := make([]float64, n)
	for i := range y {
		y[i] = 2*x[0][i] - x[1][i] + rng.NormFloat64()
	}
	folds, err := cv.Random(n, 10, 42)
	if err != nil {
		log.Fatal(err)
	}
	r, err := cv.Fit(context.Background(), lasso.Data{Columns: x, Response: y}, folds, nil)
	if err != nil {
		log.Fatal(err)
	}
	_, b := r.Model()
	fmt.Printf("non-zero at the chosen penalty: %d\n", r.Curve[r.Selected].NonZero)
	fmt.Printf("b0 %.1f, b1 %.1f\n", b[0], b[1])
	// Output:
	// non-zero at the chosen penalty: 2
	// b0 1.8, b1 -0.8
}

func ExampleStratified() {
	labels := []float64{1, 0, 0, 1, 0, 0, 1, 0, 0, 0}
	f, err := cv.Stratified(labels, 3, 7)
	if err != nil {
		log.Fatal(err)
	}
	ones := make([]int, f.K)
	for i, id := range f.ID {
		if labels[i] == 1 {
			ones[id]++
		}
	}
	fmt.Println("ones per fold:", ones)
	// Output:
	// ones per fold: [1 1 1]
}
