package cv

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/antecedent-lab/antecedent/lasso"
)

// The gathered held-out predictions equal the path's own MeanTo on every
// penalty, for 0/1 and continuous predictors.
func TestHeldOutMatchesPath(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	const n, p = 600, 6
	cols := make([][]float64, p)
	for j := range cols {
		cols[j] = make([]float64, n)
		for i := range cols[j] {
			if j%2 == 0 {
				cols[j][i] = rng.NormFloat64()
			} else if rng.Float64() < 0.3 {
				cols[j][i] = 1
			}
		}
	}
	for _, fam := range []lasso.Family{lasso.Gaussian{}, lasso.Binomial{}} {
		y := make([]float64, n)
		for i := range y {
			e := cols[0][i] - cols[1][i] + 0.5*cols[3][i]
			if _, ok := fam.(lasso.Binomial); ok {
				if rng.Float64() < 1/(1+math.Exp(-e)) {
					y[i] = 1
				}
			} else {
				y[i] = e + rng.NormFloat64()
			}
		}
		var train, held []int
		for i := range n {
			if i%5 == 2 {
				held = append(held, i)
			} else {
				train = append(train, i)
			}
		}
		path, err := lasso.Fit(context.Background(), lasso.Data{Columns: cols, Response: y, Rows: train, Predictors: []int{0, 1, 2, 3, 4, 5}}, &lasso.Settings{Family: fam, Mode: lasso.ResidualMode})
		if err != nil {
			t.Fatal(err)
		}
		ho := gatherHeldOut(path, cols, held)
		got, want := make([]float64, len(held)), make([]float64, len(held))
		for k := range path.Len() {
			ho.meanTo(got, path, k)
			path.MeanTo(want, k, cols, held)
			for i := range got {
				if math.Abs(got[i]-want[i]) > 1e-12*(1+math.Abs(want[i])) {
					t.Fatalf("%s penalty %d row %d: %g, want %g", fam.Name(), k, i, got[i], want[i])
				}
			}
		}
	}
}
