package dag_test

import (
	"fmt"
	"log"

	"github.com/antecedent-lab/antecedent/dag"
)

func ExampleGraph_MarkovBlanket() {
	g, err := dag.New([]string{"season", "rain", "sprinkler", "wet", "slippery"}, []dag.Edge{
		dag.NewEdge("season", "rain"), dag.NewEdge("season", "sprinkler"),
		dag.NewEdge("rain", "wet"), dag.NewEdge("sprinkler", "wet"), dag.NewEdge("wet", "slippery"),
	})
	if err != nil {
		log.Fatal(err)
	}
	mb, _ := g.MarkovBlanket("rain")
	fmt.Println(mb)
	// Output:
	// [season sprinkler wet]
}
