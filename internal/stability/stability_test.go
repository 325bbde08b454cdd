package stability_test

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/antecedent-lab/antecedent/internal/stability"
	"github.com/antecedent-lab/antecedent/lasso"
)

// TestBound checks the bound of Meinshausen & Bühlmann (2010),
// Theorem 1, E[V] ≤ q²/((2π−1)p), on cases worked by hand.
func TestBound(t *testing.T) {
	cases := []struct {
		q    float64
		p    int
		pi   float64
		want float64
	}{
		{4, 20, 0.75, 1.6}, // 16 / (0.5 · 20)
		{2, 10, 0.9, 0.5},  // 4 / (0.8 · 10)
		{3, 100, 1, 0.09},  // 9 / (1 · 100)
		{1, 5, 0.6, 1.0},   // 1 / (0.2 · 5)
	}
	for _, c := range cases {
		if got := stability.Bound(c.q, c.p, c.pi); math.Abs(got-c.want) > 1e-12 {
			t.Errorf("bound(%g, %d, %g) = %g, want %g", c.q, c.p, c.pi, got, c.want)
		}
	}
	if !math.IsNaN(stability.Bound(1, 5, 0.5)) || !math.IsNaN(stability.Bound(1, 0, 0.8)) {
		t.Error("bound outside its domain should be NaN")
	}
}

// problem draws y = 1.0·x0 + 0.5·x1 + noise with six pure-noise
// predictors; x0 and x1 form one group, the others a group each.
func problem(fam lasso.Family, n int) stability.Problem {
	rng := rand.New(rand.NewPCG(5, 6))
	cols := make([][]float64, 8)
	for j := range cols {
		cols[j] = make([]float64, n)
		for i := range n {
			cols[j][i] = rng.NormFloat64()
		}
	}
	y := make([]float64, n)
	lam := 0.15 // about three noise standard errors of a coefficient at n = 1,000
	if _, ok := fam.(lasso.Binomial); ok {
		lam = 0.05 // the binomial gradient is about a quarter of the Gaussian one
	}
	for i := range n {
		eta := cols[0][i] + 0.5*cols[1][i]
		if _, ok := fam.(lasso.Binomial); ok {
			if rng.Float64() < 1/(1+math.Exp(-eta)) {
				y[i] = 1
			}
		} else {
			y[i] = eta + rng.NormFloat64()
		}
	}
	return stability.Problem{
		Data:     lasso.Data{Columns: cols, Response: y, Predictors: []int{0, 1, 2, 3, 4, 5, 6, 7}},
		Group:    []int{0, 0, 2, 3, 4, 5, 6, 7},
		Counted:  []int{0, 2, 3, 4, 5, 6, 7},
		Settings: lasso.Settings{Family: fam, Penalties: []float64{lam}},
		Pairs:    20, Seed: 7, Stream: 1,
	}
}

// TestSelect checks, for both solver paths (moments for Gaussian
// responses, rows for others), that the true group is always selected,
// that noise groups are selected less often, that frequencies are shares
// of 2·Pairs fits, and that a seed gives the same answer twice.
func TestSelect(t *testing.T) {
	for _, c := range []struct {
		name string
		fam  lasso.Family
	}{{"gaussian", lasso.Gaussian{}}, {"binomial", lasso.Binomial{}}} {
		p := problem(c.fam, 1001) // odd: one row is left out of each split
		s, err := stability.Select(context.Background(), p)
		if err != nil {
			t.Fatal(err)
		}
		if s.Frequency[0] != 1 {
			t.Errorf("%s: the true group selected in %.2f of fits, want all", c.name, s.Frequency[0])
		}
		for g, f := range s.Frequency {
			if k := f * 40; math.Abs(k-math.Round(k)) > 1e-9 {
				t.Errorf("%s: group %d frequency %g is not a share of 40 fits", c.name, g, f)
			}
			if g != 0 && f > 0.75 {
				t.Errorf("%s: noise group %d selected in %.2f of fits", c.name, g, f)
			}
		}
		again, _ := stability.Select(context.Background(), p)
		if again.MeanSelected != s.MeanSelected {
			t.Errorf("%s: same seed, mean selected %g then %g", c.name, s.MeanSelected, again.MeanSelected)
		}
	}
}

func TestSelectCancelled(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := stability.Select(ctx, problem(lasso.Gaussian{}, 200)); err != context.Canceled {
		t.Errorf("error %v, want context.Canceled", err)
	}
}

func BenchmarkSelectGaussian10k(b *testing.B) { benchSelect(b, lasso.Gaussian{}, 10_000) }
func BenchmarkSelectBinomial10k(b *testing.B) { benchSelect(b, lasso.Binomial{}, 10_000) }

func benchSelect(b *testing.B, fam lasso.Family, n int) {
	p := problem(fam, n)
	b.ResetTimer()
	for range b.N {
		if _, err := stability.Select(context.Background(), p); err != nil {
			b.Fatal(err)
		}
	}
}
