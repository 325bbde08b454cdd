package antecedent

import (
	"context"
	"math"
	"slices"
	"testing"

	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/table"
)

// TestSharedListsSameResult runs the same discoveries with each fit
// listing its own 0/1 predictors and with the fits sharing one index of
// them (lasso.Index, which large tables use): every node must get the
// same parents and, to rounding, the same refit effects. The networks
// are simulated, mostly binary; complete-case handling of missing values
// puts the index over a subset of the rows, and stability selection runs
// its half-sample fits over it too. Both ways compute the same
// quantities, so this checks the bookkeeping; the fits themselves are
// checked against outside references in the lasso and cv packages.
func TestSharedListsSameResult(t *testing.T) {
	m, o, err := simulate.Random(simulate.RandomSettings{Variables: 16, Tiers: 4, BinaryShare: 0.75}, 9)
	if err != nil {
		t.Fatal(err)
	}
	s, err := m.Sample(3_000, 2)
	if err != nil {
		t.Fatal(err)
	}
	holed := make([][]float64, len(s.Columns))
	for j, c := range s.Columns {
		holed[j] = slices.Clone(c)
	}
	for i := 0; i < len(holed[3]); i += 37 {
		holed[3][i] = math.NaN()
	}
	cases := []struct {
		name string
		cols [][]float64
		cfg  Config
	}{
		{"every row", s.Columns, Config{}},
		{"complete cases", holed, Config{Missing: table.MissingCompleteCase}},
		{"stability", s.Columns, Config{Stability: Stability{Pairs: 3}}},
	}
	defer func(c int) { shareCells = c }(shareCells)
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			d, err := table.NewDataset(s.Names, c.cols)
			if err != nil {
				t.Fatal(err)
			}
			var got [2]*Result
			for k, cells := range []int{math.MaxInt, 0} {
				shareCells = cells
				cfg := c.cfg
				if got[k], err = DiscoverContext(context.Background(), d, o, &cfg); err != nil {
					t.Fatal(err)
				}
			}
			own, shared := got[0], got[1]
			for v, a := range own.Nodes {
				b := shared.Nodes[v]
				if !slices.Equal(a.Parents, b.Parents) || math.Abs(float64(a.Penalty)-float64(b.Penalty)) > 1e-9*float64(a.Penalty) {
					t.Errorf("%s: parents %v at penalty %v listing its own, %v at %v sharing", a.Name, a.Parents, a.Penalty, b.Parents, b.Penalty)
				}
			}
			if shared.Timings.Workers == 0 || own.Nodes[len(own.Nodes)-1].Rows == 0 {
				t.Fatal("no node was fitted")
			}
			if len(own.Edges) != len(shared.Edges) {
				t.Fatalf("%d edges listing its own, %d sharing", len(own.Edges), len(shared.Edges))
			}
			for k, a := range own.Edges {
				b := shared.Edges[k]
				if a.From != b.From || a.To != b.To || math.Abs(a.Coefficient-b.Coefficient) > 1e-6*(1+math.Abs(a.Coefficient)) {
					t.Errorf("edge %d: %s → %s %v listing its own, %s → %s %v sharing", k, a.From, a.To, a.Coefficient, b.From, b.To, b.Coefficient)
				}
			}
		})
	}
}
