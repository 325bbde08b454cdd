package refit

import (
	"fmt"
	"math"
)

// MinLevelRows is the fewest rows a 0/1 predictor must have on each side
// (with and without the level) for its effect to be estimated (common
// practice: an effect resting on a handful of rows is not reported).
const MinLevelRows = 5

// screen returns, for each predictor, why its effect cannot be estimated
// from these rows, or "" when it can: a 0/1 predictor with fewer than
// MinLevelRows rows on one side; and, for a 0/1 response, a predictor that
// on its own separates the response completely or quasi-completely, so
// that its maximum-likelihood estimate is infinite (Albert & Anderson 1984,
// Biometrika 71:1–10).
func screen(x [][]float64, y []float64, rows []int, binaryResponse bool) []string {
	reasons := make([]string, len(x))
	n := len(y)
	if rows != nil {
		n = len(rows)
	}
	for a, c := range x {
		var n1, e1, e0 float64
		indicator := true
		lo := [2]float64{math.Inf(1), math.Inf(1)} // smallest value with y = 0, 1
		hi := [2]float64{math.Inf(-1), math.Inf(-1)}
		for t := range n {
			i := rowAt(rows, t)
			v, r := c[i], y[i]
			if v != 0 && v != 1 {
				indicator = false
			}
			k := 0
			if r == 1 {
				k = 1
			}
			lo[k], hi[k] = math.Min(lo[k], v), math.Max(hi[k], v)
			if v == 1 {
				n1++
				e1 += r
			} else {
				e0 += r
			}
		}
		n0 := float64(n) - n1
		switch {
		case indicator && min(n0, n1) < MinLevelRows:
			side := "with"
			if n0 < n1 {
				side = "without"
			}
			reasons[a] = fmt.Sprintf("only %d rows %s it (fewer than %d)", int(min(n0, n1)), side, MinLevelRows)
		case !binaryResponse:
		case indicator && (e1 == 0 || e1 == n1):
			reasons[a] = fmt.Sprintf("separation: all %d rows with it have outcome %d", int(n1), outcome(e1 > 0))
		case indicator && (e0 == 0 || e0 == n0):
			reasons[a] = fmt.Sprintf("separation: all %d rows without it have outcome %d", int(n0), outcome(e0 > 0))
		case !indicator && (hi[0] <= lo[1] || hi[1] <= lo[0]):
			reasons[a] = "separation: the outcome is 1 on one side of a single value of it and 0 on the other"
		}
	}
	return reasons
}

func outcome(one bool) int {
	if one {
		return 1
	}
	return 0
}
