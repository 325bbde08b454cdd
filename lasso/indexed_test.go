package lasso

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestIndexed checks the unrolled loops over listed positions against
// plain ones, for list lengths that leave every remainder of four.
func TestIndexed(t *testing.T) {
	r := rand.New(rand.NewPCG(4, 9))
	const n = 40
	for _, size := range []int{0, 1, 2, 3, 4, 5, 6, 7, 8, 13, 40} {
		at := make([]int32, 0, size)
		for _, i := range r.Perm(n)[:size] {
			at = append(at, int32(i))
		}
		u, v := make([]float64, n), make([]float64, n)
		for i := range u {
			u[i], v[i] = r.NormFloat64(), r.NormFloat64()
		}
		var su, sv float64
		for _, i := range at {
			su += u[i]
			sv += v[i]
		}
		close := func(a, b float64) bool { return math.Abs(a-b) <= 1e-13*(1+math.Abs(b)) }
		if got := sumAt(u, at); !close(got, su) {
			t.Errorf("size %d: sumAt = %v, want %v", size, got, su)
		}
		if gu, gv := sumAt2(u, v, at); !close(gu, su) || !close(gv, sv) {
			t.Errorf("size %d: sumAt2 = %v, %v, want %v, %v", size, gu, gv, su, sv)
		}
		want := append([]float64(nil), u...)
		for _, i := range at {
			want[i] -= 0.5 * v[i]
		}
		got := append([]float64(nil), u...)
		subScaledAt(got, v, at, 0.5)
		for i := range got {
			if got[i] != want[i] {
				t.Fatalf("size %d: subScaledAt at %d = %v, want %v", size, i, got[i], want[i])
			}
		}
		want = append(want[:0], u...)
		for _, i := range at {
			want[i] += 1.5
		}
		got = append(got[:0], u...)
		addAt(got, at, 1.5)
		for i := range got {
			if got[i] != want[i] {
				t.Fatalf("size %d: addAt at %d = %v, want %v", size, i, got[i], want[i])
			}
		}
	}
}

// BenchmarkIndexed times the passes over a 0/1 predictor's listed rows at
// the size of a 20,000-row case's fold: 18,000 rows, 35% of them listed.
func BenchmarkIndexed(b *testing.B) {
	r := rand.New(rand.NewPCG(1, 2))
	const n = 18_000
	u, v := make([]float64, n), make([]float64, n)
	var at []int32
	for i := range u {
		u[i], v[i] = r.NormFloat64(), r.Float64()
		if r.Float64() < 0.35 {
			at = append(at, int32(i))
		}
	}
	var sink float64
	b.Run("sumAt", func(b *testing.B) {
		for b.Loop() {
			sink += sumAt(u, at)
		}
	})
	b.Run("sumAt2", func(b *testing.B) {
		for b.Loop() {
			x, y := sumAt2(u, v, at)
			sink += x + y
		}
	})
	b.Run("subScaledAt", func(b *testing.B) {
		for b.Loop() {
			subScaledAt(u, v, at, 1e-9)
		}
	})
	_ = sink
}
