package sizing_test

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"math"
	"testing"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/intervention"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/sizing"
)

var _ sizing.Generator = (*intervention.Model)(nil)

// singleParent is B = w·A + noise, with four variables of no effect in
// A's tier as further candidates.
func singleParent(w float64) *simulate.Model {
	return &simulate.Model{Nodes: []simulate.Node{
		{Name: "A"}, {Name: "N1"}, {Name: "N2"}, {Name: "N3"}, {Name: "N4"},
		{Name: "B", Parents: []string{"A"}, Weights: []float64{w}},
	}}
}

var singleOrder = &order.Order{Tiers: [][]string{{"A", "N1", "N2", "N3", "N4"}, {"B"}}}

// within reports whether a and b differ by at most z combined Monte
// Carlo standard errors (z = 3: common practice for a check that must not
// fail by chance), plus slack for shares of 0 or 1 whose SE is 0.
func within(a, sa, b, sb, z, slack float64) bool {
	return math.Abs(a-b) <= z*math.Sqrt(sa*sa+sb*sb)+slack
}

// TestDetectionRisesWithRowsAndEffect is the check for a single
// continuous parent, under both penalty rules: the share of studies that
// find A → B rises with the rows and with the effect, approaches 1 at
// large n, and for an edge of zero effect stays near the rate at which a
// pair without an edge gets one. The one-standard-error rule is the more
// conservative: weak edges need many rows, and false edges are rare.
func TestDetectionRisesWithRowsAndEffect(t *testing.T) {
	sizes := []int{40, 160, 640, 2560}
	reps := 40
	if testing.Short() {
		sizes, reps = []int{40, 640, 2560}, 20
	}
	for _, rule := range []cv.Rule{cv.OneStandardError, cv.MinimumLoss} {
		t.Run(rule.String(), func(t *testing.T) {
			cfg := &antecedent.Config{Seed: 1}
			cfg.CV.Rule = rule
			detection(t, cfg, sizes, reps)
		})
	}
}

func detection(t *testing.T, cfg *antecedent.Config, sizes []int, reps int) {
	effects := []float64{0, 0.1, 0.25}
	found := map[float64]sizing.EdgeRate{}
	falses := map[float64][]sizing.FalseRate{}
	for _, w := range effects {
		g, err := sizing.FromModel(singleParent(w))
		if err != nil {
			t.Fatal(err)
		}
		p, err := sizing.Run(context.Background(), g, singleOrder, cfg, &sizing.Settings{Sizes: sizes, Replicates: reps, Seed: 7})
		if err != nil {
			t.Fatal(err)
		}
		e, err := p.Edge("A", "B")
		if err != nil {
			t.Fatal(err)
		}
		found[w], falses[w] = e, p.False
		if p.Pairs != 4 {
			t.Errorf("pairs = %d, want the 4 pairs N → B", p.Pairs)
		}
		for k, r := range e.Found {
			t.Logf("w=%.2f n=%4d: found %.3f ± %.3f, false edges per pair %.3f ± %.3f", w, r.Rows, r.Value, r.SE, p.False[k].PerPair, p.False[k].PerPairSE)
		}
	}
	strong := found[0.25].Found
	for k := 1; k < len(sizes); k++ {
		if !within(strong[k].Value, strong[k].SE, math.Max(strong[k].Value, strong[k-1].Value), strong[k-1].SE, 2, 0) {
			t.Errorf("w=0.25: share falls from %.3f at %d rows to %.3f at %d", strong[k-1].Value, sizes[k-1], strong[k].Value, sizes[k])
		}
	}
	if last := strong[len(strong)-1].Value; last < 0.95 {
		t.Errorf("w=0.25 at %d rows: share %.3f, want near 1", sizes[len(sizes)-1], last)
	}
	if strong[0].Value >= strong[len(strong)-1].Value {
		t.Errorf("w=0.25: share does not rise with the rows: %v", strong)
	}
	weak := found[0.1].Found
	rises := false
	for k := range sizes {
		if weak[k].Value > strong[k].Value && !within(weak[k].Value, weak[k].SE, strong[k].Value, strong[k].SE, 2, 0) {
			t.Errorf("n=%d: the weaker edge is found more often (%.3f) than the stronger (%.3f)", sizes[k], weak[k].Value, strong[k].Value)
		}
		if strong[k].Value > weak[k].Value+0.2 {
			rises = true
		}
	}
	if !rises {
		t.Errorf("share does not rise with the effect: w=0.1 %v, w=0.25 %v", weak, strong)
	}
	zero := found[0].Found
	for k := range sizes {
		f := falses[0][k]
		// Slack 0.05: one false hit in 20 studies.
		if !within(zero[k].Value, zero[k].SE, f.PerPair, f.PerPairSE, 3, 0.05) {
			t.Errorf("n=%d: an edge of no effect is found in %.3f of studies, a pair without an edge in %.3f", sizes[k], zero[k].Value, f.PerPair)
		}
	}
}

