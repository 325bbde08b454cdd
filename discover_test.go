package antecedent_test

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"reflect"
	"slices"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/dag"
	"github.com/antecedent-lab/antecedent/internal/opendata"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/table"
)

// sampled draws rows rows from model m with seed and returns them as a
// dataset.
func sampled(t testing.TB, m *simulate.Model, rows int, seed uint64) *table.Dataset {
	t.Helper()
	s, err := m.Sample(rows, seed)
	if err != nil {
		t.Fatal(err)
	}
	return dataset(t, s)
}

func dataset(t testing.TB, s *simulate.Sample) *table.Dataset {
	t.Helper()
	d, err := table.NewDataset(s.Names, s.Columns)
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// hasEdge reports whether edges hold an edge from → to.
func hasEdge(edges []dag.Edge, from, to string) bool {
	return slices.ContainsFunc(edges, func(e dag.Edge) bool { return e.From == from && e.To == to })
}

func truthOf(t testing.TB, m *simulate.Model) []dag.Edge {
	g, err := m.Graph()
	if err != nil {
		t.Fatal(err)
	}
	return g.Edges()
}

// TestAsiaRecovery simulates the Asia network of Lauritzen & Spiegelhalter
// (1988) with its published probabilities at n = 10,000 and its natural
// time order. A→T is not asserted: with P(A) = 0.01 only about five
// tuberculosis cases follow a visit, too few to detect. The other seven
// arcs change probabilities by 0.3 or more (or deterministically) and must
// be found.
func TestAsiaRecovery(t *testing.T) {
	if testing.Short() {
		t.Skip("long")
	}
	s, err := simulate.Asia().Sample(10_000, 2026)
	if err != nil {
		t.Fatal(err)
	}
	res, err := antecedent.DiscoverContext(context.Background(), dataset(t, s), simulate.AsiaOrder(), &antecedent.Config{Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	truth := truthOf(t, simulate.Asia())
	score, err := dag.Compare(res.Edges, truth)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("Asia n=10000: precision %.3f recall %.3f SHD %d, edges %v", score.Precision, score.Recall, score.SHD, res.Edges)
	for _, e := range truth {
		if e.From == "A" {
			continue
		}
		if !hasEdge(res.Edges, e.From, e.To) {
			t.Errorf("missed %s -> %s", e.From, e.To)
		}
	}
	if score.Precision < 0.8 {
		t.Errorf("precision %.2f below 0.8", score.Precision)
	}
	e, _ := res.Node("E")
	if len(e.Warnings) == 0 {
		t.Error("E is a deterministic OR of T and L; a separation warning was expected")
	}
}

// TestRandomGaussianRecovery checks recovery on random tiered
// linear-Gaussian DAGs (common practice): with edge weights of at least 0.3
// and n = 2,000, recall ≥ 0.9 and precision ≥ 0.8 over five graphs, and no
// edge points backwards in time.
func TestRandomGaussianRecovery(t *testing.T) {
	var tp, est, tru int
	for seed := range uint64(5) {
		m, o, err := simulate.Random(simulate.RandomSettings{Variables: 15, Tiers: 4}, seed)
		if err != nil {
			t.Fatal(err)
		}
		d := sampled(t, m, 2000, seed+100)
		res, err := antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Seed: seed})
		if err != nil {
			t.Fatal(err)
		}
		plan, _ := o.Compile(d.Names())
		for _, e := range res.Edges {
			if plan.Tier[plan.Index(e.From)] >= plan.Tier[plan.Index(e.To)] {
				t.Errorf("edge %s -> %s goes backwards in time", e.From, e.To)
			}
		}
		sc, _ := dag.Compare(res.Edges, truthOf(t, m))
		tp += sc.Correct
		est += len(res.Edges)
		tru += sc.Correct + sc.Missing + sc.Reversed
	}
	prec, rec := float64(tp)/float64(est), float64(tp)/float64(tru)
	t.Logf("random Gaussian DAGs: precision %.3f recall %.3f (%d true edges)", prec, rec, tru)
	if rec < 0.9 || prec < 0.8 {
		t.Errorf("precision %.3f recall %.3f", prec, rec)
	}
}

// TestRefitAgainstStatsmodels checks the unpenalised refit (estimates,
// standard errors, 95% intervals) against statsmodels OLS on the diabetes
// data (Efron et al. 2004) and Logit on the breast-cancer data (Wolberg,
// Street & Mangasarian 1995), golden values from
// testdata/reference/refit_reference.py. Required edges make the parents
// exactly the reference's predictors.
func TestRefitAgainstStatsmodels(t *testing.T) {
	ref, err := opendata.ReadRefit()
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		file, response string
		want           opendata.Coefficients
	}{
		{"diabetes.csv", "progression", ref.OLS},
		{"breast_cancer.csv", "benign", ref.Logit},
	} {
		tab, err := opendata.ReadCSV(c.file)
		if err != nil {
			t.Fatal(err)
		}
		names := append(slices.Clone(c.want.Terms[1:]), c.response)
		cols := make([][]float64, len(names))
		for j, n := range names {
			cols[j] = tab.Column(n)
		}
		d, err := table.NewDataset(names, cols)
		if err != nil {
			t.Fatal(err)
		}
		o := &order.Order{Tiers: [][]string{c.want.Terms[1:], {c.response}}}
		for _, p := range c.want.Terms[1:] {
			o.Required = append(o.Required, order.Edge{From: p, To: c.response})
		}
		res, err := antecedent.Discover(d, o)
		if err != nil {
			t.Fatal(err)
		}
		node, _ := res.Node(c.response)
		if len(node.Effects) != 3 {
			t.Fatalf("%s: %d effects", c.response, len(node.Effects))
		}
		rel := func(a, b float64) float64 { return math.Abs(a-b) / math.Max(1e-12, math.Abs(b)) }
		worst := rel(float64(node.Intercept), c.want.Params[0])
		for k, e := range node.Effects {
			if e.Term != c.want.Terms[k+1] {
				t.Fatalf("term %s, want %s", e.Term, c.want.Terms[k+1])
			}
			for _, pair := range [][2]float64{
				{float64(e.Estimate), c.want.Params[k+1]}, {float64(e.SE), c.want.BSE[k+1]},
				{float64(e.Lower), c.want.Lower[k+1]}, {float64(e.Upper), c.want.Upper[k+1]},
			} {
				worst = math.Max(worst, rel(pair[0], pair[1]))
			}
		}
		// 1e-6 relative: both sides solve to far tighter tolerances.
		if worst > 1e-6 {
			t.Errorf("%s: largest relative difference from %s is %.2g", c.response, ref.Tool, worst)
		}
		t.Logf("%s: largest relative difference from statsmodels %.2g", c.response, worst)
	}
}

