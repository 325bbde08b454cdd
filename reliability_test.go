package antecedent_test

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/lasso"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/table"
)

// badInput is one entry of the catalogue of bad or degenerate inputs. Each
// either fails with an error that names the culprit, or succeeds with a
// documented result and a warning; none may panic or change the caller's
// data.
type badInput struct {
	name string
	// Exactly one of csv or cols is set.
	csv   string
	names []string
	cols  [][]float64
	order string
	cfg   *antecedent.Config
	// wantErr, when set, must be matched by errors.Is; mention must
	// appear in the error message (or, for a success, in a warning).
	wantErr error
	mention string
	// find lists edges ("from -> to") a success must contain.
	find []string
}

// column returns n values from a seeded generator.
func column(n int, seed uint64, f func(r *rand.Rand, i int) float64) []float64 {
	r := rand.New(rand.NewPCG(seed, 77))
	c := make([]float64, n)
	for i := range c {
		c[i] = f(r, i)
	}
	return c
}

func normal(r *rand.Rand, _ int) float64 { return r.NormFloat64() }

func badInputs() []badInput {
	n := 200
	x := column(n, 1, normal)
	y := column(n, 2, func(r *rand.Rand, i int) float64 { return x[i] + r.NormFloat64() })
	bin := column(n, 3, func(r *rand.Rand, i int) float64 {
		if x[i]+r.NormFloat64() > 0 {
			return 1
		}
		return 0
	})
	okOrder := "tier: x\ntier: y\n"
	with := func(f func(c []float64)) []float64 { c := slices.Clone(y); f(c); return c }
	csvOK := "x,y\n" + func() string {
		var b strings.Builder
		for i := range 60 {
			fmt.Fprintf(&b, "%g,%g\n", x[i], y[i])
		}
		return b.String()
	}()
	wide := "v0" + strings.Repeat(",v", 20000) + "\n"
	tiny := column(n, 5, func(r *rand.Rand, _ int) float64 { return 1e-12 * r.NormFloat64() })
	huge := column(n, 6, func(r *rand.Rand, _ int) float64 { return 1e12 * r.NormFloat64() })
	return []badInput{
		// Malformed CSV.
		{name: "csv ragged row", csv: "x,y\n1,2\n3\n", order: okOrder, wantErr: table.ErrCSV, mention: "line 3"},
		{name: "csv duplicate header", csv: "x,x\n1,2\n", order: okOrder, wantErr: table.ErrCSV, mention: "column 2"},
		{name: "csv empty header", csv: "x,\n1,2\n", order: okOrder, wantErr: table.ErrCSV, mention: "column 2"},
		{name: "csv byte-order mark", csv: "\ufeff" + csvOK, order: okOrder},
		{name: "csv quoted newline in a name", csv: "\"x\",\"y\ny\"\n1,2\n3,4\n", order: "tier: x\ntier: \"y\ny\"\n", wantErr: order.ErrSyntax, mention: "line"},
		{name: "csv non-numeric cell", csv: "x,y\n1,2\n2,abc\n3,4\n4,5\n", order: okOrder, wantErr: table.ErrData, mention: `"abc" is not a number`},
		{name: "csv NaN cell", csv: strings.Replace(csvOK, "\n", "\nNaN,", 1)[:0] + "x,y\n1,NaN\n2,3\n", order: okOrder, wantErr: table.ErrMissing, mention: `"y" has 1`},
		{name: "csv Inf cell", csv: "x,y\n1,Inf\n", order: okOrder, wantErr: table.ErrData, mention: "line 2"},
		{name: "csv empty file", csv: "", order: okOrder, wantErr: table.ErrCSV, mention: "empty file"},
		{name: "csv header only", csv: "x,y\n", order: okOrder, wantErr: table.ErrCSV, mention: "no data rows"},
		{name: "csv 20,001 columns", csv: wide, order: okOrder, wantErr: table.ErrCSV, mention: "more than the limit of 10000"},
		{name: "csv too many text levels", csv: "x,y\n" + func() string {
			var b strings.Builder
			for i := range 80 {
				fmt.Fprintf(&b, "level%d,%d\n", i, i)
			}
			return b.String()
		}(), order: okOrder, wantErr: table.ErrData, mention: "more than 50 distinct"},
		// Order files.
		{name: "order unknown name", cols: [][]float64{x, y}, names: []string{"x", "y"}, order: "tier: x ghost\ntier: y\n", wantErr: order.ErrInvalid, mention: `"ghost"`},
		{name: "order duplicated name", cols: [][]float64{x, y}, names: []string{"x", "y"}, order: "tier: x\ntier: y x\n", wantErr: order.ErrInvalid, mention: "placed twice"},
		{name: "order unplaced name", cols: [][]float64{x, y, bin}, names: []string{"x", "y", "b"}, order: okOrder, wantErr: order.ErrInvalid, mention: `no tier: "b"`},
		{name: "order required edge backwards", cols: [][]float64{x, y}, names: []string{"x", "y"}, order: okOrder + "require y -> x\n", wantErr: order.ErrInvalid, mention: "y -> x"},
		{name: "order forbidden and required", cols: [][]float64{x, y}, names: []string{"x", "y"}, order: okOrder + "forbid x -> y\nrequire x -> y\n", wantErr: order.ErrInvalid, mention: "both forbidden and required"},
		{name: "order malformed line", cols: [][]float64{x, y}, names: []string{"x", "y"}, order: "tier: x\nthen: y\n", wantErr: order.ErrSyntax, mention: "line 2"},
		{name: "order empty tier", cols: [][]float64{x, y}, names: []string{"x", "y"}, order: "tier: x\ntier:\ntier: y\n", wantErr: order.ErrInvalid, mention: "empty tiers: 2"},
		{name: "order empty file", cols: [][]float64{x, y}, names: []string{"x", "y"}, order: "", wantErr: order.ErrSyntax, mention: "no tier lines"},
		{name: "order bad JSON", cols: [][]float64{x, y}, names: []string{"x", "y"}, order: `{"tiers": [["x"], ["y"]`, wantErr: order.ErrSyntax, mention: "JSON"},
		// Data.
		{name: "constant response", cols: [][]float64{x, column(n, 0, func(*rand.Rand, int) float64 { return 4 })}, names: []string{"x", "y"}, order: okOrder, mention: "constant"},
		{name: "constant predictor", cols: [][]float64{column(n, 0, func(*rand.Rand, int) float64 { return 4 }), y}, names: []string{"x", "y"}, order: okOrder, mention: "x is constant"},
		{name: "duplicated columns", cols: [][]float64{x, slices.Clone(x), y}, names: []string{"x", "x2", "y"}, order: "tier: x x2\ntier: y\n", mention: "x and x2 hold identical values"},
		{name: "perfectly collinear required parents", cols: [][]float64{x, column(n, 0, func(_ *rand.Rand, i int) float64 { return 2*x[i] + 1 }), y}, names: []string{"x", "z", "y"},
			order: "tier: x z\ntier: y\nrequire x -> y\nrequire z -> y\n", mention: "collinear"},
		{name: "separating predictor", cols: [][]float64{x, column(n, 0, func(_ *rand.Rand, i int) float64 { return b2f(x[i] > 0) })}, names: []string{"x", "s"}, order: "tier: x\ntier: s\n", mention: "separation"},
		{name: "extreme scales", cols: [][]float64{tiny, huge, column(n, 7, func(r *rand.Rand, i int) float64 { return 1e12*tiny[i] + 1e-12*huge[i] + 0.3*r.NormFloat64() })},
			names: []string{"tiny", "huge", "y"}, order: "tier: tiny huge\ntier: y\n", find: []string{"tiny -> y", "huge -> y"}},
		{name: "more variables than rows", cols: func() [][]float64 {
			var cs [][]float64
			for j := range 39 {
				cs = append(cs, column(25, uint64(10+j), normal))
			}
			return append(cs, column(25, 99, func(r *rand.Rand, i int) float64 { return 3*cs[0][i] + 0.2*r.NormFloat64() }))
		}(), names: func() []string {
			var ns []string
			for j := range 40 {
				ns = append(ns, fmt.Sprintf("v%d", j))
			}
			return ns
		}(), order: func() string {
			var b strings.Builder
			b.WriteString("tier:")
			for j := range 39 {
				fmt.Fprintf(&b, " v%d", j)
			}
			return b.String() + "\ntier: v39\n"
		}(), cfg: &antecedent.Config{Folds: 5}, find: []string{"v0 -> v39"}},
		{name: "single positive case", cols: [][]float64{x, column(n, 0, func(_ *rand.Rand, i int) float64 { return b2f(i == 7) })}, names: []string{"x", "rare"}, order: "tier: x\ntier: rare\n", mention: "rare"},
		{name: "column all missing", cols: [][]float64{x, column(n, 0, func(*rand.Rand, int) float64 { return math.NaN() })}, names: []string{"x", "y"}, order: okOrder, wantErr: table.ErrMissing, mention: `"y" has 200`},
		{name: "column all missing, available case", cols: [][]float64{x, column(n, 0, func(*rand.Rand, int) float64 { return math.NaN() })}, names: []string{"x", "y"}, order: okOrder, cfg: &antecedent.Config{Missing: table.MissingAvailableCase}, mention: "only 0 usable rows"},
		{name: "missing values, complete case", cols: [][]float64{x, with(func(c []float64) { c[3] = math.NaN() })}, names: []string{"x", "y"}, order: okOrder, cfg: &antecedent.Config{Missing: table.MissingCompleteCase}, mention: "199 of 200 rows"},
		{name: "infinite value", cols: [][]float64{x, with(func(c []float64) { c[9] = math.Inf(-1) })}, names: []string{"x", "y"}, order: okOrder, wantErr: table.ErrData, mention: "row 10"},
		{name: "length mismatch", cols: [][]float64{x, y[:150]}, names: []string{"x", "y"}, order: okOrder, wantErr: table.ErrData, mention: `"y" has 150 rows`},
		{name: "empty name", cols: [][]float64{x, y}, names: []string{"x", " "}, order: okOrder, wantErr: table.ErrData, mention: "empty name"},
		{name: "duplicate name", cols: [][]float64{x, y}, names: []string{"x", "x"}, order: okOrder, wantErr: table.ErrData, mention: "twice"},
		{name: "too few rows", cols: [][]float64{x[:6], y[:6]}, names: []string{"x", "y"}, order: okOrder, wantErr: table.ErrData, mention: "6 rows for 10 folds"},
		// Options.
		{name: "zero folds means the default", cols: [][]float64{x, y}, names: []string{"x", "y"}, order: okOrder, cfg: &antecedent.Config{Folds: 0}},
		{name: "one fold", cols: [][]float64{x, y}, names: []string{"x", "y"}, order: okOrder, cfg: &antecedent.Config{Folds: 1}, wantErr: antecedent.ErrConfig, mention: "Folds 1"},
		{name: "negative folds", cols: [][]float64{x, y}, names: []string{"x", "y"}, order: okOrder, cfg: &antecedent.Config{Folds: -3}, wantErr: antecedent.ErrConfig, mention: "Folds -3"},
		{name: "more folds than rows", cols: [][]float64{x, y}, names: []string{"x", "y"}, order: okOrder, cfg: &antecedent.Config{Folds: 500}, wantErr: table.ErrData, mention: "200 rows for 500 folds"},
		{name: "threshold at one half", cols: [][]float64{x, y}, names: []string{"x", "y"}, order: okOrder, cfg: &antecedent.Config{Stability: antecedent.Stability{Pairs: 5, Threshold: 0.5}}, wantErr: antecedent.ErrConfig, mention: "Threshold 0.5"},
		{name: "threshold above one", cols: [][]float64{x, y}, names: []string{"x", "y"}, order: okOrder, cfg: &antecedent.Config{Stability: antecedent.Stability{Pairs: 5, Threshold: 1.2}}, wantErr: antecedent.ErrConfig, mention: "Threshold 1.2"},
		{name: "negative workers", cols: [][]float64{x, y}, names: []string{"x", "y"}, order: okOrder, cfg: &antecedent.Config{Workers: -1}, wantErr: antecedent.ErrConfig, mention: "Workers -1"},
		{name: "mixing outside (0, 1]", cols: [][]float64{x, y}, names: []string{"x", "y"}, order: okOrder, cfg: &antecedent.Config{CV: cv.Settings{Path: lasso.Settings{Mixing: 1.5}}}, wantErr: antecedent.ErrConfig, mention: "Mixing"},
		{name: "negative stability pairs", cols: [][]float64{x, y}, names: []string{"x", "y"}, order: okOrder, cfg: &antecedent.Config{Stability: antecedent.Stability{Pairs: -2}}, wantErr: antecedent.ErrConfig, mention: "Stability.Pairs -2"},
	}
}

