package intervention_test

import (
	"context"
	"errors"
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/intervention"
	"github.com/antecedent-lab/antecedent/table"
)

func TestNewMismatch(t *testing.T) {
	m := pathModel()
	d := sample(t, m, 200, 1)
	res := trueResult(t, m, pathOrder)
	cols := func(names ...string) *table.Dataset {
		var cs [][]float64
		for _, n := range names {
			c, _ := d.Column(n)
			cs = append(cs, c)
		}
		out, err := table.NewDataset(names, cs)
		if err != nil {
			t.Fatal(err)
		}
		return out
	}
	extra := cols("C", "X", "M2", "M1", "Y")
	if err := extra.AddText("site", slices.Repeat([]string{"north", "south"}, 100), 0); err != nil {
		t.Fatal(err)
	}
	flags := make([]float64, 200)
	flags[3] = 1
	binaryY, _ := table.NewDataset(list("C", "X", "M2", "M1", "Y"), [][]float64{mustCol(t, d, "C"), mustCol(t, d, "X"), mustCol(t, d, "M2"), mustCol(t, d, "M1"), flags})
	// The same binary Y coded the other way round: the result says "0" is
	// coded 1, the data (read from numbers) code "1" as 1.
	flipped := *res
	flipped.Nodes = slices.Clone(res.Nodes)
	for i := range flipped.Nodes {
		if flipped.Nodes[i].Name == "Y" {
			flipped.Nodes[i].Kind, flipped.Nodes[i].Levels = table.Binary, []string{"1", "0"}
			flipped.Nodes[i].Coding = `"0" = 1, "1" = 0 (reference)`
		}
	}
	for _, tc := range []struct {
		name string
		res  *antecedent.Result
		d    *table.Dataset
		want string
	}{
		{"no result", nil, d, "both needed"},
		{"no data", res, nil, "both needed"},
		{"variable missing from the data", res, cols("C", "X", "M2", "Y"), `"M1" is in the result but not in the data`},
		{"extra variable in the data", res, extra, `"site" is in the data but not in the result`},
		{"kind differs", res, binaryY, `"Y" is continuous in the result and binary in the data`},
		{"coding differs", &flipped, binaryY, `"Y" is coded "0" = 1, "1" = 0 (reference) in the result and 1 vs 0 (reference) in the data`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := intervention.New(context.Background(), tc.res, tc.d)
			if !errors.Is(err, intervention.ErrMismatch) || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("err = %v, want ErrMismatch saying %q", err, tc.want)
			}
		})
	}
}

