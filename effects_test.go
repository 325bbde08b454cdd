package antecedent_test

import (
	"context"
	"math"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/table"
)

// TestNotEstimableEffects checks that a parent that separates a binary
// child (every exposed row has the outcome) is reported as not estimable,
// with its reason and no number, instead of an odds ratio in the millions,
// while the other parent keeps its estimate; and that when the separating
// parent is required (unpenalised), so that no penalised path exists, the
// node is left unfitted with a warning rather than failing the run. Levels
// with too few rows are checked in internal/refit.
func TestNotEstimableEffects(t *testing.T) {
	n := 2000
	age, exposed, rare, outcome := make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)
	for i := range n {
		age[i] = float64(i%50) / 10
		if i%10 == 0 {
			exposed[i], outcome[i] = 1, 1 // every exposed row has the outcome
		}
		if i%3 == 0 && age[i] > 2.5 {
			outcome[i] = 1
		}
		if i < 4 {
			rare[i] = 1 // a level with four rows
		}
	}
	d, err := table.NewDataset([]string{"age", "exposed", "rare", "outcome"}, [][]float64{age, exposed, rare, outcome})
	if err != nil {
		t.Fatal(err)
	}
	o := &order.Order{Tiers: [][]string{{"age", "exposed", "rare"}, {"outcome"}},
		Required: []order.Edge{{From: "age", To: "outcome"}}}
	res, err := antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	node, _ := res.Node("outcome")
	want := map[string]string{"exposed": "separation", "age": ""}
	if len(node.Effects) != 2 {
		t.Fatalf("effects %+v", node.Effects)
	}
	for _, e := range node.Effects {
		w := want[e.Parent]
		if !strings.Contains(e.NotEstimable, w) || (w == "") != (e.NotEstimable == "") {
			t.Errorf("%s: not estimable %q, want %q", e.Parent, e.NotEstimable, w)
		}
		if (w != "") != math.IsNaN(float64(e.OddsRatio)) {
			t.Errorf("%s: odds ratio %v", e.Parent, e.OddsRatio)
		}
	}
	joined := strings.Join(res.Warnings, "\n")
	if !strings.Contains(joined, "effect of exposed not estimable") {
		t.Errorf("warnings %q", res.Warnings)
	}
	o.Required = append(o.Required, order.Edge{From: "exposed", To: "outcome"})
	res, err = antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Seed: 1})
	if err != nil {
		t.Fatalf("a required separating parent failed the run: %v", err)
	}
	if node, _ := res.Node("outcome"); node.Fitted || !strings.Contains(strings.Join(node.Warnings, " "), "separates") {
		t.Errorf("fitted %v, warnings %q", node.Fitted, node.Warnings)
	}
}
