package sizing

import (
	"fmt"
	"math"
)

// Needed answers "how many rows find this edge with this probability?".
type Needed struct {
	From string `json:"from"`
	To   string `json:"to"`
	// Probability is the target share of studies, such as 0.8.
	Probability float64 `json:"probability"`
	// Status is "reached" (Rows interpolated between two sizes),
	// "at the smallest size" (already reached there: Rows is that size,
	// and fewer may do) or "not reached" (Rows is 0: more rows than the
	// largest size are needed).
	Status string `json:"status"`
	Rows   int    `json:"rows"`
	// Below and Above are the sizes around the crossing (equal at the
	// smallest size, 0 when not reached).
	Below int `json:"below"`
	Above int `json:"above"`
	// Smoothed holds the shares made non-decreasing in the rows, one per
	// size, that the answer is read from.
	Smoothed []float64 `json:"smoothed"`
}

// Status values of Needed.
const (
	Reached    = "reached"
	AtSmallest = "at the smallest size"
	NotReached = "not reached"
)

// RowsFor returns the rows needed to find from → to in a share prob of
// studies, read from the plan's shares made non-decreasing by the
// pool-adjacent-violators algorithm and interpolated linearly in
// log(rows). It returns an error wrapping ErrSettings for an edge not in
// the plan or prob outside (0, 1).
func (p *Plan) RowsFor(from, to string, prob float64) (Needed, error) {
	if !(prob > 0 && prob < 1) {
		return Needed{}, fmt.Errorf("%w: probability %g outside (0, 1)", ErrSettings, prob)
	}
	e, err := p.Edge(from, to)
	if err != nil {
		return Needed{}, err
	}
	y := make([]float64, len(e.Found))
	for k, r := range e.Found {
		y[k] = r.Value
	}
	s := Monotone(y)
	out := Needed{From: from, To: to, Probability: prob, Status: NotReached, Smoothed: s}
	for k, v := range s {
		if v < prob {
			continue
		}
		if k == 0 {
			out.Status, out.Rows, out.Below, out.Above = AtSmallest, p.Sizes[0], p.Sizes[0], p.Sizes[0]
			return out, nil
		}
		lo, hi := math.Log(float64(p.Sizes[k-1])), math.Log(float64(p.Sizes[k]))
		f := (prob - s[k-1]) / (v - s[k-1])
		out.Status, out.Below, out.Above = Reached, p.Sizes[k-1], p.Sizes[k]
		// Rounded up, but not for the last bits of floating-point error:
		// a crossing exactly at a size gives that size.
		out.Rows = int(math.Ceil(math.Exp(lo+f*(hi-lo)) * (1 - 1e-12)))
		return out, nil
	}
	return out, nil
}

// Monotone returns the non-decreasing sequence closest to y in least
// squares (equal weights), by the pool-adjacent-violators algorithm. It
// does not modify y.
func Monotone(y []float64) []float64 {
	type block struct {
		sum float64
		n   int
	}
	var blocks []block
	for _, v := range y {
		blocks = append(blocks, block{v, 1})
		for len(blocks) > 1 {
			a, b := blocks[len(blocks)-2], blocks[len(blocks)-1]
			if a.sum/float64(a.n) <= b.sum/float64(b.n) {
				break
			}
			blocks = append(blocks[:len(blocks)-2], block{a.sum + b.sum, a.n + b.n})
		}
	}
	out := make([]float64, 0, len(y))
	for _, b := range blocks {
		for range b.n {
			out = append(out, b.sum/float64(b.n))
		}
	}
	return out
}
