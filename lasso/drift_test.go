package lasso

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"
)

// The drift bound holds: between two points of a path, every gradient
// moves by no more than drift·spread (Cauchy–Schwarz; see drift), for a
// binomial fit on 0/1 and Gaussian predictors and a Gaussian one with
// weights and without standardisation.
func TestDriftBound(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	const n, p = 800, 10
	x := make([][]float64, p)
	for j := range x {
		x[j] = make([]float64, n)
		for i := range x[j] {
			if j%2 == 0 {
				x[j][i] = 3 + 2*rng.NormFloat64()
			} else if rng.Float64() < 0.4 {
				x[j][i] = 1
			}
		}
	}
	yb, yg, w := make([]float64, n), make([]float64, n), make([]float64, n)
	for i := range n {
		eta := 0.5*(x[0][i]-3) - x[1][i]
		if rng.Float64() < 1/(1+math.Exp(-eta)) {
			yb[i] = 1
		}
		yg[i] = eta + rng.NormFloat64()
		w[i] = 0.5 + rng.Float64()
	}
	for _, c := range []struct {
		name string
		d    Data
		s    Settings
	}{
		{"binomial", Data{Columns: x, Response: yb}, Settings{Family: Binomial{}}},
		{"gaussian weighted raw scale", Data{Columns: x, Response: yg, Weights: w}, Settings{Mode: ResidualMode, NoStandardize: true}},
	} {
		st, err := Start(context.Background(), c.d, &c.s)
		if err != nil {
			t.Fatal(err)
		}
		e := st.w.e.(*residualEngine)
		st.w.drift = nil // only the test moves the snapshot
		before := make([]float64, p)
		e.gradient(before, nil)
		e.drift() // the snapshot at this point
		checked := 0
		for k := 0; k < 60; k++ {
			if more, err := st.Next(context.Background()); err != nil || !more {
				t.Fatalf("%s: penalty %d: %v", c.name, k, err)
			}
			if k%10 != 9 {
				continue
			}
			now := make([]float64, p)
			e.gradient(now, nil)
			d := e.drift()
			for j := range now {
				if moved := math.Abs(now[j] - before[j]); moved > d*e.spread(j) {
					t.Errorf("%s: penalty %d, predictor %d: gradient moved %g, bound %g", c.name, k, j, moved, d*e.spread(j))
				}
				if now[j] != before[j] {
					checked++
				}
			}
			before = now
		}
		if checked == 0 {
			t.Errorf("%s: no gradient moved: the test checks nothing", c.name)
		}
	}
}
