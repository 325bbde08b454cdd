package metrics

import (
	"errors"
	"fmt"
	"math"
)

// Sentinel errors that callers can test with errors.Is.
var (
	ErrEmpty     = errors.New("metrics: no observations")
	ErrLength    = errors.New("metrics: mismatched lengths")
	ErrNotFinite = errors.New("metrics: value is not finite")
	ErrLabel     = errors.New("metrics: label is not 0 or 1")
	ErrOneClass  = errors.New("metrics: only one class present")
	ErrWeight    = errors.New("metrics: bad weight")
	ErrConstant  = errors.New("metrics: response is constant")
)

// check validates predictions, responses and weights of equal length.
func check(pred, y, w []float64, labels bool) error {
	if len(y) == 0 {
		return ErrEmpty
	}
	if len(pred) != len(y) {
		return fmt.Errorf("%w: %d predictions for %d responses", ErrLength, len(pred), len(y))
	}
	if w != nil && len(w) != len(y) {
		return fmt.Errorf("%w: %d weights for %d responses", ErrLength, len(w), len(y))
	}
	for i := range y {
		if bad(pred[i]) {
			return fmt.Errorf("%w: prediction %d is %g", ErrNotFinite, i, pred[i])
		}
		if bad(y[i]) {
			return fmt.Errorf("%w: response %d is %g", ErrNotFinite, i, y[i])
		}
		if labels && y[i] != 0 && y[i] != 1 {
			return fmt.Errorf("%w: response %d is %g", ErrLabel, i, y[i])
		}
		if w != nil && (bad(w[i]) || w[i] < 0) {
			return fmt.Errorf("%w: weight %d is %g", ErrWeight, i, w[i])
		}
	}
	if w != nil {
		var s float64
		for _, x := range w {
			s += x
		}
		if s == 0 {
			return fmt.Errorf("%w: weights sum to zero", ErrWeight)
		}
	}
	return nil
}

func bad(x float64) bool { return math.IsNaN(x) || math.IsInf(x, 0) }

func weight(w []float64, i int) float64 {
	if w == nil {
		return 1
	}
	return w[i]
}
