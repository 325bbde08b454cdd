package jsondiff

import "testing"

func TestDiff(t *testing.T) {
	cases := []struct {
		a, b string
		tol  float64
		want string
	}{
		{`{"x": 1, "y": [1, 2]}`, `{"y": [1, 2], "x": 1}`, 0, ""},
		{`{"x": 1.0}`, `{"x": 1.0000001}`, 1e-6, ""},
		{`{"x": 1.0}`, `{"x": 1.1}`, 1e-6, ".x: 1 vs 1.1"},
		{`{"x": [1, 2]}`, `{"x": [1]}`, 0, ".x: different lengths"},
		{`{"x": "a"}`, `{"x": "b"}`, 0, ".x: a vs b"},
		{`{"x": 1}`, `{"z": 1}`, 0, ".x: 1 vs <nil>"},
	}
	for _, c := range cases {
		got, err := Diff([]byte(c.a), []byte(c.b), c.tol)
		if err != nil || got != c.want {
			t.Errorf("Diff(%s, %s) = %q, %v; want %q", c.a, c.b, got, err, c.want)
		}
	}
	if _, err := Diff([]byte("{"), []byte("{}"), 0); err == nil {
		t.Error("bad JSON accepted")
	}
}
