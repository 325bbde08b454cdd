package simulate_test

import (
	"context"
	"errors"
	"math"
	"reflect"
	"testing"

	"github.com/antecedent-lab/antecedent/lasso"
	"github.com/antecedent-lab/antecedent/simulate"
)

// TestAsiaMarginals checks simulated marginals against the exact marginals
// of the Asia network computed by enumeration from the published tables
// (Lauritzen & Spiegelhalter 1988; values in REFERENCES.md, recomputed):
// T 0.0104, L 0.055, B 0.45, E 0.064828, X 0.11029, D 0.435971. Each must
// lie within four binomial standard errors.
func TestAsiaMarginals(t *testing.T) {
	n := 200_000
	s, err := simulate.Asia().Sample(n, 1)
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]float64{"A": 0.01, "S": 0.5, "T": 0.0104, "L": 0.055, "B": 0.45, "E": 0.064828, "X": 0.11029, "D": 0.435971}
	for name, p := range want {
		var m float64
		for _, v := range s.Column(name) {
			m += v
		}
		m /= float64(n)
		se := math.Sqrt(p * (1 - p) / float64(n))
		if math.Abs(m-p) > 4*se {
			t.Errorf("P(%s) = %.5f, exact %.5f (4 SE = %.5f)", name, m, p, 4*se)
		}
	}
	// E is exactly T or L.
	e, tb, l := s.Column("E"), s.Column("T"), s.Column("L")
	for i := range e {
		if e[i] != math.Max(tb[i], l[i]) {
			t.Fatalf("row %d: E=%g, T=%g, L=%g", i, e[i], tb[i], l[i])
		}
	}
}

// TestLinearGaussian checks that least squares on simulated data recovers
// the weights (common practice) and that a target prevalence is met.
func TestLinearGaussian(t *testing.T) {
	m := &simulate.Model{Nodes: []simulate.Node{
		{Name: "a"},
		{Name: "b", Parents: []string{"a"}, Weights: []float64{0.8}, NoiseSD: 0.5},
		{Name: "c", Parents: []string{"a", "b"}, Weights: []float64{-0.5, 1.2}, Intercept: 3},
		{Name: "d", Binary: true, Parents: []string{"c"}, Weights: []float64{0.7}, Prevalence: 0.3},
	}}
	n := 50_000
	s, err := m.Sample(n, 7)
	if err != nil {
		t.Fatal(err)
	}
	path, err := lasso.Fit(context.Background(), lasso.Data{Columns: s.Columns, Response: s.Column("c"), Predictors: []int{0, 1}},
		&lasso.Settings{Penalties: []float64{1e-9}})
	if err != nil {
		t.Fatal(err)
	}
	b0, b := path.Dense(0)
	// Standard errors at n = 50,000 are below 0.01; 0.03 is generous.
	if math.Abs(b[0]+0.5) > 0.03 || math.Abs(b[1]-1.2) > 0.03 || math.Abs(b0-3) > 0.03 {
		t.Errorf("recovered %g + %g·a + %g·b", b0, b[0], b[1])
	}
	var prev float64
	for _, v := range s.Column("d") {
		prev += v / float64(n)
	}
	if math.Abs(prev-0.3) > 4*math.Sqrt(0.3*0.7/float64(n)) {
		t.Errorf("prevalence %.4f, target 0.3", prev)
	}
	again, _ := m.Sample(n, 7)
	if !reflect.DeepEqual(s, again) {
		t.Error("same seed gave different data")
	}
}

func TestRandom(t *testing.T) {
	m, o, err := simulate.Random(simulate.RandomSettings{Variables: 30, Tiers: 5, BinaryShare: 0.4}, 3)
	if err != nil {
		t.Fatal(err)
	}
	plan, err := o.Compile(namesOf(m))
	if err != nil {
		t.Fatal(err)
	}
	g, err := m.Graph()
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range g.Edges() {
		if plan.Tier[plan.Index(e.From)] >= plan.Tier[plan.Index(e.To)] {
			t.Errorf("edge %s -> %s does not go forward in time", e.From, e.To)
		}
	}
	if len(g.Edges()) == 0 {
		t.Error("no edges")
	}
	if _, err := m.Sample(100, 1); err != nil {
		t.Fatal(err)
	}
}

func namesOf(m *simulate.Model) []string {
	var out []string
	for _, n := range m.Nodes {
		out = append(out, n.Name)
	}
	return out
}

func TestBadModels(t *testing.T) {
	cases := []*simulate.Model{
		{Nodes: []simulate.Node{{Name: "a", Parents: []string{"z"}}}},
		{Nodes: []simulate.Node{{Name: "a", Parents: []string{"b"}}, {Name: "b", Parents: []string{"a"}}}},
		{Nodes: []simulate.Node{{Name: "a"}, {Name: "b", Parents: []string{"a"}, Weights: []float64{1, 2}}}},
		{Nodes: []simulate.Node{{Name: "a", Prevalence: 0.5}}},
		{Nodes: []simulate.Node{{Name: "a", Binary: true, Prevalence: 1.5}}},
	}
	for i, m := range cases {
		if _, err := m.Sample(10, 1); !errors.Is(err, simulate.ErrModel) {
			t.Errorf("case %d: error %v", i, err)
		}
	}
}