func TestRowsFor(t *testing.T) {
	p := &sizing.Plan{Sizes: []int{100, 200, 400, 800}, Edges: []sizing.EdgeRate{
		{From: "A", To: "B", Found: rates(0.2, 0.6, 0.5, 1.0)},
		{From: "C", To: "B", Found: rates(0.9, 0.95, 1, 1)},
		{From: "D", To: "B", Found: rates(0, 0.1, 0.2, 0.3)},
	}}
	for _, tc := range []struct {
		from   string
		status string
		rows   int
	}{
		// (0.6, 0.5) pool to 0.55; 0.8 lies between 0.55 at 400 and 1.0
		// at 800: log-linear, 400·2^((0.8−0.55)/0.45) = 587.9.
		{"A", sizing.Reached, 588},
		{"C", sizing.AtSmallest, 100},
		{"D", sizing.NotReached, 0},
	} {
		got, err := p.RowsFor(tc.from, "B", 0.8)
		if err != nil {
			t.Fatal(err)
		}
		if got.Status != tc.status || got.Rows != tc.rows {
			t.Errorf("%s → B: %s %d rows, want %s %d", tc.from, got.Status, got.Rows, tc.status, tc.rows)
		}
	}
	// (0.5, 0.45) pool to 0.475 and 0.8 is reached exactly at 100 rows,
	// which exp(log 50 + (log 100 − log 50)) = 100.00000000000004 must
	// not round up to 101.
	exact := &sizing.Plan{Sizes: []int{25, 50, 100}, Edges: []sizing.EdgeRate{{From: "E", To: "B", Found: rates(0.5, 0.45, 0.8)}}}
	if got, err := exact.RowsFor("E", "B", 0.8); err != nil || got.Status != sizing.Reached || got.Rows != 100 {
		t.Errorf("E → B reached exactly at a size: %s %d rows (%v), want reached at 100", got.Status, got.Rows, err)
	}
	if _, err := p.RowsFor("X", "B", 0.8); !errors.Is(err, sizing.ErrSettings) {
		t.Errorf("unknown edge: err = %v", err)
	}
	if _, err := p.RowsFor("A", "B", 1); !errors.Is(err, sizing.ErrSettings) {
		t.Errorf("probability 1: err = %v", err)
	}
}

func rates(v ...float64) []sizing.Rate {
	var r []sizing.Rate
	for _, x := range v {
		r = append(r, sizing.Rate{Value: x})
	}
	return r
}

// TestMonotone checks the pool-adjacent-violators algorithm on worked
// examples (each violating pair is replaced by its mean until the sequence
// is non-decreasing; Barlow et al. 1972, common practice).
func TestMonotone(t *testing.T) {
	for _, tc := range []struct{ in, want []float64 }{
		{[]float64{1, 3, 2, 4}, []float64{1, 2.5, 2.5, 4}},
		{[]float64{3, 2, 1}, []float64{2, 2, 2}},
		{[]float64{0.1, 0.5, 0.4, 0.3, 0.9}, []float64{0.1, 0.4, 0.4, 0.4, 0.9}},
		{[]float64{}, []float64{}},
	} {
		got := sizing.Monotone(tc.in)
		if len(got) != len(tc.want) {
			t.Fatalf("Monotone(%v) = %v", tc.in, got)
		}
		for i := range got {
			if math.Abs(got[i]-tc.want[i]) > 1e-12 {
				t.Errorf("Monotone(%v) = %v, want %v", tc.in, got, tc.want)
				break
			}
		}
	}
}

func TestDeterministic(t *testing.T) {
	g, _ := sizing.FromModel(singleParent(0.2))
	var first []byte
	for _, w := range []int{1, 3} {
		p, err := sizing.Run(context.Background(), g, singleOrder, nil, &sizing.Settings{Sizes: []int{40, 80}, Replicates: 6, Seed: 3, Workers: w})
		if err != nil {
			t.Fatal(err)
		}
		b, _ := json.Marshal(p)
		if first == nil {
			first = b
		} else if !bytes.Equal(first, b) {
			t.Errorf("%d workers give a different plan", w)
		}
	}
}

