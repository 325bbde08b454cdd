package intervention_test

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"math"
	"testing"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/intervention"
	"github.com/antecedent-lab/antecedent/simulate"
)

// pathModel is a linear-Gaussian network with a confounder C, a cause X,
// two mediators and four directed paths from X to Y.
func pathModel() *simulate.Model {
	return &simulate.Model{Nodes: []simulate.Node{
		{Name: "C", NoiseSD: 1},
		{Name: "X", Parents: list("C"), Weights: []float64{0.8}, NoiseSD: 1},
		{Name: "M2", Parents: list("X"), Weights: []float64{0.5}, NoiseSD: 1},
		{Name: "M1", Parents: list("X", "M2"), Weights: []float64{0.7, -0.6}, NoiseSD: 1},
		{Name: "Y", Parents: list("X", "M1", "M2", "C"), Weights: []float64{0.4, 1.2, 0.9, 0.5}, Intercept: 2, NoiseSD: 1},
	}}
}

var pathOrder = tiers(list("C"), list("X"), list("M2"), list("M1"), list("Y"))

// Wright's path rule (Wright 1921, J. Agricultural Research 20:557–585;
// Wright 1934, Ann. Math. Statist. 5:161–215): in a linear structural
// model the total effect of X on Y is the sum over directed paths of the
// products of the path coefficients. For pathModel:
//
//	X→Y 0.4 + X→M1→Y 0.7·1.2 + X→M2→Y 0.5·0.9 + X→M2→M1→Y 0.5·(−0.6)·1.2 = 1.33
//
// with 0.4·1.2 = 0.48 through M1 and 0.5·(0.9 − 0.6·1.2) = 0.09 through M2.
const (
	wrightTotal   = 0.4 + 0.7*1.2 + 0.5*0.9 + 0.5*(-0.6)*1.2
	wrightDirect  = 0.4
	wrightThruM1  = (0.7 + 0.5*(-0.6)) * 1.2
	wrightThruM2  = 0.5 * (0.9 + (-0.6)*1.2)
	monteCarloSEs = 4 // an estimate further than 4 standard errors from the truth fails (common practice)
)

func TestWrightPathRule(t *testing.T) {
	m := pathModel()
	d := sample(t, m, 4000, 11)
	discovered, err := antecedent.DiscoverContext(context.Background(), d, pathOrder, &antecedent.Config{Seed: 3})
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name string
		res  *antecedent.Result
	}{
		{"true parent sets", trueResult(t, m, pathOrder)},
		{"discovered parent sets", discovered},
	} {
		t.Run(tc.name, func(t *testing.T) {
			im, err := intervention.New(context.Background(), tc.res, d)
			if err != nil {
				t.Fatal(err)
			}
			q := intervention.Question{Cause: "X", Outcomes: list("Y"), A: intervention.SetTo(1), B: intervention.SetTo(0)}
			ans, err := im.Effect(context.Background(), q, &intervention.Settings{Resamples: 100, Seed: 5})
			if err != nil {
				t.Fatal(err)
			}
			y := ans.Outcomes[0]
			near(t, "g-computation difference", y.Difference, wrightTotal)
			if y.Paths == nil {
				t.Fatalf("no path decomposition: %s", y.PathsNote)
			}
			// With own residuals, g-computation of a linear network is
			// the path rule applied to the fitted coefficients, exactly.
			if g, p := float64(y.Difference.Value), float64(y.Paths.Total.Value); math.Abs(g-p) > 1e-9*(1+math.Abs(p)) {
				t.Errorf("g-computation %v differs from the fitted path sum %v", g, p)
			}
			near(t, "direct effect", y.Paths.Direct, wrightDirect)
			want := map[string]float64{"M1": wrightThruM1, "M2": wrightThruM2}
			for _, med := range y.Paths.Mediators {
				if w, ok := want[med.Name]; ok {
					near(t, "through "+med.Name, med.Effect, w)
					delete(want, med.Name)
				}
			}
			if len(want) > 0 {
				t.Errorf("mediators %v not reported", want)
			}
			for _, adj := range y.Adjusted {
				near(t, "adjusted for the "+adj.Name, adj.Difference, wrightTotal)
			}
		})
	}
}

// near fails when the truth lies more than monteCarloSEs bootstrap
// standard errors from the estimate.
func near(t *testing.T, what string, e intervention.Estimate, truth float64) {
	t.Helper()
	v, se := float64(e.Value), float64(e.SE)
	if !(se > 0) || math.Abs(v-truth) > monteCarloSEs*se {
		t.Errorf("%s = %.4f (SE %.4f), true %.4f", what, v, se, truth)
	} else {
		t.Logf("%s = %.4f (SE %.4f), true %.4f", what, v, se, truth)
	}
}

