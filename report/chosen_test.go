package report

import (
	"math"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/cv"
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

// TestRuleLevel checks the level line of the cross-validation chart: it
// marks the bound the rule compared with, the best mean plus one standard
// error under the one-SE rule and plus half of one under the half-SE rule
// (common practice for the one-SE rule; cv.HalfStandardError for the
// other), measured from the best point on the chart's own scale. When the
// rule read a standard error above the best point's (a binary node's floor,
// Node.RuleSE), the line is drawn from that one, and the caption says so.
func TestRuleLevel(t *testing.T) {
	var curve []antecedent.CurvePoint
	for k, m := range []float64{5, 4.2, 3.9, 3.7, 3.8} {
		curve = append(curve, antecedent.CurvePoint{Penalty: antecedent.Number(math.Pow(2, -float64(k))), Mean: antecedent.Number(m), SE: 0.3})
	}
	level := func(r cv.Rule, ruleSE float64) (rule, best float64, caption string) {
		n := &antecedent.Node{Curve: curve, Penalty: curve[1].Penalty, BestPenalty: curve[3].Penalty, Rule: r, RuleSE: antecedent.Number(ruleSE), Measure: cv.Deviance, Rows: 500}
		c := cvChart(n, "x")
		if c == nil || c.Rule == nil {
			t.Fatalf("%v: no level line", r)
		}
		for _, d := range c.Dots {
			if d.Class == "lowest" {
				return c.Rule.Y, d.Y, c.Caption
			}
		}
		t.Fatalf("%v: no best point", r)
		return 0, 0, ""
	}
	one, best, _ := level(cv.OneStandardError, 0.3)
	half, best2, caption := level(cv.HalfStandardError, 0.3)
	if best != best2 || math.Abs((half-best)/(one-best)-0.5) > 1e-9 {
		t.Errorf("level lines at %g (one-SE) and %g (half-SE) from the best point at %g; want the second half as far", one, half, best)
	}
	if strings.Contains(caption, "at least") {
		t.Errorf("caption speaks of a floor the rule did not use: %q", caption)
	}
	quarter, best3, caption := level(cv.QuarterStandardError, 0.6)
	if best != best3 || math.Abs((quarter-best)/(one-best)-0.5) > 1e-9 {
		t.Errorf("level lines at %g (one-SE, 0.3) and %g (quarter-SE, read 0.6) from the best point at %g; want the second half as far", one, quarter, best)
	}
	if !strings.Contains(caption, "taken as at least 0.6,") {
		t.Errorf("caption does not say the standard error was raised to 0.6: %q", caption)
	}
	// A standard error raised far above the band: the level line stays
	// inside the plot.
	n := &antecedent.Node{Curve: curve, Penalty: curve[1].Penalty, BestPenalty: curve[3].Penalty, Rule: cv.QuarterStandardError, RuleSE: 20, Measure: cv.Deviance}
	if c := cvChart(n, "x"); c == nil || c.Rule == nil || c.Rule.Y < c.Top-1e-9 || c.Rule.Y > c.Top+c.PlotH+1e-9 {
		t.Errorf("level line of a raised standard error outside the plot: %+v", c)
	}
}

// TestPairedReach checks the chart of the paired-difference rule
// (cv.PairedDifference): the level line lies at the best point's mean, and
// a stroke from the chosen point spans its allowance, the rule's multiple
// of the point's standard error of the paired difference, on the chart's
// own scale; the other rules draw no stroke.
func TestPairedReach(t *testing.T) {
	var curve []antecedent.CurvePoint
	for k, m := range []float64{5, 4.2, 3.9, 3.7, 3.8} {
		curve = append(curve, antecedent.CurvePoint{Penalty: antecedent.Number(math.Pow(2, -float64(k))), Mean: antecedent.Number(m), SE: 0.3, PairSE: antecedent.Number(0.1 * float64(4-k))})
	}
	n := &antecedent.Node{Curve: curve, Penalty: curve[2].Penalty, BestPenalty: curve[3].Penalty, Rule: cv.PairedDifference, Measure: cv.Deviance}
	c := cvChart(n, "x")
	if c == nil || c.Rule == nil || c.Reach == nil {
		t.Fatal("no level line or no stroke")
	}
	var best, chosen dot
	for _, d := range c.Dots {
		switch d.Class {
		case "lowest":
			best = d
		case "chosen":
			chosen = d
		}
	}
	if math.Abs(c.Rule.Y-best.Y) > 1e-9 {
		t.Errorf("level line at %g, best point at %g", c.Rule.Y, best.Y)
	}
	// The y scale from two points of the curve: mean 3.9 (chosen) and 3.7 (best).
	perUnit := (best.Y - chosen.Y) / (3.9 - 3.7)
	want := cv.PairedMargin * 0.2 * perUnit
	if c.Reach.X != chosen.X || math.Abs(c.Reach.Y1-chosen.Y) > 1e-9 || math.Abs((c.Reach.Y2-c.Reach.Y1)-want) > 1e-6*math.Abs(want) {
		t.Errorf("stroke %+v from the chosen point %+v; want length %g", *c.Reach, chosen, want)
	}
	n.Rule = cv.OneStandardError
	if c := cvChart(n, "x"); c.Reach != nil {
		t.Errorf("one-SE rule: a stroke %+v", *c.Reach)
	}
}
