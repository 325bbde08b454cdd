package dag

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"gonum.org/v1/gonum/graph"
	"gonum.org/v1/gonum/graph/iterator"
)

// Sentinel errors that callers can test with errors.Is.
var (
	ErrCycle    = errors.New("dag: cycle")
	ErrNode     = errors.New("dag: bad node")
	ErrEdge     = errors.New("dag: bad edge")
	ErrFormat   = errors.New("dag: bad input format")
	errInternal = errors.New("dag: internal")
)

// Edge is a directed edge with the attributes a discovered network
// carries. Attributes that were not computed are NaN. It is the one edge
// type of the project: the discovery's result, the graph, its exports and
// graph comparison all use it.
type Edge struct {
	From, To string
	// Coefficient is the effect on the original scale of the variables
	// (log odds per unit for a binary child; for a categorical parent, the
	// effect of its strongest level).
	Coefficient float64
	// Lower and Upper bound Coefficient's 95% confidence interval.
	Lower, Upper float64
	// Standardized is the edge's strength on one scale for every edge,
	// the meaning StandardizedMeaning states: the effect per standard
	// deviation of a continuous parent, from 0 to 1 for a binary parent,
	// from the reference to the strongest level for a categorical parent;
	// in standard deviations of a continuous child, in log odds for a
	// binary child.
	Standardized float64
	// Frequency is the share of resamples that selected the edge.
	Frequency float64
	// Sign is +1, −1 or 0 (unknown).
	Sign int
	// Required marks an edge forced by the order.
	Required bool
}

// StandardizedMeaning says in words what Edge.Standardized measures, for
// display wherever the number is shown.
const StandardizedMeaning = "standardised effect: per standard deviation of a continuous parent, " +
	"from 0 to 1 (reference to coded 1) for a binary parent, from the reference to the strongest level for a categorical parent; " +
	"measured in standard deviations of a continuous child and in log odds of a binary child"

// NewEdge returns an edge with every attribute unknown.
func NewEdge(from, to string) Edge {
	nan := math.NaN()
	return Edge{From: from, To: to, Coefficient: nan, Lower: nan, Upper: nan, Standardized: nan, Frequency: nan}
}

// Node is a node of a Graph; it implements graph.Node and dot.Node.
type Node struct {
	id   int64
	name string
}

// ID returns the node's id, its index in Graph.Names.
func (n Node) ID() int64 { return n.id }

// Name returns the node's variable name.
func (n Node) Name() string { return n.name }

// DOTID returns the name, for gonum's DOT encoder.
func (n Node) DOTID() string { return n.name }

// Graph is an immutable DAG of named nodes.
type Graph struct {
	names    []string
	index    map[string]int
	edges    []Edge
	byPair   map[[2]int]int // edge index by (from, to)
	parents  [][]int
	children [][]int
	topo     []int
	data     map[string]NodeData // nil when no node carries data
}

var _ graph.Directed = (*Graph)(nil)

// CycleError reports a directed cycle found by New.
type CycleError struct {
	Cycle []string // names along the cycle, first repeated at the end
}

// Error implements the error interface.
func (e *CycleError) Error() string {
	return "dag: cycle " + strings.Join(e.Cycle, " -> ")
}

// Unwrap returns ErrCycle.
func (e *CycleError) Unwrap() error { return ErrCycle }

// New builds a graph with the named nodes and edges. It returns an error
// for a duplicate or empty node name, an edge naming an unknown node, a
// self-loop, a repeated edge, or a directed cycle (a *CycleError naming
// the nodes along it). The inputs are copied.
func New(names []string, edges []Edge) (*Graph, error) {
	g := &Graph{
		names:    slices.Clone(names),
		index:    make(map[string]int, len(names)),
		byPair:   make(map[[2]int]int, len(edges)),
		parents:  make([][]int, len(names)),
		children: make([][]int, len(names)),
	}
	for i, n := range names {
		if n == "" {
			return nil, fmt.Errorf("%w: node %d has an empty name", ErrNode, i)
		}
		if _, dup := g.index[n]; dup {
			return nil, fmt.Errorf("%w: node %q given twice", ErrNode, n)
		}
		g.index[n] = i
	}
	for k, e := range edges {
		a, ok1 := g.index[e.From]
		b, ok2 := g.index[e.To]
		switch {
		case !ok1 || !ok2:
			missing := e.From
			if ok1 {
				missing = e.To
			}
			return nil, fmt.Errorf("%w: edge %d (%s -> %s) names unknown node %q", ErrEdge, k, e.From, e.To, missing)
		case a == b:
			return nil, fmt.Errorf("%w: self-loop on %q", ErrEdge, e.From)
		}
		if _, dup := g.byPair[[2]int{a, b}]; dup {
			return nil, fmt.Errorf("%w: edge %s -> %s given twice", ErrEdge, e.From, e.To)
		}
		g.byPair[[2]int{a, b}] = len(g.edges)
		g.edges = append(g.edges, e)
		g.parents[b] = append(g.parents[b], a)
		g.children[a] = append(g.children[a], b)
	}
	for i := range names {
		slices.Sort(g.parents[i])
		slices.Sort(g.children[i])
	}
	if err := g.sort(); err != nil {
		return nil, err
	}
	return g, nil
}

