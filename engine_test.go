package antecedent_test

import (
	"context"
	"encoding/json"
	"slices"
	"testing"

	"github.com/antecedent-lab/antecedent/internal/jsondiff"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/lasso"
)

// chunked is an engine that forms fold moments the way a cluster does:
// over row blocks of very different sizes (one empty), added together
// afterwards, about a shift of its own. It counts the fits it runs.
type chunked struct {
	cuts []int // block ends, as shares of 1000 rows
	fits int
}

func (c *chunked) FoldMoments(ctx context.Context, w *antecedent.MomentsWork) ([]*lasso.Moments, error) {
	n := len(w.Columns[0])
	shift := make([]float64, len(w.Shift))
	for j, s := range w.Shift {
		shift[j] = s + 0.25 // any common shift gives the same moments, to rounding
	}
	held := make([]*lasso.Moments, w.Folds.K)
	for k := range held {
		held[k] = lasso.NewMoments(shift)
	}
	start := 0
	for _, cut := range c.cuts {
		end := n * cut / 1000
		for k := range held {
			var rows []int
			for i := start; i < end; i++ {
				if w.Folds.ID[i] == k {
					rows = append(rows, i)
				}
			}
			if len(rows) == 0 {
				continue // nil rows would mean every row
			}
			part := lasso.NewMoments(shift)
			if err := part.Accumulate(w.Columns, nil, rows); err != nil {
				return nil, err
			}
			if err := held[k].Add(part); err != nil {
				return nil, err
			}
		}
		start = end
	}
	return held, nil
}

func (c *chunked) Fit(ctx context.Context, w *antecedent.FitWork) error {
	for t := w.Tasks - 1; t >= 0; t-- {
		c.fits++
		if err := w.Fit(ctx, t); err != nil {
			return err
		}
	}
	return nil
}

// resultJSON returns res as JSON without its timings.
func resultJSON(t *testing.T, res *antecedent.Result) []byte {
	t.Helper()
	res.Timings = antecedent.Timings{}
	b, err := json.Marshal(res)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// TestJobEqualsDiscover runs the job path as a remote engine would (node
// results sent through JSON, fitted in reverse order) and checks that it
// gives Discover's result exactly; then, with moments summed over uneven
// row blocks about another shift, equal parents and numbers within 1e-9
// (the rounding of a different summation order; common practice).
func TestJobEqualsDiscover(t *testing.T) {
	d, o, _ := smallProblem(t, 7)
	cfg := &antecedent.Config{Seed: 11, Stability: antecedent.Stability{Pairs: 3}, SameTier: true}
	want, err := antecedent.DiscoverContext(context.Background(), d, o, cfg)
	if err != nil {
		t.Fatal(err)
	}
	wantJSON := resultJSON(t, want)
	for _, eng := range []*chunked{nil, {cuts: []int{30, 30, 700, 1000}}} {
		var e antecedent.Engine
		if eng != nil {
			e = eng
		}
		job, err := antecedent.NewJob(context.Background(), d, o, cfg, e)
		if err != nil {
			t.Fatal(err)
		}
		if !job.SharesMoments() {
			t.Fatal("continuous nodes should share moments")
		}
		tasks := slices.Clone(job.Tasks())
		slices.Reverse(tasks)
		var outs []antecedent.NodeResult
		for _, v := range tasks {
			nr, err := job.FitNode(context.Background(), v)
			if err != nil {
				t.Fatal(err)
			}
			b, err := json.Marshal(nr)
			if err != nil {
				t.Fatal(err)
			}
			var back antecedent.NodeResult
			if err := json.Unmarshal(b, &back); err != nil {
				t.Fatal(err)
			}
			outs = append(outs, back)
		}
		got, err := job.Assemble(outs)
		if err != nil {
			t.Fatal(err)
		}
		gotJSON := resultJSON(t, got)
		if eng == nil {
			if string(gotJSON) != string(wantJSON) {
				t.Errorf("job result differs from Discover's")
			}
			continue
		}
		if diff := jsonDiff(t, wantJSON, gotJSON, 1e-9); diff != "" {
			t.Errorf("sharded moments: %s", diff)
		}
		if _, err := job.Assemble(outs[1:]); err == nil {
			t.Error("a missing node result was accepted")
		}
	}
}

// TestEngineRunsTheWork checks that DiscoverContext's node fits go through
// the engine's Fit.
func TestEngineRunsTheWork(t *testing.T) {
	d, o, _ := smallProblem(t, 7)
	eng := &chunked{cuts: []int{1000}}
	job, err := antecedent.NewJob(context.Background(), d, o, &antecedent.Config{Seed: 1}, eng)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := job.FitNode(context.Background(), 0); err == nil {
		t.Error("a first-tier variable was fitted")
	}
	if len(job.Tasks()) != 4 {
		t.Errorf("tasks %v, want the 4 later-tier variables", job.Tasks())
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
