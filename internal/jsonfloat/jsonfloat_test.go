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
