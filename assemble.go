package antecedent

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"github.com/antecedent-lab/antecedent/dag"
	"github.com/antecedent-lab/antecedent/internal/stability"
	"github.com/antecedent-lab/antecedent/order"
)

// assemble builds the result from the finished nodes: the edges with their
// effects, the graph's Markov blankets, same-tier links, warnings and the
// stability report.
func (r *run) assemble(o *order.Order, fits []nodeFit) (*Result, error) {
	res := &Result{Order: o, Config: r.cfg, Rows: r.d.Rows(), Nodes: make([]Node, len(fits)), Edges: []dag.Edge{}}
	res.Config.Progress = nil
	names := make([]string, len(fits))
	for v, f := range fits {
		names[v] = f.node.Name
		for _, q := range f.parents {
			res.Edges = append(res.Edges, r.edge(v, f, q))
		}
	}
	g, err := dag.New(names, res.Edges)
	if err != nil {
		return nil, fmt.Errorf("antecedent: internal error building the graph: %w", err)
	}
	res.Warnings = append([]string{}, r.warnings...)
	for v, f := range fits {
		res.Nodes[v] = f.node
		r.coding(&res.Nodes[v], v)
		mb, _ := g.MarkovBlanket(f.node.Name)
		if mb == nil {
			mb = []string{}
		}
		res.Nodes[v].MarkovBlanket = mb
		for _, w := range f.node.Warnings {
			res.Warnings = append(res.Warnings, fmt.Sprintf("%s: %s", f.node.Name, w))
		}
	}
	if r.baseRows != nil {
		res.Warnings = append(res.Warnings, fmt.Sprintf("complete-case analysis used %d of %d rows", len(r.baseRows), r.d.Rows()))
	}
	res.Links = r.links(fits)
	if r.cfg.Stability.Pairs > 0 {
		res.Stability = r.stabilityReport(fits)
		res.Stability.Vacuous = float64(res.Stability.ExpectedFalse) >= float64(len(res.Edges))
		res.Stability.Explanation = res.Stability.explain()
	}
	return res, nil
}

// coding copies variable v's levels and coding into its node.
func (r *run) coding(n *Node, v int) {
	vr := r.vars[v]
	n.Levels, n.Reference, n.Coding = slices.Clone(vr.Levels), vr.Reference(), vr.Coding()
}

// edge returns the edge from parent q into node f of variable v, carrying the refit
// effect of q's strongest term (by standardised size), its interval, its
// selection frequency and its sign.
func (r *run) edge(v int, f nodeFit, q int) dag.Edge {
	e := dag.NewEdge(r.vars[q].Name, f.node.Name)
	e.Required = slices.Contains(r.plan.Required[v], q)
	best := -1.0
	for _, ef := range f.node.Effects {
		if ef.Parent != e.From {
			continue
		}
		size := math.Abs(float64(ef.Standardized))
		if math.IsNaN(size) {
			size = 0
		}
		if size > best {
			best = size
			e.Coefficient, e.Lower, e.Upper, e.Standardized = float64(ef.Estimate), float64(ef.Lower), float64(ef.Upper), float64(ef.Standardized)
		}
	}
	if f.selection != nil {
		if fr, ok := f.selection.Frequency[q]; ok {
			e.Frequency = fr
		}
	}
	switch {
	case e.Coefficient > 0:
		e.Sign = 1
	case e.Coefficient < 0:
		e.Sign = -1
	}
	return e
}

// links returns the same-tier links, each pair once, in variable order.
func (r *run) links(fits []nodeFit) []Link {
	seen := map[[2]int]int{}
	for v, f := range fits {
		for _, p := range f.peers {
			seen[[2]int{min(v, p), max(v, p)}]++
		}
	}
	keys := make([][2]int, 0, len(seen))
	links := []Link{}
	for k := range seen {
		keys = append(keys, k)
	}
	slices.SortFunc(keys, func(a, b [2]int) int { return cmp.Or(a[0]-b[0], a[1]-b[1]) })
	for _, k := range keys {
		links = append(links, Link{A: r.vars[k[0]].Name, B: r.vars[k[1]].Name, Both: seen[k] == 2})
	}
	return links
}

// stabilityReport sums the per-node bounds on falsely selected edges.
func (r *run) stabilityReport(fits []nodeFit) *StabilityReport {
	rep := &StabilityReport{Pairs: r.cfg.Stability.Pairs, Threshold: r.cfg.Stability.Threshold}
	var total float64
	for _, f := range fits {
		if !f.node.Fitted || f.selection == nil || f.counted == 0 {
			continue
		}
		q := f.selection.MeanSelected
		b := stability.Bound(q, f.counted, r.cfg.Stability.Threshold)
		total += b
		rep.Nodes = append(rep.Nodes, StabilityNode{Name: f.node.Name, Selected: q, Candidates: f.counted, Bound: Number(b)})
	}
	rep.ExpectedFalse = Number(total)
	return rep
}
