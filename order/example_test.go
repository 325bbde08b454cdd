package order_test

import (
	"fmt"
	"log"
	"strings"

	"github.com/antecedent-lab/antecedent/order"
)

func ExampleParse() {
	o, err := order.Parse(strings.NewReader(`
tier traits: age sex
tier exposure: smoker
tier outcome: cough
forbid sex -> cough
`))
	if err != nil {
		log.Fatal(err)
	}
	p, err := o.Compile([]string{"age", "sex", "smoker", "cough"})
	if err != nil {
		log.Fatal(err)
	}
	for _, c := range p.Candidates[p.Index("cough")] {
		fmt.Println("cough may depend on", p.Names[c])
	}
	// Output:
	// cough may depend on age
	// cough may depend on smoker
}
