package dag

import (
	"fmt"
	"math"
)

// Comparison scores an estimated directed graph against a true one.
type Comparison struct {
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

// Compare scores estimated edges against true ones by their end points
// (other attributes are ignored). Duplicate edges are counted once; a
// self-loop or an empty name is an error, as is a pair of nodes joined in
// both directions within one list.
//
// SHD is the structural Hamming distance of Tsamardinos, Brown & Aliferis
// (2006), Machine Learning 65:31–78, in its DAG form.
func Compare(estimated, truth []Edge) (Comparison, error) {
	est, err := edgeSet(estimated, "estimated")
	if err != nil {
		return Comparison{}, err
	}
	tru, err := edgeSet(truth, "true")
	if err != nil {
		return Comparison{}, err
	}
	var s Comparison
	for e := range est {
		switch {
		case tru[e]:
			s.Correct++
		case tru[pair{e.to, e.from}]:
			s.Reversed++
		default:
			s.Extra++
		}
	}
	for e := range tru {
		if !est[e] && !est[pair{e.to, e.from}] {
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

// pair is an edge's end points.
type pair struct{ from, to string }

func edgeSet(edges []Edge, which string) (map[pair]bool, error) {
	set := make(map[pair]bool, len(edges))
	for i, edge := range edges {
		e := pair{edge.From, edge.To}
		if e.from == "" || e.to == "" {
			return nil, fmt.Errorf("%w: %s edge %d has an empty name", ErrEdge, which, i)
		}
		if e.from == e.to {
			return nil, fmt.Errorf("%w: %s edge %d is a self-loop on %q", ErrEdge, which, i, e.from)
		}
		if set[pair{e.to, e.from}] {
			return nil, fmt.Errorf("%w: %s edges join %q and %q in both directions", ErrEdge, which, e.from, e.to)
		}
		set[e] = true
	}
	return set, nil
}
