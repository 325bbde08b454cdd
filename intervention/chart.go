package intervention

import "fmt"

// Chart is what a report needs to draw one Answer: one row per outcome
// with the two settings' means and their difference, each with its
// interval, the adjustment-set estimates of the same difference beside the
// g-computation, the ratio of a binary outcome's risks and, where the path
// rule applies, the decomposition of the effect. A natural drawing is a
// dot with a horizontal interval per estimate on an axis per outcome, with
// a line at zero difference; the drawing itself (positions, labels)
// belongs to the report.
type Chart struct {
	// Title is a sentence such as "operation_minutes set to 60 rather
	// than set to 120".
	Title string `json:"title"`
	Cause string `json:"cause"`
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
	Scale string `json:"scale"`
	// Downstream is false when the outcome does not descend from the
	// cause: its mean is then the same under both settings.
	Downstream bool     `json:"downstream"`
	A          Estimate `json:"a"`
	B          Estimate `json:"b"`
	Difference Estimate `json:"difference"`
	// Ratio is A / B for a risk; unknown (NaN) for a mean.
	Ratio Estimate `json:"ratio"`
	// Adjusted holds the adjustment-set estimates of Difference, labelled
	// by set ("parents of the cause", "optimal").
	Adjusted []ChartPoint `json:"adjusted"`
	// Paths holds the path decomposition per unit of the cause, labelled
	// "total", "direct" and "through M" for each mediator M; empty when
	// the path rule does not apply, and PathsNote then says why.
	Paths     []ChartPoint `json:"paths"`
	PathsNote string       `json:"paths_note,omitempty"`
}

// ChartPoint is a labelled estimate.
type ChartPoint struct {
	Label    string   `json:"label"`
	Estimate Estimate `json:"estimate"`
}

// Chart returns the data to draw a.
func (a *Answer) Chart() Chart {
	c := Chart{
		Title: fmt.Sprintf("%s %v rather than %v", a.Cause, a.A, a.B), Cause: a.Cause,
		LabelA: a.A.String(), LabelB: a.B.String(), Level: a.Level,
		Rows: []ChartRow{}, Caution: Cautions[0] + " " + Cautions[1],
	}
	for _, o := range a.Outcomes {
		r := ChartRow{Outcome: o.Name, Scale: "mean", Downstream: o.Downstream, A: o.MeanA, B: o.MeanB, Difference: o.Difference,
			Ratio: unknown(), Adjusted: []ChartPoint{}, Paths: []ChartPoint{}, PathsNote: o.PathsNote}
		if o.Binary {
			r.Scale, r.Ratio = "risk", o.Ratio
		}
		for _, adj := range o.Adjusted {
			r.Adjusted = append(r.Adjusted, ChartPoint{Label: adj.Name, Estimate: adj.Difference})
		}
		if p := o.Paths; p != nil {
			r.Paths = append(r.Paths, ChartPoint{"total", p.Total}, ChartPoint{"direct", p.Direct})
			for _, m := range p.Mediators {
				r.Paths = append(r.Paths, ChartPoint{"through " + m.Name, m.Effect})
			}
		}
		c.Rows = append(c.Rows, r)
	}
	return c
}
