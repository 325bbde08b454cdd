package dag

import (
	"fmt"
	"maps"
	"slices"
)

// NodeData is what a graph knows of a node besides its name and edges:
// the tier of the time order it belongs to, and its variable's kind,
// levels and coding. Every export writes it and every reader gives it
// back. The zero value is "unknown".
type NodeData struct {
	// Tier is the node's tier in the time order, counted from 1; zero
	// is unknown.
	Tier int
	// TierLabel is the tier's label, if the order gives one.
	TierLabel string
	// Kind is "continuous", "binary" or "categorical", or empty.
	Kind string
	// Levels are a binary or categorical variable's values, the
	// reference first; a binary variable is coded 0 for the first and 1
	// for the second.
	Levels []string
	// Coding says the coding in words.
	Coding string
}

func (d NodeData) isZero() bool {
	return d.Tier == 0 && d.TierLabel == "" && d.Kind == "" && len(d.Levels) == 0 && d.Coding == ""
}

// WithNodeData returns a copy of the graph whose nodes carry the given
// data, replacing any they had. It returns an error for a name that is not
// a node or a negative tier. Data are copied.
func (g *Graph) WithNodeData(data map[string]NodeData) (*Graph, error) {
	c := *g
	c.data = nil
	for name, d := range data {
		if _, ok := g.index[name]; !ok {
			return nil, fmt.Errorf("%w: data given for %q, which is not a node", ErrNode, name)
		}
		if d.Tier < 0 {
			return nil, fmt.Errorf("%w: node %q has tier %d; tiers count from 1", ErrNode, name, d.Tier)
		}
		if d.isZero() {
			continue
		}
		if c.data == nil {
			c.data = make(map[string]NodeData, len(data))
		}
		d.Levels = slices.Clone(d.Levels)
		c.data[name] = d
	}
	return &c, nil
}

// NodeData returns the named node's data, the zero value when it has none
// or the name is not a node.
func (g *Graph) NodeData(name string) NodeData {
	d := g.data[name]
	d.Levels = slices.Clone(d.Levels)
	return d
}

// tiers returns the nodes grouped by known tier, tiers ascending, nodes in
// graph order; nodes of unknown tier are left out.
func (g *Graph) tiers() (tiers []int, members map[int][]string) {
	members = map[int][]string{}
	for _, n := range g.names {
		if t := g.data[n].Tier; t > 0 {
			members[t] = append(members[t], n)
		}
	}
	tiers = slices.Sorted(maps.Keys(members))
	return tiers, members
}

// tierLabel returns the first label given to a node of tier t.
func (g *Graph) tierLabel(t int) string {
	for _, n := range g.names {
		if d := g.data[n]; d.Tier == t && d.TierLabel != "" {
			return d.TierLabel
		}
	}
	return ""
}
