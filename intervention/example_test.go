package intervention_test

import (
	"context"
	"fmt"
	"log"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/dag"
	"github.com/antecedent-lab/antecedent/intervention"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/table"
)

// ExampleModel_Effect asks a discovered network what switching a binary
// exposure on rather than off would change, on a small simulated study.
func ExampleModel_Effect() {
	truth := &simulate.Model{Nodes: []simulate.Node{
		{Name: "age", Intercept: 60, NoiseSD: 10},
		{Name: "exposure", Binary: true, Parents: []string{"age"}, Weights: []float64{0.05}, Intercept: -3},
		{Name: "marker", Parents: []string{"exposure", "age"}, Weights: []float64{1.5, 0.02}, NoiseSD: 1},
		{Name: "outcome", Parents: []string{"marker", "exposure"}, Weights: []float64{2, 1}, NoiseSD: 1},
	}}
	s, err := truth.Sample(2000, 1)
	if err != nil {
		log.Fatal(err)
	}
	data, err := table.NewDataset(s.Names, s.Columns)
	if err != nil {
		log.Fatal(err)
	}
	o := &order.Order{Tiers: [][]string{{"age"}, {"exposure"}, {"marker"}, {"outcome"}}}
	ctx := context.Background()
	res, err := antecedent.DiscoverContext(ctx, data, o, &antecedent.Config{Seed: 1})
	if err != nil {
		log.Fatal(err)
	}
	m, err := intervention.New(ctx, res, data)
	if err != nil {
		log.Fatal(err)
	}
	ans, err := m.Effect(ctx, intervention.Question{
		Cause: "exposure", Outcomes: []string{"outcome"},
		A: intervention.SetTo(1), B: intervention.SetTo(0),
	}, &intervention.Settings{Seed: 1})
	if err != nil {
		log.Fatal(err)
	}
	// The true total effect is 1 + 1.5·2 = 4 (Wright's path rule); the
	// discovery finds all five true edges, the weak age → marker too.
	y := ans.Outcomes[0]
	fmt.Printf("outcome: %.2f if exposed, %.2f if not; difference %.2f (95%% interval %.2f to %.2f)\n",
		y.MeanA.Value, y.MeanB.Value, y.Difference.Value, y.Difference.Lower, y.Difference.Upper)
	fmt.Printf("direct %.2f, through marker %.2f\n", y.Paths.Direct.Value, y.Paths.Mediators[0].Effect.Value)
	// Output:
	// outcome: 6.33 if exposed, 2.46 if not; difference 3.87 (95% interval 3.68 to 4.11)
	// direct 1.02, through marker 2.85
}

// ExampleOptimalSet names the adjustment sets for X → Y in a small graph:
// the parents of X include an instrument I, which the optimal set leaves
// out, and the optimal set adds W, a parent of Y only.
func ExampleOptimalSet() {
	e := dag.NewEdge
	g, err := dag.New([]string{"I", "C", "W", "X", "Y"}, []dag.Edge{e("I", "X"), e("C", "X"), e("C", "Y"), e("W", "Y"), e("X", "Y")})
	if err != nil {
		log.Fatal(err)
	}
	pa, _ := intervention.ParentSet(g, "X")
	opt, _ := intervention.OptimalSet(g, "X", "Y")
	fmt.Println(pa, opt)
	// Output:
	// [I C] [C W]
}
