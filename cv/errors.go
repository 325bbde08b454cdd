package cv

import "errors"

// Sentinel errors that callers can test with errors.Is.
var (
	// ErrFolds is returned for a bad number of folds or bad fold ids.
	ErrFolds = errors.New("cv: bad folds")
	// ErrFoldClasses is returned when a held-out fold lacks one of the two
	// classes and the measure needs both.
	ErrFoldClasses = errors.New("cv: fold lacks a class")
	// ErrMeasure is returned for a measure that does not suit the family.
	ErrMeasure = errors.New("cv: measure does not suit the family")
	// ErrLength is returned when fold ids and data disagree in length.
	ErrLength = errors.New("cv: mismatched lengths")
	// ErrNoFit is returned when the full-data path or a fold's path ends
	// before its first penalty (for example an unpenalised predictor that
	// separates a binary response, whose coefficient never converges).
	ErrNoFit = errors.New("cv: no penalty fitted")
)
