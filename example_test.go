package antecedent_test

import (
	"context"
	"fmt"
	"log"
	"strings"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/table"
)

// Example shows the whole job on a small simulated study: data and an
// order in, parents, scores and effects out.
func Example() {
	// Simulated data: exposure depends on age; outcome on both.
	m := &simulate.Model{Nodes: []simulate.Node{
		{Name: "age", Intercept: 60, NoiseSD: 10},
		{Name: "exposure", Binary: true, Parents: []string{"age"}, Weights: []float64{0.05}, Prevalence: 0.3},
		{Name: "marker"},
		{Name: "outcome", Parents: []string{"age", "exposure"}, Weights: []float64{0.1, 2}, NoiseSD: 1},
	}}
	s, err := m.Sample(2000, 1)
	if err != nil {
		log.Fatal(err)
	}
	data, err := table.NewDataset(s.Names, s.Columns)
	if err != nil {
		log.Fatal(err)
	}
	o, err := order.Parse(strings.NewReader(`
tier baseline: age marker
tier treatment: exposure
tier follow-up: outcome
`))
	if err != nil {
		log.Fatal(err)
	}
	res, err := antecedent.DiscoverContext(context.Background(), data, o, &antecedent.Config{Seed: 7})
	if err != nil {
		log.Fatal(err)
	}
	for _, e := range res.Edges {
		fmt.Printf("%s -> %s (%+.2f)\n", e.From, e.To, e.Coefficient)
	}
	out, _ := res.Node("outcome")
	fmt.Printf("outcome: R² %.2f, Markov blanket %v\n", out.Score.Value, out.MarkovBlanket)
	// Output:
	// age -> exposure (+0.05)
	// age -> outcome (+0.10)
	// exposure -> outcome (+2.03)
	// outcome: R² 0.70, Markov blanket [age exposure]
}
