package main

import (
	"math"
	"testing"
)

func TestMedian(t *testing.T) {
	for _, c := range []struct {
		in   []float64
		want float64
	}{
		{[]float64{3}, 3},
		{[]float64{5, 1, 3}, 3},
		{[]float64{4, 1, 3, 2}, 2.5},
	} {
		if got := median(c.in); got != c.want {
			t.Errorf("median(%v) = %g, want %g", c.in, got, c.want)
		}
	}
	if !math.IsNaN(median(nil)) {
		t.Error("median of nothing is not NaN")
	}
}

// TestMatchSignal checks that the matched continuous networks' true edges
// are as strong as the binary ones by the oracle's median |z|, and that
// weights were scaled down to get there (a binary child carries less
// information per row than a continuous one with unit noise: common
// practice).
func TestMatchSignal(t *testing.T) {
	for _, strength := range []struct {
		name   string
		lo, hi float64
	}{{"weak", 0.15, 0.4}, {"strong", 0.4, 1}} {
		b := setting{kind: "binary", n: 300, p: 12, parents: 2, lo: strength.lo, hi: strength.hi, strength: strength.name}
		c := b
		c.kind, c.match = "continuous", &b
		m, target := matchSignal(c)
		if got := medianOracleZ(m); math.Abs(got/target-1) > 0.01 {
			t.Errorf("%s: matched median |z| %.3f, binary %.3f", strength.name, got, target)
		}
		if !(m.scale > 0 && m.scale < 1) {
			t.Errorf("%s: weights scaled by %g", strength.name, m.scale)
		}
	}
}
