package dag_test

import (
	"errors"
	"math"
	"testing"

	"github.com/antecedent-lab/antecedent/dag"
)

// TestCompare works the structural Hamming distance by hand in its
// DAG form (Tsamardinos, Brown & Aliferis 2006; a reversal counted once,
// common practice).
func TestCompare(t *testing.T) {
	truth := []dag.Edge{dag.NewEdge("a", "b"), dag.NewEdge("b", "c"), dag.NewEdge("c", "d"), dag.NewEdge("a", "d")}
	cases := []struct {
		name                              string
		est                               []dag.Edge
		correct, reversed, extra, missing int
		shd                               int
		precision, recall                 float64
	}{
		{"identical", truth, 4, 0, 0, 0, 0, 1, 1},
		// b→a reversed (1), a→c extra (1), c→d and a→d missing (2): SHD 4.
		{"mixed", []dag.Edge{dag.NewEdge("b", "a"), dag.NewEdge("b", "c"), dag.NewEdge("a", "c")}, 1, 1, 1, 2, 4, 1.0 / 3, 0.25},
		{"empty", nil, 0, 0, 0, 4, 4, math.NaN(), 0},
		{"duplicates", []dag.Edge{dag.NewEdge("a", "b"), dag.NewEdge("a", "b")}, 1, 0, 0, 3, 3, 1, 0.25},
	}
	for _, c := range cases {
		s, err := dag.Compare(c.est, truth)
		if err != nil {
			t.Fatal(err)
		}
		if s.Correct != c.correct || s.Reversed != c.reversed || s.Extra != c.extra || s.Missing != c.missing || s.SHD != c.shd {
			t.Errorf("%s: got %+v", c.name, s)
		}
		if !same(s.Precision, c.precision) || !same(s.Recall, c.recall) {
			t.Errorf("%s: precision %g recall %g, want %g %g", c.name, s.Precision, s.Recall, c.precision, c.recall)
		}
	}
	s, _ := dag.Compare([]dag.Edge{dag.NewEdge("b", "a"), dag.NewEdge("b", "c"), dag.NewEdge("a", "c")}, truth)
	if s.SkeletonPrecision != 2.0/3 || s.SkeletonRecall != 0.5 {
		t.Errorf("skeleton precision %g recall %g, want 2/3 and 1/2", s.SkeletonPrecision, s.SkeletonRecall)
	}
	if f := 2 * (1.0 / 3) * 0.25 / (1.0/3 + 0.25); math.Abs(s.F1-f) > 1e-15 {
		t.Errorf("F1 %g, want %g", s.F1, f)
	}
}

func TestCompareErrors(t *testing.T) {
	cases := []struct {
		name       string
		est, truth []dag.Edge
	}{
		{"self-loop", []dag.Edge{dag.NewEdge("a", "a")}, nil},
		{"both ways", nil, []dag.Edge{dag.NewEdge("a", "b"), dag.NewEdge("b", "a")}},
		{"empty name", []dag.Edge{dag.NewEdge("", "b")}, nil},
	}
	for _, c := range cases {
		if _, err := dag.Compare(c.est, c.truth); !errors.Is(err, dag.ErrEdge) {
			t.Errorf("%s: error %v, want dag.ErrEdge", c.name, err)
		}
	}
}

func same(a, b float64) bool { return a == b || (math.IsNaN(a) && math.IsNaN(b)) }
