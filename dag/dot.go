package dag

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/gonum/graph/formats/dot"
	"gonum.org/v1/gonum/graph/formats/dot/ast"
)

// DOT returns the graph in Graphviz's DOT language, drawn top to bottom.
// Each tier of the time order (when the nodes' data give tiers) is a
// subgraph "tierN" of rank same, so that its nodes line up in one row,
// labelled with the tier's label. Edge labels carry the standardised
// effect rounded to two decimals, whose meaning the graph's label states;
// negative effects are dashed, and pen width grows with selection
// frequency. Every number is also written exactly, as attributes named
// like the JSON keys (coefficient, lower, upper, standardized, frequency,
// sign, required; kind, levels, coding on nodes), which Graphviz passes
// over and ReadDOT reads back.
func (g *Graph) DOT(name string) ([]byte, error) {
	var b bytes.Buffer
	fmt.Fprintf(&b, "strict digraph %s {\n", dotQuote(name))
	b.WriteString("  graph [rankdir=TB, newrank=true")
	for _, e := range g.edges {
		if !math.IsNaN(e.Standardized) || !math.IsNaN(e.Coefficient) {
			fmt.Fprintf(&b, ", labelloc=b, fontsize=10,\n    label=%s",
				dotQuote("Edge labels: "+StandardizedMeaning+" (coefficient on the variables' own scales where no standardised effect is known)."))
			break
		}
	}
	b.WriteString("];\n")
	tiers, members := g.tiers()
	for _, t := range tiers {
		fmt.Fprintf(&b, "\n  subgraph tier%d {\n    rank=same;\n", t)
		if l := g.tierLabel(t); l != "" {
			fmt.Fprintf(&b, "    label=%s;\n", dotQuote(l))
		}
		for _, n := range members[t] {
			b.WriteString("    ")
			if err := g.dotNode(&b, n); err != nil {
				return nil, err
			}
		}
		b.WriteString("  }\n")
	}
	first := true
	for _, n := range g.names {
		if g.data[n].Tier > 0 {
			continue
		}
		if first {
			b.WriteString("\n")
			first = false
		}
		b.WriteString("  ")
		if err := g.dotNode(&b, n); err != nil {
			return nil, err
		}
	}
	if len(g.edges) > 0 {
		b.WriteString("\n")
	}
	for _, e := range g.edges {
		fmt.Fprintf(&b, "  %s -> %s", dotQuote(e.From), dotQuote(e.To))
		var attrs []string
		effect := e.Standardized
		if math.IsNaN(effect) {
			effect = e.Coefficient
		}
		if !math.IsNaN(effect) {
			attrs = append(attrs, "label="+dotQuote(fmt.Sprintf("%.2f", effect)))
		}
		if e.Sign < 0 {
			attrs = append(attrs, "style=dashed")
		}
		if !math.IsNaN(e.Frequency) {
			attrs = append(attrs, fmt.Sprintf("penwidth=%.2f", 0.5+2.5*e.Frequency))
		}
		for _, kv := range []struct {
			k string
			v float64
		}{{"coefficient", e.Coefficient}, {"lower", e.Lower}, {"upper", e.Upper}, {"standardized", e.Standardized}, {"frequency", e.Frequency}} {
			if !math.IsNaN(kv.v) && !math.IsInf(kv.v, 0) {
				attrs = append(attrs, kv.k+"="+dotQuote(strconv.FormatFloat(kv.v, 'g', -1, 64)))
			}
		}
		attrs = append(attrs, "sign="+dotQuote(strconv.Itoa(e.Sign)))
		if e.Required {
			attrs = append(attrs, `required="true"`)
		}
		fmt.Fprintf(&b, " [%s];\n", strings.Join(attrs, ", "))
	}
	b.WriteString("}\n")
	return b.Bytes(), nil
}

// dotNode writes one node statement with its data.
func (g *Graph) dotNode(b *bytes.Buffer, n string) error {
	b.WriteString(dotQuote(n))
	d := g.data[n]
	var attrs []string
	if d.Kind != "" {
		attrs = append(attrs, "kind="+dotQuote(d.Kind))
	}
	if len(d.Levels) > 0 {
		lv, err := json.Marshal(d.Levels)
		if err != nil {
			return err
		}
		attrs = append(attrs, "levels="+dotQuote(string(lv)))
	}
	if d.Coding != "" {
		attrs = append(attrs, "coding="+dotQuote(d.Coding))
	}
	if len(attrs) > 0 {
		fmt.Fprintf(b, " [%s]", strings.Join(attrs, ", "))
	}
	b.WriteString(";\n")
	return nil
}

// dotQuote writes s as a DOT double-quoted string: quotes and backslashes
// escaped, so that Graphviz shows the text as it is.
func dotQuote(s string) string {
	var b strings.Builder
	b.WriteByte('"')
	for _, r := range s {
		switch r {
		case '"', '\\':
			b.WriteByte('\\')
			b.WriteRune(r)
		case '\n':
			b.WriteString(`\n`)
		default:
			b.WriteRune(r)
		}
	}
	b.WriteByte('"')
	return b.String()
}

// dotUnquote reverses dotQuote for a quoted ID and returns other IDs as
// they are.
func dotUnquote(s string) string {
	if len(s) < 2 || s[0] != '"' || s[len(s)-1] != '"' {
		return s
	}
	s = strings.ReplaceAll(s[1:len(s)-1], "\\\n", "")
	var b strings.Builder
	for i := 0; i < len(s); i++ {
		if s[i] == '\\' && i+1 < len(s) {
			switch s[i+1] {
			case '"', '\\':
				b.WriteByte(s[i+1])
				i++
				continue
			case 'n':
				b.WriteByte('\n')
				i++
				continue
			}
		}
		b.WriteByte(s[i])
	}
	return b.String()
}