func b2f(b bool) float64 {
	if b {
		return 1
	}
	return 0
}

// TestBadInputCatalogue runs every case of the catalogue.
func TestBadInputCatalogue(t *testing.T) {
	cases := badInputs()
	if len(cases) < 40 {
		t.Fatalf("catalogue has %d cases; the promise is at least 40", len(cases))
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var before [][]float64
			for _, col := range c.cols {
				before = append(before, slices.Clone(col))
			}
			res, err := runCase(c)
			for j := range c.cols {
				if !sameBits(before[j], c.cols[j]) {
					t.Errorf("caller's column %d was changed", j)
				}
			}
			if c.wantErr != nil {
				if !errors.Is(err, c.wantErr) {
					t.Fatalf("error %v, want %v", err, c.wantErr)
				}
				if !strings.Contains(err.Error(), c.mention) {
					t.Errorf("error %q does not mention %q", err, c.mention)
				}
				return
			}
			if err != nil {
				t.Fatalf("unexpected error: %v", err)
			}
			if c.mention != "" && !strings.Contains(strings.Join(res.Warnings, "\n"), c.mention) {
				t.Errorf("warnings %q do not mention %q", res.Warnings, c.mention)
			}
			if _, err := res.Graph(); err != nil {
				t.Errorf("result graph: %v", err)
			}
			var got []string
			for _, e := range res.Edges {
				got = append(got, e.From+" -> "+e.To)
			}
			for _, e := range c.find {
				if !slices.Contains(got, e) {
					t.Errorf("edges %v lack %s", got, e)
				}
			}
		})
	}
}

