package report

import (
	"math"
	"testing"

	"github.com/antecedent-lab/antecedent"
)

// TestChosenBy checks the "chosen by" cell of each procedure: the
// evidence the result carries for a parent, or the procedure alone when
// it carries none.
func TestChosenBy(t *testing.T) {
	nan := math.NaN()
	terms := []antecedent.Term{{Term: "age", Variable: "age", Value: 0.25, Weight: 0.5}, {Term: "bmi", Variable: "bmi", Value: -0.1, Weight: 1}}
	for _, c := range []struct {
		name      string
		selection string
		term      string
		required  bool
		freq      float64
		want      string
	}{
		{"adaptive, weight", "adaptive", "age", false, nan, "adaptive lasso, penalty weight 0.5"},
		{"adaptive, not among the penalised terms", "adaptive", "sex", false, nan, "adaptive lasso"},
		{"lasso, penalised coefficient", "lasso", "bmi", false, nan, "lasso, penalised coefficient -0.1"},
		{"relaxed", "relaxed", "age", false, nan, "relaxed lasso"},
		{"stability, frequency", "stability", "age", false, 0.92, "stability selection: 92% of halves"},
		{"stability, no frequency", "stability", "age", false, nan, "stability selection"},
		{"required", "adaptive", "age", true, nan, "required by the order"},
	} {
		n := &antecedent.Node{Selection: c.selection, Penalised: terms}
		if got := chosenBy(n, antecedent.Effect{Parent: c.term, Term: c.term}, c.required, c.freq); got != c.want {
			t.Errorf("%s: %q, want %q", c.name, got, c.want)
		}
	}
}
