// Package jsonfloat writes floating-point numbers to JSON with NaN and
// ±Inf as null (unknown or undefined) and reads null back as NaN, so that
// unknown values survive a round trip. It serves the result types of the
// root package and the edges of package dag.
package jsonfloat

import (
	"encoding/json"
	"math"
	"strconv"
)

// Marshal returns x as JSON, null when x is NaN or infinite. The digits
// are those encoding/json writes for a float64 (the shortest that read
// back exactly; exponent form below 1e-6 and from 1e21), formed here
// without reflection.
func Marshal(x float64) ([]byte, error) {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return []byte("null"), nil
	}
	return appendFloat(make([]byte, 0, 24), x), nil
}

// appendFloat appends x as encoding/json's float encoder does.
func appendFloat(b []byte, x float64) []byte {
	format := byte('f')
	if a := math.Abs(x); a != 0 && (a < 1e-6 || a >= 1e21) {
		format = 'e'
	}
	b = strconv.AppendFloat(b, x, format, -1, 64)
	if format == 'e' {
		// Clean up e-09 to e-9, as encoding/json does.
		if n := len(b); n >= 4 && b[n-4] == 'e' && b[n-3] == '-' && b[n-2] == '0' {
			b[n-2] = b[n-1]
			b = b[:n-1]
		}
	}
	return b
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
