package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
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
