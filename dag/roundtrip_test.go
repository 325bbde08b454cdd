package dag_test

import (
	"bytes"
	"math"
	"os"
	"reflect"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent/dag"
)

// sample is a graph with every kind of attribute, unknown values, names
// that need quoting in each format, and node data.
func sample(t *testing.T) *dag.Graph {
	t.Helper()
	names := []string{"age", `dose "mg"`, `path\to`, "a&b <x>", "ödem", "outcome", "alone"}
	e1 := dag.Edge{From: "age", To: "outcome", Coefficient: 0.1 + 0.2, Lower: -1e-300, Upper: 7.25e10, Standardized: 1.0 / 3, Frequency: 0.9, Sign: 1, Required: true}
	e2 := dag.NewEdge(`dose "mg"`, "outcome")
	e2.Sign = -1
	e2.Coefficient = -2.5
	e3 := dag.NewEdge("age", `path\to`)
	e4 := dag.NewEdge("a&b <x>", "ödem")
	e4.Frequency = 0.55
	g, err := dag.New(names, []dag.Edge{e1, e2, e3, e4})
	if err != nil {
		t.Fatal(err)
	}
	g, err = g.WithNodeData(map[string]dag.NodeData{
		"age":       {Tier: 1, TierLabel: "traits", Kind: "continuous"},
		`dose "mg"`: {Tier: 2, TierLabel: "treatment \"A\"", Kind: "categorical", Levels: []string{"none", "low", `"high"`}, Coding: "indicators against none"},
		`path\to`:   {Tier: 2, TierLabel: "treatment \"A\"", Kind: "binary", Levels: []string{"no", "yes"}, Coding: "yes vs no (reference)"},
		"a&b <x>":   {Tier: 1, TierLabel: "traits"},
		"ödem":      {Tier: 3},
		"outcome":   {Tier: 3, Kind: "continuous"},
	})
	if err != nil {
		t.Fatal(err)
	}
	return g
}

func sameEdge(a, b dag.Edge) bool {
	eq := func(x, y float64) bool { return x == y || math.IsNaN(x) && math.IsNaN(y) }
	return a.From == b.From && a.To == b.To && eq(a.Coefficient, b.Coefficient) && eq(a.Lower, b.Lower) && eq(a.Upper, b.Upper) &&
		eq(a.Standardized, b.Standardized) && eq(a.Frequency, b.Frequency) && a.Sign == b.Sign && a.Required == b.Required
}

// TestRoundTrip writes the graph in each form and reads it back with Read:
// nodes, every edge attribute bit for bit (unknown stays unknown) and, in
// every form but the edge list, the nodes' data.
func TestRoundTrip(t *testing.T) {
	g := sample(t)
	write := map[dag.Format]func(*bytes.Buffer) error{
		dag.FormatJSON: func(b *bytes.Buffer) error {
			j, err := g.MarshalJSON()
			b.Write(j)
			return err
		},
		dag.FormatGraphML: func(b *bytes.Buffer) error { return g.GraphML(b) },
		dag.FormatDOT: func(b *bytes.Buffer) error {
			d, err := g.DOT("net")
			b.Write(d)
			return err
		},
		dag.FormatEdgeCSV: func(b *bytes.Buffer) error { return g.WriteEdgeCSV(b) },
	}
	for _, f := range []dag.Format{dag.FormatJSON, dag.FormatGraphML, dag.FormatDOT, dag.FormatEdgeCSV} {
		t.Run(f.String(), func(t *testing.T) {
			var b bytes.Buffer
			if err := write[f](&b); err != nil {
				t.Fatal(err)
			}
			back, got, err := dag.Read(bytes.NewReader(b.Bytes()))
			if err != nil {
				t.Fatalf("reading back: %v\n%s", err, b.String())
			}
			if got != f {
				t.Errorf("read as %v, written as %v", got, f)
			}
			wantNames, gotNames := g.Names(), back.Names()
			slices.Sort(wantNames)
			slices.Sort(gotNames)
			if !slices.Equal(gotNames, wantNames) {
				t.Errorf("names %q, want %q", gotNames, wantNames)
			}
			we, ge := g.Edges(), back.Edges()
			if len(ge) != len(we) {
				t.Fatalf("%d edges, want %d", len(ge), len(we))
			}
			for i := range we {
				if !sameEdge(ge[i], we[i]) {
					t.Errorf("edge %d: %+v, want %+v", i, ge[i], we[i])
				}
			}
			if f == dag.FormatEdgeCSV {
				return
			}
			for _, n := range g.Names() {
				if w, d := g.NodeData(n), back.NodeData(n); !reflect.DeepEqual(w, d) {
					t.Errorf("node %q data %+v, want %+v", n, d, w)
				}
			}
		})
	}
}

