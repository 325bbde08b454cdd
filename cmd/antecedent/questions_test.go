package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent/simulate"
)

// questionFiles writes a small simulated study (treated → marker →
// outcome, with age before all), its order, and the result of discover.
func questionFiles(t *testing.T) (dir, data, result string) {
	t.Helper()
	dir = t.TempDir()
	m := &simulate.Model{Nodes: []simulate.Node{
		{Name: "age", Intercept: 60, NoiseSD: 10},
		{Name: "treated", Binary: true, Parents: []string{"age"}, Weights: []float64{0.04}, Intercept: -2.4},
		{Name: "marker", Parents: []string{"treated", "age"}, Weights: []float64{1.5, 0.03}, NoiseSD: 1},
		{Name: "outcome", Parents: []string{"marker"}, Weights: []float64{1}, NoiseSD: 1},
	}}
	s, err := m.Sample(400, 3)
	if err != nil {
		t.Fatal(err)
	}
	var b strings.Builder
	b.WriteString(strings.Join(s.Names, ",") + "\n")
	for i := range 400 {
		for j, c := range s.Columns {
			if j > 0 {
				b.WriteByte(',')
			}
			b.WriteString(strconv.FormatFloat(c[i], 'g', -1, 64))
		}
		b.WriteByte('\n')
	}
	data = filepath.Join(dir, "d.csv")
	ord := filepath.Join(dir, "o.txt")
	result = filepath.Join(dir, "r.json")
	os.WriteFile(data, []byte(b.String()), 0o644)
	os.WriteFile(ord, []byte("tier: age\ntier: treated\ntier: marker\ntier: outcome\n"), 0o644)
	if _, errs, code := runCLI(t, "discover", "--data", data, "--order", ord, "--json", result, "--quiet"); code != 0 {
		t.Fatalf("discover: %s", errs)
	}
	return dir, data, result
}

func TestEffectCommand(t *testing.T) {
	dir, data, result := questionFiles(t)
	out := filepath.Join(dir, "e.json")
	stdout, errs, code := runCLI(t, "effect", "--result", result, "--data", data, "--cause", "treated", "--resamples", "20", "--json", out)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, s := range []string{"What if treated were set to 1 rather than set to 0?", "outcome", "optimal", "Path decomposition", "Caution", "not a treatment recommendation"} {
		if !strings.Contains(stdout, s) {
			t.Errorf("output lacks %q:\n%s", s, stdout)
		}
	}
	var ans struct {
		Cause    string `json:"cause"`
		Outcomes []struct {
			Name       string `json:"name"`
			Difference struct {
				Value *float64 `json:"value"`
			} `json:"difference"`
		} `json:"outcomes"`
		Cautions []string `json:"cautions"`
	}
	b, _ := os.ReadFile(out)
	if err := json.Unmarshal(b, &ans); err != nil || ans.Cause != "treated" || len(ans.Outcomes) == 0 || ans.Outcomes[0].Difference.Value == nil || len(ans.Cautions) == 0 {
		t.Fatalf("answer JSON: %v %s", err, b)
	}
	stdout, errs, code = runCLI(t, "effect", "--result", result, "--data", data, "--cause", "marker", "--if", "shift:+1", "--resamples", "10")
	if code != 0 || !strings.Contains(stdout, "What if marker were shifted by +1 rather than as observed?") {
		t.Fatalf("shift: exit %d %s\n%s", code, errs, stdout)
	}
}

func TestStudySizeCommand(t *testing.T) {
	dir, data, result := questionFiles(t)
	out := filepath.Join(dir, "s.json")
	stdout, errs, code := runCLI(t, "studysize", "--result", result, "--data", data, "--sizes", "40,80", "--replicates", "4", "--edge", "treated->marker", "--json", out)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, s := range []string{"treated -> marker", "false edges", "80% of studies", "Caution"} {
		if !strings.Contains(stdout, s) {
			t.Errorf("output lacks %q:\n%s", s, stdout)
		}
	}
	var doc struct {
		Plan struct {
			Sizes []int `json:"sizes"`
		} `json:"plan"`
		Needed struct {
			Status string `json:"status"`
		} `json:"rows_needed"`
	}
	b, _ := os.ReadFile(out)
	if err := json.Unmarshal(b, &doc); err != nil || len(doc.Plan.Sizes) != 2 || doc.Needed.Status == "" {
		t.Fatalf("plan JSON: %v %s", err, b)
	}
}

func TestQuestionCommandErrors(t *testing.T) {
	dir, data, result := questionFiles(t)
	other := filepath.Join(dir, "other.csv")
	os.WriteFile(other, []byte("age,treated\n1,0\n2,1\n3,0\n"), 0o644)
	for _, c := range []struct {
		args []string
		code int
		want string
	}{
		{[]string{"effect", "--result", result, "--data", data}, 2, "--cause are required"},
		{[]string{"effect", "--result", result, "--data", data, "--cause", "marker"}, 2, "--if is required"},
		{[]string{"effect", "--result", result, "--data", data, "--cause", "treated", "--if", "set:abc"}, 2, "not a number"},
		{[]string{"effect", "--result", result, "--data", data, "--cause", "nope", "--if", "set:1"}, 2, `unknown cause "nope"`},
		{[]string{"effect", "--result", result, "--data", data, "--cause", "treated", "--if", "set:2"}, 2, "can be set to 0 or 1"},
		{[]string{"effect", "--result", result, "--data", data, "--cause", "treated", "--json", data}, 2, "refusing"},
		{[]string{"effect", "--result", result, "--data", other, "--cause", "treated"}, 1, "do not match"},
		{[]string{"studysize", "--result", result}, 2, "--data are required"},
		{[]string{"studysize", "--result", result, "--data", data, "--edge", "treated-marker"}, 2, "FROM->TO"},
		{[]string{"studysize", "--result", result, "--data", data, "--edge", "outcome->age"}, 2, "not an edge"},
		{[]string{"studysize", "--result", result, "--data", data, "--sizes", "5"}, 2, "too small"},
		{[]string{"studysize", "--result", result, "--data", data, "--sizes", "x"}, 2, "--sizes"},
	} {
		_, errs, code := runCLI(t, c.args...)
		if code != c.code || !strings.Contains(errs, c.want) || strings.Count(strings.TrimSpace(errs), "\n") > 0 {
			t.Errorf("%v: exit %d, stderr %q; want exit %d mentioning %q on one line", c.args[:min(len(c.args), 7)], code, errs, c.code, c.want)
		}
	}
}
