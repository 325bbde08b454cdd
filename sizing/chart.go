package sizing

import "fmt"

// Chart is what a report needs to draw a plan: one curve per edge of the
// share of studies that find it against the study size (a logarithmic
// axis suits the sizes), with Monte Carlo standard errors as error bars,
// and the expected number of false edges per study on a second panel.
type Chart struct {
	Title string `json:"title"`
	// Rows are the study sizes, the horizontal axis.
	Rows []int `json:"rows"`
	// Curves holds one curve per edge the order allows.
	Curves []Curve `json:"curves"`
	// FalseEdges is the expected number of false edges per study.
	FalseEdges Curve `json:"false_edges"`
	// Caution is the sentence to print under the chart.
	Caution string `json:"caution"`
}

// Curve is a labelled series over the study sizes.
type Curve struct {
	Label  string    `json:"label"`
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
		cv := Curve{Label: e.From + " → " + e.To}
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