// TestDOTTierRanks checks that each tier is one subgraph of rank same, in
// tier order, and that Graphviz's own canonical rewrite of our DOT reads
// back to the same graph: testdata/canon.dot is `dot -Tcanon` of
// testdata/written.dot (Graphviz 2.43.0; regenerate with
// testdata/graphviz.sh).
func TestDOTTierRanks(t *testing.T) {
	g := sample(t)
	d, err := g.DOT("net")
	if err != nil {
		t.Fatal(err)
	}
	s := string(d)
	i1, i2, i3 := strings.Index(s, "subgraph tier1 {\n    rank=same;\n    label=\"traits\";"),
		strings.Index(s, "subgraph tier2 {"), strings.Index(s, "subgraph tier3 {")
	if i1 < 0 || i2 < i1 || i3 < i2 {
		t.Errorf("tier subgraphs missing or out of order:\n%s", s)
	}
	if !strings.Contains(s, `"alone";`) || strings.Index(s, `"alone";`) < i3 {
		t.Errorf("node of unknown tier should follow the tiers:\n%s", s)
	}
	written, err := os.ReadFile("testdata/written.dot")
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(written, d) {
		t.Errorf("testdata/written.dot is stale; rewrite it from this test's graph and rerun testdata/graphviz.sh:\n%s", d)
	}
	canon, err := os.Open("testdata/canon.dot")
	if err != nil {
		t.Fatal(err)
	}
	defer canon.Close()
	back, f, err := dag.Read(canon)
	if err != nil || f != dag.FormatDOT {
		t.Fatalf("Graphviz's rewrite: %v (read as %v)", err, f)
	}
	if len(back.Edges()) != len(g.Edges()) {
		t.Fatalf("Graphviz's rewrite has %d edges, want %d", len(back.Edges()), len(g.Edges()))
	}
	for i, e := range g.Edges() {
		got, ok := back.EdgeBetween(e.From, e.To)
		if !ok || !sameEdge(got, e) {
			t.Errorf("edge %d after Graphviz: %+v, want %+v", i, got, e)
		}
	}
	for _, n := range g.Names() {
		if w, d := g.NodeData(n), back.NodeData(n); !reflect.DeepEqual(w, d) {
			t.Errorf("node %q after Graphviz: %+v, want %+v", n, d, w)
		}
	}
}

// TestReadGraphMLOutside reads GraphML written by networkx (a
// general-purpose graph library; testdata/write_networkx.py names its version),
// whose key ids differ from ours and which uses key defaults.
func TestReadGraphMLOutside(t *testing.T) {
	f, err := os.Open("testdata/networkx.graphml")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	g, err := dag.ReadGraphML(f)
	if err != nil {
		t.Fatal(err)
	}
	if want := []string{"smoking", "tar", "cancer", "isolated"}; !slices.Equal(g.Names(), want) {
		t.Errorf("names %q, want %q", g.Names(), want)
	}
	e, ok := g.EdgeBetween("tar", "cancer")
	if !ok || e.Coefficient != 0.75 || e.Sign != 1 || !math.IsNaN(e.Frequency) {
		t.Errorf("tar -> cancer %+v", e)
	}
	if d := g.NodeData("cancer"); d.Tier != 3 || d.Kind != "binary" || !slices.Equal(d.Levels, []string{"no", "yes"}) {
		t.Errorf("cancer's data %+v", d)
	}
	if d := g.NodeData("smoking"); d.Tier != 1 || d.TierLabel != "exposure" {
		t.Errorf("smoking's data %+v (tier_label from the key default)", d)
	}
}