func smallProblem(t testing.TB, seed uint64) (*table.Dataset, *order.Order, *simulate.Model) {
	m := &simulate.Model{Nodes: []simulate.Node{
		{Name: "age"},
		{Name: "female", Binary: true, Prevalence: 0.5},
		{Name: "bmi", Parents: []string{"age"}, Weights: []float64{0.5}},
		{Name: "diabetes", Binary: true, Parents: []string{"bmi", "age"}, Weights: []float64{1, 0.5}, Prevalence: 0.2},
		{Name: "noise1"},
		{Name: "outcome", Parents: []string{"diabetes", "bmi"}, Weights: []float64{1, -0.6}},
	}}
	s, err := m.Sample(1500, seed)
	if err != nil {
		t.Fatal(err)
	}
	o := &order.Order{Tiers: [][]string{{"age", "female"}, {"bmi", "noise1"}, {"diabetes"}, {"outcome"}}}
	return dataset(t, s), o, m
}

func TestStabilitySelection(t *testing.T) {
	d, o, m := smallProblem(t, 3)
	res, err := antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Seed: 4, Stability: antecedent.Stability{Pairs: 10}})
	if err != nil {
		t.Fatal(err)
	}
	if res.Stability == nil || res.Stability.Threshold != 0.75 {
		t.Fatalf("stability report %+v", res.Stability)
	}
	var sum float64
	for _, n := range res.Stability.Nodes {
		want := n.Selected * n.Selected / ((2*0.75 - 1) * float64(n.Candidates))
		if math.Abs(float64(n.Bound)-want) > 1e-12 {
			t.Errorf("%s: bound %g, want %g", n.Name, n.Bound, want)
		}
		sum += float64(n.Bound)
	}
	if math.Abs(sum-float64(res.Stability.ExpectedFalse)) > 1e-12 {
		t.Errorf("total bound %g, sum %g", res.Stability.ExpectedFalse, sum)
	}
	for _, e := range res.Edges {
		if !(e.Frequency >= 0.75) && !e.Required {
			t.Errorf("edge %s -> %s kept at frequency %g", e.From, e.To, e.Frequency)
		}
	}
	sc, _ := dag.Compare(res.Edges, truthOf(t, m))
	if sc.Recall < 0.99 {
		t.Errorf("stable edges %v miss true ones (recall %.2f)", res.Edges, sc.Recall)
	}
}

