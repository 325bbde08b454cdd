package antecedent

import (
	"errors"
	"fmt"
)

// ErrConfig is wrapped by every error about a Config or an order that does
// not suit the data. Problems with the data themselves wrap table.ErrData
// or table.ErrMissing.
var ErrConfig = errors.New("antecedent: bad configuration")

// ConfigError reports a Config field whose value is out of range.
type ConfigError struct {
	// Field is the field's path in Config, such as "Folds" or
	// "Stability.Threshold".
	Field string
	// Value is the value given, as text.
	Value string
	// Reason says what the field accepts.
	Reason string
}

// Error implements the error interface.
func (e *ConfigError) Error() string {
	return fmt.Sprintf("antecedent: bad configuration: %s %s: %s", e.Field, e.Value, e.Reason)
}

// Unwrap returns ErrConfig.
func (e *ConfigError) Unwrap() error { return ErrConfig }
