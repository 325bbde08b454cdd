package order_test

import (
	"bytes"
	"encoding/json"
	"errors"
	"reflect"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent/order"
)

const sample = `# follow-up study
tier traits: age sex   # fixed at birth
tier baseline: bmi, diabetes

tier: "implant type" anaesthesia
forbid sex -> diabetes
require age -> bmi
`

func TestParseText(t *testing.T) {
	o, err := order.Parse(strings.NewReader(sample))
	if err != nil {
		t.Fatal(err)
	}
	want := &order.Order{
		Tiers:     [][]string{{"age", "sex"}, {"bmi", "diabetes"}, {"implant type", "anaesthesia"}},
		Labels:    []string{"traits", "baseline", ""},
		Forbidden: []order.Edge{{"sex", "diabetes"}},
		Required:  []order.Edge{{"age", "bmi"}},
	}
	if !reflect.DeepEqual(o, want) {
		t.Fatalf("got %+v\nwant %+v", o, want)
	}
	var buf bytes.Buffer
	if err := o.WriteText(&buf); err != nil {
		t.Fatal(err)
	}
	back, err := order.Parse(&buf)
	if err != nil {
		t.Fatalf("%v in\n%s", err, buf.String())
	}
	if !reflect.DeepEqual(back, o) {
		t.Errorf("text round trip: %+v", back)
	}
	js, err := json.Marshal(o)
	if err != nil {
		t.Fatal(err)
	}
	back, err = order.Parse(bytes.NewReader(js))
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(back, o) {
		t.Errorf("JSON round trip: %s -> %+v", js, back)
	}
}

func TestParseJSONShape(t *testing.T) {
	// The shape other tools write (from the issue).
	in := `{"tiers": [["a","b"],["c"]], "forbidden": [["a","c"]], "required": [["b","c"]]}`
	o, err := order.Parse(strings.NewReader(in))
	if err != nil {
		t.Fatal(err)
	}
	want := &order.Order{Tiers: [][]string{{"a", "b"}, {"c"}}, Forbidden: []order.Edge{{"a", "c"}}, Required: []order.Edge{{"b", "c"}}}
	if !reflect.DeepEqual(o, want) {
		t.Fatalf("got %+v", o)
	}
}

func TestParseErrors(t *testing.T) {
	cases := []struct{ name, in, contains string }{
		{"unknown keyword", "tier: a\nlayer: b\n", "line 2: unknown keyword"},
		{"tier without colon", "tier a b\n", "line 1"},
		{"bad forbid", "tier: a b\nforbid a b\n", "line 2"},
		{"unclosed quote", "tier: \"a b\n", "unclosed quote"},
		{"no tiers", "# nothing\n\n", "no tier lines"},
		{"JSON unknown field", `{"tiers": [["a"]], "layers": 1}`, "unknown field"},
		{"JSON syntax", "{\"tiers\": [[\"a\"]\n,,}", "line 2"},
		{"JSON no tiers", `{"forbidden": []}`, "no \"tiers\""},
		{"JSON trailing", `{"tiers": [["a"]]} {}`, "after"},
	}
	for _, c := range cases {
		_, err := order.Parse(strings.NewReader(c.in))
		if !errors.Is(err, order.ErrSyntax) || !strings.Contains(err.Error(), c.contains) {
			t.Errorf("%s: error %v, want syntax error mentioning %q", c.name, err, c.contains)
		}
	}
}

func TestCompile(t *testing.T) {
	o, _ := order.Parse(strings.NewReader(sample))
	names := []string{"anaesthesia", "age", "bmi", "diabetes", "implant type", "sex"}
	p, err := o.Compile(names)
	if err != nil {
		t.Fatal(err)
	}
	idx := func(ns ...string) []int {
		var out []int
		for _, n := range ns {
			out = append(out, p.Index(n))
		}
		return out
	}
	if got := p.Candidates[p.Index("diabetes")]; !reflect.DeepEqual(got, idx("age")) {
		t.Errorf("diabetes candidates %v (sex is forbidden)", got)
	}
	if got := p.Candidates[p.Index("bmi")]; !reflect.DeepEqual(got, idx("age", "sex")) {
		t.Errorf("bmi candidates %v", got)
	}
	if got := p.Required[p.Index("bmi")]; !reflect.DeepEqual(got, idx("age")) {
		t.Errorf("bmi required %v", got)
	}
	if got := p.Candidates[p.Index("age")]; len(got) != 0 {
		t.Errorf("age candidates %v", got)
	}
	if got := p.Peers[p.Index("anaesthesia")]; !reflect.DeepEqual(got, idx("implant type")) {
		t.Errorf("anaesthesia peers %v", got)
	}
	if got := p.Candidates[p.Index("implant type")]; len(got) != 4 {
		t.Errorf("implant type candidates %v", got)
	}
}

func TestCompileListsEverything(t *testing.T) {
	o := &order.Order{
		Tiers:     [][]string{{"a", "ghost"}, {}, {"b", "a"}, {"c"}},
		Forbidden: []order.Edge{{"a", "c"}, {"x", "c"}},
		Required:  []order.Edge{{"c", "b"}, {"a", "c"}},
	}
	_, err := o.Compile([]string{"a", "b", "c", "d"})
	var ve *order.ValidationError
	if !errors.As(err, &ve) || !errors.Is(err, order.ErrInvalid) {
		t.Fatalf("error %v", err)
	}
	want := &order.ValidationError{
		Unknown:     []string{"ghost"},
		Duplicated:  []string{"a"},
		Unplaced:    []string{"d"},
		EmptyTiers:  []int{1},
		Backward:    []order.Edge{{"c", "b"}},
		Conflicting: []order.Edge{{"a", "c"}},
		BadEdges:    []order.BadEdge{{Edge: order.Edge{From: "x", To: "c"}, Keyword: "forbid", Unknown: []string{"x"}}},
	}
	if !reflect.DeepEqual(ve, want) {
		t.Errorf("got %+v\nwant %+v", ve, want)
	}
	for _, s := range []string{`"ghost"`, `"a"`, `"d"`, "empty tiers: 2", "c -> b", "a -> c", `forbid "x" -> "c": unknown name "x"`} {
		if !strings.Contains(err.Error(), s) {
			t.Errorf("message %q lacks %s", err, s)
		}
	}
}

