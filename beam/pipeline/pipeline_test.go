package pipeline

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"testing"

	"github.com/antecedent-lab/antecedent/internal/jsondiff"

	"github.com/apache/beam/sdks/v2/go/pkg/beam"
	"github.com/apache/beam/sdks/v2/go/pkg/beam/io/filesystem"
	"github.com/apache/beam/sdks/v2/go/pkg/beam/runners/prism"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/table"
)

// Every test here runs Prism, whose job server listens on every network
// interface: run them in a network namespace with loopback only (see the
// README).

func TestMain(m *testing.M) {
	beam.Init()
	filesystem.Register("flaky", func(context.Context) filesystem.Interface { return flakyFS{} })
	os.Exit(m.Run())
}

// flakyFS reads local files, failing the first read of any file whose
// name contains "fail-once", as cloud storage sometimes does.
type flakyFS struct{}

var (
	failed   sync.Map
	failures atomic.Int64
)

func (flakyFS) local(p string) string { return strings.TrimPrefix(p, "flaky://") }
func (flakyFS) Close() error          { return nil }
func (f flakyFS) List(ctx context.Context, glob string) ([]string, error) {
	return filepath.Glob(f.local(glob))
}
func (f flakyFS) OpenRead(ctx context.Context, p string) (io.ReadCloser, error) {
	if strings.Contains(p, "fail-once") {
		if _, seen := failed.LoadOrStore(p, true); !seen {
			failures.Add(1)
			return nil, errors.New("flaky: storage unavailable (simulated)")
		}
	}
	return os.Open(f.local(p))
}
func (f flakyFS) OpenWrite(ctx context.Context, p string) (io.WriteCloser, error) {
	return os.Create(f.local(p))
}
func (f flakyFS) Size(ctx context.Context, p string) (int64, error) {
	st, err := os.Stat(f.local(p))
	if err != nil {
		return 0, err
	}
	return st.Size(), nil
}

// mixedTable simulates a seeded mixed network (continuous and binary
// nodes from package simulate) and adds a categorical first-tier variable,
// region, cut from a simulated variable that drives later ones; it
// returns the table as CSV rows under a header, and the order.
func mixedTable(t *testing.T, n int) (header string, rows []string, o *order.Order) {
	t.Helper()
	m := &simulate.Model{Nodes: []simulate.Node{
		{Name: "latent"},
		{Name: "age"},
		{Name: "smoker", Binary: true, Prevalence: 0.3},
		{Name: "bmi", Parents: []string{"age", "latent"}, Weights: []float64{0.4, 0.6}},
		{Name: "statin", Binary: true, Parents: []string{"age", "bmi"}, Weights: []float64{0.8, 0.5}, Prevalence: 0.25},
		{Name: "sbp", Parents: []string{"bmi", "smoker"}, Weights: []float64{0.5, 0.7}},
		{Name: "event", Binary: true, Parents: []string{"sbp", "statin", "smoker"}, Weights: []float64{0.7, -0.6, 0.5}, Prevalence: 0.2},
		{Name: "score", Parents: []string{"event", "sbp"}, Weights: []float64{1, 0.3}},
	}}
	s, err := m.Sample(n, 17)
	if err != nil {
		t.Fatal(err)
	}
	names := []string{"region", "age", "smoker", "bmi", "statin", "sbp", "event", "score"}
	rng := rand.New(rand.NewPCG(3, 4))
	for i := range n {
		z := s.Column("latent")[i]
		region := "east"
		switch {
		case z < -0.5:
			region = "north"
		case z > 0.5:
			region = "south"
		}
		if rng.Float64() < 0.1 {
			region = "west"
		}
		cells := []string{region}
		for _, name := range names[1:] {
			cells = append(cells, strconv.FormatFloat(s.Column(name)[i], 'g', -1, 64))
		}
		rows = append(rows, strings.Join(cells, ","))
	}
	o = &order.Order{Tiers: [][]string{{"region", "age", "smoker"}, {"bmi"}, {"statin", "sbp"}, {"event"}, {"score"}}}
	return strings.Join(names, ","), rows, o
}

// writeShards writes rows into shards of the given sizes (the last takes
// the rest) and returns their paths, prefixed by scheme.
func writeShards(t *testing.T, dir, scheme, header string, rows []string, sizes []int, names []string) []string {
	t.Helper()
	var paths []string
	start := 0
	for s, name := range names {
		end := len(rows)
		if s < len(sizes) {
			end = start + sizes[s]
		}
		p := filepath.Join(dir, name)
		body := header + "\n" + strings.Join(rows[start:end], "\n")
		if end > start {
			body += "\n"
		}
		if err := os.WriteFile(p, []byte(body), 0o600); err != nil {
			t.Fatal(err)
		}
		paths = append(paths, scheme+p)
		start = end
	}
	return paths
}

