package main

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent"
)

func runCLI(t *testing.T, args ...string) (string, string, int) {
	t.Helper()
	var out, errb bytes.Buffer
	code := run(context.Background(), args, &out, &errb)
	return out.String(), errb.String(), code
}

func TestDemo(t *testing.T) {
	if testing.Short() {
		t.Skip("long")
	}
	dir := t.TempDir()
	out, errs, code := runCLI(t, "demo", "--out", dir, "--report", filepath.Join(dir, "demo.html"), "--questions")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	if strings.Contains(errs, "\r") {
		t.Error("progress bar drawn although stderr is not a terminal")
	}
	for _, s := range []string{"Tier 1 — traits", "length_of_stay", "AUC", "R²", "Against the known true graph", "precision", "Caution",
		`coded "yes" = 1, "no" = 0 (reference)`, "for 1 vs 0",
		"What if tranexamic_acid were set to 1", "Rows needed to find transfusion -> length_of_stay"} {
		if !strings.Contains(out, s) {
			t.Errorf("demo output lacks %q", s)
		}
	}
	b, err := os.ReadFile(filepath.Join(dir, "result.json"))
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Edges []struct{ From, To string } `json:"edges"`
		Nodes []struct{ Name string }     `json:"nodes"`
	}
	if err := json.Unmarshal(b, &doc); err != nil || len(doc.Edges) == 0 || len(doc.Nodes) != 18 || doc.Edges[0].From == "" {
		t.Fatalf("result.json: %v %+v", err, doc)
	}
	for _, f := range []string{"effect.json", "studysize.json"} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Error(err)
		}
	}
	if dot, err := os.ReadFile(filepath.Join(dir, "network.dot")); err != nil || !strings.Contains(string(dot), "digraph") {
		t.Fatalf("network.dot: %v", err)
	}
	html, err := os.ReadFile(filepath.Join(dir, "demo.html"))
	if err != nil || !strings.Contains(string(html), "Recovery after joint replacement") {
		t.Fatalf("demo.html: %v", err)
	}
	// With --questions the report shows both answers, each as a chart.
	for _, s := range []string{"Questions asked of the network", "What if tranexamic_acid were set to 1 rather than set to 0?",
		"Rows needed to find transfusion → length_of_stay in 80% of studies"} {
		if !strings.Contains(string(html), s) {
			t.Errorf("demo.html lacks %q", s)
		}
	}
	if n := strings.Count(string(html), `<figure class="qchart">`); n != 2 {
		t.Errorf("demo.html has %d question charts, want 2", n)
	}
	if !strings.Contains(out, "How parents were chosen: Each variable is predicted") {
		t.Error("the summary does not say how parents were chosen")
	}
}

func TestSimulateDiscoverCompare(t *testing.T) {
	dir := t.TempDir()
	data, ord, truth := filepath.Join(dir, "d.csv"), filepath.Join(dir, "o.txt"), filepath.Join(dir, "t.csv")
	if _, errs, code := runCLI(t, "simulate", "--variables", "8", "--tiers", "3", "--rows", "600", "--data", data, "--order", ord, "--truth", truth); code != 0 {
		t.Fatalf("simulate: %s", errs)
	}
	res := filepath.Join(dir, "r.json")
	gml := filepath.Join(dir, "g.graphml")
	out, errs, code := runCLI(t, "discover", "--data", data, "--order", ord, "--json", res, "--graphml", gml, "--folds", "5", "--stability-pairs", "3")
	if code != 0 {
		t.Fatalf("discover: %s", errs)
	}
	if !strings.Contains(out, "Stability selection") {
		t.Errorf("summary lacks stability:\n%s", out)
	}
	// With stability selection on, the summary explains it, not the
	// adaptive lasso it replaces.
	if flat := strings.Join(strings.Fields(out), " "); !strings.Contains(flat, "How parents were chosen: Each variable is predicted from the variables measured before it by lasso regressions on 3 pairs of complementary random halves") ||
		strings.Contains(flat, "two rounds of lasso") {
		t.Errorf("the summary does not explain stability selection:\n%s", out)
	}
	out, errs, code = runCLI(t, "compare", "--estimate", res, "--truth", truth)
	if code != 0 || !strings.Contains(out, "precision") || !strings.Contains(out, "structural Hamming distance") {
		t.Fatalf("compare: %d %s %s", code, out, errs)
	}
	if _, err := os.Stat(gml); err != nil {
		t.Error(err)
	}
}

