package lasso_test

import (
	"context"
	"fmt"
	"math/rand/v2"
	"sync"
	"testing"

	"github.com/antecedent-lab/antecedent/lasso"
)

var (
	benchMu       sync.Mutex
	benchProblems = map[string]problem{}
)

func benchProblem(n, p int, binomial bool) problem {
	benchMu.Lock()
	defer benchMu.Unlock()
	key := fmt.Sprint(n, p, binomial)
	if pr, ok := benchProblems[key]; ok {
		return pr
	}
	pr := randomProblem(42, n, p, binomial, false)
	benchProblems[key] = pr
	return pr
}

func benchPath(b *testing.B, n, p int, s lasso.Settings) {
	_, binomial := s.Family.(lasso.Binomial)
	pr := benchProblem(n, p, binomial)
	d := lasso.Data{Columns: pr.x, Response: pr.y}
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		if _, err := lasso.Fit(context.Background(), d, &s); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkGaussianGramN10kP100(b *testing.B) {
	benchPath(b, 10_000, 100, lasso.Settings{Mode: lasso.GramMode})
}
func BenchmarkGaussianResidualN10kP100(b *testing.B) {
	benchPath(b, 10_000, 100, lasso.Settings{Mode: lasso.ResidualMode})
}
func BenchmarkBinomialN10kP100(b *testing.B) {
	benchPath(b, 10_000, 100, lasso.Settings{Family: lasso.Binomial{}})
}
func BenchmarkGaussianGramN100kP50(b *testing.B) {
	benchPath(b, 100_000, 50, lasso.Settings{Mode: lasso.GramMode})
}
func BenchmarkGaussianResidualN100kP50(b *testing.B) {
	benchPath(b, 100_000, 50, lasso.Settings{Mode: lasso.ResidualMode})
}
func BenchmarkBinomialN100kP50(b *testing.B) {
	benchPath(b, 100_000, 50, lasso.Settings{Family: lasso.Binomial{}})
}

// BenchmarkBinomialIndicatorsN20kP40 fits a binomial path on 0/1
// predictors that are mostly ones (prevalences 0.85), which the residual
// engine holds by the positions of their zeros.
func BenchmarkBinomialIndicatorsN20kP40(b *testing.B) {
	const n, p = 20_000, 40
	rng := rand.New(rand.NewPCG(1, 2))
	cols := zeroOnes(rng, n, p, func() float64 { return 0.85 })
	y := make([]float64, n)
	for i := range y {
		if rng.Float64() < 0.2+0.3*cols[0][i] {
			y[i] = 1
		}
	}
	d := lasso.Data{Columns: cols, Response: y}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := lasso.Fit(context.Background(), d, &lasso.Settings{Family: lasso.Binomial{}}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkBinomialFold fits a 0/1 response on 0/1 predictors over nine
// tenths of the rows, the predictors listed by the fit itself ("own") or
// read from an index over every row ("shared"), whose fit also runs over
// the tenth it leaves out, at weight zero.
func BenchmarkBinomialFold(b *testing.B) {
	const n, p = 20_000, 60
	rng := rand.New(rand.NewPCG(1, 2))
	x := zeroOnes(rng, n, p, func() float64 { return 0.1 + 0.8*rng.Float64() })
	y := make([]float64, n)
	for i := range y {
		if rng.Float64() < 0.3+0.1*(x[0][i]+x[1][i]+x[2][i]) {
			y[i] = 1
		}
	}
	var rows []int
	for i := range n {
		if i%10 != 3 {
			rows = append(rows, i)
		}
	}
	index, err := lasso.NewIndex(x, nil)
	if err != nil {
		b.Fatal(err)
	}
	for _, c := range []struct {
		name  string
		index *lasso.Index
	}{{"own", nil}, {"shared", index}} {
		b.Run(c.name, func(b *testing.B) {
			d := lasso.Data{Columns: x, Response: y, Rows: rows, Index: c.index}
			s := &lasso.Settings{Family: lasso.Binomial{}, NumPenalties: 50}
			b.ReportAllocs()
			for b.Loop() {
				if _, err := lasso.Fit(context.Background(), d, s); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// zeroOnes returns p columns of n rows drawn from rng, each 1 at a rate
// that rate gives (called once per column, before its rows are drawn)
// and 0 otherwise.
func zeroOnes(rng *rand.Rand, n, p int, rate func() float64) [][]float64 {
	cols := make([][]float64, p)
	for j := range cols {
		r := rate()
		cols[j] = make([]float64, n)
		for i := range cols[j] {
			if rng.Float64() < r {
				cols[j][i] = 1
			}
		}
	}
	return cols
}
