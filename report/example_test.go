package report_test

import (
	"bytes"
	"context"
	"fmt"
	"log"
	"strings"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/intervention"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/report"
	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/table"
)

// Example_questions discovers a small simulated network, asks it what
// shifting a dose would change, and writes a report whose section of
// answered questions draws the answer with its cautions. (The data are
// drawn with a dose effect of 0.7 per unit; the answer is the fitted
// network's estimate of it.)
func Example_questions() {
	m := &simulate.Model{Nodes: []simulate.Node{
		{Name: "age", Intercept: 60, NoiseSD: 10},
		{Name: "dose", Parents: []string{"age"}, Weights: []float64{0.05}, NoiseSD: 1},
		{Name: "response", Parents: []string{"dose"}, Weights: []float64{0.7}, NoiseSD: 1},
	}}
	s, err := m.Sample(1000, 1)
	if err != nil {
		log.Fatal(err)
	}
	d, err := table.NewDataset(s.Names, s.Columns)
	if err != nil {
		log.Fatal(err)
	}
	o := &order.Order{Tiers: [][]string{{"age"}, {"dose"}, {"response"}}}
	ctx := context.Background()
	res, err := antecedent.DiscoverContext(ctx, d, o, &antecedent.Config{Seed: 1})
	if err != nil {
		log.Fatal(err)
	}
	im, err := intervention.New(ctx, res, d)
	if err != nil {
		log.Fatal(err)
	}
	ans, err := im.Effect(ctx, intervention.Question{Cause: "dose", A: intervention.ShiftBy(1)}, &intervention.Settings{Resamples: 50, Seed: 1})
	if err != nil {
		log.Fatal(err)
	}
	var page bytes.Buffer
	if err := report.Write(&page, res, &report.Options{Interventions: []*intervention.Answer{ans}}); err != nil {
		log.Fatal(err)
	}
	fmt.Println(strings.Contains(page.String(), "Questions asked of the network"))
	fmt.Println(strings.Count(page.String(), `<figure class="qchart">`), "chart")
	fmt.Printf("response under the shift: %.2f more\n", float64(ans.Outcomes[0].Difference.Value))
	// Output:
	// true
	// 1 chart
	// response under the shift: 0.68 more
}
