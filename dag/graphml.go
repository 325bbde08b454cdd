package dag

import (
	"encoding/json"
	"encoding/xml"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
)

// graphmlNS is the GraphML namespace.
const graphmlNS = "http://graphml.graphdrawing.org/xmlns"

type gmlData struct {
	Key   string `xml:"key,attr"`
	Value string `xml:",chardata"`
}

type gmlNode struct {
	ID   string    `xml:"id,attr"`
	Data []gmlData `xml:"data"`
}

type gmlEdge struct {
	ID       string    `xml:"id,attr,omitempty"`
	Source   string    `xml:"source,attr"`
	Target   string    `xml:"target,attr"`
	Directed string    `xml:"directed,attr,omitempty"`
	Data     []gmlData `xml:"data"`
}

type gmlKey struct {
	ID      string  `xml:"id,attr"`
	For     string  `xml:"for,attr"`
	Name    string  `xml:"attr.name,attr"`
	Type    string  `xml:"attr.type,attr"`
	Desc    string  `xml:"desc,omitempty"`
	Default *string `xml:"default"`
}

type gmlGraph struct {
	ID          string    `xml:"id,attr"`
	EdgeDefault string    `xml:"edgedefault,attr"`
	Nodes       []gmlNode `xml:"node"`
	Edges       []gmlEdge `xml:"edge"`
}

type gmlDoc struct {
	XMLName xml.Name   `xml:"graphml"`
	NS      string     `xml:"xmlns,attr"`
	Keys    []gmlKey   `xml:"key"`
	Graphs  []gmlGraph `xml:"graph"`
}

// gmlKeys are the data keys GraphML writes, with their types and
// meanings; ReadGraphML reads the same names.
var gmlKeys = []gmlKey{
	{ID: "name", For: "node", Name: "name", Type: "string", Desc: "the variable's name"},
	{ID: "tier", For: "node", Name: "tier", Type: "int", Desc: "the variable's tier in the time order, counted from 1"},
	{ID: "tier_label", For: "node", Name: "tier_label", Type: "string", Desc: "the tier's label in the order"},
	{ID: "kind", For: "node", Name: "kind", Type: "string", Desc: "continuous, binary or categorical"},
	{ID: "levels", For: "node", Name: "levels", Type: "string", Desc: "the variable's values as a JSON array, the reference first; a binary variable is coded 0 for the first and 1 for the second"},
	{ID: "reference", For: "node", Name: "reference", Type: "string", Desc: "the level effects are measured against"},
	{ID: "coding", For: "node", Name: "coding", Type: "string", Desc: "the coding in words"},
	{ID: "coefficient", For: "edge", Name: "coefficient", Type: "double", Desc: "effect on the variables' own scales (log odds for a binary child); for a categorical parent, of its strongest level"},
	{ID: "lower", For: "edge", Name: "lower", Type: "double", Desc: "lower end of the coefficient's 95% interval"},
	{ID: "upper", For: "edge", Name: "upper", Type: "double", Desc: "upper end of the coefficient's 95% interval"},
	{ID: "standardized", For: "edge", Name: "standardized", Type: "double", Desc: StandardizedMeaning},
	{ID: "frequency", For: "edge", Name: "frequency", Type: "double", Desc: "share of subsamples that selected the edge"},
	{ID: "sign", For: "edge", Name: "sign", Type: "int", Desc: "+1, -1, or 0 when unknown"},
	{ID: "required", For: "edge", Name: "required", Type: "boolean", Desc: "edge forced by the order"},
}

