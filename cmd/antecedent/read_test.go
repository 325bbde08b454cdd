package main

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/report"
)

// studyCSV writes a small study of our own with text codings: age, sex
// (female/male), region (north/south/east) and an outcome coded
// case/control that depends on age and region; cells[i] replaces the
// outcome cell of data row i.
func studyCSV(t *testing.T, dir string, cells map[int]string) (string, string) {
	t.Helper()
	r := rand.New(rand.NewPCG(13, 13))
	var b strings.Builder
	b.WriteString("age,sex,region,outcome\n")
	for i := range 400 {
		age := 40 + 30*r.Float64()
		region := []string{"north", "south", "east", "east"}[r.IntN(4)]
		eta := -6 + 0.12*age
		if region == "north" {
			eta += 1.2
		}
		outcome := "control"
		if r.Float64() < 1/(1+math.Exp(-eta)) {
			outcome = "case"
		}
		if v, ok := cells[i]; ok {
			outcome = v
		}
		fmt.Fprintf(&b, "%.1f,%s,%s,%s\n", age, []string{"female", "male"}[r.IntN(2)], region, outcome)
	}
	data, ord := filepath.Join(dir, "study.csv"), filepath.Join(dir, "study.order")
	if err := os.WriteFile(data, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(ord, []byte("tier: age sex region\ntier: outcome\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	return data, ord
}

// TestCodingsRoundTrip checks that the codings read from a CSV file are
// shown on the terminal, kept in the result JSON and read back, written
// to GraphML and shown in the report (issue 13).
func TestCodingsRoundTrip(t *testing.T) {
	dir := t.TempDir()
	data, ord := studyCSV(t, dir, nil)
	res, gml := filepath.Join(dir, "r.json"), filepath.Join(dir, "g.graphml")
	out, errs, code := runCLI(t, "discover", "--data", data, "--order", ord, "--json", res, "--graphml", gml, "--folds", "5",
		"--coded-1", "outcome=case", "--reference", "region=east")
	if code != 0 {
		t.Fatalf("discover: %s", errs)
	}
	for _, s := range []string{
		`coded "case" = 1, "control" = 0 (reference)`,
		`coded "north", "south" each vs "east" (reference)`,
		`← region=north: odds ratio`,
		`for "north" vs "east"`,
	} {
		if !strings.Contains(out, s) {
			t.Errorf("summary lacks %q:\n%s", s, out)
		}
	}
	f, err := os.Open(res)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r, err := antecedent.ReadResult(f)
	if err != nil {
		t.Fatal(err)
	}
	outcome, _ := r.Node("outcome")
	region, _ := r.Node("region")
	if outcome.Reference != "control" || strings.Join(outcome.Levels, ",") != "control,case" ||
		region.Reference != "east" || strings.Join(region.Levels, ",") != "east,north,south" {
		t.Errorf("codings read back: outcome %q %q, region %q %q", outcome.Levels, outcome.Reference, region.Levels, region.Reference)
	}
	// Age raises the odds of a case in the generating model (0.12 per
	// year): with case coded 1 its odds ratio is above 1.
	for _, e := range outcome.Effects {
		if e.Parent == "age" && !(e.OddsRatio > 1 && e.Contrast == "per unit") {
			t.Errorf("age: odds ratio %v, contrast %q", e.OddsRatio, e.Contrast)
		}
	}
	var page strings.Builder
	if err := report.Write(&page, r, nil); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(page.String(), `Coded &#34;case&#34; = 1, &#34;control&#34; = 0 (reference)`) {
		t.Error("the report lacks the outcome's coding")
	}
	g, err := os.ReadFile(gml)
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range []string{`<data key="levels">[&#34;east&#34;,&#34;north&#34;,&#34;south&#34;]</data>`, `<data key="reference">control</data>`, `<data key="kind">categorical</data>`} {
		if !strings.Contains(string(g), s) {
			t.Errorf("GraphML lacks %s", s)
		}
	}
}

// TestReadingMessages checks, with the exact line a command-line user
// reads, the reading errors of issue 13 and their fixes written as flags.
func TestReadingMessages(t *testing.T) {
	dir := t.TempDir()
	bad := func(name string, cells map[int]string) string {
		sub := filepath.Join(dir, name)
		if err := os.MkdirAll(sub, 0o755); err != nil {
			t.Fatal(err)
		}
		data, _ := studyCSV(t, sub, cells)
		return data
	}
	_, ord := studyCSV(t, dir, nil)
	write := func(name, text string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	typo := bad("typo", map[int]string{57: "cas"})
	dot := bad("dot", map[int]string{90: "."})
	semi := write("semi.csv", "age;sex;region;outcome\n61;female;north;case\n")
	gaps := write("gaps.csv", "age,sex,region,outcome\n"+strings.Repeat("61,female,north,case\n70,male,east,control\n", 10)+"55,,south,case\n")
	cases := []struct {
		name string
		args []string
		want string
		code int
	}{
		{"rare level", []string{"--data", typo}, `antecedent discover: ` + typo + `: CSV line 59, column 4 ("outcome"): "cas" appears only once (line 59) among 400 values; the others are "case" or "control"; correct the file, or use --as-is outcome (to keep it as a level)`, 1},
		{"missing-value marker", []string{"--data", dot}, `antecedent discover: ` + dot + `: CSV line 92, column 4 ("outcome"): "." appears only once (line 92) among 400 values; the others are "case" or "control"; correct the file, or use --missing-codes . (if it marks a missing value), or use --as-is outcome (to keep it as a level)`, 1},
		{"declared missing code", []string{"--data", dot, "--missing-codes", "."}, `antecedent discover: missing values: "outcome" has 1 missing value (line 92); rerun with --missing complete-case (use only the rows where every variable is present) or --missing available-case (fit each variable on the rows where it and its candidate parents are present)`, 1},
		{"semicolons", []string{"--data", semi}, `antecedent discover: ` + semi + `: CSV line 1: the header has no commas but 3 semicolons, so the file looks separated by semicolons; use --separator ';'`, 1},
		{"missing on file lines", []string{"--data", gaps}, `antecedent discover: missing values: "sex" has 1 missing value (line 22); rerun with --missing complete-case (use only the rows where every variable is present) or --missing available-case (fit each variable on the rows where it and its candidate parents are present)`, 1},
		{"bad separator", []string{"--data", semi, "--separator", "::"}, `antecedent discover: --separator "::": want one character, or "tab"`, 2},
		{"bad pair", []string{"--data", semi, "--reference", "region"}, `invalid value "region" for flag -reference: want VARIABLE=LEVEL, got "region"`, 2},
		{"unknown level", []string{"--data", typo, "--as-is", "outcome", "--reference", "region=west"}, `antecedent discover: ` + typo + `: CSV line 1, column 3 ("region"): "region" has no level "west" (its levels: "east", "north", "south")`, 1},
	}
	for _, c := range cases {
		_, errs, code := runCLI(t, append([]string{"discover", "--order", ord, "--folds", "5"}, c.args...)...)
		got, _, _ := strings.Cut(strings.TrimSpace(errs), "\n")
		if got != c.want || code != c.code {
			t.Errorf("%s: exit %d\n got %s\nwant %s", c.name, code, got, c.want)
		}
	}
}

// TestParquetData runs discover on the clinic table written by another
// tool as CSV, as one Parquet file and as a directory of Parquet parts
// (table/parquetfile/testdata, from apache-arrow and parquet-wasm): the
// three summaries and result files agree.
func TestParquetData(t *testing.T) {
	dir := t.TempDir()
	ord := filepath.Join(dir, "clinic.order")
	if err := os.WriteFile(ord, []byte("tier: age site arm smoker\ntier: treated dose\ntier: relapse\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	const fixtures = "../../table/parquetfile/testdata/"
	var first, firstJSON string
	for i, data := range []string{fixtures + "clinic.csv", fixtures + "clinic.parquet", fixtures + "clinic-parts"} {
		res := filepath.Join(dir, fmt.Sprintf("r%d.json", i))
		out, errs, code := runCLI(t, "discover", "--data", data, "--order", ord, "--json", res, "--folds", "5", "--missing", "complete-case")
		if code != 0 {
			t.Fatalf("%s: %s", data, errs)
		}
		raw, err := os.ReadFile(res)
		if err != nil {
			t.Fatal(err)
		}
		var m map[string]any
		if err := json.Unmarshal(raw, &m); err != nil {
			t.Fatal(err)
		}
		delete(m, "timings") // how long the run took
		js, _ := json.Marshal(m)
		out = regexp.MustCompile(`; [0-9.]+ s\.`).ReplaceAllString(out, ".") // how long the run took
		if i == 0 {
			first, firstJSON = out, string(js)
			continue
		}
		if out != first {
			t.Errorf("%s: summary differs from the CSV's:\n%s\nCSV:\n%s", data, out, first)
		}
		if string(js) != firstJSON {
			t.Errorf("%s: result differs from the CSV's", data)
		}
	}
	// Bad input: the message names the file's row and column and offers
	// the command's flags; CSV-only flags are refused.
	for _, tc := range []struct {
		args []string
		want string
		code int
	}{
		{[]string{"--data", fixtures + "mixed.parquet"}, `antecedent discover: ` + fixtures + `mixed.parquet: row 58 of mixed.parquet, column 1 ("level"): "-" is not a number, and the column's other 119 values are; correct the source, or use --missing-codes '-' (if it marks a missing value), or use --as-is level (to read the column as text)`, 1},
		{[]string{"--data", fixtures + "date.parquet"}, `antecedent discover: parquetfile: date.parquet: column "visit": the logical type DATE is not read; convert it to a number or text before writing the file`, 1},
		{[]string{"--data", fixtures + "clinic.parquet", "--decimal-comma"}, `antecedent discover: --separator and --decimal-comma apply to CSV files, not to Parquet`, 2},
	} {
		_, errs, code := runCLI(t, append([]string{"discover", "--order", ord}, tc.args...)...)
		if code != tc.code || strings.TrimSpace(errs) != tc.want {
			t.Errorf("%v: code %d, message\n%s\nwant %d,\n%s", tc.args, code, errs, tc.code, tc.want)
		}
	}
}

// TestQuestionsReadLikeDiscover checks that effect and studysize take the
// reading flags discover takes, from the one shared flag set: a study
// written with semicolons, decimal commas, a missing-value code and text
// codings is read by all three, and read without the flags it is refused
// with the flag that fixes it, or (coding) with the coding that differs.
func TestQuestionsReadLikeDiscover(t *testing.T) {
	dir := t.TempDir()
	plain, ord := studyCSV(t, dir, nil)
	b, err := os.ReadFile(plain)
	if err != nil {
		t.Fatal(err)
	}
	// Semicolons between fields, commas in numbers, and "." for the sex
	// of the first patient.
	text := strings.ReplaceAll(strings.ReplaceAll(string(b), ",", ";"), ".", ",")
	text = strings.Replace(text, ";female;", ";.;", 1)
	text = strings.Replace(text, ";male;", ";.;", 1)
	data := filepath.Join(dir, "semi.csv")
	if err := os.WriteFile(data, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	result := filepath.Join(dir, "r.json")
	read := []string{"--separator", ";", "--decimal-comma", "--missing-codes", ".", "--coded-1", "outcome=case", "--reference", "region=east"}
	if _, errs, code := runCLI(t, append([]string{"discover", "--data", data, "--order", ord, "--json", result, "--folds", "5",
		"--missing", "complete-case", "--quiet"}, read...)...); code != 0 {
		t.Fatalf("discover: %s", errs)
	}
	effect := []string{"effect", "--result", result, "--data", data, "--cause", "age", "--if", "shift:10", "--resamples", "5"}
	size := []string{"studysize", "--result", result, "--data", data, "--sizes", "60,120", "--replicates", "2"}
	for _, args := range [][]string{effect, size} {
		out, errs, code := runCLI(t, append(args, read...)...)
		if code != 0 || !strings.Contains(out, "Caution") {
			t.Errorf("%s with the reading flags: exit %d %s\n%s", args[0], code, errs, out)
		}
	}
	// An older age raises the risk of a case in the generating model
	// (0.12 per year on the log-odds scale): with "case" coded 1, ten
	// more years raise the outcome's mean.
	out, _, _ := runCLI(t, append(effect, read...)...)
	if !regexp.MustCompile(`outcome\s+0\.\d+ \[[^]]*\]\s+0\.\d+ \[[^]]*\]\s+0\.\d+ `).MatchString(out) {
		t.Errorf("ten more years do not raise the risk of a case:\n%s", out)
	}
	for _, c := range []struct {
		name string
		keep int // reading flags kept: read[:keep]
		more []string
		want string
	}{
		{"no separator", 0, nil, "use --separator ';'"},
		{"no missing code", 3, nil, "use --missing-codes ."},
		{"other coding", 5, []string{"--coded-1", "outcome=control"}, `"outcome" is coded "case" = 1, "control" = 0 (reference) in the result and "control" = 1, "case" = 0 (reference) in the data`},
	} {
		for _, args := range [][]string{effect, size} {
			_, errs, code := runCLI(t, slices.Concat(args, read[:c.keep], c.more)...)
			if code == 0 || !strings.Contains(errs, c.want) {
				t.Errorf("%s, %s: exit %d, stderr %q; want it to say %q", args[0], c.name, code, errs, c.want)
			}
			if strings.Count(strings.TrimSpace(errs), "\n") > 0 {
				t.Errorf("%s, %s: the error takes more than one line: %q", args[0], c.name, errs)
			}
		}
	}
}