func mustCol(t *testing.T, d *table.Dataset, name string) []float64 {
	t.Helper()
	c, err := d.Column(name)
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// TestEquationsMatchResult checks that the model's equations are the
// result's own refits when the data are the discovery's, and that other
// data are flagged.
func TestEquationsMatchResult(t *testing.T) {
	m := mixedModel()
	d := sample(t, m, 1500, 3)
	res, err := antecedent.DiscoverContext(context.Background(), d, mixedOrder, &antecedent.Config{Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	im, err := intervention.New(context.Background(), res, d)
	if err != nil {
		t.Fatal(err)
	}
	if w := im.Warnings(); len(w) > 0 {
		t.Errorf("warnings on the discovery's own data: %v", w)
	}
	for _, n := range res.Nodes {
		if len(n.Candidates) == 0 {
			continue
		}
		eq, err := im.Equation(n.Name)
		if err != nil {
			t.Fatal(err)
		}
		if eq.Family != n.Family || len(eq.Terms) != len(n.Effects) {
			t.Fatalf("%s: equation %+v, result %+v", n.Name, eq, n.Effects)
		}
		if math.Abs(eq.Intercept-float64(n.Intercept)) > 1e-9*(1+math.Abs(eq.Intercept)) {
			t.Errorf("%s: intercept %v, result %v", n.Name, eq.Intercept, n.Intercept)
		}
		for k, e := range n.Effects {
			if eq.Terms[k] != e.Term || math.Abs(eq.Coefficients[k]-float64(e.Estimate)) > 1e-9*(1+math.Abs(eq.Coefficients[k])) {
				t.Errorf("%s: %s %v, result %s %v", n.Name, eq.Terms[k], eq.Coefficients[k], e.Term, e.Estimate)
			}
		}
		if (eq.ResidualSD > 0) != (n.Family == "gaussian") {
			t.Errorf("%s: residual SD %v", n.Name, eq.ResidualSD)
		}
	}
	other := sample(t, m, 1500, 4)
	im2, err := intervention.New(context.Background(), res, other)
	if err != nil {
		t.Fatal(err)
	}
	if len(im2.Warnings()) == 0 {
		t.Error("other data than the discovery's gave no warning")
	}
	if _, err := im.Equation("A"); !errors.Is(err, intervention.ErrUnsupported) {
		t.Errorf("first-tier equation: err = %v", err)
	}
	if _, err := im.Equation("nope"); !errors.Is(err, intervention.ErrQuestion) {
		t.Errorf("unknown variable: err = %v", err)
	}
}

// TestResidualSD checks the residual spread of a continuous equation
// against the true noise (pathModel: unit noise).
func TestResidualSD(t *testing.T) {
	m := pathModel()
	im := model(t, m, pathOrder, sample(t, m, 20000, 5))
	eq, err := im.Equation("Y")
	if err != nil {
		t.Fatal(err)
	}
	// The SD of a sample SD of n normal values is about σ/√(2n) = 0.005.
	if math.Abs(eq.ResidualSD-1) > 0.02 {
		t.Errorf("residual SD %v, true 1", eq.ResidualSD)
	}
}

func TestSample(t *testing.T) {
	m := mixedModel()
	d := sample(t, m, 3000, 3)
	im := model(t, m, mixedOrder, d)
	a, err := im.Sample(20000, 9)
	if err != nil {
		t.Fatal(err)
	}
	b, _ := im.Sample(20000, 9)
	c, _ := im.Sample(20000, 10)
	if !slices.Equal(mustCol(t, a, "Z"), mustCol(t, b, "Z")) {
		t.Error("the same seed gave different data")
	}
	if slices.Equal(mustCol(t, a, "Z"), mustCol(t, c, "Z")) {
		t.Error("different seeds gave the same data")
	}
	if !slices.Equal(a.Names(), d.Names()) {
		t.Errorf("names %v, want %v", a.Names(), d.Names())
	}
	// Means of the drawn study agree with the data's within sampling
	// error (4 SE of the difference of two means; common practice).
	for _, v := range a.Variables() {
		x, y := mustCol(t, a, v.Name), mustCol(t, d, v.Name)
		mx, sx := meanSD(x)
		my, sy := meanSD(y)
		se := math.Sqrt(sx*sx/float64(len(x)) + sy*sy/float64(len(y)))
		if math.Abs(mx-my) > 4*se {
			t.Errorf("%s: drawn mean %.4f, data %.4f (SE %.4f)", v.Name, mx, my, se)
		}
		if k := kindOf(d, v.Name); v.Kind != k {
			t.Errorf("%s: kind %v, want %v", v.Name, v.Kind, k)
		}
	}
	// First-tier variables come as whole rows of the data.
	seen := map[[2]float64]bool{}
	for i, x := range mustCol(t, d, "A") {
		seen[[2]float64{x, mustCol(t, d, "S")[i]}] = true
	}
	for i, x := range mustCol(t, a, "A")[:100] {
		if !seen[[2]float64{x, mustCol(t, a, "S")[i]}] {
			t.Fatalf("row %d: (A, S) = (%v, %v) is not a row of the data", i, x, mustCol(t, a, "S")[i])
		}
	}
	if _, err := im.Sample(0, 1); !errors.Is(err, intervention.ErrQuestion) {
		t.Errorf("0 rows: err = %v", err)
	}
}

func kindOf(d *table.Dataset, name string) table.Kind {
	for _, v := range d.Variables() {
		if v.Name == name {
			return v.Kind
		}
	}
	return -1
}

func meanSD(x []float64) (float64, float64) {
	var s, ss float64
	for _, v := range x {
		s += v
	}
	mu := s / float64(len(x))
	for _, v := range x {
		ss += (v - mu) * (v - mu)
	}
	return mu, math.Sqrt(ss / float64(len(x)-1))
}

// TestUnsupportedFamily checks a node fitted with a caller's family: it
// has no equation the model can run, so it cannot be regenerated.
func TestUnsupportedFamily(t *testing.T) {
	m := pathModel()
	d := sample(t, m, 300, 1)
	res := trueResult(t, m, pathOrder)
	res.Nodes[4].Family = "poisson"
	im, err := intervention.New(context.Background(), res, d)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := im.Sample(10, 1); !errors.Is(err, intervention.ErrUnsupported) {
		t.Errorf("Sample: err = %v", err)
	}
	_, err = im.Effect(context.Background(), intervention.Question{Cause: "X", A: intervention.SetTo(1), B: intervention.SetTo(0)}, nil)
	if !errors.Is(err, intervention.ErrUnsupported) {
		t.Errorf("Effect: err = %v", err)
	}
	// A question that need not regenerate Y still works.
	if _, err := im.Effect(context.Background(), intervention.Question{Cause: "X", Outcomes: list("M1"), A: intervention.SetTo(1), B: intervention.SetTo(0)},
		&intervention.Settings{Resamples: 5}); err != nil {
		t.Errorf("Effect on M1: err = %v", err)
	}
}

// TestMissingAndCategorical checks a dataset with a missing value and a
// categorical first-tier variable: the row is left out, the categorical
// variable is drawn with its levels and cannot be a cause.
func TestMissingAndCategorical(t *testing.T) {
	m := pathModel()
	d0 := sample(t, m, 400, 2)
	var cols [][]float64
	for _, n := range d0.Names() {
		c := slices.Clone(mustCol(t, d0, n))
		cols = append(cols, c)
	}
	cols[4][7] = math.NaN()
	d, err := table.NewDataset(d0.Names(), cols)
	if err != nil {
		t.Fatal(err)
	}
	site := make([]string, 400)
	for i := range site {
		site[i] = []string{"east", "north", "west"}[i%3]
	}
	if err := d.AddText("site", site, 0); err != nil {
		t.Fatal(err)
	}
	o := tiers(list("C", "site"), list("X"), list("M2"), list("M1"), list("Y"))
	res := trueResult(t, m, pathOrder)
	res.Order = o
	res.Nodes = append(res.Nodes, antecedent.Node{Name: "site", Kind: table.Categorical})
	res.Nodes[1].Candidates = append(res.Nodes[1].Candidates, "site")
	res.Nodes[1].Parents = append(res.Nodes[1].Parents, "site")
	res.Edges = append(res.Edges, dagEdge("site", "X"))
	im, err := intervention.New(context.Background(), res, d)
	if err != nil {
		t.Fatal(err)
	}
	if im.Rows() != 399 {
		t.Errorf("rows %d, want 399", im.Rows())
	}
	eq, _ := im.Equation("X")
	if !slices.Equal(eq.Terms, list("C", "site=north", "site=west")) {
		t.Errorf("X's terms %v", eq.Terms)
	}
	s, err := im.Sample(300, 1)
	if err != nil {
		t.Fatal(err)
	}
	if v := s.Variables(); v[len(v)-1].Name != "site" || !slices.Equal(v[len(v)-1].Levels, list("east", "north", "west")) {
		t.Errorf("drawn variables %+v", v)
	}
	_, err = im.Effect(context.Background(), intervention.Question{Cause: "site", A: intervention.SetTo(1), B: intervention.SetTo(0)}, nil)
	if !errors.Is(err, intervention.ErrQuestion) {
		t.Errorf("categorical cause: err = %v", err)
	}
	ans, err := im.Effect(context.Background(), intervention.Question{Cause: "X", Outcomes: list("Y"), A: intervention.SetTo(1), B: intervention.SetTo(0)},
		&intervention.Settings{Resamples: 10})
	if err != nil {
		t.Fatal(err)
	}
	if ans.Rows != 399 || !slices.Equal(ans.Outcomes[0].Adjusted[0].Set, list("C", "site")) {
		t.Errorf("rows %d, parents set %v", ans.Rows, ans.Outcomes[0].Adjusted[0].Set)
	}
}

func TestParseAction(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want intervention.Action
		ok   bool
	}{
		{"observed", intervention.Action{}, true},
		{"set:60", intervention.SetTo(60), true},
		{"=1", intervention.SetTo(1), true},
		{"shift:-30", intervention.ShiftBy(-30), true},
		{"+5", intervention.ShiftBy(5), true},
		{"-2.5", intervention.ShiftBy(-2.5), true},
		{"set:abc", intervention.Action{}, false},
		{"60", intervention.Action{}, false},
		{"", intervention.Action{}, false},
	} {
		got, err := intervention.ParseAction(tc.in)
		if (err == nil) != tc.ok || (tc.ok && got != tc.want) {
			t.Errorf("ParseAction(%q) = %v, %v", tc.in, got, err)
		}
		if err != nil && !errors.Is(err, intervention.ErrQuestion) {
			t.Errorf("ParseAction(%q): error %v does not wrap ErrQuestion", tc.in, err)
		}
	}
	for _, a := range []intervention.Action{{}, intervention.SetTo(60), intervention.ShiftBy(-30)} {
		back, err := intervention.ParseAction(strings.NewReplacer("set to ", "set:", "shifted by ", "shift:", "as observed", "observed").Replace(a.String()))
		if err != nil || back != a {
			t.Errorf("%v does not read back: %v, %v", a, back, err)
		}
	}
}