// sort computes a topological order by Kahn's algorithm, smallest index
// first among ready nodes, or reports a cycle.
func (g *Graph) sort() error {
	n := len(g.names)
	indeg := make([]int, n)
	for i := range n {
		indeg[i] = len(g.parents[i])
	}
	var ready []int
	for i := range n {
		if indeg[i] == 0 {
			ready = append(ready, i)
		}
	}
	for len(ready) > 0 {
		slices.Sort(ready)
		i := ready[0]
		ready = ready[1:]
		g.topo = append(g.topo, i)
		for _, c := range g.children[i] {
			indeg[c]--
			if indeg[c] == 0 {
				ready = append(ready, c)
			}
		}
	}
	if len(g.topo) == n {
		return nil
	}
	// Walk parents among the unsorted nodes until one repeats.
	left := make([]bool, n)
	for i := range left {
		left[i] = indeg[i] > 0
	}
	start := slices.Index(left, true)
	seen := map[int]int{}
	var walk []int
	for v := start; ; {
		if at, ok := seen[v]; ok {
			cyc := walk[at:]
			slices.Reverse(cyc)
			names := make([]string, 0, len(cyc)+1)
			for _, u := range cyc {
				names = append(names, g.names[u])
			}
			names = append(names, names[0])
			return &CycleError{Cycle: names}
		}
		seen[v] = len(walk)
		walk = append(walk, v)
		for _, p := range g.parents[v] {
			if left[p] {
				v = p
				break
			}
		}
	}
}

// Names returns the node names in id order.
func (g *Graph) Names() []string { return slices.Clone(g.names) }

// Len returns the number of nodes.
func (g *Graph) Len() int { return len(g.names) }

// Edges returns the edges in the order given to New.
func (g *Graph) Edges() []Edge { return slices.Clone(g.edges) }

// EdgeBetween returns the edge from → to and whether it exists.
func (g *Graph) EdgeBetween(from, to string) (Edge, bool) {
	a, ok1 := g.index[from]
	b, ok2 := g.index[to]
	if !ok1 || !ok2 {
		return Edge{}, false
	}
	k, ok := g.byPair[[2]int{a, b}]
	if !ok {
		return Edge{}, false
	}
	return g.edges[k], true
}

func (g *Graph) lookup(name string) (int, error) {
	i, ok := g.index[name]
	if !ok {
		return 0, fmt.Errorf("%w: no node %q", ErrNode, name)
	}
	return i, nil
}

func (g *Graph) namesOf(ids []int) []string {
	out := make([]string, len(ids))
	for k, i := range ids {
		out[k] = g.names[i]
	}
	return out
}

// Parents returns the parents of name in id order.
func (g *Graph) Parents(name string) ([]string, error) {
	i, err := g.lookup(name)
	if err != nil {
		return nil, err
	}
	return g.namesOf(g.parents[i]), nil
}

// Children returns the children of name in id order.
func (g *Graph) Children(name string) ([]string, error) {
	i, err := g.lookup(name)
	if err != nil {
		return nil, err
	}
	return g.namesOf(g.children[i]), nil
}

