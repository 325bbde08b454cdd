package cv

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/antecedent-lab/antecedent/lasso"
)

// The stopping rule needs ten strict rises in a row and a rise past the
// minimum of 0.3 of its standard error; a flat step, a fall or a NaN
// resets it.
func TestPastMinimum(t *testing.T) {
	rising := func(n int) []float64 {
		m := []float64{5, 4, 3}
		for i := range n {
			m = append(m, 3+float64(i+1)*0.01)
		}
		return m
	}
	cases := []struct {
		name string
		mean []float64
		se   float64
		want bool
	}{
		{"ten rises", rising(10), 0.2, true},
		{"ten rises, too small against the SE", rising(10), 0.5, false},
		{"nine rises", rising(9), 0.2, false},
		{"flat step in the stretch", append(rising(10)[:8], 3.05, 3.05, 3.06, 3.07, 3.08, 3.09), 0.2, false},
		{"fall at the end", append(rising(10), 3.0), 0.2, false},
		{"NaN in the stretch", append(rising(10)[:9], math.NaN(), 4, 5), 0.2, false},
		{"short", []float64{1, 2}, 0.2, false},
	}
	for _, c := range cases {
		se := make([]float64, len(c.mean))
		for i := range se {
			se[i] = c.se
		}
		if got := pastMinimum(c.mean, se); got != c.want {
			t.Errorf("%s: pastMinimum = %v, want %v", c.name, got, c.want)
		}
	}
}

// A stopped cross-validation agrees with the whole one: the same best and
// one-SE penalties, the same curve and fold values up to the stop, and a
// full-data path that is the whole one's first penalties. The data are a
// sparse logistic model on 0/1 and Gaussian predictors, where the held-out
// loss rises past its minimum, and a linear one fitted with residual
// updates and from moments.
func TestStopAgreesWithWholePath(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	const n, p = 2000, 25
	x := make([][]float64, p)
	for j := range x {
		x[j] = make([]float64, n)
		for i := range x[j] {
			if j%2 == 0 {
				x[j][i] = rng.NormFloat64()
			} else if rng.Float64() < 0.3 {
				x[j][i] = 1
			}
		}
	}
	yb, yg := make([]float64, n), make([]float64, n)
	for i := range n {
		eta := -0.5 + 0.8*x[0][i] - 0.6*x[1][i] + 0.4*x[4][i]
		if rng.Float64() < 1/(1+math.Exp(-eta)) {
			yb[i] = 1
		}
		yg[i] = eta + rng.NormFloat64()
	}
	stopped := 0
	for _, c := range []struct {
		name string
		y    []float64
		path lasso.Settings
	}{
		{"binomial", yb, lasso.Settings{Family: lasso.Binomial{}}},
		{"gaussian residual", yg, lasso.Settings{Mode: lasso.ResidualMode}},
		{"gaussian moments", yg, lasso.Settings{}},
	} {
		folds, err := Random(n, 10, 7)
		if err != nil {
			t.Fatal(err)
		}
		d := lasso.Data{Columns: x, Response: c.y}
		whole, err := Fit(context.Background(), d, folds, &Settings{Path: c.path, WholePath: true, Workers: 2})
		if err != nil {
			t.Fatal(err)
		}
		cut, err := Fit(context.Background(), d, folds, &Settings{Path: c.path, Workers: 2})
		if err != nil {
			t.Fatal(err)
		}
		if whole.Best != cut.Best || whole.OneSE != cut.OneSE || whole.Selected != cut.Selected {
			t.Errorf("%s: best/one-SE/selected %d/%d/%d whole, %d/%d/%d stopped", c.name,
				whole.Best, whole.OneSE, whole.Selected, cut.Best, cut.OneSE, cut.Selected)
		}
		k := cut.Full.Len()
		if k < whole.Full.Len() {
			stopped++
			if cut.Full.Status != lasso.Stopped {
				t.Errorf("%s: status %v after %d of %d penalties", c.name, cut.Full.Status, k, whole.Full.Len())
			}
		}
		if len(cut.Curve) != k || k <= cut.Best {
			t.Fatalf("%s: curve of %d points for a path of %d, best %d", c.name, len(cut.Curve), k, cut.Best)
		}
		for i := range k {
			if cut.Curve[i] != whole.Curve[i] || cut.Full.Penalties[i] != whole.Full.Penalties[i] || cut.Full.Intercept[i] != whole.Full.Intercept[i] {
				t.Fatalf("%s: penalty %d differs: %+v against %+v", c.name, i, cut.Curve[i], whole.Curve[i])
			}
			for f := range folds.K {
				if cut.FoldValues[f][i] != whole.FoldValues[f][i] {
					t.Fatalf("%s: fold %d, penalty %d: %g against %g", c.name, f, i, cut.FoldValues[f][i], whole.FoldValues[f][i])
				}
			}
		}
	}
	if stopped == 0 {
		t.Error("no path stopped early: the test checks nothing")
	}
}

// TestChooseWithinStandardError checks which standard error chooseWithin's
// bound reads: the one given (Rule.Yardstick's, which is the floor when the
// best point's standard error is missing), else the best point's own.
func TestChooseWithinStandardError(t *testing.T) {
	curve := []Point{{Mean: 5}, {Mean: 4.2}, {Mean: 3.9}, {Mean: 3.7, SE: math.NaN()}, {Mean: 3.8}}
	for _, tc := range []struct {
		name   string
		bestSE float64
		se     float64
		want   int
	}{
		{"the given standard error, best point's missing", math.NaN(), 0.8, 2},
		{"the given standard error over the best point's", 0.1, 2, 1},
		{"none given: the best point's", 0.8, math.NaN(), 2},
		{"none given and the best point's missing: the minimum", math.NaN(), math.NaN(), 3},
	} {
		curve[3].SE = tc.bestSE
		if best, got := chooseWithin(curve, false, 0.5, false, tc.se); best != 3 || got != tc.want {
			t.Errorf("%s: best %d, chosen %d; want 3, %d", tc.name, best, got, tc.want)
		}
	}
}
