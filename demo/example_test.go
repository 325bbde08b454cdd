package demo_test

import (
	"fmt"
	"log"

	"github.com/antecedent-lab/antecedent/demo"
)

// ExampleLoad loads the synthetic demonstration study and its known graph.
func ExampleLoad() {
	d, o, truth, err := demo.Load()
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("%d rows, %d variables in %d tiers, %d true edges\n", d.Rows(), len(d.Names()), len(o.Tiers), len(truth.Edges()))
	// Output:
	// 5000 rows, 18 variables in 6 tiers, 36 true edges
}