func TestErrorsAreOneLine(t *testing.T) {
	dir := t.TempDir()
	bad := filepath.Join(dir, "bad.csv")
	os.WriteFile(bad, []byte("a,b\n1,2\n3\n"), 0o644)
	ord := filepath.Join(dir, "o.txt")
	os.WriteFile(ord, []byte("tier: a\ntier: b\n"), 0o644)
	cases := []struct {
		args []string
		code int
		want string
	}{
		{[]string{"frobnicate"}, 2, "unknown command"},
		{[]string{"discover"}, 2, "--data and --order are required"},
		{[]string{"discover", "--data", bad, "--order", ord}, 1, "line 3"},
		{[]string{"discover", "--data", filepath.Join(dir, "none.csv"), "--order", ord}, 1, "no such file"},
		{[]string{"discover", "--data", bad, "--order", ord, "--folds", "1"}, 2, "--folds 1"},
		{[]string{"discover", "--data", bad, "--order", ord, "--rule", "best"}, 2, "unknown rule"},
		{[]string{"discover", "--data", bad, "--order", ord, "--json", bad}, 2, "refusing to write"},
		{[]string{"discover", "--data", bad, "--order", ord, "--stability-pairs", "5", "--stability-threshold", "0.4"}, 2, "(0.5, 1]"},
		{[]string{"compare", "--estimate", bad, "--truth", bad}, 1, "from"},
	}
	for _, c := range cases {
		_, errs, code := runCLI(t, c.args...)
		if code != c.code || !strings.Contains(errs, c.want) || strings.Count(strings.TrimSpace(errs), "\n") > 0 {
			t.Errorf("%v: exit %d, stderr %q; want exit %d mentioning %q on one line", c.args, code, errs, c.code, c.want)
		}
	}
}

func TestRefusesToOverwriteInput(t *testing.T) {
	dir := t.TempDir()
	data, ord, truth := filepath.Join(dir, "d.csv"), filepath.Join(dir, "o.txt"), filepath.Join(dir, "t.csv")
	runCLI(t, "simulate", "--variables", "5", "--tiers", "2", "--rows", "200", "--data", data, "--order", ord, "--truth", truth)
	before, _ := os.ReadFile(data)
	_, errs, code := runCLI(t, "discover", "--data", data, "--order", ord, "--folds", "3", "--json", data)
	after, _ := os.ReadFile(data)
	if code == 0 || !strings.Contains(errs, "refusing") || !bytes.Equal(before, after) {
		t.Errorf("exit %d %q; data changed: %v", code, errs, !bytes.Equal(before, after))
	}
}

func TestProgressBar(t *testing.T) {
	var b bytes.Buffer
	p := newProgressBar(&b)
	p.update(antecedent.Progress{Done: 3, Total: 12, Stage: "nodes"})
	if s := b.String(); !strings.Contains(s, "nodes 3/12 [#######-----") || !strings.Contains(s, "left") {
		t.Errorf("bar %q", s)
	}
	p.finish()
	if !strings.HasSuffix(b.String(), "\r") {
		t.Error("finish does not clear the line")
	}
	// Not a terminal: no bar.
	if isTerminal(&b) {
		t.Error("a buffer is not a terminal")
	}
}

// TestHelpAndVersion checks the conventions: help asked for goes to
// standard output with status 0; a command line without a command prints
// usage to standard error with status 2; version names the tool.
func TestHelpAndVersion(t *testing.T) {
	cases := []struct {
		args      []string
		code      int
		out, errs string // text expected on standard output and error
		quietOut  bool   // nothing expected on standard output
	}{
		{[]string{"help", "discover"}, 0, "--data", "", false},
		{[]string{"discover", "-h"}, 0, "--order", "", false},
		{[]string{"help"}, 0, "Commands:", "", false},
		{nil, 2, "", "Commands:", true},
		{[]string{"version"}, 0, "antecedent", "", false},
	}
	for _, c := range cases {
		out, errs, code := runCLI(t, c.args...)
		if code != c.code || !strings.Contains(out, c.out) || !strings.Contains(errs, c.errs) || (c.quietOut && out != "") {
			t.Errorf("%v: exit %d, stdout %q, stderr %q", c.args, code, out, errs)
		}
	}
}

// TestOutputsCheckedFirst checks that an output that cannot be written is
// reported before the data are even read.
func TestOutputsCheckedFirst(t *testing.T) {
	dir := t.TempDir()
	missing := filepath.Join(dir, "no-such-folder", "result.json")
	// The data file does not exist either: the output must be reported first.
	_, errs, code := runCLI(t, "discover", "--data", filepath.Join(dir, "none.csv"), "--order", filepath.Join(dir, "none.order"), "--json", missing)
	if code == 0 || !strings.Contains(errs, "cannot write") || strings.Count(strings.TrimSpace(errs), "\n") > 0 {
		t.Errorf("exit %d, stderr %q", code, errs)
	}
}

func TestPlainMessages(t *testing.T) {
	cases := []struct{ in, want string }{
		{"antecedent: bad configuration: Folds 1: need at least 2", "bad configuration: Folds 1: need at least 2"},
		{"stray.csv: table: CSV line 3: bad data: x", "stray.csv: CSV line 3: bad data: x"},
		{"antecedent: node \"y\": cv: lasso: response is constant", "node \"y\": response is constant"},
		{"column \"order: x\" is odd", "column \"order: x\" is odd"},
	}
	for _, c := range cases {
		if got := plain(c.in); got != c.want {
			t.Errorf("plain(%q) = %q, want %q", c.in, got, c.want)
		}
	}
}
