package lasso_test

import (
	"testing"

	"github.com/antecedent-lab/antecedent/lasso"
)

// BenchmarkAccumulateN100kQ200 forms the cross-products of 200 columns
// over 100,000 rows (the one pass shared by every Gaussian node).
func BenchmarkAccumulateN100kQ200(b *testing.B) {
	pr := benchProblem(100_000, 200, false)
	shift := lasso.ColumnMeans(pr.x, nil, nil)
	b.ResetTimer()
	for b.Loop() {
		m := lasso.NewMoments(shift)
		if err := m.Accumulate(pr.x, nil, nil); err != nil {
			b.Fatal(err)
		}
	}
}
