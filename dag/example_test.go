package dag_test

import (
	"bytes"
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

// ExampleRead writes a graph with tiers as DOT, in which each tier is one
// row when drawn, and reads it back.
func ExampleRead() {
	g, err := dag.New([]string{"exercise", "weight", "knee_pain"}, []dag.Edge{
		dag.NewEdge("exercise", "weight"), dag.NewEdge("weight", "knee_pain")})
	if err != nil {
		log.Fatal(err)
	}
	g, err = g.WithNodeData(map[string]dag.NodeData{
		"exercise": {Tier: 1, TierLabel: "habits"}, "weight": {Tier: 2}, "knee_pain": {Tier: 3}})
	if err != nil {
		log.Fatal(err)
	}
	b, err := g.DOT("knees")
	if err != nil {
		log.Fatal(err)
	}
	back, format, err := dag.Read(bytes.NewReader(b))
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println(format, back.Names(), back.NodeData("exercise").TierLabel, len(back.Edges()))
	// Output:
	// DOT [exercise weight knee_pain] habits 2
}
