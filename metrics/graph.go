package metrics

import (
	"fmt"
	"math"
)

// Edge is a directed edge between two named nodes.
type Edge struct {
	From, To string
}

// GraphScore compares an estimated directed graph with a true one.
type GraphScore struct {
	// Correct counts estimated edges present in the truth with the same
	// direction; Reversed those present in the opposite direction; Extra
	// those absent from the truth in either direction; Missing the true
	// edges absent from the estimate in either direction.
	Correct, Reversed, Extra, Missing int
	// Precision, Recall and F1 of directed edges: a reversed edge counts
	// as wrong. They are NaN when undefined (no estimated or no true
	// edges).
	Precision, Recall, F1 float64
	// SkeletonPrecision and SkeletonRecall ignore direction.
	SkeletonPrecision, SkeletonRecall float64
	// SHD is the structural Hamming distance in its DAG form (Tsamardinos,
	// Brown & Aliferis 2006): Missing + Extra + Reversed, a reversed edge
	// counted once.
	SHD int
}

// CompareGraphs scores estimated edges against true ones. Duplicate edges
// are counted once; a self-loop or an empty name is an error, as is a pair
// of nodes joined in both directions within one graph.
func CompareGraphs(estimated, truth []Edge) (GraphScore, error) {
	est, err := edgeSet(estimated, "estimated")
	if err != nil {
		return GraphScore{}, err
	}
	tru, err := edgeSet(truth, "true")
	if err != nil {
		return GraphScore{}, err
	}
	var s GraphScore
	for e := range est {
		switch {
		case tru[e]:
			s.Correct++
		case tru[Edge{e.To, e.From}]:
			s.Reversed++
		default:
			s.Extra++
		}
	}
	for e := range tru {
		if !est[e] && !est[Edge{e.To, e.From}] {
			s.Missing++
		}
	}
	s.SHD = s.Missing + s.Extra + s.Reversed
	s.Precision = ratio(s.Correct, len(est))
	s.Recall = ratio(s.Correct, len(tru))
	s.F1 = math.NaN()
	if s.Precision+s.Recall > 0 {
		s.F1 = 2 * s.Precision * s.Recall / (s.Precision + s.Recall)
	} else if len(est) > 0 && len(tru) > 0 {
		s.F1 = 0
	}
	s.SkeletonPrecision = ratio(s.Correct+s.Reversed, len(est))
	s.SkeletonRecall = ratio(s.Correct+s.Reversed, len(tru))
	return s, nil
}

func ratio(a, b int) float64 {
	if b == 0 {
		return math.NaN()
	}
	return float64(a) / float64(b)
}

func edgeSet(edges []Edge, which string) (map[Edge]bool, error) {
	set := make(map[Edge]bool, len(edges))
	for i, e := range edges {
		if e.From == "" || e.To == "" {
			return nil, fmt.Errorf("%w: %s edge %d has an empty name", ErrEdge, which, i)
		}
		if e.From == e.To {
			return nil, fmt.Errorf("%w: %s edge %d is a self-loop on %q", ErrEdge, which, i, e.From)
		}
		if set[Edge{e.To, e.From}] {
			return nil, fmt.Errorf("%w: %s edges join %q and %q in both directions", ErrEdge, which, e.From, e.To)
		}
		set[e] = true
	}
	return set, nil
}