// TestMisspelledNames checks that a misspelt name in a tier, forbid or
// require line is reported as unknown with the data name it most likely
// misspells.
func TestMisspelledNames(t *testing.T) {
	data := []string{"age", "sex", "smoker", "bmi", "diabetes", "outcome"}
	for _, c := range []struct {
		text string
		want []string
	}{
		{"tier a: age sexx smoker\ntier b: bmi diabetes outcome\n", []string{`unknown names: "sexx" (did you mean "sex"?)`, `names in no tier: "sex"`}},
		{"tier a: age sex smoker\ntier b: bmi diabetes outcome\nforbid smokr -> diabetes\n", []string{`forbid "smokr" -> "diabetes": unknown name "smokr" (did you mean "smoker"?)`}},
		{"tier a: age sex smoker\ntier b: bmi diabetes outcome\nrequire Age -> outcom\n", []string{`require "Age" -> "outcom": unknown names "Age" (did you mean "age"?) and "outcom" (did you mean "outcome"?)`}},
		{"tier a: age sex smoker\ntier b: bmi diabetes outcome\nforbid weight -> bmi\n", []string{`forbid "weight" -> "bmi": unknown name "weight"`}},
		{"tier a: age sex smoker\ntier b: bmi diabetes outcome\nforbid bmi -> bmi\n", []string{`forbid "bmi" -> "bmi": an edge from a variable to itself`}},
	} {
		o, err := order.Parse(strings.NewReader(c.text))
		if err != nil {
			t.Fatal(err)
		}
		_, err = o.Compile(data)
		if err == nil {
			t.Errorf("%q accepted", c.text)
			continue
		}
		for _, w := range c.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%q: message %q lacks %q", c.text, err, w)
			}
		}
		if strings.Contains(c.text, "weight") && strings.Contains(err.Error(), "did you mean") {
			t.Errorf("suggestion for a name close to none: %v", err)
		}
	}
}

// TestClosest checks the suggestion rule (common practice for "did you
// mean" messages: smallest edit distance, a clear winner, a bound).
func TestClosest(t *testing.T) {
	names := []string{"age", "sex", "smoker", "bmi", "diabetes", "diabetes_type", "hba1c", "hba1c_6m"}
	for _, c := range []struct{ in, want string }{
		{"sexx", "sex"},         // an insertion
		{"Sex", "sex"},          // case is ignored
		{"smkoer", "smoker"},    // a swap of neighbours is one edit
		{"diabtes", "diabetes"}, // a deletion
		{"hba1c_6", "hba1c_6m"},
		{"bm", "bmi"},       // short names allow one edit
		{"hba1c_", "hba1c"}, // one edit beats two
		{"weight", ""},      // nothing close
		{"dbts", ""},        // four edits from diabetes: too far
	} {
		if got := order.Closest(c.in, names); got != c.want {
			t.Errorf("Closest(%q) = %q, want %q", c.in, got, c.want)
		}
	}
	if got := order.Closest("ab", []string{"ax", "ay"}); got != "" {
		t.Errorf("a tie gave %q", got)
	}
}

func TestFromTimes(t *testing.T) {
	o, err := order.FromTimes([]string{"stroke", "birth weight", "diabetes", "hypertension", "sex"},
		[]float64{71, 0, 52, 50.5, 0}, 2)
	if err != nil {
		t.Fatal(err)
	}
	want := [][]string{{"birth weight", "sex"}, {"hypertension", "diabetes"}, {"stroke"}}
	if !reflect.DeepEqual(o.Tiers, want) {
		t.Errorf("tiers %v, want %v", o.Tiers, want)
	}
	if _, err := order.FromTimes([]string{"a"}, []float64{1, 2}, 1); err == nil {
		t.Error("mismatched lengths accepted")
	}
	if _, err := order.FromTimes([]string{"a", "a"}, []float64{1, 2}, 1); err == nil {
		t.Error("duplicate accepted")
	}
}

func TestWriteTextRefusesWhatTextCannotCarry(t *testing.T) {
	cases := map[string]*order.Order{
		"quote in a name":      {Tiers: [][]string{{`a"b`}}},
		"line break in edge":   {Tiers: [][]string{{"a"}, {"b"}}, Required: []order.Edge{{"a", "b\nc"}}},
		"colon in a label":     {Tiers: [][]string{{"a"}}, Labels: []string{"week: 1"}},
		"label without tier":   {Tiers: [][]string{{"a"}}, Labels: []string{"", "later"}},
		"space around label":   {Tiers: [][]string{{"a"}}, Labels: []string{" x"}},
		"empty name in a tier": {Tiers: [][]string{{""}}},
	}
	for name, o := range cases {
		var b bytes.Buffer
		if err := o.WriteText(&b); !errors.Is(err, order.ErrNotText) || b.Len() > 0 {
			t.Errorf("%s: wrote %q, error %v", name, b.Bytes(), err)
		}
	}
}