// GraphML writes the graph as GraphML, the open XML standard for graphs.
// Nodes carry their name and, where known, their data (tier, tier label,
// kind, levels as a JSON array, reference, coding); edges carry their
// attributes; each as a typed data key with a description of its meaning.
// An unknown value is left out. ReadGraphML reads it back.
func (g *Graph) GraphML(w io.Writer) error {
	d := gmlDoc{NS: graphmlNS, Keys: gmlKeys, Graphs: []gmlGraph{{ID: "G", EdgeDefault: "directed"}}}
	gr := &d.Graphs[0]
	for i, n := range g.names {
		nd := gmlNode{ID: fmt.Sprintf("n%d", i), Data: []gmlData{{"name", n}}}
		info := g.data[n]
		if info.Tier > 0 {
			nd.Data = append(nd.Data, gmlData{"tier", strconv.Itoa(info.Tier)})
		}
		if info.TierLabel != "" {
			nd.Data = append(nd.Data, gmlData{"tier_label", info.TierLabel})
		}
		if info.Kind != "" {
			nd.Data = append(nd.Data, gmlData{"kind", info.Kind})
		}
		if len(info.Levels) > 0 {
			b, err := json.Marshal(info.Levels)
			if err != nil {
				return err
			}
			nd.Data = append(nd.Data, gmlData{"levels", string(b)}, gmlData{"reference", info.Levels[0]})
		}
		if info.Coding != "" {
			nd.Data = append(nd.Data, gmlData{"coding", info.Coding})
		}
		gr.Nodes = append(gr.Nodes, nd)
	}
	for k, e := range g.edges {
		ed := gmlEdge{ID: fmt.Sprintf("e%d", k), Source: fmt.Sprintf("n%d", g.index[e.From]), Target: fmt.Sprintf("n%d", g.index[e.To])}
		for _, kv := range []struct {
			k string
			v float64
		}{{"coefficient", e.Coefficient}, {"lower", e.Lower}, {"upper", e.Upper}, {"standardized", e.Standardized}, {"frequency", e.Frequency}} {
			if !math.IsNaN(kv.v) && !math.IsInf(kv.v, 0) {
				ed.Data = append(ed.Data, gmlData{kv.k, strconv.FormatFloat(kv.v, 'g', -1, 64)})
			}
		}
		ed.Data = append(ed.Data, gmlData{"sign", strconv.Itoa(e.Sign)}, gmlData{"required", strconv.FormatBool(e.Required)})
		gr.Edges = append(gr.Edges, ed)
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

// maxGraphML bounds the bytes ReadGraphML reads.
const maxGraphML = 256 << 20

// ReadGraphML reads a directed graph from GraphML: the form GraphML
// writes, or one written by another program. Data keys are matched by
// their attr.name (the names GraphML writes; others are ignored) and their
// defaults apply; a node's name is its "name" data or else its id. It
// returns an error naming the element for an undirected graph or edge, an
// edge naming an unknown node, a value that is not of its key's type, or a
// file with no graph.
func ReadGraphML(r io.Reader) (*Graph, error) {
	var d gmlDoc
	dec := xml.NewDecoder(io.LimitReader(r, maxGraphML))
	if err := dec.Decode(&d); err != nil {
		return nil, fmt.Errorf("%w: GraphML: %v", ErrFormat, err)
	}
	if d.XMLName.Local != "graphml" {
		return nil, fmt.Errorf("%w: GraphML: root element is <%s>, not <graphml>", ErrFormat, d.XMLName.Local)
	}
	if len(d.Graphs) != 1 {
		return nil, fmt.Errorf("%w: GraphML: %d graphs in the file, want one", ErrFormat, len(d.Graphs))
	}
	gr := d.Graphs[0]
	if gr.EdgeDefault != "directed" {
		return nil, fmt.Errorf("%w: GraphML: graph %q has edgedefault %q; a causal network is directed", ErrFormat, gr.ID, gr.EdgeDefault)
	}
	// Key ids → names, and the defaults by element kind.
	names := map[string]string{}
	defaults := map[string]map[string]string{"node": {}, "edge": {}}
	for _, k := range d.Keys {
		names[k.ID] = k.Name
		if k.Default != nil && (k.For == "node" || k.For == "edge" || k.For == "all") {
			for _, f := range []string{"node", "edge"} {
				if k.For == f || k.For == "all" {
					defaults[f][k.Name] = strings.TrimSpace(*k.Default)
				}
			}
		}
	}
	values := func(kind string, data []gmlData) map[string]string {
		v := make(map[string]string, len(defaults[kind])+len(data))
		for k, x := range defaults[kind] {
			v[k] = x
		}
		for _, x := range data {
			name, ok := names[x.Key]
			if !ok {
				name = x.Key
			}
			v[name] = x.Value
		}
		return v
	}
	byID := make(map[string]string, len(gr.Nodes))
	nodeNames := make([]string, 0, len(gr.Nodes))
	data := map[string]NodeData{}
	for _, n := range gr.Nodes {
		v := values("node", n.Data)
		name := n.ID
		if s, ok := v["name"]; ok && s != "" {
			name = s
		}
		if _, dup := byID[n.ID]; dup {
			return nil, fmt.Errorf("%w: GraphML: node id %q given twice", ErrFormat, n.ID)
		}
		byID[n.ID] = name
		nodeNames = append(nodeNames, name)
		var nd NodeData
		if s, ok := v["tier"]; ok && s != "" {
			t, err := strconv.Atoi(strings.TrimSpace(s))
			if err != nil || t < 1 {
				return nil, fmt.Errorf("%w: GraphML: node %q: tier %q is not a whole number from 1", ErrFormat, name, s)
			}
			nd.Tier = t
		}
		nd.TierLabel, nd.Kind, nd.Coding = v["tier_label"], v["kind"], v["coding"]
		if s, ok := v["levels"]; ok && s != "" {
			if err := json.Unmarshal([]byte(s), &nd.Levels); err != nil {
				return nil, fmt.Errorf("%w: GraphML: node %q: levels %q are not a JSON array of strings", ErrFormat, name, s)
			}
		}
		if !nd.isZero() {
			data[name] = nd
		}
	}
	edges := make([]Edge, 0, len(gr.Edges))
	for k, e := range gr.Edges {
		at := e.ID
		if at == "" {
			at = fmt.Sprintf("number %d", k+1)
		}
		if e.Directed == "false" {
			return nil, fmt.Errorf("%w: GraphML: edge %s is undirected", ErrFormat, at)
		}
		from, ok1 := byID[e.Source]
		to, ok2 := byID[e.Target]
		if !ok1 || !ok2 {
			missing := e.Source
			if ok1 {
				missing = e.Target
			}
			return nil, fmt.Errorf("%w: GraphML: edge %s names node id %q, which is not declared", ErrFormat, at, missing)
		}
		ed := NewEdge(from, to)
		v := values("edge", e.Data)
		for _, key := range edgeColumns {
			val, ok := v[key]
			if !ok {
				continue
			}
			if err := ed.setAttr(key, val); err != nil {
				return nil, fmt.Errorf("%w: GraphML: edge %s (%s -> %s): %s %v", ErrFormat, at, from, to, key, err)
			}
		}
		edges = append(edges, ed)
	}
	g, err := New(nodeNames, edges)
	if err != nil {
		return nil, err
	}
	return g.WithNodeData(data)
}
