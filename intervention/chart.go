package intervention

import "fmt"

// Chart is what a report needs to draw one Answer: one row per outcome
// with the two settings' means and their difference, each with its
// interval, and the adjustment-set estimates of the same difference beside
// the g-computation. A natural drawing is a dot with a horizontal
// interval per row on a shared axis, with a line at zero difference.
type Chart struct {
	// Title is a sentence such as "operation_minutes set to 60 rather
	// than set to 120".
	Title string `json:"title"`
	// LabelA and LabelB name the two settings.
	LabelA string `json:"label_a"`
	LabelB string `json:"label_b"`
	// Level is the intervals' coverage (0.95).
	Level float64    `json:"level"`
	Rows  []ChartRow `json:"rows"`
	// Caution is the sentence to print under the chart.
	Caution string `json:"caution"`
}

// ChartRow is one outcome of a Chart.
type ChartRow struct {
	Outcome string `json:"outcome"`
	// Scale is "risk" for a binary outcome (differences in proportion)
	// and "mean" for a continuous one (differences in its units).
	Scale      string   `json:"scale"`
	A          Estimate `json:"a"`
	B          Estimate `json:"b"`
	Difference Estimate `json:"difference"`
	// Adjusted holds the adjustment-set estimates of Difference, labelled
	// by set ("parents of the cause", "optimal").
	Adjusted []ChartPoint `json:"adjusted"`
}

// ChartPoint is a labelled estimate.
type ChartPoint struct {
	Label    string   `json:"label"`
	Estimate Estimate `json:"estimate"`
}

// Chart returns the data to draw a.
func (a *Answer) Chart() Chart {
	c := Chart{
		Title:  fmt.Sprintf("%s %v rather than %v", a.Cause, a.A, a.B),
		LabelA: a.A.String(), LabelB: a.B.String(), Level: a.Level,
		Rows: []ChartRow{}, Caution: Cautions[0] + " " + Cautions[1],
	}
	for _, o := range a.Outcomes {
		r := ChartRow{Outcome: o.Name, Scale: "mean", A: o.MeanA, B: o.MeanB, Difference: o.Difference, Adjusted: []ChartPoint{}}
		if o.Binary {
			r.Scale = "risk"
		}
		for _, adj := range o.Adjusted {
			r.Adjusted = append(r.Adjusted, ChartPoint{Label: adj.Name, Estimate: adj.Difference})
		}
		c.Rows = append(c.Rows, r)
	}
	return c
}
