package intervention

import "errors"

// Sentinel errors that callers can test with errors.Is.
var (
	// ErrMismatch is wrapped when a result and a dataset do not describe
	// the same variables (names or kinds differ).
	ErrMismatch = errors.New("intervention: result and data do not match")
	// ErrUnsupported is wrapped when a variable that must be regenerated
	// has no equation the model can run: a family other than gaussian or
	// binomial, or a refit that could not be estimated.
	ErrUnsupported = errors.New("intervention: variable cannot be regenerated")
	// ErrQuestion is wrapped by every error about a Question or Settings:
	// an unknown variable, an action that does not suit the cause, a value
	// out of range.
	ErrQuestion = errors.New("intervention: bad question")
)