func TestReadErrors(t *testing.T) {
	for _, c := range []struct {
		name, in, want string
	}{
		{"undirected DOT", "graph g { a -- b }", "undirected"},
		{"two DOT graphs", "digraph a { x } digraph b { y }", "2 graphs"},
		{"DOT cycle", "digraph g { a -> b -> a }", "cycle"},
		{"DOT bad number", `digraph g { a -> b [coefficient="x"] }`, `coefficient "x" is not a number`},
		{"DOT subgraph edge", "digraph g { a -> {b c} }", "subgraph"},
		{"DOT syntax", "digraph g { a -> }", "DOT"},
		{"GraphML undirected", `<graphml xmlns="http://graphml.graphdrawing.org/xmlns"><graph id="G" edgedefault="undirected"></graph></graphml>`, "undirected"},
		{"GraphML unknown node", `<graphml><graph edgedefault="directed"><node id="a"/><edge source="a" target="b"/></graph></graphml>`, `node id "b"`},
		{"GraphML bad value", `<graphml><key id="k" for="edge" attr.name="frequency" attr.type="double"/><graph edgedefault="directed"><node id="a"/><node id="b"/><edge id="e1" source="a" target="b"><data key="k">often</data></edge></graph></graphml>`, `edge e1 (a -> b): frequency "often"`},
		{"GraphML truncated", `<graphml><graph edgedefault="directed"><node id="a"/>`, "GraphML"},
		{"CSV bad number", "from,to,coefficient\na,b,big\n", `line 2: column "coefficient": "big"`},
		{"CSV bad sign", "from,to,sign\na,b,2\n", `column "sign"`},
		{"JSON bad", `{"nodes": 3}`, "bad input format"},
	} {
		t.Run(c.name, func(t *testing.T) {
			_, _, err := dag.Read(strings.NewReader(c.in))
			if err == nil || !strings.Contains(err.Error(), c.want) {
				t.Errorf("error %v, want one containing %q", err, c.want)
			}
		})
	}
}

// FuzzRead checks that reading any bytes in any form never panics and
// that an accepted graph is acyclic and writes back in every form.
func FuzzRead(f *testing.F) {
	f.Add([]byte("from,to\na,b\nb,c\n"))
	f.Add([]byte(`{"nodes": ["a", {"name": "b", "tier": 2}], "edges": [{"from": "a", "to": "b"}]}`))
	f.Add([]byte(`strict digraph g { subgraph tier1 { rank=same; a } a -> b [coefficient="1"] }`))
	f.Add([]byte(`<graphml><graph edgedefault="directed"><node id="a"/><node id="b"/><edge source="a" target="b"/></graph></graphml>`))
	f.Fuzz(func(t *testing.T, in []byte) {
		g, _, err := dag.Read(bytes.NewReader(in))
		if err != nil {
			return
		}
		if n := len(g.TopologicalOrder()); n != g.Len() {
			t.Fatalf("topological order has %d of %d nodes", n, g.Len())
		}
		var b bytes.Buffer
		if err := g.GraphML(&b); err != nil {
			t.Fatal(err)
		}
		if _, err := g.DOT("x"); err != nil {
			t.Fatal(err)
		}
		if err := g.WriteEdgeCSV(&b); err != nil {
			t.Fatal(err)
		}
	})
}

// BenchmarkRoundTrip writes and reads a 300-node, 900-edge graph in each
// form.
func BenchmarkRoundTrip(b *testing.B) {
	const p = 300
	names := make([]string, p)
	data := map[string]dag.NodeData{}
	for i := range names {
		names[i] = "v" + strings.Repeat("x", i%7) + string(rune('a'+i%26)) + strconv.Itoa(i)
		data[names[i]] = dag.NodeData{Tier: 1 + i/30, Kind: "continuous"}
	}
	var edges []dag.Edge
	for i := 30; i < p; i++ {
		for k := 1; k <= 3; k++ {
			e := dag.NewEdge(names[(i*k*7)%(i/30*30)], names[i])
			e.Coefficient, e.Standardized, e.Sign = float64(k)/7, float64(k)/11, 1
			edges = append(edges, e)
		}
	}
	g, err := dag.New(names, uniqueEdges(edges))
	if err != nil {
		b.Fatal(err)
	}
	if g, err = g.WithNodeData(data); err != nil {
		b.Fatal(err)
	}
	for _, f := range []dag.Format{dag.FormatJSON, dag.FormatGraphML, dag.FormatDOT, dag.FormatEdgeCSV} {
		b.Run(f.String(), func(b *testing.B) {
			for b.Loop() {
				var buf bytes.Buffer
				switch f {
				case dag.FormatJSON:
					j, _ := g.MarshalJSON()
					buf.Write(j)
				case dag.FormatGraphML:
					g.GraphML(&buf)
				case dag.FormatDOT:
					d, _ := g.DOT("g")
					buf.Write(d)
				default:
					g.WriteEdgeCSV(&buf)
				}
				if _, _, err := dag.Read(&buf); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func uniqueEdges(es []dag.Edge) []dag.Edge {
	seen := map[[2]string]bool{}
	var out []dag.Edge
	for _, e := range es {
		if k := [2]string{e.From, e.To}; !seen[k] {
			seen[k] = true
			out = append(out, e)
		}
	}
	return out
}
