package main

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent/demo"
)

func TestPipeline(t *testing.T) {
	dir := t.TempDir()
	data, _ := demo.File("joint_replacement.csv")
	lines := strings.SplitAfterN(string(data), "\n", 1502)
	os.WriteFile(filepath.Join(dir, "d.csv"), []byte(strings.Join(lines[:1501], "")), 0o644)
	ord, _ := demo.File("joint_replacement.order")
	os.WriteFile(filepath.Join(dir, "o.txt"), ord, 0o644)
	out := filepath.Join(dir, "out")
	res, err := run(context.Background(), filepath.Join(dir, "d.csv"), filepath.Join(dir, "o.txt"), out, 1)
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range []string{"result.json", "network.dot", "network.graphml", "edges.csv"} {
		b, err := os.ReadFile(filepath.Join(out, f))
		if err != nil || len(b) == 0 {
			t.Errorf("%s: %v", f, err)
		}
	}
	edges, _ := os.ReadFile(filepath.Join(out, "edges.csv"))
	if got := strings.Count(string(edges), "\n"); got != len(res.Edges)+1 {
		t.Errorf("edges.csv has %d lines for %d edges", got, len(res.Edges))
	}
}
