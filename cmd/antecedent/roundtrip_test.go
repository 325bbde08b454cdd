package main

import (
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/dag"
)

// TestExportsRoundTrip writes every graph form from one discovery and
// checks that compare reads each (as estimate and as truth) with the same
// scores as the result JSON, and that the library reads each back to the
// result's edges and tiers.
func TestExportsRoundTrip(t *testing.T) {
	dir := t.TempDir()
	data, ord, truth := filepath.Join(dir, "d.csv"), filepath.Join(dir, "o.txt"), filepath.Join(dir, "t.csv")
	if _, errs, code := runCLI(t, "simulate", "--variables", "10", "--tiers", "3", "--rows", "500", "--binary", "0.3", "--data", data, "--order", ord, "--truth", truth); code != 0 {
		t.Fatalf("simulate: %s", errs)
	}
	files := map[string]string{"json": "r.json", "dot": "g.dot", "graphml": "g.graphml", "edges": "e.csv"}
	args := []string{"discover", "--data", data, "--order", ord, "--folds", "5", "--quiet"}
	for flag, name := range files {
		files[flag] = filepath.Join(dir, name)
		args = append(args, "--"+flag, files[flag])
	}
	if _, errs, code := runCLI(t, args...); code != 0 {
		t.Fatalf("discover: %s", errs)
	}
	want, _, code := runCLI(t, "compare", "--estimate", files["json"], "--truth", truth)
	if code != 0 {
		t.Fatalf("compare on the result JSON failed: %s", want)
	}
	b, err := os.ReadFile(files["json"])
	if err != nil {
		t.Fatal(err)
	}
	res, err := antecedent.ReadResult(strings.NewReader(string(b)))
	if err != nil {
		t.Fatal(err)
	}
	rg, err := res.Graph()
	if err != nil {
		t.Fatal(err)
	}
	for flag, path := range files {
		t.Run(flag, func(t *testing.T) {
			got, errs, code := runCLI(t, "compare", "--estimate", path, "--truth", truth)
			if code != 0 || got != want {
				t.Errorf("compare --estimate %s: exit %d %s\n%s\nwant\n%s", flag, code, errs, got, want)
			}
			self, errs, code := runCLI(t, "compare", "--estimate", files["json"], "--truth", path)
			if code != 0 || !strings.Contains(self, "F1                1.000") {
				t.Errorf("compare --truth %s against the result itself: exit %d %s\n%s", flag, code, errs, self)
			}
			f, err := os.Open(path)
			if err != nil {
				t.Fatal(err)
			}
			defer f.Close()
			g, _, err := dag.Read(f)
			if err != nil {
				t.Fatal(err)
			}
			if len(g.Edges()) != len(res.Edges) {
				t.Fatalf("%d edges, want %d", len(g.Edges()), len(res.Edges))
			}
			for _, e := range res.Edges {
				ge, ok := g.EdgeBetween(e.From, e.To)
				if !ok || !reflect.DeepEqual(ge.Coefficient, e.Coefficient) || ge.Sign != e.Sign {
					t.Errorf("edge %s -> %s: %+v, want %+v", e.From, e.To, ge, e)
				}
			}
			if flag == "edges" {
				return // an edge list carries no node data
			}
			for _, n := range res.Nodes {
				if d, w := g.NodeData(n.Name), rg.NodeData(n.Name); !reflect.DeepEqual(d, w) || d.Tier != n.Tier {
					t.Errorf("node %s: %+v, want %+v", n.Name, d, w)
				}
			}
		})
	}
}
