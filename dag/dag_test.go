package dag_test

import (
	"bytes"
	"encoding/json"
	"encoding/xml"
	"errors"
	"math"
	"reflect"
	"slices"
	"strings"
	"testing"

	"gonum.org/v1/gonum/graph/topo"

	"github.com/antecedent-lab/antecedent/dag"
)

// asia is the "chest clinic" network of Lauritzen & Spiegelhalter (1988),
// JRSS-B 50:157–224: A visit to Asia, S smoker, T tuberculosis, L lung
// cancer, B bronchitis, E either, X positive X-ray, D dyspnoea.
func asia(t *testing.T) *dag.Graph {
	t.Helper()
	names := []string{"A", "S", "T", "L", "B", "E", "X", "D"}
	var edges []dag.Edge
	for _, e := range [][2]string{{"A", "T"}, {"S", "L"}, {"S", "B"}, {"T", "E"}, {"L", "E"}, {"E", "X"}, {"E", "D"}, {"B", "D"}} {
		edges = append(edges, dag.NewEdge(e[0], e[1]))
	}
	g, err := dag.New(names, edges)
	if err != nil {
		t.Fatal(err)
	}
	return g
}

// TestMarkovBlanket checks blankets on the Asia graph against the
// definition (parents, children, children's other parents; Pearl 1988,
// Probabilistic Reasoning in Intelligent Systems, from memory), worked by
// hand from the published arcs.
func TestMarkovBlanket(t *testing.T) {
	g := asia(t)
	cases := map[string][]string{
		"E": {"T", "L", "B", "X", "D"},
		"L": {"S", "T", "E"},
		"B": {"S", "E", "D"},
		"A": {"T"},
		"S": {"L", "B"},
		"X": {"E"},
		"D": {"B", "E"},
		"T": {"A", "L", "E"},
	}
	for node, want := range cases {
		got, err := g.MarkovBlanket(node)
		if err != nil {
			t.Fatal(err)
		}
		slices.Sort(got)
		slices.Sort(want)
		if !slices.Equal(got, want) {
			t.Errorf("blanket of %s = %v, want %v", node, got, want)
		}
	}
}

func TestRelatives(t *testing.T) {
	g := asia(t)
	check := func(what string, got []string, err error, want ...string) {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
		if !slices.Equal(got, want) {
			t.Errorf("%s = %v, want %v", what, got, want)
		}
	}
	p, err := g.Parents("E")
	check("parents of E", p, err, "T", "L")
	c, err := g.Children("S")
	check("children of S", c, err, "L", "B")
	a, err := g.Ancestors("D")
	check("ancestors of D", a, err, "A", "S", "T", "L", "B", "E")
	d, err := g.Descendants("S")
	check("descendants of S", d, err, "L", "B", "E", "X", "D")
	if _, err := g.Parents("Q"); !errors.Is(err, dag.ErrNode) {
		t.Errorf("unknown node: %v", err)
	}
	order := g.TopologicalOrder()
	pos := map[string]int{}
	for i, n := range order {
		pos[n] = i
	}
	for _, e := range g.Edges() {
		if pos[e.From] >= pos[e.To] {
			t.Errorf("topological order %v puts %s after %s", order, e.From, e.To)
		}
	}
}

// TestGonum checks that gonum's own algorithms accept the graph.
func TestGonum(t *testing.T) {
	g := asia(t)
	sorted, err := topo.Sort(g)
	if err != nil {
		t.Fatal(err)
	}
	if len(sorted) != 8 {
		t.Fatalf("topo.Sort gave %d nodes", len(sorted))
	}
	if !g.HasEdgeBetween(5, 2) || g.HasEdgeFromTo(5, 2) || !g.HasEdgeFromTo(2, 5) {
		t.Error("edge queries wrong for T -> E")
	}
	if g.Edge(5, 2) != nil || g.Edge(2, 5) == nil || g.Node(99) != nil {
		t.Error("Edge or Node wrong")
	}
	if n := g.To(5).Len(); n != 2 {
		t.Errorf("E has %d parents through To", n)
	}
}

