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

var (
	indicatorMu      sync.Mutex
	indicatorColumns [][]float64
	indicatorY       []float64
)

// indicatorFixture returns a seeded n = 20,000, p = 50 problem of 0/1
// predictors (prevalences from 5% to 95%) and a 0/1 response that depends
// on five of them, the shape of a node of the M-binary case of
// bench/discover.
func indicatorFixture() ([][]float64, []float64) {
	indicatorMu.Lock()
	defer indicatorMu.Unlock()
	if indicatorColumns != nil {
		return indicatorColumns, indicatorY
	}
	rng := rand.New(rand.NewPCG(7, 8))
	n, p := 20_000, 50
	x := make([][]float64, p)
	for j := range x {
		prev := 0.05 + 0.9*float64(j)/float64(p-1)
		x[j] = make([]float64, n)
		for i := range x[j] {
			if rng.Float64() < prev {
				x[j][i] = 1
			}
		}
	}
	y := make([]float64, n)
	for i := range y {
		eta := -1.0
		for j := 3; j < p; j += 10 {
			eta += 0.4 * x[j][i]
		}
		if rng.Float64() < 1/(1+math.Exp(-eta)) {
			y[i] = 1
		}
	}
	indicatorColumns, indicatorY = x, y
	return x, y
}

// BenchmarkBinomialIndicatorsN20kP50 is the cross-validated binomial path
// of one binary node on binary candidates (10 folds, stopped past the
// minimum), the unit of work of the binary cases of bench/discover.
func BenchmarkBinomialIndicatorsN20kP50(b *testing.B) {
	x, y := indicatorFixture()
	folds, _ := cv.Random(len(y), 10, 1)
	s := &cv.Settings{Path: lasso.Settings{Family: lasso.Binomial{}}}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := cv.Fit(context.Background(), lasso.Data{Columns: x, Response: y}, folds, s); err != nil {
			b.Fatal(err)
		}
	}
}
