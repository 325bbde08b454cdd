package dag

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"

	"github.com/antecedent-lab/antecedent/internal/jsonfloat"
)

// jsonEdge is an Edge's JSON form: unknown attributes are null.
type jsonEdge struct {
	From         string          `json:"from"`
	To           string          `json:"to"`
	Coefficient  jsonfloat.Float `json:"coefficient"`
	Lower        jsonfloat.Float `json:"lower"`
	Upper        jsonfloat.Float `json:"upper"`
	Standardized jsonfloat.Float `json:"standardized"`
	Frequency    jsonfloat.Float `json:"frequency"`
	Sign         int             `json:"sign"`
	Required     bool            `json:"required,omitempty"`
}

// MarshalJSON writes the edge as an object with unknown attributes null.
func (e Edge) MarshalJSON() ([]byte, error) {
	return json.Marshal(jsonEdge{e.From, e.To, jsonfloat.Float(e.Coefficient), jsonfloat.Float(e.Lower), jsonfloat.Float(e.Upper),
		jsonfloat.Float(e.Standardized), jsonfloat.Float(e.Frequency), e.Sign, e.Required})
}

// UnmarshalJSON reads the form MarshalJSON writes; a missing or null
// attribute is unknown (NaN).
func (e *Edge) UnmarshalJSON(b []byte) error {
	nan := jsonfloat.Float(math.NaN())
	j := jsonEdge{Coefficient: nan, Lower: nan, Upper: nan, Standardized: nan, Frequency: nan}
	if err := json.Unmarshal(b, &j); err != nil {
		return err
	}
	*e = Edge{From: j.From, To: j.To, Coefficient: float64(j.Coefficient), Lower: float64(j.Lower), Upper: float64(j.Upper),
		Standardized: float64(j.Standardized), Frequency: float64(j.Frequency), Sign: j.Sign, Required: j.Required}
	return nil
}

// jsonNode is a node's JSON form, the same keys as a node of the
// discovery's result JSON, so that ReadJSON reads either.
type jsonNode struct {
	Name      string   `json:"name"`
	Tier      *int     `json:"tier"`
	TierLabel *string  `json:"tier_label"`
	Kind      *string  `json:"kind"`
	Levels    []string `json:"levels"`
	Coding    *string  `json:"coding"`
}

// UnmarshalJSON reads a node as an object or as a bare name.
func (n *jsonNode) UnmarshalJSON(b []byte) error {
	if t := bytes.TrimSpace(b); len(t) > 0 && t[0] == '"' {
		*n = jsonNode{}
		return json.Unmarshal(t, &n.Name)
	}
	type plain jsonNode
	return json.Unmarshal(b, (*plain)(n))
}

type jsonGraph struct {
	Nodes []jsonNode `json:"nodes"`
	Edges []Edge     `json:"edges"`
}

// MarshalJSON writes {"nodes": [{"name", "tier", "tier_label", "kind",
// "levels", "coding"}], "edges": [{"from", "to", ...}]}, every key present
// and unknown values null.
func (g *Graph) MarshalJSON() ([]byte, error) {
	j := jsonGraph{Nodes: make([]jsonNode, len(g.names)), Edges: g.edges}
	str := func(s string) *string {
		if s == "" {
			return nil
		}
		return &s
	}
	for i, n := range g.names {
		d := g.data[n]
		j.Nodes[i] = jsonNode{Name: n, TierLabel: str(d.TierLabel), Kind: str(d.Kind), Levels: d.Levels, Coding: str(d.Coding)}
		if d.Tier > 0 {
			j.Nodes[i].Tier = &d.Tier
		}
	}
	if j.Edges == nil {
		j.Edges = []Edge{}
	}
	return json.Marshal(j)
}

// UnmarshalJSON reads the form MarshalJSON writes, and also the
// discovery's result JSON (whose nodes and edges have the same keys among
// others) and a list of bare node names; missing attributes are unknown
// (NaN). Nodes named only by edges are added.
func (g *Graph) UnmarshalJSON(b []byte) error {
	var j jsonGraph
	if err := json.Unmarshal(b, &j); err != nil {
		return fmt.Errorf("%w: %v", ErrFormat, err)
	}
	names := make([]string, 0, len(j.Nodes))
	data := map[string]NodeData{}
	seen := map[string]bool{}
	for _, n := range j.Nodes {
		names = append(names, n.Name)
		seen[n.Name] = true
		var d NodeData
		if n.Tier != nil {
			d.Tier = *n.Tier
		}
		if n.TierLabel != nil {
			d.TierLabel = *n.TierLabel
		}
		if n.Kind != nil {
			d.Kind = *n.Kind
		}
		if n.Coding != nil {
			d.Coding = *n.Coding
		}
		d.Levels = n.Levels
		if !d.isZero() {
			data[n.Name] = d
		}
	}
	for _, e := range j.Edges {
		for _, n := range []string{e.From, e.To} {
			if !seen[n] && n != "" {
				seen[n] = true
				names = append(names, n)
			}
		}
	}
	ng, err := New(names, j.Edges)
	if err != nil {
		return err
	}
	if ng, err = ng.WithNodeData(data); err != nil {
		return err
	}
	*g = *ng
	return nil
}

// maxJSON bounds the bytes ReadJSON reads: a result JSON of a very wide
// study (its curves and paths included) stays well below it.
const maxJSON = 1 << 30

// ReadJSON reads a graph in the JSON form, or the network of a result JSON
// written by the discovery.
func ReadJSON(r io.Reader) (*Graph, error) {
	b, err := io.ReadAll(io.LimitReader(r, maxJSON+1))
	if err != nil {
		return nil, err
	}
	if len(b) > maxJSON {
		return nil, fmt.Errorf("%w: JSON larger than %d bytes", ErrFormat, maxJSON)
	}
	g := new(Graph)
	if err := g.UnmarshalJSON(b); err != nil {
		return nil, err
	}
	return g, nil
}
