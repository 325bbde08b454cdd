package intervention_test

import (
	"context"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/antecedent-lab/antecedent/dag"
	"github.com/antecedent-lab/antecedent/internal/opendata"
	"github.com/antecedent-lab/antecedent/intervention"
	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/table"
)

// adjustmentRef is one case of testdata/reference/adjustment.json,
// written by testdata/reference/adjustment_reference.py (statsmodels OLS
// and Logit; the file records the versions).
type adjustmentRef struct {
	Set         []string `json:"set"`
	A           float64  `json:"a"`
	B           float64  `json:"b"`
	Coefficient float64  `json:"coefficient"`
	SE          float64  `json:"se"`
	Lower       float64  `json:"lower"`
	Upper       float64  `json:"upper"`
	Difference  float64  `json:"difference"`
}

// openModel builds a network by hand over columns of an open dataset in
// testdata and fits it.
func openModel(t *testing.T, file string, net *simulate.Model, tiersOf [][]string) *intervention.Model {
	t.Helper()
	tab, err := opendata.ReadCSV(file)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	var cols [][]float64
	for _, nd := range net.Nodes {
		names = append(names, nd.Name)
		cols = append(cols, tab.Column(nd.Name))
	}
	d, err := table.NewDataset(names, cols)
	if err != nil {
		t.Fatal(err)
	}
	return model(t, net, tiers(tiersOf...), d)
}

// TestAdjustedMatchesStatsmodels checks the adjustment sets named for two
// hand-written networks over open data (diabetes: Efron et al. 2004;
// breast cancer: Wolberg, Street & Mangasarian 1995; see testdata/README.md)
// and the regressions on them against statsmodels.
//
// Diabetes: age→bmi, sex→bmi, age→bp, bmi→bp, bmi→s5, bp→progression,
// s5→progression, bmi→progression. For bmi → progression: the parents of
// bmi are {age, sex}; cn = {bp, s5, progression}, forb = {bmi, bp, s5,
// progression}, pa(cn) = {age, bmi, bp, s5}, so the optimal set is {age}.
//
// Breast cancer: mean_texture→mean_radius, mean_radius→worst_smoothness,
// worst_smoothness→benign, mean_radius→benign, mean_texture→benign. For
// mean_radius → benign both sets are {mean_texture}.
func TestAdjustedMatchesStatsmodels(t *testing.T) {
	var cases struct {
		Tool            string        `json:"tool"`
		DiabetesParents adjustmentRef `json:"diabetes_parents"`
		DiabetesOptimal adjustmentRef `json:"diabetes_optimal"`
		CancerParents   adjustmentRef `json:"cancer_parents"`
	}
	if err := opendata.ReadJSON("reference/adjustment.json", &cases); err != nil {
		t.Fatal(err)
	}
	t.Logf("reference: %s", cases.Tool)
	p := func(names ...string) []string { return names }
	diabetes := &simulate.Model{Nodes: []simulate.Node{
		{Name: "age"}, {Name: "sex"},
		{Name: "bmi", Parents: p("age", "sex")},
		{Name: "bp", Parents: p("age", "bmi")},
		{Name: "s5", Parents: p("bmi")},
		{Name: "progression", Parents: p("bp", "s5", "bmi")},
	}}
	cancer := &simulate.Model{Nodes: []simulate.Node{
		{Name: "mean_texture"},
		{Name: "mean_radius", Parents: p("mean_texture")},
		{Name: "worst_smoothness", Parents: p("mean_radius")},
		{Name: "benign", Binary: true, Parents: p("worst_smoothness", "mean_radius", "mean_texture")},
	}}
	for _, tc := range []struct {
		name             string
		file             string
		net              *simulate.Model
		tiers            [][]string
		cause, outcome   string
		parents, optimal adjustmentRef
		tol              float64 // relative
	}{
		// Least squares from moments agrees with statsmodels' QR to
		// about 1e-10; Newton's method to its convergence (1e-12 in
		// deviance), about 1e-7 in the estimates.
		{"diabetes OLS", "diabetes.csv", diabetes, [][]string{{"age", "sex"}, {"bmi"}, {"bp", "s5"}, {"progression"}},
			"bmi", "progression", cases.DiabetesParents, cases.DiabetesOptimal, 1e-8},
		{"breast cancer Logit", "breast_cancer.csv", cancer, [][]string{{"mean_texture"}, {"mean_radius"}, {"worst_smoothness"}, {"benign"}},
			"mean_radius", "benign", cases.CancerParents, cases.CancerParents, 1e-6},
	} {
		t.Run(tc.name, func(t *testing.T) {
			im := openModel(t, tc.file, tc.net, tc.tiers)
			ans, err := im.Effect(context.Background(), intervention.Question{
				Cause: tc.cause, Outcomes: list(tc.outcome),
				A: intervention.SetTo(tc.parents.A), B: intervention.SetTo(tc.parents.B),
			}, &intervention.Settings{Resamples: 20, Seed: 1})
			if err != nil {
				t.Fatal(err)
			}
			adj := ans.Outcomes[0].Adjusted
			if len(adj) != 2 {
				t.Fatalf("adjusted %+v, want parents and optimal", adj)
			}
			for k, want := range []adjustmentRef{tc.parents, tc.optimal} {
				got := adj[k]
				if !slices.Equal(got.Set, want.Set) {
					t.Errorf("%s set %v, want %v", got.Name, got.Set, want.Set)
					continue
				}
				for _, c := range []struct {
					what      string
					got, want float64
				}{
					{"coefficient", float64(got.Coefficient), want.Coefficient},
					{"SE", float64(got.SE), want.SE},
					{"lower", float64(got.Lower), want.Lower},
					{"upper", float64(got.Upper), want.Upper},
					{"difference", float64(got.Difference.Value), want.Difference},
				} {
					if math.Abs(c.got-c.want) > tc.tol*math.Abs(c.want) {
						t.Errorf("%s set %v: %s %.12g, statsmodels %.12g", got.Name, got.Set, c.what, c.got, c.want)
					}
				}
			}
		})
	}
}

