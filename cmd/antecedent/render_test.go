package main

import (
	"encoding/json"
	"fmt"
	"html/template"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent/intervention"
	"github.com/antecedent-lab/antecedent/sizing"
)

// TestRenderFromResultJSON draws the report from a saved result and checks
// it carries the network and the cautions the discover command prints.
func TestRenderFromResultJSON(t *testing.T) {
	dir := t.TempDir()
	data, ord := filepath.Join(dir, "d.csv"), filepath.Join(dir, "o.txt")
	if _, errs, code := runCLI(t, "simulate", "--variables", "6", "--tiers", "3", "--rows", "400", "--data", data, "--order", ord, "--truth", filepath.Join(dir, "t.csv")); code != 0 {
		t.Fatalf("simulate: %s", errs)
	}
	res := filepath.Join(dir, "r.json")
	want, errs, code := runCLI(t, "discover", "--data", data, "--order", ord, "--json", res, "--folds", "5")
	if code != 0 {
		t.Fatalf("discover: %s", errs)
	}
	html, dot := filepath.Join(dir, "r.html"), filepath.Join(dir, "g.dot")
	got, errs, code := runCLI(t, "render", "--result", res, "--report", html, "--dot", dot)
	if code != 0 {
		t.Fatalf("render: %s", errs)
	}
	for _, line := range []string{"hypothesis", "clinical judgement"} {
		if strings.Contains(want, line) && !strings.Contains(got, line) {
			t.Errorf("summary lacks %q:\n%s", line, got)
		}
	}
	page, err := os.ReadFile(html)
	if err != nil || !strings.Contains(string(page), "hypothesis") {
		t.Errorf("report missing or without its caution: %v", err)
	}
	if _, err := os.Stat(dot); err != nil {
		t.Error(err)
	}
	if _, _, code := runCLI(t, "render", "--result", res, "--report", res); code == 0 {
		t.Error("render wrote over its input")
	}
}

// TestRenderAnswers writes an intervention answer and a study plan with
// effect and studysize, draws them into the report with render, and
// checks that the page shows each answer's own numbers; answers that are
// not answers, or about another network, are refused with one line.
func TestRenderAnswers(t *testing.T) {
	dir, data, result := questionFiles(t)
	eff, plan := filepath.Join(dir, "e.json"), filepath.Join(dir, "s.json")
	if _, errs, code := runCLI(t, "effect", "--result", result, "--data", data, "--cause", "treated", "--resamples", "20", "--json", eff, "--quiet"); code != 0 {
		t.Fatalf("effect: %s", errs)
	}
	if _, errs, code := runCLI(t, "studysize", "--result", result, "--data", data, "--sizes", "40,80,160", "--replicates", "4",
		"--edge", "treated->marker", "--json", plan, "--quiet"); code != 0 {
		t.Fatalf("studysize: %s", errs)
	}
	html := filepath.Join(dir, "r.html")
	if _, errs, code := runCLI(t, "render", "--result", result, "--report", html, "--effect", eff, "--studysize", plan, "--quiet"); code != 0 {
		t.Fatalf("render: %s", errs)
	}
	page, err := os.ReadFile(html)
	if err != nil {
		t.Fatal(err)
	}
	var ans intervention.Answer
	var sz sizing.Answer
	for p, v := range map[string]any{eff: &ans, plan: &sz} {
		b, err := os.ReadFile(p)
		if err != nil {
			t.Fatal(err)
		}
		if err := json.Unmarshal(b, v); err != nil {
			t.Fatal(err)
		}
	}
	s := string(page)
	want := []string{"Questions asked of the network", "What if treated were set to 1 rather than set to 0?", "not a treatment recommendation",
		fmt.Sprintf("%.3g [%.3g, %.3g]", float64(ans.Outcomes[0].Difference.Value), float64(ans.Outcomes[0].Difference.Lower), float64(ans.Outcomes[0].Difference.Upper)),
		"Rows needed to find treated → marker in 80% of studies",
		fmt.Sprintf("%.2f ± %.2f", sz.Plan.False[0].Mean, sz.Plan.False[0].SE)}
	for _, w := range want {
		if !strings.Contains(s, template.HTMLEscapeString(w)) {
			t.Errorf("the report lacks %q", w)
		}
	}
	other := filepath.Join(dir, "other.json")
	os.WriteFile(other, []byte(`{"cause":"blood_type","a":{"kind":"set","value":1},"b":{"kind":"set","value":0},"outcomes":[]}`), 0o644)
	for _, c := range []struct {
		args []string
		code int
		want string
	}{
		{[]string{"--effect", eff}, 2, "give --report"},
		{[]string{"--report", html, "--effect", plan}, 1, "unknown field"},
		{[]string{"--report", html, "--studysize", eff}, 1, "unknown field"},
		{[]string{"--report", html, "--effect", other}, 1, `"blood_type", which is not a variable of the result`},
		{[]string{"--report", eff, "--effect", eff}, 2, "refusing to write"},
	} {
		_, errs, code := runCLI(t, append([]string{"render", "--result", result, "--quiet"}, c.args...)...)
		if code != c.code || !strings.Contains(errs, c.want) || strings.Count(strings.TrimSpace(errs), "\n") > 0 {
			t.Errorf("%v: exit %d, stderr %q; want exit %d mentioning %q on one line", c.args, code, errs, c.code, c.want)
		}
	}
}
