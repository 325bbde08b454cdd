package jsonfloat

import (
	"encoding/json"
	"math"
	"testing"
)

func TestRoundTrip(t *testing.T) {
	cases := []struct {
		in   float64
		text string
	}{
		{1.5, "1.5"},
		{-0.125, "-0.125"},
		{math.NaN(), "null"},
		{math.Inf(1), "null"},
		{math.Inf(-1), "null"},
		{1e-300, "1e-300"},
	}
	for _, c := range cases {
		b, err := json.Marshal(Float(c.in))
		if err != nil || string(b) != c.text {
			t.Errorf("%g: %s, %v; want %s", c.in, b, err, c.text)
			continue
		}
		var back Float
		if err := json.Unmarshal(b, &back); err != nil {
			t.Fatal(err)
		}
		if x := float64(back); x != c.in && !(math.IsNaN(x) && (math.IsNaN(c.in) || math.IsInf(c.in, 0))) {
			t.Errorf("%g came back as %g", c.in, x)
		}
	}
	var f Float
	if err := json.Unmarshal([]byte(`"x"`), &f); err == nil {
		t.Error("a string was read as a number")
	}
}

// TestMarshalMatchesEncodingJSON checks that Marshal writes every finite
// value exactly as encoding/json does (the reference it replaces).
func TestMarshalMatchesEncodingJSON(t *testing.T) {
	vals := []float64{0, math.Copysign(0, -1), 1, -1, 0.1, 1e-6, 9.99e-7, 1e-7, 1.5e-9, 1e20, 1e21, 1.234e21, -3e-300,
		math.MaxFloat64, math.SmallestNonzeroFloat64, 123456789.123, 1e-100, 5e-324}
	var seed uint64 = 88172645463325252 // xorshift64 (Marsaglia 2003)
	for range 100_000 {
		seed ^= seed << 13
		seed ^= seed >> 7
		seed ^= seed << 17
		if x := math.Float64frombits(seed); !math.IsNaN(x) && !math.IsInf(x, 0) {
			vals = append(vals, x)
		}
	}
	for _, x := range vals {
		got, _ := Marshal(x)
		want, err := json.Marshal(x)
		if err != nil || string(got) != string(want) {
			t.Fatalf("%v: %s, encoding/json %s", x, got, want)
		}
	}
}