// mixedModel has binary and continuous nodes, a binary mediator B with
// children, and explicit intercepts (so that an intervened copy keeps
// them).
func mixedModel() *simulate.Model {
	return &simulate.Model{Nodes: []simulate.Node{
		{Name: "A", NoiseSD: 1},
		{Name: "S", Binary: true, Intercept: -0.8},
		{Name: "X", Binary: true, Parents: list("A", "S"), Weights: []float64{0.8, 0.7}, Intercept: -0.4},
		{Name: "M", Parents: list("X", "A"), Weights: []float64{1.0, 0.5}, NoiseSD: 1},
		{Name: "B", Binary: true, Parents: list("X", "S"), Weights: []float64{1.2, 0.8}, Intercept: -1},
		{Name: "Y", Binary: true, Parents: list("M", "B", "A"), Weights: []float64{0.6, 1.0, -0.5}, Intercept: -1.5},
		{Name: "Z", Parents: list("M", "B", "X"), Weights: []float64{0.7, 1.5, 0.5}, NoiseSD: 1.5},
	}}
}

var mixedOrder = tiers(list("A", "S"), list("X"), list("M", "B"), list("Y", "Z"))

// TestNaturalCourse checks that the setting "as observed" reproduces the
// data: continuous descendants exactly (fitted mean plus own residual),
// binary ones through the mean fitted probability, which equals the
// observed proportion for a logistic model with an intercept (the score
// equation of the intercept; common practice).
func TestNaturalCourse(t *testing.T) {
	m := mixedModel()
	d := sample(t, m, 1500, 2)
	im := model(t, m, mixedOrder, d)
	ans, err := im.Effect(context.Background(), intervention.Question{Cause: "X", A: intervention.Action{}, B: intervention.SetTo(0)},
		&intervention.Settings{Resamples: 10, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	if len(ans.Outcomes) != 4 {
		t.Fatalf("outcomes %v, want the four descendants of X", ans.Outcomes)
	}
	for _, o := range ans.Outcomes {
		col, _ := d.Column(o.Name)
		var sum float64
		for _, x := range col {
			sum += x
		}
		obs := sum / float64(len(col))
		if got := float64(o.MeanA.Value); math.Abs(got-obs) > 1e-9 {
			t.Errorf("%s: mean as observed %.12f, data %.12f", o.Name, got, obs)
		}
	}
}

// TestDrawsMatchExpectation checks the coupled draws of a binary mediator:
// Z is linear in B, so its mean under a setting is the average of
// b0 + bM·M' + bB·p_B' + bX·x + own residual; the g-computation with draws
// must agree within the draws' Monte Carlo error.
func TestDrawsMatchExpectation(t *testing.T) {
	m := mixedModel()
	d := sample(t, m, 2000, 4)
	im := model(t, m, mixedOrder, d)
	ans, err := im.Effect(context.Background(), intervention.Question{Cause: "X", Outcomes: list("Z"), A: intervention.SetTo(1), B: intervention.SetTo(0)},
		&intervention.Settings{Resamples: 2, Draws: 200, Seed: 9})
	if err != nil {
		t.Fatal(err)
	}
	eqM, _ := im.Equation("M")
	eqB, _ := im.Equation("B")
	eqZ, _ := im.Equation("Z")
	cols := map[string][]float64{}
	for _, n := range im.Names() {
		cols[n], _ = d.Column(n)
	}
	lin := func(e intervention.Equation, row int, over map[string]float64) float64 {
		s := e.Intercept
		for k, term := range e.Terms {
			x, ok := over[term]
			if !ok {
				x = cols[term][row]
			}
			s += e.Coefficients[k] * x
		}
		return s
	}
	expect := func(x float64) float64 {
		var sum float64
		for i := range cols["X"] {
			mNew := lin(eqM, i, map[string]float64{"X": x}) + cols["M"][i] - lin(eqM, i, nil)
			pB := 1 / (1 + math.Exp(-lin(eqB, i, map[string]float64{"X": x})))
			resid := cols["Z"][i] - lin(eqZ, i, nil)
			sum += lin(eqZ, i, map[string]float64{"X": x, "M": mNew, "B": pB}) + resid
		}
		return sum / float64(len(cols["X"]))
	}
	z := ans.Outcomes[0]
	for _, c := range []struct {
		name string
		got  float64
		want float64
	}{{"set to 1", float64(z.MeanA.Value), expect(1)}, {"set to 0", float64(z.MeanB.Value), expect(0)}} {
		// 200 draws of 2000 rows: the draws' error is below 0.01 (B's
		// coefficient 1.5 times the binomial SD over 400,000 draws).
		if math.Abs(c.got-c.want) > 0.01 {
			t.Errorf("%s: g-computation %.4f, expectation %.4f", c.name, c.got, c.want)
		}
	}
}

func TestBinaryOutcomeRatio(t *testing.T) {
	m := mixedModel()
	d := sample(t, m, 1000, 6)
	im := model(t, m, mixedOrder, d)
	ans, err := im.Effect(context.Background(), intervention.Question{Cause: "X", Outcomes: list("Y", "S"), A: intervention.SetTo(1), B: intervention.SetTo(0)},
		&intervention.Settings{Resamples: 20, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	y, s := ans.Outcomes[0], ans.Outcomes[1]
	if !y.Binary || y.Paths != nil || y.PathsNote == "" {
		t.Errorf("Y: binary %v, paths %v, note %q", y.Binary, y.Paths, y.PathsNote)
	}
	if r, want := float64(y.Ratio.Value), float64(y.MeanA.Value/y.MeanB.Value); math.Abs(r-want) > 1e-12 {
		t.Errorf("ratio %v, want %v", r, want)
	}
	if !(y.Ratio.Lower <= y.Ratio.Value && y.Ratio.Value <= y.Ratio.Upper) {
		t.Errorf("ratio %v outside its interval [%v, %v]", y.Ratio.Value, y.Ratio.Lower, y.Ratio.Upper)
	}
	if s.Downstream || s.Difference.Value != 0 || s.Ratio.Value != 1 {
		t.Errorf("S, an earlier variable, changed: %+v", s)
	}
}

func TestDeterministic(t *testing.T) {
	m := mixedModel()
	d := sample(t, m, 600, 8)
	im := model(t, m, mixedOrder, d)
	q := intervention.Question{Cause: "X", A: intervention.SetTo(1), B: intervention.SetTo(0)}
	var first []byte
	for _, w := range []int{1, 2, 5} {
		ans, err := im.Effect(context.Background(), q, &intervention.Settings{Resamples: 30, Seed: 4, Workers: w})
		if err != nil {
			t.Fatal(err)
		}
		b, err := json.Marshal(ans)
		if err != nil {
			t.Fatal(err)
		}
		if first == nil {
			first = b
		} else if !bytes.Equal(b, first) {
			t.Errorf("%d workers give a different answer", w)
		}
	}
}

func TestCancel(t *testing.T) {
	m := mixedModel()
	d := sample(t, m, 600, 8)
	im := model(t, m, mixedOrder, d)
	ctx, cancel := context.WithCancel(context.Background())
	calls := 0
	_, err := im.Effect(ctx, intervention.Question{Cause: "X", A: intervention.SetTo(1), B: intervention.SetTo(0)},
		&intervention.Settings{Resamples: 500, Workers: 1, Progress: func(done, total int) {
			calls++
			if done == 3 {
				cancel()
			}
		}})
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("err = %v, want context.Canceled", err)
	}
	if calls >= 500 {
		t.Errorf("%d resamples ran after the cancel", calls)
	}
}

func TestQuestionErrors(t *testing.T) {
	m := mixedModel()
	d := sample(t, m, 300, 1)
	im := model(t, m, mixedOrder, d)
	on, off := intervention.SetTo(1), intervention.SetTo(0)
	for _, tc := range []struct {
		name string
		q    intervention.Question
		s    *intervention.Settings
		want error
	}{
		{"unknown cause", intervention.Question{Cause: "W", A: on, B: off}, nil, intervention.ErrQuestion},
		{"same settings", intervention.Question{Cause: "X", A: on, B: on}, nil, intervention.ErrQuestion},
		{"binary shifted", intervention.Question{Cause: "X", A: intervention.ShiftBy(1), B: intervention.Action{}}, nil, intervention.ErrQuestion},
		{"binary set to 2", intervention.Question{Cause: "X", A: intervention.SetTo(2), B: off}, nil, intervention.ErrQuestion},
		{"not a number", intervention.Question{Cause: "M", A: intervention.SetTo(math.NaN()), B: off}, nil, intervention.ErrQuestion},
		{"unknown kind", intervention.Question{Cause: "M", A: intervention.Action{Kind: 7}, B: off}, nil, intervention.ErrQuestion},
		{"outcome is the cause", intervention.Question{Cause: "X", Outcomes: list("X"), A: on, B: off}, nil, intervention.ErrQuestion},
		{"unknown outcome", intervention.Question{Cause: "X", Outcomes: list("Q"), A: on, B: off}, nil, intervention.ErrQuestion},
		{"outcome twice", intervention.Question{Cause: "X", Outcomes: list("Y", "Y"), A: on, B: off}, nil, intervention.ErrQuestion},
		{"empty outcomes", intervention.Question{Cause: "X", Outcomes: []string{}, A: on, B: off}, nil, intervention.ErrQuestion},
		{"no descendants", intervention.Question{Cause: "Y", A: on, B: off}, nil, intervention.ErrQuestion},
		{"one resample", intervention.Question{Cause: "X", A: on, B: off}, &intervention.Settings{Resamples: 1}, intervention.ErrQuestion},
		{"level 1", intervention.Question{Cause: "X", A: on, B: off}, &intervention.Settings{Level: 1}, intervention.ErrQuestion},
		{"negative draws", intervention.Question{Cause: "X", A: on, B: off}, &intervention.Settings{Draws: -1}, intervention.ErrQuestion},
		{"negative workers", intervention.Question{Cause: "X", A: on, B: off}, &intervention.Settings{Workers: -1}, intervention.ErrQuestion},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := im.Effect(context.Background(), tc.q, tc.s)
			if !errors.Is(err, tc.want) {
				t.Errorf("err = %v, want %v", err, tc.want)
			}
		})
	}
}

func TestExtrapolationWarning(t *testing.T) {
	m := pathModel()
	d := sample(t, m, 300, 1)
	im := model(t, m, pathOrder, d)
	ans, err := im.Effect(context.Background(), intervention.Question{Cause: "X", A: intervention.SetTo(100), B: intervention.SetTo(0)},
		&intervention.Settings{Resamples: 5})
	if err != nil {
		t.Fatal(err)
	}
	if len(ans.Warnings) == 0 {
		t.Error("setting X far outside its range gave no warning")
	}
}

// TestShiftMatchesTruth checks a shift of a continuous cause against the
// true model shifted the same way (simulated with many rows; the shifted
// and the natural model are drawn with the same seed, so their draws are
// coupled and the difference's own Monte Carlo error is small).
func TestShiftMatchesTruth(t *testing.T) {
	m := mixedModel()
	d := sample(t, m, 2000, 21)
	im := model(t, m, mixedOrder, d)
	shift := intervention.ShiftBy(1.5)
	ans, err := im.Effect(context.Background(), intervention.Question{Cause: "M", Outcomes: list("Y", "Z"), A: shift, B: intervention.Action{}},
		&intervention.Settings{Resamples: 60, Seed: 2})
	if err != nil {
		t.Fatal(err)
	}
	for _, o := range ans.Outcomes {
		truth := trueMean(t, intervened(t, m, "M", shift), o.Name, 200_000, 77) - trueMean(t, m, o.Name, 200_000, 77)
		near(t, o.Name+" difference", o.Difference, truth)
	}
}

// TestWrightRandomNetworks repeats the path-rule check on random
// linear-Gaussian tiered networks: for every cause and each of its
// descendants, the g-computation difference between setting the cause to
// 1 and to 0 must match the sum over directed paths of the products of the
// true weights (Wright 1921, 1934), computed here by dynamic programming
// over the true model in time order.
func TestWrightRandomNetworks(t *testing.T) {
	checked := 0
	for seed := range uint64(3) {
		m, o, err := simulate.Random(simulate.RandomSettings{Variables: 8, Tiers: 4, EdgeProbability: 0.4}, seed+20)
		if err != nil {
			t.Fatal(err)
		}
		im := model(t, m, o, sample(t, m, 3000, seed))
		g, _ := m.Graph()
		for _, x := range g.Names() {
			de, _ := g.Descendants(x)
			if len(de) == 0 {
				continue
			}
			ans, err := im.Effect(context.Background(), intervention.Question{Cause: x, A: intervention.SetTo(1), B: intervention.SetTo(0)},
				&intervention.Settings{Resamples: 40, Seed: seed})
			if err != nil {
				t.Fatal(err)
			}
			total := map[string]float64{x: 1}
			for _, name := range g.TopologicalOrder() {
				for _, nd := range m.Nodes {
					if nd.Name != name {
						continue
					}
					for k, p := range nd.Parents {
						total[name] += nd.Weights[k] * total[p]
					}
				}
			}
			for _, out := range ans.Outcomes {
				near(t, x+" → "+out.Name, out.Difference, total[out.Name])
				checked++
			}
		}
	}
	if checked < 10 {
		t.Errorf("only %d pairs checked", checked)
	}
}
