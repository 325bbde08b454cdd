package lasso_test

import (
	"context"
	"fmt"
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