// TestDeterministic checks identical results for 1, 2 and 8 workers and a
// lossless JSON round trip.
func TestDeterministic(t *testing.T) {
	d, o, _ := smallProblem(t, 5)
	var first []byte
	for _, w := range []int{1, 2, 8} {
		res, err := antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Seed: 9, Workers: w, Stability: antecedent.Stability{Pairs: 3}})
		if err != nil {
			t.Fatal(err)
		}
		res.Timings = antecedent.Timings{}
		res.Config.Workers = 0
		b, err := json.Marshal(res)
		if err != nil {
			t.Fatal(err)
		}
		if first == nil {
			first = b
			back, err := antecedent.ReadResult(bytes.NewReader(b))
			if err != nil {
				t.Fatal(err)
			}
			again, _ := json.Marshal(back)
			if !bytes.Equal(again, b) {
				t.Error("JSON round trip changed the result")
			}
			continue
		}
		if !bytes.Equal(first, b) {
			t.Errorf("%d workers changed the result", w)
		}
	}
}

func TestMissingPolicies(t *testing.T) {
	d0, o, _ := smallProblem(t, 6)
	names := d0.Names()
	cols := make([][]float64, len(names))
	for j, n := range names {
		c, _ := d0.Column(n)
		cols[j] = slices.Clone(c)
	}
	cols[2][10] = math.NaN() // bmi
	cols[2][20] = math.NaN()
	cols[5][7] = math.NaN() // outcome
	before := make([][]float64, len(cols))
	for j := range cols {
		before[j] = slices.Clone(cols[j])
	}
	d, err := table.NewDataset(names, cols)
	if err != nil {
		t.Fatal(err)
	}
	_, err = antecedent.Discover(d, o)
	var me *table.MissingError
	if !errors.As(err, &me) || !errors.Is(err, table.ErrMissing) || len(me.Columns) != 2 || me.Columns[0].Name != "bmi" || me.Columns[0].FirstRows[0] != 11 {
		t.Fatalf("error %v", err)
	}
	for _, policy := range []table.MissingPolicy{table.MissingCompleteCase, table.MissingAvailableCase} {
		res, err := antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Missing: policy})
		if err != nil {
			t.Fatalf("%v: %v", policy, err)
		}
		out, _ := res.Node("outcome")
		age, _ := res.Node("bmi")
		switch policy {
		case table.MissingCompleteCase:
			if out.Rows != 1497 || age.Rows != 1497 {
				t.Errorf("complete case rows %d %d, want 1497", out.Rows, age.Rows)
			}
		case table.MissingAvailableCase:
			if out.Rows != 1497 || age.Rows != 1498 {
				t.Errorf("available case rows: outcome %d (want 1497), bmi %d (want 1498)", out.Rows, age.Rows)
			}
		}
	}
	for j := range cols {
		if !reflect.DeepEqual(fmtNaN(before[j]), fmtNaN(cols[j])) {
			t.Errorf("column %d changed", j)
		}
	}
}

func fmtNaN(x []float64) []float64 {
	out := slices.Clone(x)
	for i, v := range out {
		if math.IsNaN(v) {
			out[i] = -999
		}
	}
	return out
}

func TestCancelDiscover(t *testing.T) {
	d, o, _ := smallProblem(t, 7)
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := antecedent.DiscoverContext(ctx, d, o, nil); !errors.Is(err, context.Canceled) {
		t.Fatalf("error %v", err)
	}
}

