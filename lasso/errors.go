package lasso

import (
	"errors"
	"fmt"
)

// Sentinel errors that callers can test with errors.Is.
var (
	// ErrNoRows is returned when a fit is asked for with no observations.
	ErrNoRows = errors.New("lasso: no rows to fit")
	// ErrNoPredictors is returned when the predictor set is empty.
	ErrNoPredictors = errors.New("lasso: empty predictor set")
	// ErrLength is returned when slices that must agree in length do not.
	ErrLength = errors.New("lasso: mismatched lengths")
	// ErrNotFinite is returned when data hold NaN or ±Inf.
	ErrNotFinite = errors.New("lasso: value is not finite")
	// ErrConstantResponse is returned when the response has no variation
	// over the rows being fitted.
	ErrConstantResponse = errors.New("lasso: response is constant")
	// ErrResponse is returned when a response value is not allowed by the
	// family, such as a binomial response other than 0 or 1.
	ErrResponse = errors.New("lasso: response value not allowed by family")
	// ErrWeight is returned for negative or non-finite observation weights,
	// or weights that sum to zero.
	ErrWeight = errors.New("lasso: bad observation weight")
	// ErrPenalty is returned for a bad penalty sequence or penalty scale.
	ErrPenalty = errors.New("lasso: bad penalty")
	// ErrSettings is returned for settings outside their documented range.
	ErrSettings = errors.New("lasso: bad settings")
	// ErrIndex is returned when a row or predictor index is out of range.
	ErrIndex = errors.New("lasso: index out of range")
)

// DataError describes a problem with one value of the input: which
// variable (a predictor column index, or -1 for the response, -2 for the
// weights), which row, and how many values share the problem.
type DataError struct {
	Column int // predictor column index; -1 for the response; -2 for weights
	Row    int // first offending row (index into the full columns)
	Count  int // number of offending values
	Value  float64
	Err    error
}

// Error implements the error interface.
func (e *DataError) Error() string {
	var what string
	switch e.Column {
	case -1:
		what = "response"
	case -2:
		what = "weights"
	default:
		what = fmt.Sprintf("predictor column %d", e.Column)
	}
	msg := e.Err.Error()
	if len(msg) > len("lasso: ") && msg[:len("lasso: ")] == "lasso: " {
		msg = msg[len("lasso: "):]
	}
	if e.Count > 1 {
		return fmt.Sprintf("lasso: %s: %s: %d values (first at row %d, value %g)", what, msg, e.Count, e.Row, e.Value)
	}
	return fmt.Sprintf("lasso: %s: %s (row %d, value %g)", what, msg, e.Row, e.Value)
}

// Unwrap returns the underlying sentinel error.
func (e *DataError) Unwrap() error { return e.Err }
