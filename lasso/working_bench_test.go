package lasso

import (
	"math/rand/v2"
	"testing"
)

// BenchmarkWorkingBinomial times one formation of the binomial working
// weights and residuals (with the deviance) over 10,000 rows.
func BenchmarkWorkingBinomial(b *testing.B) {
	b.Run("deviance", func(b *testing.B) { benchWorking(b, true) })
	b.Run("weights", func(b *testing.B) { benchWorking(b, false) })
}

func benchWorking(b *testing.B, dev bool) {
	const n = 10_000
	rng := rand.New(rand.NewPCG(5, 6))
	x := make([]float64, n)
	y := make([]float64, n)
	for i := range x {
		x[i] = rng.NormFloat64()
		if rng.Float64() < 0.3 {
			y[i] = 1
		}
	}
	r, err := resolve(&Settings{Family: Binomial{}}, n, 1)
	if err != nil {
		b.Fatal(err)
	}
	e, err := newResidualEngine(Data{Columns: [][]float64{x}, Response: y}, []int{0}, nil, []float64{1}, r)
	if err != nil {
		b.Fatal(err)
	}
	for i := range e.eta {
		e.eta[i] = 2 * rng.NormFloat64()
	}
	e.wantDev = dev
	for b.Loop() {
		e.fresh, e.devOK = false, false
		e.working()
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/n, "ns/row")
}

func BenchmarkExpNegAbs10k(b *testing.B) {
	x := benchArgs(-20, 20)
	x = append(append(append(x, x...), x...), x...)
	dst := make([]float64, len(x))
	for b.Loop() {
		expNegAbs(dst, x)
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(len(x)), "ns/row")
}
