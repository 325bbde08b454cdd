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

func ExampleCompare() {
	truth := []dag.Edge{dag.NewEdge("smoking", "cough"), dag.NewEdge("age", "smoking")}
	est := []dag.Edge{dag.NewEdge("smoking", "cough"), dag.NewEdge("smoking", "age"), dag.NewEdge("age", "cough")}
	s, _ := dag.Compare(est, truth)
	fmt.Printf("precision %.2f recall %.2f SHD %d\n", s.Precision, s.Recall, s.SHD)
	// Output:
	// precision 0.33 recall 0.50 SHD 2
}
