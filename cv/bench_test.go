package cv_test

import (
	"context"
	"math"
	"math/rand/v2"
	"sync"
	"testing"

	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/lasso"
)

var (
	fixtureMu sync.Mutex
	fixtures  = map[bool][2]any{}
)

// fixture returns a seeded n = 100,000, p = 50 problem whose response
// depends on every fifth predictor.
func fixture(binomial bool) ([][]float64, []float64) {
	fixtureMu.Lock()
	defer fixtureMu.Unlock()
	if f, ok := fixtures[binomial]; ok {
		return f[0].([][]float64), f[1].([]float64)
	}
	rng := rand.New(rand.NewPCG(42, 1))
	n, p := 100_000, 50
	x := make([][]float64, p)
	for j := range x {
		x[j] = make([]float64, n)
		for i := range x[j] {
			x[j][i] = rng.NormFloat64()
		}
	}
	y := make([]float64, n)
	for i := range y {
		var eta float64
		for j := 0; j < p; j += 5 {
			eta += 0.3 * x[j][i]
		}
		if binomial {
			if rng.Float64() < 1/(1+math.Exp(-eta)) {
				y[i] = 1
			}
		} else {
			y[i] = eta + rng.NormFloat64()
		}
	}
	fixtures[binomial] = [2]any{x, y}
	return x, y
}

func benchCV(b *testing.B, binomial bool, mode lasso.Mode, whole bool) {
	x, y := fixture(binomial)
	folds, _ := cv.Random(len(y), 10, 1)
	s := &cv.Settings{Path: lasso.Settings{Mode: mode}, WholePath: whole}
	if binomial {
		s.Path.Family = lasso.Binomial{}
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := cv.Fit(context.Background(), lasso.Data{Columns: x, Response: y}, folds, s); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkGaussianN100kP50(b *testing.B)         { benchCV(b, false, lasso.GramMode, false) }
func BenchmarkGaussianResidualN100kP50(b *testing.B) { benchCV(b, false, lasso.ResidualMode, false) }
func BenchmarkBinomialN100kP50(b *testing.B)         { benchCV(b, true, 0, false) }

// BenchmarkBinomialWholePathN100kP50 fits every penalty (WholePath), the
// cost of the binomial case before paths stopped past their minimum.
func BenchmarkBinomialWholePathN100kP50(b *testing.B) { benchCV(b, true, 0, true) }