// runCase runs one case, turning a panic into a test failure message.
func runCase(c badInput) (res *antecedent.Result, err error) {
	defer func() {
		if p := recover(); p != nil {
			err = fmt.Errorf("PANIC: %v", p)
		}
	}()
	var d *table.Dataset
	if c.cols == nil {
		d, err = table.ReadCSV(strings.NewReader(c.csv), nil)
	} else {
		d, err = table.NewDataset(c.names, c.cols)
	}
	if err != nil {
		return nil, err
	}
	o, err := order.Parse(strings.NewReader(c.order))
	if err != nil {
		return nil, err
	}
	return antecedent.DiscoverContext(context.Background(), d, o, c.cfg)
}

func sameBits(a, b []float64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if math.Float64bits(a[i]) != math.Float64bits(b[i]) {
			return false
		}
	}
	return true
}

// TestSurfaceDetails checks small promises of the embedding API: a nil
// context is an error, not a panic; a measure for 0/1 responses applies to
// binary nodes while continuous ones use deviance; every key of the result
// JSON is present, empty lists as [] and unknown values as null.
func TestSurfaceDetails(t *testing.T) {
	d, o, _ := smallProblem(t, 8)
	if _, err := antecedent.DiscoverContext(nil, d, o, nil); !errors.Is(err, antecedent.ErrConfig) {
		t.Errorf("nil context: %v", err)
	}
	res, err := antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Seed: 1, CV: cv.Settings{Measure: cv.AreaUnderCurve}})
	if err != nil {
		t.Fatalf("AUC on a mixed network: %v", err)
	}
	for _, n := range res.Nodes {
		if !n.Fitted {
			if n.Rows != d.Rows() {
				t.Errorf("%s: rows %d, want %d", n.Name, n.Rows, d.Rows())
			}
			continue
		}
		want := cv.Deviance
		if n.Kind == table.Binary {
			want = cv.AreaUnderCurve
		}
		if n.Measure != want {
			t.Errorf("%s (%v): measure %v, want %v", n.Name, n.Kind, n.Measure, want)
		}
	}
	var buf bytes.Buffer
	if err := res.WriteJSON(&buf); err != nil {
		t.Fatal(err)
	}
	var raw map[string]json.RawMessage
	if err := json.Unmarshal(buf.Bytes(), &raw); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"nodes", "edges", "links", "order", "config", "rows", "stability", "warnings", "timings"} {
		if _, ok := raw[k]; !ok {
			t.Errorf("result JSON lacks %q", k)
		}
	}
	if string(raw["links"]) != "[]" || string(raw["stability"]) != "null" {
		t.Errorf("links %s, stability %s; want [] and null", raw["links"], raw["stability"])
	}
	var nodes []map[string]json.RawMessage
	json.Unmarshal(raw["nodes"], &nodes)
	for _, k := range []string{"required", "warnings", "curve", "effects", "tier_label", "markov_blanket"} {
		if _, ok := nodes[0][k]; !ok {
			t.Errorf("first node lacks %q", k)
		}
	}
}