func TestCancel(t *testing.T) {
	g, _ := sizing.FromModel(singleParent(0.2))
	ctx, cancel := context.WithCancel(context.Background())
	calls := 0
	_, err := sizing.Run(ctx, g, singleOrder, nil, &sizing.Settings{Sizes: []int{40, 80}, Replicates: 200, Workers: 1,
		Progress: func(done, total int) {
			calls++
			if done == 2 {
				cancel()
			}
		}})
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("err = %v, want context.Canceled", err)
	}
	if calls >= 400 {
		t.Errorf("%d studies ran after the cancel", calls)
	}
}

func TestSettingsErrors(t *testing.T) {
	g, _ := sizing.FromModel(singleParent(0.2))
	for _, tc := range []struct {
		name string
		g    sizing.Generator
		o    *order.Order
		cfg  *antecedent.Config
		s    *sizing.Settings
		want error
	}{
		{"no generator", nil, singleOrder, nil, &sizing.Settings{Sizes: []int{40}}, sizing.ErrSettings},
		{"no order", g, nil, nil, &sizing.Settings{Sizes: []int{40}}, sizing.ErrSettings},
		{"no sizes", g, singleOrder, nil, &sizing.Settings{}, sizing.ErrSettings},
		{"too small for the folds", g, singleOrder, nil, &sizing.Settings{Sizes: []int{19}}, sizing.ErrSettings},
		{"sizes not increasing", g, singleOrder, nil, &sizing.Settings{Sizes: []int{80, 40}}, sizing.ErrSettings},
		{"one replicate", g, singleOrder, nil, &sizing.Settings{Sizes: []int{40}, Replicates: 1}, sizing.ErrSettings},
		{"negative workers", g, singleOrder, nil, &sizing.Settings{Sizes: []int{40}, Workers: -1}, sizing.ErrSettings},
		{"bad config", g, singleOrder, &antecedent.Config{Folds: 1}, &sizing.Settings{Sizes: []int{40}}, antecedent.ErrConfig},
		{"order does not match", g, &order.Order{Tiers: [][]string{{"A"}, {"B"}}}, nil, &sizing.Settings{Sizes: []int{40}, Replicates: 2}, order.ErrInvalid},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := sizing.Run(context.Background(), tc.g, tc.o, tc.cfg, tc.s)
			if !errors.Is(err, tc.want) {
				t.Errorf("err = %v, want %v", err, tc.want)
			}
		})
	}
	if _, err := sizing.FromModel(&simulate.Model{Nodes: []simulate.Node{{Name: "A", Parents: []string{"Z"}}}}); err == nil {
		t.Error("a model with an unknown parent was accepted")
	}
}

// TestFromFittedNetwork plans from a network fitted on data: an
// intervention.Model is a Generator, its edges the fitted ones.
func TestFromFittedNetwork(t *testing.T) {
	truth := singleParent(0.5)
	g0, _ := sizing.FromModel(truth)
	d, err := g0.Sample(2000, 1)
	if err != nil {
		t.Fatal(err)
	}
	res, err := antecedent.DiscoverContext(context.Background(), d, singleOrder, &antecedent.Config{Seed: 2})
	if err != nil {
		t.Fatal(err)
	}
	m, err := intervention.New(context.Background(), res, d)
	if err != nil {
		t.Fatal(err)
	}
	p, err := sizing.Run(context.Background(), m, singleOrder, &antecedent.Config{Seed: 2}, &sizing.Settings{Sizes: []int{30, 400}, Replicates: 10, Seed: 5})
	if err != nil {
		t.Fatal(err)
	}
	e, err := p.Edge("A", "B")
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(float64(e.Coefficient)-0.5) > 0.1 || e.Found[1].Value != 1 {
		t.Errorf("A → B: coefficient %v, found %v", e.Coefficient, e.Found)
	}
	ch := p.Chart()
	if len(ch.Curves) != len(p.Edges) || len(ch.FalseEdges.Values) != 2 || ch.Needed != nil {
		t.Errorf("chart %+v", ch)
	}
	for k, c := range ch.Curves {
		if c.From != p.Edges[k].From || c.To != p.Edges[k].To || len(c.Values) != len(p.Sizes) {
			t.Errorf("curve %d: %+v for edge %s → %s", k, c, p.Edges[k].From, p.Edges[k].To)
		}
	}
	need, err := p.RowsFor("A", "B", 0.8)
	if err != nil {
		t.Fatal(err)
	}
	ac := (&sizing.Answer{Plan: p, Needed: &need}).Chart()
	if ac.Needed == nil || ac.Needed.Rows != need.Rows || ac.Needed.Status != need.Status || ac.Title != "Rows needed to find A → B in 80% of studies" {
		t.Errorf("answer chart: needed %+v, title %q", ac.Needed, ac.Title)
	}
}
