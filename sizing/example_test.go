package sizing_test

import (
	"context"
	"fmt"
	"log"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/sizing"
)

// Example asks how many rows find a modest continuous effect with 80%
// probability, when four unrelated variables compete with it.
func Example() {
	m := &simulate.Model{Nodes: []simulate.Node{
		{Name: "dose"}, {Name: "n1"}, {Name: "n2"}, {Name: "n3"}, {Name: "n4"},
		{Name: "response", Parents: []string{"dose"}, Weights: []float64{0.3}},
	}}
	o := &order.Order{Tiers: [][]string{{"dose", "n1", "n2", "n3", "n4"}, {"response"}}}
	g, err := sizing.FromModel(m)
	if err != nil {
		log.Fatal(err)
	}
	p, err := sizing.Run(context.Background(), g, o, &antecedent.Config{Seed: 1},
		&sizing.Settings{Sizes: []int{50, 100, 200, 400, 800}, Replicates: 40, Seed: 1})
	if err != nil {
		log.Fatal(err)
	}
	e, _ := p.Edge("dose", "response")
	for _, r := range e.Found {
		fmt.Printf("%4d rows: found in %.2f of studies (± %.2f)\n", r.Rows, r.Value, r.SE)
	}
	need, _ := p.RowsFor("dose", "response", 0.8)
	fmt.Printf("80%%: about %d rows (%s between %d and %d)\n", need.Rows, need.Status, need.Below, need.Above)
	// Output:
	//   50 rows: found in 0.38 of studies (± 0.08)
	//  100 rows: found in 0.65 of studies (± 0.08)
	//  200 rows: found in 0.95 of studies (± 0.03)
	//  400 rows: found in 1.00 of studies (± 0.00)
	//  800 rows: found in 1.00 of studies (± 0.00)
	// 80%: about 142 rows (reached between 100 and 200)
}

// ExampleAnswer_Chart gives a report the numbers to draw a plan with its
// rows needed: the edge's shares with their standard errors, and the
// target share and rows to mark.
func ExampleAnswer_Chart() {
	m := &simulate.Model{Nodes: []simulate.Node{
		{Name: "dose"}, {Name: "n1"},
		{Name: "response", Parents: []string{"dose"}, Weights: []float64{0.5}},
	}}
	o := &order.Order{Tiers: [][]string{{"dose", "n1"}, {"response"}}}
	g, err := sizing.FromModel(m)
	if err != nil {
		log.Fatal(err)
	}
	p, err := sizing.Run(context.Background(), g, o, &antecedent.Config{Seed: 1},
		&sizing.Settings{Sizes: []int{25, 50, 100}, Replicates: 20, Seed: 1})
	if err != nil {
		log.Fatal(err)
	}
	need, err := p.RowsFor("dose", "response", 0.8)
	if err != nil {
		log.Fatal(err)
	}
	c := (&sizing.Answer{Plan: p, Needed: &need}).Chart()
	fmt.Println(c.Title)
	for _, cv := range c.Curves {
		fmt.Printf("%s: %.2f\n", cv.Label, cv.Values)
	}
	fmt.Printf("mark %.0f%% at %d rows (%s)\n", 100*c.Needed.Probability, c.Needed.Rows, c.Needed.Status)
	// Output:
	// Rows needed to find dose → response in 80% of studies
	// dose → response: [0.80 0.80 1.00]
	// mark 80% at 25 rows (at the smallest size)
}