func TestCycle(t *testing.T) {
	_, err := dag.New([]string{"a", "b", "c", "d"}, []dag.Edge{
		dag.NewEdge("d", "a"), dag.NewEdge("a", "b"), dag.NewEdge("b", "c"), dag.NewEdge("c", "a"),
	})
	var ce *dag.CycleError
	if !errors.As(err, &ce) || !errors.Is(err, dag.ErrCycle) {
		t.Fatalf("error %v", err)
	}
	if len(ce.Cycle) != 4 || ce.Cycle[0] != ce.Cycle[3] || slices.Contains(ce.Cycle, "d") {
		t.Errorf("cycle %v", ce.Cycle)
	}
	for _, c := range []struct {
		names []string
		edges []dag.Edge
		want  error
	}{
		{[]string{"a", "a"}, nil, dag.ErrNode},
		{[]string{""}, nil, dag.ErrNode},
		{[]string{"a"}, []dag.Edge{dag.NewEdge("a", "z")}, dag.ErrEdge},
		{[]string{"a"}, []dag.Edge{dag.NewEdge("a", "a")}, dag.ErrEdge},
		{[]string{"a", "b"}, []dag.Edge{dag.NewEdge("a", "b"), dag.NewEdge("a", "b")}, dag.ErrEdge},
	} {
		if _, err := dag.New(c.names, c.edges); !errors.Is(err, c.want) {
			t.Errorf("%v %v: error %v, want %v", c.names, c.edges, err, c.want)
		}
	}
}

func TestExports(t *testing.T) {
	names := []string{"age", "a&b <x>", "outcome"}
	e1 := dag.Edge{From: "age", To: "outcome", Coefficient: 0.5, Standardized: 0.3, Frequency: 0.9, Sign: 1}
	e2 := dag.NewEdge("a&b <x>", "outcome")
	e2.Sign = -1
	g, err := dag.New(names, []dag.Edge{e1, e2})
	if err != nil {
		t.Fatal(err)
	}
	// JSON round trip keeps unknown attributes unknown.
	b, err := json.Marshal(g)
	if err != nil {
		t.Fatal(err)
	}
	var back dag.Graph
	if err := json.Unmarshal(b, &back); err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(back.Names(), names) {
		t.Errorf("names %v", back.Names())
	}
	got := back.Edges()
	if !reflect.DeepEqual(got[0], e1) || !math.IsNaN(got[1].Coefficient) || got[1].Sign != -1 {
		t.Errorf("edges after round trip %+v", got)
	}
	// DOT through gonum.
	dot, err := g.DOT("net")
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range []string{`digraph "net"`, `"age" -> "outcome"`, "penwidth", "dashed", "Edge labels: standardised effect: per standard deviation of a continuous parent"} {
		if !strings.Contains(string(dot), s) {
			t.Errorf("DOT lacks %q:\n%s", s, dot)
		}
	}
	// GraphML is well-formed XML with escaped names.
	var buf bytes.Buffer
	if err := g.GraphML(&buf); err != nil {
		t.Fatal(err)
	}
	var parsed struct {
		Graph struct {
			Nodes []struct {
				Data string `xml:"data"`
			} `xml:"node"`
			Edges []struct{} `xml:"edge"`
		} `xml:"graph"`
	}
	if err := xml.Unmarshal(buf.Bytes(), &parsed); err != nil {
		t.Fatalf("GraphML does not parse: %v", err)
	}
	if len(parsed.Graph.Nodes) != 3 || parsed.Graph.Nodes[1].Data != "a&b <x>" || len(parsed.Graph.Edges) != 2 {
		t.Errorf("GraphML content %+v", parsed)
	}
}

func TestReadEdgeCSV(t *testing.T) {
	g, err := dag.ReadEdgeCSV(strings.NewReader("\ufeffFrom,To,note\nsmoking,cough,x\nage,smoking,\nlonely,,\n"))
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(g.Names(), []string{"smoking", "cough", "age", "lonely"}) || len(g.Edges()) != 2 {
		t.Errorf("names %v edges %v", g.Names(), g.Edges())
	}
	for _, bad := range []string{"", "a,b\nx,y\n", "from,to\n,y\n", "from,to\na,b\nb,a\n"} {
		if _, err := dag.ReadEdgeCSV(strings.NewReader(bad)); err == nil {
			t.Errorf("%q accepted", bad)
		}
	}
}

// FuzzReadEdgeCSV checks that reading an edge list never panics and that
// an accepted graph is acyclic with a consistent topological order.
func FuzzReadEdgeCSV(f *testing.F) {
	f.Add([]byte("from,to\na,b\nb,c\n"))
	f.Add([]byte("From,To,weight\nx,y,1\ny,x,2\n"))
	f.Add([]byte("to,from\n\"a\nb\",c\n"))
	f.Fuzz(func(t *testing.T, in []byte) {
		g, err := dag.ReadEdgeCSV(bytes.NewReader(in))
		if err != nil {
			return
		}
		if n := len(g.TopologicalOrder()); n != g.Len() {
			t.Fatalf("topological order has %d of %d nodes", n, g.Len())
		}
	})
}
