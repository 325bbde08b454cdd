package antecedent

import (
	"context"
	"encoding/binary"
	"fmt"
	"hash/fnv"
	"math"
	"slices"
	"sync"
	"time"

	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/internal/pool"
	"github.com/antecedent-lab/antecedent/lasso"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/table"
)

// Discover runs DiscoverContext with a background context and default
// settings.
func Discover(d *table.Dataset, o *order.Order) (*Result, error) {
	return DiscoverContext(context.Background(), d, o, nil)
}

// DiscoverContext finds, for every variable, its direct causes among the
// variables fixed earlier: each variable is regressed with an L1 penalty
// (linear for continuous, logistic for binary, or its own family) on every
// variable of earlier tiers, the penalty chosen by cross-validation; the
// non-zero predictors become its parents, refitted without penalty for
// effect sizes. The graph is acyclic because every candidate comes earlier
// in time.
//
// It returns an error for an order that does not match the data (listing
// every problem), missing values under MissingRefused (listing the
// variables), a categorical variable that would be a response, a bad
// configuration, and ctx.Err() when ctx is cancelled. Degenerate but legal
// input (a constant variable, separation) gives a result with warnings.
// The same data, order and configuration give the same result for any
// number of workers.
func DiscoverContext(ctx context.Context, d *table.Dataset, o *order.Order, c *Config) (*Result, error) {
	if ctx == nil {
		return nil, fmt.Errorf("%w: nil context (use context.Background())", ErrConfig)
	}
	start := time.Now()
	r, err := newRun(ctx, d, o, c, nil)
	if err != nil {
		return nil, err
	}
	prepared := time.Now()
	fits, workers, err := r.fitAll(ctx)
	if err != nil {
		return nil, err
	}
	res, err := r.assemble(o, fits)
	if err != nil {
		return nil, err
	}
	end := time.Now()
	res.Timings = Timings{
		Prepare: prepared.Sub(start).Seconds(), Nodes: end.Sub(prepared).Seconds(), Total: end.Sub(start).Seconds(),
		Workers: workers, Moments: r.total != nil, Penalised: r.penalised(),
	}
	return res, nil
}

// run holds what every node of one Discover call shares. It is not
// changed once prepare returns, except for the once-formed spreads.
type run struct {
	d        *table.Dataset
	vars     []table.Variable
	cols     [][]float64 // the dataset's design columns
	plan     *order.Plan
	cfg      Config
	baseRows []int // rows every node uses (nil: every row), unless available-case
	warnings []string
	engine   Engine // where the heavy work runs (nil: Goroutines)

	// Shared Gaussian moments over every design column, by fold.
	folds *cv.Folds
	total *lasso.Moments
	held  []*lasso.Moments
	// heldRows gives the rows behind held, for the paired rule's per-row
	// pairs on Gaussian nodes (nil under the other rules).
	heldRows *cv.HeldRows

	// lists is the shared index of the 0/1 design columns over baseRows
	// that large tables' fits in rows (all but the Gaussian nodes solved
	// from moments) read (nil: each fit lists its own; see listsFor).
	lists *lasso.Index
	// foldWorkers is the number of a node's folds fitted at once; above
	// one, one node is fitted at a time (see prepare).
	foldWorkers int

	// Standard deviations of design columns over baseRows, formed once.
	sdOnce []sync.Once
	sdBase []float64
}

