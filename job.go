package antecedent

import (
	"context"
	"fmt"
	"slices"

	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/internal/stability"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/table"
)

// newRun checks the configuration, the data and the order as Discover
// does and returns the prepared run, its fold moments (when continuous
// nodes need them) formed by engine e (nil: Goroutines).
func newRun(ctx context.Context, d *table.Dataset, o *order.Order, c *Config, e Engine) (*run, error) {
	cfg, err := c.resolve()
	if err != nil {
		return nil, err
	}
	if d == nil || len(d.Names()) == 0 {
		return nil, fmt.Errorf("%w: empty dataset", table.ErrData)
	}
	if o == nil {
		return nil, fmt.Errorf("%w: no order", ErrConfig)
	}
	plan, err := o.Compile(d.Names())
	if err != nil {
		return nil, err
	}
	r := &run{d: d, vars: d.Variables(), cols: d.Columns(), plan: plan, cfg: cfg, engine: e}
	if err := r.prepare(ctx); err != nil {
		return nil, err
	}
	return r, nil
}

// Job is one discovery prepared for an engine that fits nodes away from
// the caller, such as a Beam pipeline: every worker builds the same Job
// from the same data, order and configuration, fits the nodes it is handed
// with FitNode, and one worker assembles the result from every node's
// NodeResult. The result equals DiscoverContext's but for Timings. A Job
// is safe for concurrent FitNode calls.
type Job struct {
	r *run
	o *order.Order
}

// NewJob checks d, o and c as DiscoverContext does and prepares the run;
// when continuous nodes share fold moments, e.FoldMoments forms them (nil:
// Goroutines). It returns DiscoverContext's errors.
func NewJob(ctx context.Context, d *table.Dataset, o *order.Order, c *Config, e Engine) (*Job, error) {
	r, err := newRun(ctx, d, o, c, e)
	if err != nil {
		return nil, err
	}
	return &Job{r: r, o: o}, nil
}

// SharesMoments reports whether the job's continuous nodes are fitted from
// shared fold moments.
func (j *Job) SharesMoments() bool { return j.r.total != nil }

// Tasks returns the variables to fit, in order: those with candidate
// parents. Every other variable's node needs no fitting.
func (j *Job) Tasks() []int {
	var todo []int
	for v := range j.r.vars {
		if len(j.r.plan.Candidates[v]) > 0 {
			todo = append(todo, v)
		}
	}
	return todo
}

// FitNode runs variable v's whole pipeline, exactly as DiscoverContext
// does, and returns its outcome. It returns an error for a v that is not
// one of Tasks, and the node's fitting errors.
func (j *Job) FitNode(ctx context.Context, v int) (NodeResult, error) {
	if v < 0 || v >= len(j.r.vars) || len(j.r.plan.Candidates[v]) == 0 {
		return NodeResult{}, fmt.Errorf("%w: variable %d is not a node to fit", ErrConfig, v)
	}
	f, err := j.r.fitNode(ctx, j.r.planNode(v))
	if err != nil {
		return NodeResult{}, err
	}
	return newNodeResult(v, f), nil
}

// Assemble returns the result from the outcomes of every task, in any
// order. It returns an error when one is missing, repeated or foreign.
func (j *Job) Assemble(results []NodeResult) (*Result, error) {
	r := j.r
	fits := make([]nodeFit, len(r.vars))
	have := make([]bool, len(r.vars))
	for _, nr := range results {
		v := nr.Variable
		if v < 0 || v >= len(r.vars) || len(r.plan.Candidates[v]) == 0 || have[v] || nr.Node.Name != r.vars[v].Name {
			return nil, fmt.Errorf("%w: a node result for variable %d (%q) does not belong to this job or is repeated", ErrConfig, v, nr.Node.Name)
		}
		have[v] = true
		fits[v] = nr.fit()
	}
	for v := range r.vars {
		switch {
		case len(r.plan.Candidates[v]) == 0:
			fits[v] = nodeFit{node: r.newNode(r.planNode(v))}
		case !have[v]:
			return nil, fmt.Errorf("%w: no node result for %q", ErrConfig, r.vars[v].Name)
		}
	}
	res, err := r.assemble(j.o, fits)
	if err != nil {
		return nil, err
	}
	res.Timings = Timings{Moments: r.total != nil, Penalised: r.penalised()}
	return res, nil
}

// NodeResult is one fitted node, in a form that travels between processes
// as JSON without loss (NaN is written as null and read back as NaN).
type NodeResult struct {
	Variable  int            `json:"variable"`
	Node      Node           `json:"node"`
	Parents   []int          `json:"parents"`
	Stability *nodeStability `json:"stability,omitempty"`
	Counted   int            `json:"counted"`
	Peers     []int          `json:"peers,omitempty"`
}

// nodeStability is a node's stability selection.
type nodeStability struct {
	Frequency    map[int]float64 `json:"frequency"`
	MeanSelected float64         `json:"mean_selected"`
}

func newNodeResult(v int, f nodeFit) NodeResult {
	nr := NodeResult{Variable: v, Node: f.node, Parents: slices.Clone(f.parents), Counted: f.counted, Peers: slices.Clone(f.peers)}
	if f.selection != nil {
		nr.Stability = &nodeStability{Frequency: f.selection.Frequency, MeanSelected: f.selection.MeanSelected}
	}
	return nr
}

func (nr NodeResult) fit() nodeFit {
	f := nodeFit{node: nr.Node, parents: nr.Parents, counted: nr.Counted, peers: nr.Peers}
	if nr.Stability != nil {
		f.selection = &stability.Selection{Frequency: nr.Stability.Frequency, MeanSelected: nr.Stability.MeanSelected}
	}
	return f
}

// MomentFolds returns the folds over which a run of configuration c with
// n usable rows sums the moments its continuous nodes share (fold ids over
// those rows), so that an engine summing them elsewhere uses the same
// folds. It returns c's configuration error.
func MomentFolds(n int, c *Config) (*cv.Folds, error) {
	cfg, err := c.resolve()
	if err != nil {
		return nil, err
	}
	return cv.Random(n, cfg.Folds, cfg.Seed)
}
