// Package jsonfloat writes floating-point numbers to JSON with NaN and
// ±Inf as null (unknown or undefined) and reads null back as NaN, so that
// unknown values survive a round trip. It serves the result types of the
// root package and the edges of package dag.
package jsonfloat

import (
	"encoding/json"
	"math"
)

// Marshal returns x as JSON, null when x is NaN or infinite.
func Marshal(x float64) ([]byte, error) {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return []byte("null"), nil
	}
	return json.Marshal(x)
}

// Unmarshal reads a JSON number, or null as NaN.
func Unmarshal(b []byte) (float64, error) {
	if string(b) == "null" {
		return math.NaN(), nil
	}
	var x float64
	err := json.Unmarshal(b, &x)
	return x, err
}

// Float is a float64 whose JSON form is that of Marshal and Unmarshal: NaN
// and ±Inf are written as null, and null is read as NaN.
type Float float64

// MarshalJSON implements json.Marshaler.
func (x Float) MarshalJSON() ([]byte, error) { return Marshal(float64(x)) }

// UnmarshalJSON implements json.Unmarshaler.
func (x *Float) UnmarshalJSON(b []byte) error {
	f, err := Unmarshal(b)
	if err != nil {
		return err
	}
	*x = Float(f)
	return nil
}
