package stability_test

import (
	"math"
	"testing"

	"github.com/antecedent-lab/antecedent/internal/stability"
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
