package metrics_test

import (
	"fmt"

	"github.com/antecedent-lab/antecedent/metrics"
)

func ExampleAUC() {
	scores := []float64{0.1, 0.4, 0.35, 0.8, 0.4}
	labels := []float64{0, 0, 1, 1, 1}
	a, err := metrics.AUC(scores, labels, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("AUC %.3f\n", a)
	// Output:
	// AUC 0.750
}