// validAdjustment reports whether z is a valid adjustment set for the
// total effect of x on y in g, by the adjustment criterion of Shpitser,
// VanderWeele & Robins (2010, UAI) in the form of Perković, Textor, Kalisch
// & Maathuis (2018, JMLR 18(220)): z holds no descendant of a variable on
// a proper causal path (nor x), and z d-separates x and y in the proper
// back-door graph (g without the first edge of every causal path from x
// to y). d-separation is decided on the moral graph of the ancestral set
// (Lauritzen, Dawid, Larsen & Leimer 1990, Networks 20:491–505).
func validAdjustment(g *dag.Graph, x, y string, z []string) bool {
	names := g.Names()
	de, _ := g.Descendants(x)
	an, _ := g.Ancestors(y)
	cn := map[string]bool{}
	for _, n := range names {
		if n == y && slices.Contains(de, y) || slices.Contains(de, n) && slices.Contains(an, n) {
			cn[n] = true
		}
	}
	for _, s := range z {
		if s == x {
			return false
		}
		for c := range cn {
			d, _ := g.Descendants(c)
			if s == c || slices.Contains(d, s) {
				return false
			}
		}
	}
	// Proper back-door graph: drop x → w for w in cn.
	parents := map[string][]string{}
	for _, e := range g.Edges() {
		if e.From == x && cn[e.To] {
			continue
		}
		parents[e.To] = append(parents[e.To], e.From)
	}
	// Ancestral set of {x, y} ∪ z.
	keep := map[string]bool{}
	stack := append([]string{x, y}, z...)
	for len(stack) > 0 {
		n := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		if keep[n] {
			continue
		}
		keep[n] = true
		stack = append(stack, parents[n]...)
	}
	// Moral graph on the ancestral set, without z.
	adj := map[string]map[string]bool{}
	link := func(a, b string) {
		if adj[a] == nil {
			adj[a] = map[string]bool{}
		}
		if adj[b] == nil {
			adj[b] = map[string]bool{}
		}
		adj[a][b], adj[b][a] = true, true
	}
	for n := range keep {
		ps := parents[n]
		for i, p := range ps {
			link(p, n)
			for _, q := range ps[i+1:] {
				link(p, q)
			}
		}
	}
	blocked := map[string]bool{}
	for _, s := range z {
		blocked[s] = true
	}
	seen := map[string]bool{x: true}
	stack = []string{x}
	for len(stack) > 0 {
		n := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		if n == y {
			return false
		}
		for m := range adj[n] {
			if keep[m] && !blocked[m] && !seen[m] {
				seen[m] = true
				stack = append(stack, m)
			}
		}
	}
	return true
}

