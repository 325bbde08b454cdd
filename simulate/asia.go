package simulate

import "github.com/antecedent-lab/antecedent/order"

// Asia returns the "chest clinic" network of Lauritzen & Spiegelhalter
// (1988), JRSS-B 50:157–224, with its published conditional probabilities
// (as reproduced by the BUGS example "Asia"): eight binary variables, A
// visit to Asia, S smoker, T tuberculosis, L lung cancer, B bronchitis, E
// either tuberculosis or lung cancer (a deterministic OR), X positive
// X-ray, D dyspnoea. Each edge's weight is its log odds ratio where the
// table makes one exact, and otherwise a nominal 1.
func Asia() *Model {
	p := func(f func(v []float64) float64) func([]float64) float64 { return f }
	pick := func(cond bool, yes, no float64) float64 {
		if cond {
			return yes
		}
		return no
	}
	return &Model{Nodes: []Node{
		{Name: "A", Binary: true, Probability: p(func([]float64) float64 { return 0.01 })},
		{Name: "S", Binary: true, Probability: p(func([]float64) float64 { return 0.5 })},
		{Name: "T", Binary: true, Parents: []string{"A"}, Weights: []float64{1},
			Probability: p(func(v []float64) float64 { return pick(v[0] == 1, 0.05, 0.01) })},
		{Name: "L", Binary: true, Parents: []string{"S"}, Weights: []float64{1},
			Probability: p(func(v []float64) float64 { return pick(v[0] == 1, 0.10, 0.01) })},
		{Name: "B", Binary: true, Parents: []string{"S"}, Weights: []float64{1},
			Probability: p(func(v []float64) float64 { return pick(v[0] == 1, 0.60, 0.30) })},
		{Name: "E", Binary: true, Parents: []string{"T", "L"}, Weights: []float64{1, 1},
			Probability: p(func(v []float64) float64 { return pick(v[0] == 1 || v[1] == 1, 1, 0) })},
		{Name: "X", Binary: true, Parents: []string{"E"}, Weights: []float64{1},
			Probability: p(func(v []float64) float64 { return pick(v[0] == 1, 0.98, 0.05) })},
		{Name: "D", Binary: true, Parents: []string{"E", "B"}, Weights: []float64{1, 1},
			Probability: p(func(v []float64) float64 {
				switch e, b := v[0] == 1, v[1] == 1; {
				case e && b:
					return 0.9
				case e:
					return 0.7
				case b:
					return 0.8
				}
				return 0.1
			})},
	}}
}

// AsiaOrder returns the natural time order of the Asia network:
// {A, S} < {T, L, B} < {E} < {X, D}.
func AsiaOrder() *order.Order {
	return &order.Order{
		Tiers:  [][]string{{"A", "S"}, {"T", "L", "B"}, {"E"}, {"X", "D"}},
		Labels: []string{"exposures", "diseases", "either", "findings"},
	}
}
