package simulate_test

import (
	"fmt"
	"log"

	"github.com/antecedent-lab/antecedent/simulate"
)

func ExampleModel_Sample() {
	m := &simulate.Model{Nodes: []simulate.Node{
		{Name: "dose"},
		{Name: "response", Parents: []string{"dose"}, Weights: []float64{2}, NoiseSD: 0.1},
	}}
	s, err := m.Sample(3, 1)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println(s.Names, len(s.Columns[0]))
	// Output:
	// [dose response] 3
}
