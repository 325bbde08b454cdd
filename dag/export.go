package dag

import (
	"encoding/csv"
	"encoding/json"
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/gonum/graph/encoding"
	"gonum.org/v1/gonum/graph/encoding/dot"

	"github.com/antecedent-lab/antecedent/internal/jsonfloat"
)

// DOT returns the graph in Graphviz's DOT language, through gonum's
// encoding/dot. Edge labels carry the standardised effect, whose meaning
// the graph's label states, negative effects are dashed, and pen width
// grows with selection frequency.
func (g *Graph) DOT(name string) ([]byte, error) {
	return dot.Marshal(g, name, "", "  ")
}

// attrs is a fixed list of DOT attributes.
type attrs []encoding.Attribute

// Attributes implements encoding.Attributer.
func (a attrs) Attributes() []encoding.Attribute { return a }

// DOTAttributers gives gonum's DOT encoder the graph's label: what the
// numbers on the edges measure, when any edge carries one.
func (g *Graph) DOTAttributers() (graph, node, edge encoding.Attributer) {
	var ga attrs
	for _, e := range g.edges {
		if !math.IsNaN(e.Standardized) || !math.IsNaN(e.Coefficient) {
			ga = attrs{{Key: "label", Value: `"Edge labels: ` + StandardizedMeaning + ` (coefficient on the variables' own scales where no standardised effect is known)."`},
				{Key: "labelloc", Value: "b"}, {Key: "fontsize", Value: "10"}}
			break
		}
	}
	return ga, attrs(nil), attrs(nil)
}

// NodeData describes a node for GraphMLNodes: its variable's kind and,
// for a binary or categorical variable, its levels (the reference first)
// and its coding in words.
type NodeData struct {
	Kind   string
	Levels []string
	Coding string
}

// GraphML writes the graph as GraphML (the open XML standard for graphs),
// with the edge attributes as typed data keys. Unknown attributes are
// omitted from an edge.
func (g *Graph) GraphML(w io.Writer) error { return g.GraphMLNodes(w, nil) }

// GraphMLNodes writes the graph as GraphML like GraphML, and for each node
// named in nodes its data: keys "kind", "levels" (a JSON array, the
// reference first), "reference" and "coding". Each key carries a
// description of its meaning.
func (g *Graph) GraphMLNodes(w io.Writer, nodes map[string]NodeData) error {
	type data struct {
		Key   string `xml:"key,attr"`
		Value string `xml:",chardata"`
	}
	type node struct {
		ID   string `xml:"id,attr"`
		Data []data `xml:"data"`
	}
	type edge struct {
		ID     string `xml:"id,attr"`
		Source string `xml:"source,attr"`
		Target string `xml:"target,attr"`
		Data   []data `xml:"data"`
	}
	type key struct {
		ID   string `xml:"id,attr"`
		For  string `xml:"for,attr"`
		Name string `xml:"attr.name,attr"`
		Type string `xml:"attr.type,attr"`
		Desc string `xml:"desc,omitempty"`
	}
	type graphEl struct {
		ID          string `xml:"id,attr"`
		EdgeDefault string `xml:"edgedefault,attr"`
		Nodes       []node `xml:"node"`
		Edges       []edge `xml:"edge"`
	}
	type doc struct {
		XMLName xml.Name `xml:"graphml"`
		NS      string   `xml:"xmlns,attr"`
		Keys    []key    `xml:"key"`
		Graph   graphEl  `xml:"graph"`
	}
	d := doc{
		NS: "http://graphml.graphdrawing.org/xmlns",
		Keys: []key{
			{"name", "node", "name", "string", ""},
			{"coefficient", "edge", "coefficient", "double", "effect on the variables' own scales (log odds for a binary child); for a categorical parent, of its strongest level"},
			{"lower", "edge", "lower", "double", "lower end of the coefficient's 95% interval"},
			{"upper", "edge", "upper", "double", "upper end of the coefficient's 95% interval"},
			{"standardized", "edge", "standardized", "double", StandardizedMeaning},
			{"frequency", "edge", "frequency", "double", "share of subsamples that selected the edge"},
			{"sign", "edge", "sign", "int", ""},
			{"required", "edge", "required", "boolean", "edge forced by the order"},
		},
		Graph: graphEl{ID: "G", EdgeDefault: "directed"},
	}
	if nodes != nil {
		d.Keys = append(d.Keys,
			key{"kind", "node", "kind", "string", "continuous, binary or categorical"},
			key{"levels", "node", "levels", "string", "the variable's values as a JSON array, the reference first; a binary variable is coded 0 for the first and 1 for the second"},
			key{"reference", "node", "reference", "string", "the level effects are measured against"},
			key{"coding", "node", "coding", "string", "the coding in words"})
	}
	for i, n := range g.names {
		nd := node{ID: fmt.Sprintf("n%d", i), Data: []data{{"name", n}}}
		if info, ok := nodes[n]; ok {
			if info.Kind != "" {
				nd.Data = append(nd.Data, data{"kind", info.Kind})
			}
			if len(info.Levels) > 0 {
				b, err := json.Marshal(info.Levels)
				if err != nil {
					return err
				}
				nd.Data = append(nd.Data, data{"levels", string(b)}, data{"reference", info.Levels[0]})
			}
			if info.Coding != "" {
				nd.Data = append(nd.Data, data{"coding", info.Coding})
			}
		}
		d.Graph.Nodes = append(d.Graph.Nodes, nd)
	}
	num := func(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }
	for k, e := range g.edges {
		ed := edge{ID: fmt.Sprintf("e%d", k), Source: fmt.Sprintf("n%d", g.index[e.From]), Target: fmt.Sprintf("n%d", g.index[e.To])}
		for _, kv := range []struct {
			k string
			v float64
		}{{"coefficient", e.Coefficient}, {"lower", e.Lower}, {"upper", e.Upper}, {"standardized", e.Standardized}, {"frequency", e.Frequency}} {
			if !math.IsNaN(kv.v) && !math.IsInf(kv.v, 0) {
				ed.Data = append(ed.Data, data{kv.k, num(kv.v)})
			}
		}
		ed.Data = append(ed.Data, data{"sign", strconv.Itoa(e.Sign)}, data{"required", strconv.FormatBool(e.Required)})
		d.Graph.Edges = append(d.Graph.Edges, ed)
	}
	if _, err := io.WriteString(w, xml.Header); err != nil {
		return err
	}
	enc := xml.NewEncoder(w)
	enc.Indent("", "  ")
	if err := enc.Encode(d); err != nil {
		return err
	}
	_, err := io.WriteString(w, "\n")
	return err
}

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

