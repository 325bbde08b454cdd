package intervention_test

import (
	"context"
	"math"
	"testing"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/dag"
	"github.com/antecedent-lab/antecedent/intervention"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/table"
)

// trueResult returns the result a perfect discovery would give for data
// from m: every node's parents are its parents in m.
func trueResult(t testing.TB, m *simulate.Model, o *order.Order) *antecedent.Result {
	t.Helper()
	names := make([]string, len(m.Nodes))
	for i, nd := range m.Nodes {
		names[i] = nd.Name
	}
	plan, err := o.Compile(names)
	if err != nil {
		t.Fatal(err)
	}
	res := &antecedent.Result{Order: o}
	for i, nd := range m.Nodes {
		n := antecedent.Node{Name: nd.Name, Kind: table.Continuous, Family: "gaussian", Parents: append([]string{}, nd.Parents...)}
		if nd.Binary {
			n.Kind, n.Family = table.Binary, "binomial"
		}
		for _, c := range plan.Candidates[i] {
			n.Candidates = append(n.Candidates, names[c])
		}
		n.Fitted = len(n.Candidates) > 0
		res.Nodes = append(res.Nodes, n)
		for _, p := range nd.Parents {
			res.Edges = append(res.Edges, dag.NewEdge(p, nd.Name))
		}
	}
	return res
}

// sample draws n rows of m as a dataset whose kinds are m's.
func sample(t testing.TB, m *simulate.Model, n int, seed uint64) *table.Dataset {
	t.Helper()
	s, err := m.Sample(n, seed)
	if err != nil {
		t.Fatal(err)
	}
	d, err := table.NewDataset(s.Names, s.Columns)
	if err != nil {
		t.Fatal(err)
	}
	for _, nd := range m.Nodes {
		if !nd.Binary {
			if err := d.SetKind(nd.Name, table.Continuous); err != nil {
				t.Fatal(err)
			}
		}
	}
	return d
}

// model returns the intervention model of m's true graph fitted on d.
func model(t testing.TB, m *simulate.Model, o *order.Order, d *table.Dataset) *intervention.Model {
	t.Helper()
	im, err := intervention.New(context.Background(), trueResult(t, m, o), d)
	if err != nil {
		t.Fatal(err)
	}
	return im
}

// intervened returns a copy of m in which the cause is fixed by a: set to
// a value, or shifted (for a continuous cause, by adding to its
// intercept). The copy keeps every other node's equation, so its sample
// means are the true interventional means. Binary nodes of m must have
// explicit intercepts (a prevalence would be re-solved on the intervened
// sample).
func intervened(t testing.TB, m *simulate.Model, cause string, a intervention.Action) *simulate.Model {
	t.Helper()
	out := &simulate.Model{Nodes: append([]simulate.Node{}, m.Nodes...)}
	for i := range out.Nodes {
		nd := &out.Nodes[i]
		if nd.Prevalence != 0 {
			t.Fatalf("node %s has a prevalence; give it an intercept", nd.Name)
		}
		if nd.Name != cause {
			continue
		}
		switch {
		case a.Kind == intervention.Shift && !nd.Binary:
			nd.Intercept += a.Value
		case a.Kind == intervention.Set && nd.Binary:
			v := a.Value
			nd.Parents, nd.Weights, nd.Intercept = nil, nil, 0
			nd.Probability = func([]float64) float64 { return v }
		case a.Kind == intervention.Set:
			// simulate reads a zero noise SD as 1; the smallest
			// positive one leaves the value exact.
			nd.Parents, nd.Weights, nd.Intercept, nd.NoiseSD = nil, nil, a.Value, math.SmallestNonzeroFloat64
		default:
			t.Fatalf("cannot intervene on %s with %v", cause, a)
		}
	}
	return out
}

// trueMean returns the mean of outcome in n rows drawn from m.
func trueMean(t testing.TB, m *simulate.Model, outcome string, n int, seed uint64) float64 {
	t.Helper()
	s, err := m.Sample(n, seed)
	if err != nil {
		t.Fatal(err)
	}
	var sum float64
	for _, x := range s.Column(outcome) {
		sum += x
	}
	return sum / float64(n)
}

func tiers(names ...[]string) *order.Order { return &order.Order{Tiers: names} }

func list(names ...string) []string { return names }

func dagEdge(from, to string) dag.Edge { return dag.NewEdge(from, to) }