// TestValidAdjustmentChecker checks the checker itself on the textbook
// cases (Pearl 2009, Causality, sec. 3.3; common practice): with C → X,
// C → Y, X → M → Y, X → Y, the confounder must be adjusted for and the
// mediator must not be.
func TestValidAdjustmentChecker(t *testing.T) {
	g, err := dag.New(list("C", "X", "M", "Y"), []dag.Edge{dag.NewEdge("C", "X"), dag.NewEdge("C", "Y"), dag.NewEdge("X", "M"), dag.NewEdge("M", "Y"), dag.NewEdge("X", "Y")})
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		z     []string
		valid bool
	}{{nil, false}, {list("C"), true}, {list("M"), false}, {list("C", "M"), false}} {
		if got := validAdjustment(g, "X", "Y", tc.z); got != tc.valid {
			t.Errorf("set %v: valid %v, want %v", tc.z, got, tc.valid)
		}
	}
}

// TestSetsAreValid checks on random tiered networks that the parents of
// the cause and the optimal set are valid adjustment sets for every
// cause–descendant pair.
func TestSetsAreValid(t *testing.T) {
	checked := 0
	for seed := range uint64(40) {
		m, _, err := simulate.Random(simulate.RandomSettings{Variables: 10, Tiers: 4, EdgeProbability: 0.35}, seed)
		if err != nil {
			t.Fatal(err)
		}
		g, err := m.Graph()
		if err != nil {
			t.Fatal(err)
		}
		for _, x := range g.Names() {
			de, _ := g.Descendants(x)
			for _, y := range de {
				pa, _ := intervention.ParentSet(g, x)
				opt, err := intervention.OptimalSet(g, x, y)
				if err != nil {
					t.Fatal(err)
				}
				if !validAdjustment(g, x, y, pa) {
					t.Errorf("seed %d: parents %v of %s not valid for %s", seed, pa, x, y)
				}
				if !validAdjustment(g, x, y, opt) {
					t.Errorf("seed %d: optimal set %v not valid for %s → %s", seed, opt, x, y)
				}
				checked++
			}
		}
	}
	if checked < 200 {
		t.Errorf("only %d pairs checked", checked)
	}
}

// TestOptimalSetIsMoreEfficient checks the property that defines the
// optimal set (Henckel, Perković & Maathuis 2022, JRSS-B 84(2):579–599:
// its asymptotic variance is the least among valid adjustment sets) on a
// network where it differs from the cause's parents: an instrument I
// (a parent of X only) inflates the variance, a precision variable W (a
// parent of Y only) shrinks it.
func TestOptimalSetIsMoreEfficient(t *testing.T) {
	m := &simulate.Model{Nodes: []simulate.Node{
		{Name: "I"}, {Name: "C"}, {Name: "W"},
		{Name: "X", Parents: list("I", "C"), Weights: []float64{1.5, 0.7}},
		{Name: "Y", Parents: list("X", "C", "W"), Weights: []float64{0.5, 0.8, 1.5}},
	}}
	o := tiers(list("I", "C", "W"), list("X"), list("Y"))
	rng := rand.New(rand.NewPCG(1, 2))
	for range 5 {
		d := sample(t, m, 2000, rng.Uint64())
		ans, err := model(t, m, o, d).Effect(context.Background(), intervention.Question{Cause: "X", A: intervention.SetTo(1), B: intervention.SetTo(0)},
			&intervention.Settings{Resamples: 20})
		if err != nil {
			t.Fatal(err)
		}
		pa, opt := ans.Outcomes[0].Adjusted[0], ans.Outcomes[0].Adjusted[1]
		if !slices.Equal(pa.Set, list("I", "C")) || !slices.Equal(opt.Set, list("C", "W")) {
			t.Fatalf("sets %v and %v, want [I C] and [C W]", pa.Set, opt.Set)
		}
		if !(opt.SE < pa.SE) {
			t.Errorf("optimal set's SE %v not below the parents' %v", opt.SE, pa.SE)
		}
	}
}

func TestOptimalSetErrors(t *testing.T) {
	g, _ := pathModel().Graph()
	if _, err := intervention.OptimalSet(g, "Y", "X"); err == nil {
		t.Error("Y → X (not a descendant) gave no error")
	}
	if _, err := intervention.OptimalSet(g, "Q", "Y"); err == nil {
		t.Error("unknown cause gave no error")
	}
	if _, err := intervention.ParentSet(g, "Q"); err == nil {
		t.Error("unknown cause gave no error")
	}
}