// single runs Discover on the whole table, read as the command line reads it.
func single(t *testing.T, header string, rows []string, o *order.Order, cfg *antecedent.Config) *antecedent.Result {
	t.Helper()
	d, err := table.ReadCSV(strings.NewReader(header+"\n"+strings.Join(rows, "\n")+"\n"), nil)
	if err != nil {
		t.Fatal(err)
	}
	res, err := antecedent.DiscoverContext(context.Background(), d, o, cfg)
	if err != nil {
		t.Fatal(err)
	}
	return res
}

// distributed runs the pipeline on Prism and reads its result.
func distributed(t *testing.T, shards []string, o *order.Order, cfg *antecedent.Config, out string) *antecedent.Result {
	t.Helper()
	p, s := beam.NewPipelineWithRoot()
	if err := Build(s, Settings{Shards: shards, Order: o, Config: cfg, Output: out}); err != nil {
		t.Fatal(err)
	}
	if _, err := prism.Execute(context.Background(), p); err != nil {
		t.Fatal(err)
	}
	f, err := os.Open(strings.TrimPrefix(out, "flaky://"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	res, err := antecedent.ReadResult(f)
	if err != nil {
		t.Fatal(err)
	}
	return res
}

// TestPrismEqualsDiscover checks, on Prism, that the distributed result
// equals single-machine Discover with the same seed and folds: identical
// parent sets and, node by node, identical JSON for binary nodes (the same
// code on the same rebuilt table) and every number within 1e-9 for
// continuous ones, whose shared moments are summed in another order
// (tolerance: common practice for double-precision sums of a few thousand
// terms). Shards have very different sizes, one is empty, and one fails
// its first read.
func TestPrismEqualsDiscover(t *testing.T) {
	header, rows, o := mixedTable(t, 3000)
	cases := []struct {
		name   string
		sizes  []int
		shards []string
		cfg    *antecedent.Config
	}{
		{"uneven with an empty shard", []int{7, 0, 2100}, []string{"a.csv", "b.csv", "c.csv", "d.csv"},
			&antecedent.Config{Seed: 5, Folds: 5, SameTier: true}},
		{"a shard fails once", []int{1000, 1000}, []string{"a.csv", "fail-once.csv", "c.csv"},
			&antecedent.Config{Seed: 9, Stability: antecedent.Stability{Pairs: 2}}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			dir := t.TempDir()
			before := failures.Load()
			shards := writeShards(t, dir, "flaky://", header, rows, c.sizes, c.shards)
			want := single(t, header, rows, o, c.cfg)
			got := distributed(t, shards, o, c.cfg, "flaky://"+filepath.Join(dir, "result.json"))
			if strings.Contains(c.name, "fails") && failures.Load() == before {
				t.Error("no read failed; the retry was not exercised")
			}
			compare(t, want, got)
		})
	}
}

func compare(t *testing.T, want, got *antecedent.Result) {
	t.Helper()
	if !got.Timings.Moments || !want.Timings.Moments {
		t.Error("continuous nodes did not share fold moments")
	}
	want.Timings, got.Timings = antecedent.Timings{}, antecedent.Timings{}
	if len(want.Nodes) != len(got.Nodes) {
		t.Fatalf("%d nodes, want %d", len(got.Nodes), len(want.Nodes))
	}
	continuous := 0
	for v, w := range want.Nodes {
		g := got.Nodes[v]
		if fmt.Sprint(w.Parents) != fmt.Sprint(g.Parents) {
			t.Errorf("%s: parents %v, want %v", w.Name, g.Parents, w.Parents)
		}
		wj, _ := json.Marshal(w)
		gj, _ := json.Marshal(g)
		if w.Family == "gaussian" && len(w.Candidates) > 0 {
			continuous++
			if d := jsonDiff(t, wj, gj, 1e-9); d != "" {
				t.Errorf("%s: %s", w.Name, d)
			}
		} else if string(wj) != string(gj) {
			t.Errorf("%s: node differs: %s", w.Name, jsonDiff(t, wj, gj, 0))
		}
	}
	if continuous == 0 {
		t.Error("no continuous node was compared")
	}
	wj, _ := json.Marshal(want)
	gj, _ := json.Marshal(got)
	if d := jsonDiff(t, wj, gj, 1e-9); d != "" {
		t.Errorf("result: %s", d)
	}
}

// jsonDiff returns the first difference between two JSON documents,
// numbers compared within tol (see internal/jsondiff).
func jsonDiff(t *testing.T, a, b []byte, tol float64) string {
	t.Helper()
	d, err := jsondiff.Diff(a, b, tol)
	if err != nil {
		t.Fatal(err)
	}
	return d
}