// maxDOT bounds the bytes ReadDOT reads.
const maxDOT = 256 << 20

// ReadDOT reads a directed graph in the DOT language: the form DOT writes,
// or one drawn by hand. Node and edge statements and subgraphs are read;
// a subgraph named "tierN" gives its nodes tier N and its label the tier's
// label; the exact-value attributes DOT writes (and kind, levels, coding,
// tier on nodes) are read back, other attributes are ignored. It returns
// an error for an undirected graph, more than one graph, an edge to or from
// a subgraph, a value that is not a number, or a cycle.
func ReadDOT(r io.Reader) (*Graph, error) {
	src, err := io.ReadAll(io.LimitReader(r, maxDOT+1))
	if err != nil {
		return nil, err
	}
	if len(src) > maxDOT {
		return nil, fmt.Errorf("%w: DOT larger than %d bytes", ErrFormat, maxDOT)
	}
	f, err := dot.ParseBytes(src)
	if err != nil {
		return nil, fmt.Errorf("%w: DOT: %v", ErrFormat, err)
	}
	if len(f.Graphs) != 1 {
		return nil, fmt.Errorf("%w: DOT: %d graphs in the file, want one", ErrFormat, len(f.Graphs))
	}
	gr := f.Graphs[0]
	if !gr.Directed {
		return nil, fmt.Errorf("%w: DOT: graph %s is undirected (graph, not digraph); a causal network is directed", ErrFormat, dotUnquote(gr.ID))
	}
	rd := &dotReader{data: map[string]NodeData{}, seen: map[string]bool{}}
	if err := rd.stmts(gr.Stmts, 0, ""); err != nil {
		return nil, fmt.Errorf("%w: DOT: %v", ErrFormat, err)
	}
	g, err := New(rd.names, rd.edges)
	if err != nil {
		return nil, err
	}
	for n, d := range rd.data {
		if d.isZero() {
			delete(rd.data, n)
		}
	}
	return g.WithNodeData(rd.data)
}

// dotReader collects nodes, node data and edges from DOT statements.
type dotReader struct {
	names []string
	seen  map[string]bool
	data  map[string]NodeData
	edges []Edge
}

func (rd *dotReader) node(id string, tier int, label string) string {
	n := dotUnquote(id)
	if !rd.seen[n] {
		rd.seen[n] = true
		rd.names = append(rd.names, n)
	}
	if tier > 0 {
		d := rd.data[n]
		d.Tier, d.TierLabel = tier, label
		rd.data[n] = d
	}
	return n
}

func (rd *dotReader) stmts(stmts []ast.Stmt, tier int, label string) error {
	for _, s := range stmts {
		switch s := s.(type) {
		case *ast.NodeStmt:
			n := rd.node(s.Node.ID, tier, label)
			d := rd.data[n]
			for _, a := range s.Attrs {
				v := dotUnquote(a.Val)
				switch a.Key {
				case "kind":
					d.Kind = v
				case "coding":
					d.Coding = v
				case "levels":
					if err := json.Unmarshal([]byte(v), &d.Levels); err != nil {
						return fmt.Errorf("node %q: levels %q are not a JSON array of strings", n, v)
					}
				case "tier":
					t, err := strconv.Atoi(v)
					if err != nil || t < 1 {
						return fmt.Errorf("node %q: tier %q is not a whole number from 1", n, v)
					}
					d.Tier = t
				}
			}
			rd.data[n] = d
		case *ast.EdgeStmt:
			from, ok := s.From.(*ast.Node)
			if !ok {
				return fmt.Errorf("an edge from a subgraph is not read; write one edge per pair of nodes")
			}
			a := rd.node(from.ID, 0, "")
			for e := s.To; e != nil; e = e.To {
				to, ok := e.Vertex.(*ast.Node)
				if !ok {
					return fmt.Errorf("an edge from %q to a subgraph is not read; write one edge per pair of nodes", a)
				}
				b := rd.node(to.ID, 0, "")
				ed := NewEdge(a, b)
				if err := dotEdgeAttrs(&ed, s.Attrs); err != nil {
					return fmt.Errorf("edge %s -> %s: %v", a, b, err)
				}
				rd.edges = append(rd.edges, ed)
				a = b
			}
		case *ast.Subgraph:
			t, l := tier, label
			if id := dotUnquote(s.ID); strings.HasPrefix(id, "tier") {
				if k, err := strconv.Atoi(id[len("tier"):]); err == nil && k > 0 {
					t, l = k, ""
					for _, st := range s.Stmts {
						switch a := st.(type) {
						case *ast.Attr: // label="…";
							if a.Key == "label" {
								l = dotUnquote(a.Val)
							}
						case *ast.AttrStmt: // graph [label="…"];
							for _, at := range a.Attrs {
								if a.Kind == ast.GraphKind && at.Key == "label" {
									l = dotUnquote(at.Val)
								}
							}
						}
					}
				}
			}
			if err := rd.stmts(s.Stmts, t, l); err != nil {
				return err
			}
		}
	}
	return nil
}

// dotEdgeAttrs sets the attributes DOT writes exactly.
func dotEdgeAttrs(e *Edge, attrs []*ast.Attr) error {
	for _, a := range attrs {
		if err := e.setAttr(a.Key, dotUnquote(a.Val)); err != nil {
			return fmt.Errorf("%s %v", a.Key, err)
		}
	}
	return nil
}
