package antecedent_test

import (
	"fmt"
	"testing"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/metrics"
)

func TestDbgDemo(t *testing.T) {
	d, o, g, err := antecedent.Demo()
	if err != nil {
		t.Fatal(err)
	}
	res, err := antecedent.Discover(d, o)
	if err != nil {
		t.Fatal(err)
	}
	var truth []metrics.Edge
	for _, e := range g.Edges() {
		truth = append(truth, metrics.Edge{From: e.From, To: e.To})
	}
	sc, _ := metrics.CompareGraphs(edgesOf(res), truth)
	fmt.Printf("%+v\n", sc)
	for _, n := range res.Nodes {
		fmt.Println(n.Name, n.Parents, n.Score.Measure, n.Score.Value, n.Warnings)
	}
	fmt.Printf("%+v\n", res.Timings)
}