type jsonGraph struct {
	Nodes []string `json:"nodes"`
	Edges []Edge   `json:"edges"`
}

// MarshalJSON writes {"nodes": [...], "edges": [{"from", "to", ...}]},
// unknown attributes as null.
func (g *Graph) MarshalJSON() ([]byte, error) {
	j := jsonGraph{Nodes: g.names, Edges: g.edges}
	if j.Nodes == nil {
		j.Nodes = []string{}
	}
	if j.Edges == nil {
		j.Edges = []Edge{}
	}
	return json.Marshal(j)
}

// UnmarshalJSON reads the form MarshalJSON writes; missing attributes are
// unknown (NaN). Nodes named only by edges are added.
func (g *Graph) UnmarshalJSON(b []byte) error {
	var j jsonGraph
	if err := json.Unmarshal(b, &j); err != nil {
		return fmt.Errorf("%w: %v", ErrFormat, err)
	}
	names := j.Nodes
	seen := map[string]bool{}
	for _, n := range names {
		seen[n] = true
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
	*g = *ng
	return nil
}

// ReadJSON reads a graph in the JSON form.
func ReadJSON(r io.Reader) (*Graph, error) {
	b, err := io.ReadAll(io.LimitReader(r, 64<<20))
	if err != nil {
		return nil, err
	}
	g := new(Graph)
	if err := g.UnmarshalJSON(b); err != nil {
		return nil, err
	}
	return g, nil
}

// ReadEdgeCSV reads a known graph from CSV: a header naming "from" and
// "to" columns (any case; other columns are ignored), then one edge per
// row. A row with "to" empty declares an isolated node. Nodes take the
// order in which they first appear. Errors name the line.
func ReadEdgeCSV(r io.Reader) (*Graph, error) {
	cr := csv.NewReader(r)
	cr.FieldsPerRecord = -1
	head, err := cr.Read()
	if err != nil {
		if errors.Is(err, io.EOF) {
			return nil, fmt.Errorf("%w: empty edge list", ErrFormat)
		}
		return nil, fmt.Errorf("%w: %v", ErrFormat, err)
	}
	from, to := -1, -1
	for i, h := range head {
		switch strings.ToLower(strings.TrimSpace(strings.TrimPrefix(h, "\ufeff"))) {
		case "from":
			from = i
		case "to":
			to = i
		}
	}
	if from < 0 || to < 0 {
		return nil, fmt.Errorf("%w: line 1: header needs columns \"from\" and \"to\", got %q", ErrFormat, head)
	}
	var names []string
	seen := map[string]bool{}
	add := func(n string) {
		if !seen[n] {
			seen[n] = true
			names = append(names, n)
		}
	}
	var edges []Edge
	for {
		rec, err := cr.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return nil, fmt.Errorf("%w: %v", ErrFormat, err)
		}
		line, _ := cr.FieldPos(0)
		if from >= len(rec) || to >= len(rec) {
			return nil, fmt.Errorf("%w: line %d has %d fields", ErrFormat, line, len(rec))
		}
		a, b := strings.TrimSpace(rec[from]), strings.TrimSpace(rec[to])
		if a == "" {
			return nil, fmt.Errorf("%w: line %d has an empty \"from\"", ErrFormat, line)
		}
		add(a)
		if b == "" {
			continue
		}
		add(b)
		edges = append(edges, NewEdge(a, b))
	}
	return New(names, edges)
}
