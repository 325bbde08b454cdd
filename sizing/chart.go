package sizing

import "fmt"

// Chart is what a report needs to draw a plan: one curve per edge of the
// share of studies that find it against the study size (a logarithmic
// axis suits the sizes), with Monte Carlo standard errors as error bars,
// the expected number of false edges per study, and, for an answer to
// "rows needed", the target share and the rows read from the curve. The
// drawing itself (positions, labels) belongs to the report.
type Chart struct {
	Title string `json:"title"`
	// Rows are the study sizes, the horizontal axis.
	Rows []int `json:"rows"`
	// Curves holds one curve per edge the order allows.
	Curves []Curve `json:"curves"`
	// FalseEdges is the expected number of false edges per study.
	FalseEdges Curve `json:"false_edges"`
	// Needed, when not nil, is the answer to "rows needed to find an edge
	// with a given probability" that the chart marks: the target share
	// (Needed.Probability) and the rows read from the edge's curve.
	Needed *Needed `json:"rows_needed,omitempty"`
	// Caution is the sentence to print under the chart.
	Caution string `json:"caution"`
}

// Curve is a labelled series over the study sizes. From and To name the
// edge (both empty for the false-edge count).
type Curve struct {
	Label  string    `json:"label"`
	From   string    `json:"from,omitempty"`
	To     string    `json:"to,omitempty"`
	Values []float64 `json:"values"`
	SE     []float64 `json:"se"`
}

// Chart returns the data to draw p.
func (p *Plan) Chart() Chart {
	c := Chart{
		Title: fmt.Sprintf("Share of %d simulated studies per size that find each edge", p.Replicates),
		Rows:  append([]int{}, p.Sizes...), Curves: []Curve{},
		FalseEdges: Curve{Label: "false edges per study"},
		Caution:    Cautions[0] + " " + Cautions[1],
	}
	for _, e := range p.Edges {
		if !e.Allowed {
			continue
		}
		cv := Curve{Label: e.From + " → " + e.To, From: e.From, To: e.To}
		for _, r := range e.Found {
			cv.Values = append(cv.Values, r.Value)
			cv.SE = append(cv.SE, r.SE)
		}
		c.Curves = append(c.Curves, cv)
	}
	for _, f := range p.False {
		c.FalseEdges.Values = append(c.FalseEdges.Values, f.Mean)
		c.FalseEdges.SE = append(c.FalseEdges.SE, f.SE)
	}
	return c
}

// Answer is a plan with the answer to "rows needed" for one edge, when
// one was asked: what the studysize command writes as JSON and a report
// draws.
type Answer struct {
	Plan   *Plan   `json:"plan"`
	Needed *Needed `json:"rows_needed,omitempty"`
}

// Chart returns the data to draw a: its plan's chart with the rows
// needed marked.
func (a *Answer) Chart() Chart {
	c := a.Plan.Chart()
	if a.Needed != nil {
		n := *a.Needed
		c.Needed = &n
		c.Title = fmt.Sprintf("Rows needed to find %s → %s in %.0f%% of studies", n.From, n.To, 100*n.Probability)
	}
	return c
}
