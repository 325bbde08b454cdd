package main

import (
	"math"
	"testing"
)

func TestEstimate(t *testing.T) {
	spec := []specNode{{Index: 1, Candidates: make([]int, 2)}, {Index: 2, Candidates: make([]int, 4)},
		{Index: 3, Candidates: make([]int, 6)}, {Index: 4, Candidates: make([]int, 8)}}
	for _, c := range []struct {
		name      string
		fixed     float64
		times     map[string]float64
		total, se float64
	}{
		{"every node", 1, map[string]float64{"1": 1, "2": 3, "3": 2, "4": 5}, 12, 0},
		{"time proportional to candidates", 0, map[string]float64{"2": 2, "4": 4}, 10, 0},
		// R = 6/12; residuals 3 − 2 = 1 and 3 − 4 = −1; v = 16·(1/2)/2·2/1 = 8.
		{"two of four", 0, map[string]float64{"2": 3, "4": 3}, 10, math.Sqrt(8)},
		{"one node", 0.5, map[string]float64{"3": 3}, 0.5 + 10, math.NaN()},
	} {
		total, se := pyReport{Fixed: c.fixed, NodeSeconds: c.times}.estimate(spec)
		if math.Abs(total-c.total) > 1e-12 || !(math.Abs(se-c.se) < 1e-12 || math.IsNaN(se) && math.IsNaN(c.se)) {
			t.Errorf("%s: %g ± %g, want %g ± %g", c.name, total, se, c.total, c.se)
		}
	}
}