// prepare checks the data against the configuration, applies the
// missing-value policy, notes degenerate columns and forms the moments
// shared by Gaussian nodes.
func (r *run) prepare(ctx context.Context) error {
	if err := r.checkResponses(); err != nil {
		return err
	}
	missing := r.d.Missing() != nil
	if r.cfg.Missing != table.MissingAvailableCase {
		var err error
		if r.baseRows, err = r.d.Usable(r.cfg.Missing, nil); err != nil {
			return err
		}
		if r.baseRows != nil && len(r.baseRows) < 2*r.cfg.Folds {
			return fmt.Errorf("%w: %d complete rows of %d, too few for %d folds", table.ErrMissing, len(r.baseRows), r.d.Rows(), r.cfg.Folds)
		}
	}
	r.sdOnce, r.sdBase = make([]sync.Once, len(r.cols)), make([]float64, len(r.cols))
	r.dataWarnings()
	n := r.d.Rows()
	if r.baseRows != nil {
		n = len(r.baseRows)
	}
	if n < r.cfg.Folds {
		return fmt.Errorf("%w: %d rows for %d folds", table.ErrData, n, r.cfg.Folds)
	}
	// Fits over a shared index pass over all its rows, so every design
	// column must be finite on them: not under available-case handling
	// of missing values.
	if n*len(r.cols) >= shareCells && n < math.MaxInt32 && !(missing && r.cfg.Missing == table.MissingAvailableCase) {
		var err error
		if r.lists, err = lasso.NewIndex(r.cols, r.baseRows); err != nil {
			return err
		}
		// Each fit holds about nine arrays over the rows: fitting one
		// node's folds in parallel rather than several nodes at once
		// keeps one node's fits in memory, not one per worker.
		r.foldWorkers = pool.Workers(r.cfg.Workers)
	}
	// Shared moments serve every Gaussian node when all nodes use the
	// same rows.
	needMoments := false
	for v, cands := range r.plan.Candidates {
		if len(cands) > 0 && roleOf(r.family(v)) == gaussian {
			needMoments = true
		}
	}
	if !needMoments || (missing && r.cfg.Missing == table.MissingAvailableCase) {
		return nil
	}
	return r.sharedMoments(ctx, n)
}

// shareCells is the size of table (rows × design columns) from which the
// fits of a run share one listing of each 0/1 column (a lasso.Index)
// instead of each of a node's eleven fits, two nodes at a time, listing
// its own: at 10⁸ cells those lists alone can reach gigabytes. Sharing
// costs time, as each fit then runs over the rows it leaves out too, at
// weight zero: a tenth more rows for a fold fit, twice its rows for a
// stability half (bench/README.md, "Memory of the million-row case").
var shareCells = 50_000_000 // a variable for tests

// listsFor returns the shared index for a fit on rows (nil: the base
// rows), or nil when there is none or rows do not increase.
func (r *run) listsFor(rows []int) *lasso.Index {
	if r.lists == nil {
		return nil
	}
	for t := 1; t < len(rows); t++ {
		if rows[t] <= rows[t-1] {
			return nil
		}
	}
	return r.lists
}

// checkResponses refuses a categorical response and families given for
// unknown or categorical variables.
func (r *run) checkResponses() error {
	for v, cands := range r.plan.Candidates {
		if len(cands) > 0 && r.vars[v].Kind == table.Categorical {
			return fmt.Errorf("%w: %q is categorical with %d levels and follows other variables in time; a categorical response is not supported (recode it as binary indicators or move it to the first tier)",
				table.ErrData, r.vars[v].Name, len(r.vars[v].Levels))
		}
	}
	names := make([]string, 0, len(r.cfg.Families))
	for name := range r.cfg.Families {
		names = append(names, name)
	}
	slices.Sort(names)
	for _, name := range names {
		i := slices.IndexFunc(r.vars, func(v table.Variable) bool { return v.Name == name })
		switch {
		case i < 0:
			return fmt.Errorf("%w: a family is given for %q, which is not a variable of the data", ErrConfig, name)
		case r.vars[i].Kind == table.Categorical && r.cfg.Families[name] != nil:
			return fmt.Errorf("%w: %q is categorical and cannot take a family", ErrConfig, name)
		}
	}
	return nil
}

// sharedMoments forms the cross-products of every design column over each
// fold of the n base rows, and their total.
func (r *run) sharedMoments(ctx context.Context, n int) error {
	f, err := cv.Random(n, r.cfg.Folds, r.cfg.Seed)
	if err != nil {
		return err
	}
	r.folds = &cv.Folds{K: r.cfg.Folds, ID: spreadIDs(f.ID, r.baseRows, r.d.Rows())}
	shift := lasso.ColumnMeans(r.cols, nil, r.baseRows)
	if r.held, err = r.foldMoments(ctx, shift); err != nil {
		return err
	}
	r.total = lasso.NewMoments(r.held[0].Shift)
	for _, m := range r.held {
		if err := r.total.Add(m); err != nil {
			return err
		}
	}
	if r.cfg.CV.Rule.Paired() {
		r.heldRows = &cv.HeldRows{Columns: r.cols, Held: make([][]int, r.folds.K)}
		for k := range r.heldRows.Held {
			r.heldRows.Held[k] = r.folds.Held(k, r.baseRows)
		}
	}
	return nil
}