func TestCategoricalPredictor(t *testing.T) {
	// site shifts the outcome for "south" only; an edge from site exists
	// when any level is selected.
	var b strings.Builder
	b.WriteString("site,outcome\n")
	sites := []string{"east", "north", "south"}
	for i := range 600 {
		s := sites[i%3]
		y := float64(i%7) / 7
		if s == "south" {
			y += 2
		}
		b.WriteString(s + "," + strings.TrimRight(strings.TrimRight(ftoa(y), "0"), ".") + "\n")
	}
	d, err := table.ReadCSV(strings.NewReader(b.String()), nil)
	if err != nil {
		t.Fatal(err)
	}
	o := mustOrder(t, "tier: site\ntier: outcome\n")
	res, err := antecedent.Discover(d, o)
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Edges) != 1 || res.Edges[0].From != "site" {
		t.Fatalf("edges %+v", res.Edges)
	}
	n, _ := res.Node("outcome")
	var terms []string
	for _, e := range n.Effects {
		terms = append(terms, e.Term)
	}
	if !slices.Equal(terms, []string{"site=north", "site=south"}) {
		t.Errorf("effect terms %v", terms)
	}
	// A categorical response is refused with a clear error.
	o2 := mustOrder(t, "tier: outcome\ntier: site\n")
	if _, err := antecedent.Discover(d, o2); !errors.Is(err, table.ErrData) || !strings.Contains(err.Error(), "categorical") {
		t.Errorf("categorical response: %v", err)
	}
}

// TestStabilityBoundExplained checks that a bound no smaller than the
// number of edges kept is flagged as vacuous and explained in words.
func TestStabilityBoundExplained(t *testing.T) {
	d, o, _ := smallProblem(t, 5)
	res, err := antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Seed: 4, Stability: antecedent.Stability{Pairs: 10, Threshold: 0.55}})
	if err != nil {
		t.Fatal(err)
	}
	st := res.Stability
	want := float64(st.ExpectedFalse) >= float64(len(res.Edges))
	if st.Vacuous != want {
		t.Errorf("bound %.2f with %d edges: vacuous %v", float64(st.ExpectedFalse), len(res.Edges), st.Vacuous)
	}
	text := st.Explanation
	for _, w := range []string{"exchangeab", "raise the threshold", "fewer candidates"} {
		if !strings.Contains(text, w) {
			t.Errorf("explanation lacks %q: %s", w, text)
		}
	}
	if st.Vacuous != strings.Contains(text, "vacuous") {
		t.Errorf("explanation and flag disagree: %s", text)
	}
	t.Logf("bound %.2f, %d edges: %s", float64(st.ExpectedFalse), len(res.Edges), text)
}

// TestStabilityIgnoresSelection checks that stability selection runs its
// half-sample lasso fits at the plain lasso's cross-validated penalty
// whatever Config.Selection says: the adaptive lasso's second-stage
// penalty is on the scale of its own penalty factors and means nothing to
// a plain fit. Frequencies, penalties and edges must be those of a run
// with the textbook lasso named.
func TestStabilityIgnoresSelection(t *testing.T) {
	d, o, _ := smallProblem(t, 3)
	run := func(sel antecedent.Selection) *antecedent.Result {
		res, err := antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Seed: 4, Selection: sel, Stability: antecedent.Stability{Pairs: 10}})
		if err != nil {
			t.Fatal(err)
		}
		return res
	}
	want := run(antecedent.PenalisedLasso)
	for _, sel := range []antecedent.Selection{antecedent.AdaptiveLasso, antecedent.RelaxedLasso} {
		got := run(sel)
		for i, n := range got.Nodes {
			w := want.Nodes[i]
			if !n.Fitted {
				continue
			}
			if n.Selection != "stability" || !sameNumber(float64(n.Penalty), float64(w.Penalty)) {
				t.Errorf("%v: %s selection %q at penalty %g, want stability at %g", sel, n.Name, n.Selection, float64(n.Penalty), float64(w.Penalty))
			}
		}
		if fmt.Sprint(got.Edges) != fmt.Sprint(want.Edges) {
			t.Errorf("%v: edges\n%v\nwant\n%v", sel, got.Edges, want.Edges)
		}
	}
}

func sameNumber(a, b float64) bool { return a == b || (math.IsNaN(a) && math.IsNaN(b)) }