// MarkovBlanket returns the parents, the children and the children's other
// parents of name, in id order: the smallest set that makes name
// independent of every other node in a distribution faithful to the DAG.
func (g *Graph) MarkovBlanket(name string) ([]string, error) {
	i, err := g.lookup(name)
	if err != nil {
		return nil, err
	}
	in := make([]bool, len(g.names))
	for _, p := range g.parents[i] {
		in[p] = true
	}
	for _, c := range g.children[i] {
		in[c] = true
		for _, p := range g.parents[c] {
			in[p] = true
		}
	}
	in[i] = false
	var ids []int
	for k, ok := range in {
		if ok {
			ids = append(ids, k)
		}
	}
	return g.namesOf(ids), nil
}

// Ancestors returns every node with a directed path to name, in id order.
func (g *Graph) Ancestors(name string) ([]string, error) { return g.reach(name, g.parents) }

// Descendants returns every node reached from name by a directed path, in
// id order.
func (g *Graph) Descendants(name string) ([]string, error) { return g.reach(name, g.children) }

func (g *Graph) reach(name string, next [][]int) ([]string, error) {
	i, err := g.lookup(name)
	if err != nil {
		return nil, err
	}
	seen := make([]bool, len(g.names))
	stack := []int{i}
	for len(stack) > 0 {
		v := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		for _, u := range next[v] {
			if !seen[u] {
				seen[u] = true
				stack = append(stack, u)
			}
		}
	}
	var ids []int
	for k, ok := range seen {
		if ok {
			ids = append(ids, k)
		}
	}
	return g.namesOf(ids), nil
}

// TopologicalOrder returns the names so that every edge goes from an
// earlier to a later name; among nodes that could come next, the one with
// the smallest id comes first.
func (g *Graph) TopologicalOrder() []string { return g.namesOf(g.topo) }

// gonum graph.Directed implementation.

func (g *Graph) node(i int) graph.Node { return Node{id: int64(i), name: g.names[i]} }

func (g *Graph) nodes(ids []int) graph.Nodes {
	if len(ids) == 0 {
		return graph.Empty
	}
	ns := make([]graph.Node, len(ids))
	for k, i := range ids {
		ns[k] = g.node(i)
	}
	return iterator.NewOrderedNodes(ns)
}

func (g *Graph) valid(id int64) bool { return id >= 0 && id < int64(len(g.names)) }

// Node returns the node with the given id, or nil.
func (g *Graph) Node(id int64) graph.Node {
	if !g.valid(id) {
		return nil
	}
	return g.node(int(id))
}

// Nodes returns every node in id order.
func (g *Graph) Nodes() graph.Nodes {
	ids := make([]int, len(g.names))
	for i := range ids {
		ids[i] = i
	}
	return g.nodes(ids)
}

// From returns the children of the node with the given id.
func (g *Graph) From(id int64) graph.Nodes {
	if !g.valid(id) {
		return graph.Empty
	}
	return g.nodes(g.children[id])
}

// To returns the parents of the node with the given id.
func (g *Graph) To(id int64) graph.Nodes {
	if !g.valid(id) {
		return graph.Empty
	}
	return g.nodes(g.parents[id])
}

// HasEdgeBetween reports whether an edge joins x and y in either direction.
func (g *Graph) HasEdgeBetween(x, y int64) bool {
	return g.HasEdgeFromTo(x, y) || g.HasEdgeFromTo(y, x)
}

// HasEdgeFromTo reports whether there is an edge u → v.
func (g *Graph) HasEdgeFromTo(u, v int64) bool {
	if !g.valid(u) || !g.valid(v) {
		return false
	}
	_, ok := g.byPair[[2]int{int(u), int(v)}]
	return ok
}

// Edge returns the edge u → v, or nil.
func (g *Graph) Edge(u, v int64) graph.Edge {
	if !g.HasEdgeFromTo(u, v) {
		return nil
	}
	return gonumEdge{from: g.node(int(u)), to: g.node(int(v)), e: g.edges[g.byPair[[2]int{int(u), int(v)}]]}
}

// gonumEdge adapts an Edge to graph.Edge.
type gonumEdge struct {
	from, to graph.Node
	e        Edge
}

func (e gonumEdge) From() graph.Node { return e.from }
func (e gonumEdge) To() graph.Node   { return e.to }
func (e gonumEdge) ReversedEdge() graph.Edge {
	r := e.e
	r.From, r.To = e.e.To, e.e.From
	return gonumEdge{from: e.to, to: e.from, e: r}
}