// spreadIDs returns fold ids over all n rows of a dataset from ids over a
// subset of its rows (nil: ids already cover every row); rows outside the
// subset get -1, which no fold holds.
func spreadIDs(ids, rows []int, n int) []int {
	if rows == nil {
		return ids
	}
	out := make([]int, n)
	for i := range out {
		out[i] = -1
	}
	for t, i := range rows {
		out[i] = ids[t]
	}
	return out
}

// dataWarnings notes constant variables and identical columns, whose
// edges cannot be estimated or told apart.
func (r *run) dataWarnings() {
	seen := map[uint64][]int{}
	for v := range r.vars {
		terms := r.d.Terms(v)
		c := r.cols[terms[0]]
		first, constant := math.NaN(), true
		h := fnv.New64a()
		var buf [8]byte
		forEach(len(c), r.baseRows, func(i int) {
			x := c[i]
			if math.IsNaN(x) {
				return
			}
			if math.IsNaN(first) {
				first = x
			} else if x != first {
				constant = false
			}
		})
		if constant && len(terms) == 1 {
			r.warnings = append(r.warnings, fmt.Sprintf("%s is constant over the rows used; it cannot be a parent", r.vars[v].Name))
			continue
		}
		if len(terms) > 1 {
			continue
		}
		forEach(len(c), r.baseRows, func(i int) {
			binary.LittleEndian.PutUint64(buf[:], math.Float64bits(c[i]))
			h.Write(buf[:])
		})
		key := h.Sum64()
		for _, u := range seen[key] {
			if slices.Equal(r.cols[r.d.Terms(u)[0]], c) {
				r.warnings = append(r.warnings, fmt.Sprintf("%s and %s hold identical values; edges from them cannot be told apart", r.vars[u].Name, r.vars[v].Name))
			}
		}
		seen[key] = append(seen[key], v)
	}
}

// fitAll runs every node's pipeline on the worker pool and returns the
// finished nodes by variable, and the number of workers used.
func (r *run) fitAll(ctx context.Context) ([]nodeFit, int, error) {
	fits := make([]nodeFit, len(r.vars))
	var todo []int
	for v := range r.vars {
		if len(r.plan.Candidates[v]) > 0 {
			todo = append(todo, v)
		} else {
			fits[v] = nodeFit{node: r.newNode(r.planNode(v))}
		}
	}
	var mu sync.Mutex
	done := 0
	report := func() {
		if r.cfg.Progress == nil {
			return
		}
		mu.Lock()
		defer mu.Unlock()
		done++
		r.cfg.Progress(Progress{Done: done, Total: len(todo), Stage: "nodes"})
	}
	workers := pool.Workers(r.cfg.Workers)
	nodes := workers
	if r.foldWorkers > 1 {
		nodes = 1 // the workers fit each node's folds
	}
	err := r.engineOf().Fit(ctx, &FitWork{Tasks: len(todo), Workers: nodes, Fit: func(ctx context.Context, t int) error {
		v := todo[t]
		f, err := r.fitNode(ctx, r.planNode(v))
		if err != nil {
			return err
		}
		fits[v] = f
		report()
		return nil
	}})
	return fits, workers, err
}

// penalised counts the nodes with candidate parents.
func (r *run) penalised() int {
	n := 0
	for _, c := range r.plan.Candidates {
		if len(c) > 0 {
			n++
		}
	}
	return n
}

func forEach(n int, rows []int, f func(i int)) {
	if rows == nil {
		for i := range n {
			f(i)
		}
		return
	}
	for _, i := range rows {
		f(i)
	}
}

func rowAt(rows []int, t int) int {
	if rows == nil {
		return t
	}
	return rows[t]
}

// sd returns the population standard deviation of design column c over
// rows; over the base rows it is formed once per column.
func (r *run) sd(c int, rows []int) float64 {
	base := r.baseRows
	same := (rows == nil && base == nil) || (len(rows) > 0 && len(rows) == len(base) && &rows[0] == &base[0])
	if same {
		r.sdOnce[c].Do(func() { _, v := meanVar(r.cols[c], rows); r.sdBase[c] = math.Sqrt(v) })
		return r.sdBase[c]
	}
	_, v := meanVar(r.cols[c], rows)
	return math.Sqrt(v)
}

// meanVar returns the mean and the population variance of x over rows
// (nil: every row), by two passes.
func meanVar(x []float64, rows []int) (mean, variance float64) {
	var n float64
	forEach(len(x), rows, func(i int) { mean += x[i]; n++ })
	mean /= n
	forEach(len(x), rows, func(i int) { variance += (x[i] - mean) * (x[i] - mean) })
	return mean, variance / n
}
