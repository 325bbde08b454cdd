package antecedent

import (
	"context"
	"encoding/binary"
	"errors"
	"fmt"
	"hash/fnv"
	"math"
	"slices"
	"sort"
	"sync"
	"time"

	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/internal/pool"
	"github.com/antecedent-lab/antecedent/lasso"
	"github.com/antecedent-lab/antecedent/metrics"
	"github.com/antecedent-lab/antecedent/order"
)

// Discover runs DiscoverContext with a background context and default
// settings.
func Discover(d *Dataset, o *order.Order) (*Result, error) {
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
// every problem), missing values under MissingIsError (listing the
// variables), a categorical variable that would be a response, a bad
// configuration, and ctx.Err() when ctx is cancelled. Degenerate but legal
// input (a constant variable, separation) gives a result with warnings.
// The same data, order and configuration give the same result for any
// number of workers.
func DiscoverContext(ctx context.Context, d *Dataset, o *order.Order, c *Config) (*Result, error) {
	start := time.Now()
	cfg, err := c.resolve()
	if err != nil {
		return nil, err
	}
	if d == nil || len(d.vars) == 0 {
		return nil, fmt.Errorf("%w: empty dataset", ErrData)
	}
	if o == nil {
		return nil, fmt.Errorf("%w: no order", ErrConfig)
	}
	plan, err := o.Compile(d.Names())
	if err != nil {
		return nil, err
	}
	r := &run{d: d, plan: plan, cfg: cfg, sdOnce: make([]sync.Once, len(d.cols)), sdBase: make([]float64, len(d.cols))}
	if err := r.prepare(ctx); err != nil {
		return nil, err
	}
	prepared := time.Now()
	res := &Result{Order: o, Config: cfg, Rows: d.rows}
	res.Config.Progress = nil
	res.Nodes = make([]Node, len(d.vars))
	var todo []int
	for v := range d.vars {
		res.Nodes[v] = r.blankNode(v)
		if len(plan.Candidates[v]) > 0 {
			todo = append(todo, v)
		}
	}
	var mu sync.Mutex
	done := 0
	report := func() {
		if cfg.Progress == nil {
			return
		}
		mu.Lock()
		defer mu.Unlock()
		done++
		cfg.Progress(Progress{Done: done, Total: len(todo), Stage: "nodes"})
	}
	fits := make([]nodeFit, len(d.vars))
	workers := pool.Workers(cfg.Workers)
	err = pool.Run(ctx, workers, len(todo), func(ctx context.Context, t int) error {
		v := todo[t]
		f, err := r.fitNode(ctx, v, &res.Nodes[v])
		if err != nil {
			return err
		}
		fits[v] = f
		report()
		return nil
	})
	if err != nil {
		return nil, err
	}
	if err := r.assemble(res, fits); err != nil {
		return nil, err
	}
	end := time.Now()
	res.Timings = Timings{
		Prepare: prepared.Sub(start).Seconds(), Nodes: end.Sub(prepared).Seconds(), Total: end.Sub(start).Seconds(),
		Workers: workers, Moments: r.total != nil, Penalised: len(todo),
	}
	return res, nil
}

// run holds what every node shares.
type run struct {
	d        *Dataset
	plan     *order.Plan
	cfg      Config
	miss     [][]bool
	baseRows []int // nil: every row
	warnings []string

	// Shared Gaussian moments over every design column, by fold.
	folds *cv.Folds
	total *lasso.Moments
	held  []*lasso.Moments

	// Standard deviations of design columns over baseRows, formed once.
	sdOnce []sync.Once
	sdBase []float64
}

func (r *run) prepare(ctx context.Context) error {
	d, plan := r.d, r.plan
	for v, cands := range plan.Candidates {
		if len(cands) > 0 && d.vars[v].Kind == Categorical {
			return fmt.Errorf("%w: %q is categorical with %d levels and follows other variables in time; a categorical response is not supported (recode it as binary indicators or move it to the first tier)",
				ErrData, d.vars[v].Name, len(d.vars[v].Levels))
		}
	}
	miss, me := d.missingness()
	r.miss = miss
	if me != nil {
		switch r.cfg.Missing {
		case MissingIsError:
			return me
		case CompleteCase:
			for i := 0; i < d.rows; i++ {
				ok := true
				for _, m := range miss {
					if m != nil && m[i] {
						ok = false
						break
					}
				}
				if ok {
					r.baseRows = append(r.baseRows, i)
				}
			}
			if len(r.baseRows) < 2*r.cfg.Folds {
				return fmt.Errorf("%w: %d complete rows of %d, too few for %d folds", ErrMissing, len(r.baseRows), d.rows, r.cfg.Folds)
			}
			if r.baseRows == nil {
				r.baseRows = []int{}
			}
		}
	}
	r.dataWarnings()
	n := d.rows
	if r.baseRows != nil {
		n = len(r.baseRows)
	}
	if n < r.cfg.Folds {
		return fmt.Errorf("%w: %d rows for %d folds", ErrData, n, r.cfg.Folds)
	}
	// Shared moments serve every Gaussian node when all nodes use the
	// same rows.
	needMoments := false
	for v, cands := range plan.Candidates {
		if len(cands) > 0 && r.isGaussian(v) {
			needMoments = true
		}
	}
	if !needMoments || (me != nil && r.cfg.Missing == AvailableCase) {
		return nil
	}
	f, err := cv.Random(n, r.cfg.Folds, r.cfg.Seed)
	if err != nil {
		return err
	}
	ids := f.ID
	if r.baseRows != nil {
		ids = make([]int, d.rows)
		for i := range ids {
			ids[i] = -1
		}
		for t, i := range r.baseRows {
			ids[i] = f.ID[t]
		}
	}
	r.folds = &cv.Folds{K: r.cfg.Folds, ID: ids}
	shift := lasso.ColumnMeans(d.cols, nil, r.baseRows)
	r.held = make([]*lasso.Moments, r.cfg.Folds)
	err = pool.Run(ctx, r.cfg.Workers, r.cfg.Folds, func(ctx context.Context, k int) error {
		rows := r.folds.Held(k, nil)
		m := lasso.NewMoments(shift)
		if err := m.Accumulate(d.cols, nil, rows); err != nil {
			return err
		}
		r.held[k] = m
		return nil
	})
	if err != nil {
		return err
	}
	r.total = lasso.NewMoments(shift)
	for _, m := range r.held {
		if err := r.total.Add(m); err != nil {
			return err
		}
	}
	return nil
}

// dataWarnings notes constant variables and identical columns, whose
// edges cannot be estimated or told apart.
func (r *run) dataWarnings() {
	d := r.d
	seen := map[uint64][]int{}
	for v, cols := range d.varCols {
		c := d.cols[cols[0]]
		first, constant := math.NaN(), true
		h := fnv.New64a()
		var buf [8]byte
		forEach(d.rows, r.baseRows, func(i int) {
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
		if constant && len(cols) == 1 {
			r.warnings = append(r.warnings, fmt.Sprintf("%s is constant over the rows used; it cannot be a parent", d.vars[v].Name))
			continue
		}
		if len(cols) > 1 {
			continue
		}
		forEach(d.rows, r.baseRows, func(i int) {
			binary.LittleEndian.PutUint64(buf[:], math.Float64bits(c[i]))
			h.Write(buf[:])
		})
		key := h.Sum64()
		for _, u := range seen[key] {
			if slices.Equal(d.cols[d.varCols[u][0]], c) {
				r.warnings = append(r.warnings, fmt.Sprintf("%s and %s hold identical values; edges from them cannot be told apart", d.vars[u].Name, d.vars[v].Name))
			}
		}
		seen[key] = append(seen[key], v)
	}
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

func (r *run) family(v int) lasso.Family {
	vr := r.d.vars[v]
	if vr.Family != nil {
		return vr.Family
	}
	if vr.Kind == Binary {
		return lasso.Binomial{}
	}
	return lasso.Gaussian{}
}

func (r *run) isGaussian(v int) bool {
	_, ok := r.family(v).(lasso.Gaussian)
	return ok
}

func (r *run) names(vs []int) []string {
	out := make([]string, len(vs))
	for i, v := range vs {
		out[i] = r.d.vars[v].Name
	}
	return out
}

func (r *run) blankNode(v int) Node {
	vr := r.d.vars[v]
	tier := r.plan.Tier[v]
	n := Node{
		Name: vr.Name, Kind: vr.Kind, Family: r.family(v).Name(), Tier: tier,
		Candidates: r.names(r.plan.Candidates[v]), Required: r.names(r.plan.Required[v]), Parents: []string{},
		Penalty: nan(), BestPenalty: nan(), OneSEPenalty: nan(), Rule: r.cfg.Rule, Measure: r.cfg.Measure,
		Score: Score{Value: nan(), SE: nan()}, Intercept: nan(),
	}
	if vr.Kind == Categorical {
		n.Family = ""
	}
	if tier < len(r.plan.Labels) {
		n.TierLabel = r.plan.Labels[tier]
	}
	return n
}

// nodeFit is what assemble needs from a node beyond its Node entry.
type nodeFit struct {
	parents   []int // variables
	frequency map[int]float64
	peers     []int // same-tier variables selected
	meanSel   float64
	penalised int
}

// design returns the design columns of variables vs and the variable of
// each column.
func (r *run) design(vs []int) (cols, owner []int) {
	for _, v := range vs {
		for _, c := range r.d.varCols[v] {
			cols = append(cols, c)
			owner = append(owner, v)
		}
	}
	return cols, owner
}

// rowsFor returns the rows a node uses (nil means every row).
func (r *run) rowsFor(v int, preds []int) []int {
	if r.cfg.Missing != AvailableCase {
		return r.baseRows
	}
	any := r.miss[v] != nil
	for _, p := range preds {
		any = any || r.miss[p] != nil
	}
	if !any {
		return nil
	}
	rows := []int{}
	for i := 0; i < r.d.rows; i++ {
		ok := r.miss[v] == nil || !r.miss[v][i]
		for _, p := range preds {
			if r.miss[p] != nil && r.miss[p][i] {
				ok = false
				break
			}
		}
		if ok {
			rows = append(rows, i)
		}
	}
	return rows
}

func (r *run) pathSettings(v int, scale []float64) lasso.Settings {
	return lasso.Settings{
		Family: r.family(v), Mixing: r.cfg.Mixing, PenaltyScale: scale,
		NumPenalties: r.cfg.Penalties, Tolerance: r.cfg.Tolerance,
	}
}

// cvOut is a node's cross-validated path with what produced it.
type cvOut struct {
	res   *cv.Result
	rows  []int // rows used (nil: every row)
	cols  []int // design columns of the candidates
	owner []int // variable of each design column
	oof   *foldScores
}

// crossValidate runs the cross-validated path of variable v on the
// candidate variables cands.
func (r *run) crossValidate(ctx context.Context, v int, cands []int) (cvOut, error) {
	cols, owner := r.design(cands)
	scale := make([]float64, len(cols))
	for t, c := range owner {
		scale[t] = 1
		if slices.Contains(r.plan.Required[v], c) {
			scale[t] = 0
		}
	}
	y := r.d.varCols[v][0]
	s := &cv.Settings{Path: r.pathSettings(v, scale), Measure: r.cfg.Measure, Rule: r.cfg.Rule, Workers: 1}
	rows := r.rowsFor(v, cands)
	out := cvOut{rows: rows, cols: cols, owner: owner}
	if r.total != nil && r.isGaussian(v) && r.cfg.Measure != cv.MeanAbsoluteError {
		res, err := cv.FitMoments(ctx, r.total, r.held, y, cols, s)
		out.res = res
		return out, err
	}
	n := r.d.rows
	if rows != nil {
		n = len(rows)
	}
	if n < 2*r.cfg.Folds {
		return out, &tooFewRows{rows: n, folds: r.cfg.Folds}
	}
	seed := r.cfg.Seed + uint64(v)*0x9e3779b97f4a7c15
	var folds *cv.Folds
	var err error
	yv := r.d.cols[y]
	if _, bin := r.family(v).(lasso.Binomial); bin {
		labels := make([]float64, n)
		for t := range labels {
			labels[t] = yv[rowAt(rows, t)]
		}
		folds, err = cv.Stratified(labels, r.cfg.Folds, seed)
	} else {
		folds, err = cv.Random(n, r.cfg.Folds, seed)
	}
	if err != nil {
		return out, err
	}
	if rows != nil {
		ids := make([]int, r.d.rows)
		for i := range ids {
			ids[i] = -1
		}
		for t, i := range rows {
			ids[i] = folds.ID[t]
		}
		folds = &cv.Folds{K: folds.K, ID: ids}
	}
	res, err := cv.Fit(ctx, lasso.Data{Columns: r.d.cols, Response: yv, Rows: rows, Predictors: cols}, folds, s)
	if err != nil {
		return out, err
	}
	out.res = res
	out.oof = r.outOfFold(res, v, rows, folds)
	return out, nil
}

// tooFewRows reports a node with too few usable rows to cross-validate.
type tooFewRows struct{ rows, folds int }

func (e *tooFewRows) Error() string {
	return fmt.Sprintf("antecedent: %d usable rows for %d folds", e.rows, e.folds)
}

func rowAt(rows []int, t int) int {
	if rows == nil {
		return t
	}
	return rows[t]
}

// foldScores holds out-of-fold predictions at the selected penalty.
type foldScores struct {
	pred, y []float64
}

// outOfFold returns the out-of-fold means at the selected penalty, from
// which binary nodes get their AUC.
func (r *run) outOfFold(res *cv.Result, v int, rows []int, folds *cv.Folds) *foldScores {
	if res.FoldPaths == nil {
		return nil
	}
	yv := r.d.cols[r.d.varCols[v][0]]
	var fs foldScores
	for f, path := range res.FoldPaths {
		held := folds.Held(f, rows)
		mu := make([]float64, len(held))
		path.MeanTo(mu, min(res.Selected, path.Len()-1), r.d.cols, held)
		fs.pred = append(fs.pred, mu...)
		for _, i := range held {
			fs.y = append(fs.y, yv[i])
		}
	}
	return &fs
}

func (r *run) fitNode(ctx context.Context, v int, node *Node) (nodeFit, error) {
	var fit nodeFit
	cands := r.plan.Candidates[v]
	out, err := r.crossValidate(ctx, v, cands)
	res, rows, cols, owner := out.res, out.rows, out.cols, out.owner
	if err != nil {
		if errors.Is(err, context.Canceled) || errors.Is(err, context.DeadlineExceeded) {
			return fit, err
		}
		var few *tooFewRows
		switch {
		case errors.As(err, &few):
			node.Warnings = append(node.Warnings, fmt.Sprintf("only %d usable rows, too few for %d-fold cross-validation; not fitted", few.rows, few.folds))
		case errors.Is(err, lasso.ErrConstantResponse) && r.variance(v, rows) == 0:
			node.Warnings = append(node.Warnings, "constant over the rows used; no parents estimated")
		case errors.Is(err, lasso.ErrConstantResponse):
			node.Warnings = append(node.Warnings, "too little variation to cross-validate (a training fold holds a single value); no parents estimated")
		default:
			return fit, fmt.Errorf("antecedent: node %q: %w", r.d.vars[v].Name, err)
		}
		fit.parents = slices.Clone(r.plan.Required[v])
		node.Parents = r.names(fit.parents)
		return fit, nil
	}
	node.Fitted = true
	node.Rows = r.d.rows
	if rows != nil {
		node.Rows = len(rows)
	}
	full := res.Full
	node.Penalty = Number(res.Penalty())
	node.BestPenalty = Number(res.Curve[res.Best].Penalty)
	node.OneSEPenalty = Number(res.Curve[res.OneSE].Penalty)
	node.Measure = res.Measure
	node.Status = full.Status.String()
	if full.Status != lasso.Completed {
		node.Warnings = append(node.Warnings, fmt.Sprintf("path ended early (%v) after %d penalties", full.Status, full.Len()))
	}
	for _, p := range res.Curve {
		node.Curve = append(node.Curve, CurvePoint{Penalty: Number(p.Penalty), Mean: Number(p.Mean), SE: Number(p.SE), NonZero: p.NonZero})
	}
	// Coefficient paths of the terms that enter at or before the selected
	// penalty, and of the ten largest at the path's end: the lines a
	// reader can follow. Terms left out are zero up to the selected
	// penalty and small after it; the result stays small for wide data.
	keep := make([]bool, len(cols))
	for k := 0; k <= min(res.Selected, full.Len()-1); k++ {
		for _, t := range full.Coefficients[k].Index {
			keep[t] = true
		}
	}
	last := full.Coefficients[full.Len()-1]
	order := slices.Clone(last.Index)
	size := make(map[int]float64, len(order))
	for i, t := range last.Index {
		size[t] = math.Abs(last.Value[i] * r.sd(cols[t], rows))
	}
	slices.SortFunc(order, func(a, b int) int {
		switch {
		case size[a] > size[b]:
			return -1
		case size[a] < size[b]:
			return 1
		}
		return a - b
	})
	for _, t := range order[:min(10, len(order))] {
		keep[t] = true
	}
	node.Path = &CoefficientPath{Terms: []string{}, Values: [][]Number{}}
	slot := make([]int, len(cols))
	for t, c := range cols {
		slot[t] = -1
		if keep[t] {
			slot[t] = len(node.Path.Terms)
			node.Path.Terms = append(node.Path.Terms, r.d.termName(c))
			node.Path.Values = append(node.Path.Values, make([]Number, full.Len()))
		}
	}
	b := make([]float64, len(cols))
	for k := range full.Len() {
		node.Path.Penalties = append(node.Path.Penalties, Number(full.Penalties[k]))
		full.CoefficientsTo(b, k)
		for t := range cols {
			if slot[t] >= 0 {
				node.Path.Values[slot[t]][k] = Number(b[t])
			}
		}
	}
	_, sel := res.Model()
	chosen := map[int]bool{}
	for t, x := range sel {
		if x != 0 {
			chosen[owner[t]] = true
			node.Penalised = append(node.Penalised, Term{Term: r.d.termName(cols[t]), Variable: r.d.vars[owner[t]].Name, Value: Number(x)})
		}
	}
	for _, q := range r.plan.Required[v] {
		chosen[q] = true
	}
	node.Score = r.score(out, v)
	if r.cfg.Stability.Pairs > 0 {
		freq, meanSel, penalised, err := r.stability(ctx, v, res.Penalty(), rows, cols, owner)
		if err != nil {
			return fit, err
		}
		fit.frequency, fit.meanSel, fit.penalised = freq, meanSel, penalised
		chosen = map[int]bool{}
		for q, f := range freq {
			if f >= r.cfg.Stability.Threshold {
				chosen[q] = true
			}
		}
		for _, q := range r.plan.Required[v] {
			chosen[q] = true
		}
	}
	for _, q := range cands {
		if chosen[q] {
			fit.parents = append(fit.parents, q)
		}
	}
	node.Parents = r.names(fit.parents)
	if err := r.refit(ctx, v, fit.parents, rows, node); err != nil {
		return fit, err
	}
	if r.cfg.SameTier && len(r.plan.Peers[v]) > 0 {
		all := slices.Concat(cands, r.plan.Peers[v])
		slices.Sort(all)
		out2, err := r.crossValidate(ctx, v, all)
		res2, owner2 := out2.res, out2.owner
		if err != nil && !errors.Is(err, lasso.ErrConstantResponse) {
			return fit, fmt.Errorf("antecedent: node %q (same tier): %w", r.d.vars[v].Name, err)
		}
		if err == nil {
			_, b2 := res2.Model()
			for t, x := range b2 {
				if x != 0 && slices.Contains(r.plan.Peers[v], owner2[t]) && !slices.Contains(fit.peers, owner2[t]) {
					fit.peers = append(fit.peers, owner2[t])
				}
			}
		}
	}
	return fit, nil
}

// score computes the node's cross-validated score at the selected
// penalty: pooled out-of-fold AUC with the Hanley–McNeil standard error for
// binary nodes, R² = 1 − CV mean squared error / variance for continuous
// ones, deviance explained for other families.
func (r *run) score(out cvOut, v int) Score {
	res := out.res
	sel := res.Selected
	switch r.family(v).(type) {
	case lasso.Binomial:
		s := Score{Measure: "auc", Value: nan(), SE: nan()}
		if fs := out.oof; fs != nil {
			a, err := metrics.AUC(fs.pred, fs.y, nil)
			if err == nil {
				pos := 0
				for _, y := range fs.y {
					if y == 1 {
						pos++
					}
				}
				s.Value = Number(a)
				s.SE = Number(metrics.HanleyMcNeilSE(a, pos, len(fs.y)-pos))
			}
		}
		return s
	case lasso.Gaussian:
		vy := r.variance(v, out.rows)
		if res.Measure == cv.Deviance || res.Measure == cv.MeanSquaredError {
			return Score{Measure: "r2", Value: Number(1 - res.Curve[sel].Mean/vy), SE: Number(res.Curve[sel].SE / vy)}
		}
		s := Score{Measure: "r2", Value: nan(), SE: nan()}
		if fs := out.oof; fs != nil {
			if r2, err := metrics.RSquared(fs.pred, fs.y, nil); err == nil {
				s.Value = Number(r2)
			}
		}
		return s
	default:
		null := res.Full.NullDeviance / res.Full.Weight
		s := Score{Measure: "deviance explained", Value: nan(), SE: nan()}
		if res.Measure == cv.Deviance && null > 0 {
			s.Value = Number(1 - res.Curve[sel].Mean/null)
			s.SE = Number(res.Curve[sel].SE / null)
		}
		return s
	}
}

// sd returns the population standard deviation of design column c over
// rows; over the base rows it is formed once per column.
func (r *run) sd(c int, rows []int) float64 {
	base := r.baseRows
	same := (rows == nil && base == nil) || (len(rows) > 0 && len(rows) == len(base) && &rows[0] == &base[0])
	if same {
		r.sdOnce[c].Do(func() { r.sdBase[c] = r.sdOver(c, rows) })
		return r.sdBase[c]
	}
	return r.sdOver(c, rows)
}

func (r *run) sdOver(c int, rows []int) float64 {
	x := r.d.cols[c]
	var s1, s2, n float64
	forEach(r.d.rows, rows, func(i int) {
		s1 += x[i]
		s2 += x[i] * x[i]
		n++
	})
	m := s1 / n
	return math.Sqrt(math.Max(s2/n-m*m, 0))
}

// variance returns the population variance of variable v over rows.
func (r *run) variance(v int, rows []int) float64 {
	y := r.d.cols[r.d.varCols[v][0]]
	var m, n float64
	each := func(f func(x float64)) {
		if rows == nil {
			for _, x := range y {
				f(x)
			}
		} else {
			for _, i := range rows {
				f(y[i])
			}
		}
	}
	each(func(x float64) { m += x; n++ })
	m /= n
	var ss float64
	each(func(x float64) { ss += (x - m) * (x - m) })
	return ss / n
}

// assemble builds edges, links, blankets and the stability report.
func (r *run) assemble(res *Result, fits []nodeFit) error {
	for v := range r.d.vars {
		node := &res.Nodes[v]
		for _, p := range fits[v].parents {
			e := Edge{From: r.d.vars[p].Name, To: node.Name, Coefficient: nan(), Lower: nan(), Upper: nan(), Standardized: nan(), Frequency: nan(),
				Required: slices.Contains(r.plan.Required[v], p)}
			best := -1.0
			for _, ef := range node.Effects {
				if ef.Parent != e.From {
					continue
				}
				size := math.Abs(float64(ef.Standardized))
				if math.IsNaN(size) {
					size = 0
				}
				if size > best {
					best = size
					e.Coefficient, e.Lower, e.Upper, e.Standardized = ef.Estimate, ef.Lower, ef.Upper, ef.Standardized
				}
			}
			if f, ok := fits[v].frequency[p]; ok {
				e.Frequency = Number(f)
			}
			switch c := float64(e.Coefficient); {
			case c > 0:
				e.Sign = 1
			case c < 0:
				e.Sign = -1
			}
			res.Edges = append(res.Edges, e)
		}
		for _, w := range node.Warnings {
			res.Warnings = append(res.Warnings, fmt.Sprintf("%s: %s", node.Name, w))
		}
	}
	res.Warnings = append(r.warnings, res.Warnings...)
	if r.baseRows != nil {
		res.Warnings = append(res.Warnings, fmt.Sprintf("complete-case analysis used %d of %d rows", len(r.baseRows), r.d.rows))
	}
	// Same-tier links.
	seen := map[[2]int]int{}
	for v := range r.d.vars {
		for _, p := range fits[v].peers {
			key := [2]int{min(v, p), max(v, p)}
			seen[key]++
		}
	}
	keys := make([][2]int, 0, len(seen))
	for k := range seen {
		keys = append(keys, k)
	}
	sort.Slice(keys, func(a, b int) bool {
		return keys[a][0] < keys[b][0] || (keys[a][0] == keys[b][0] && keys[a][1] < keys[b][1])
	})
	for _, k := range keys {
		res.Links = append(res.Links, Link{A: r.d.vars[k[0]].Name, B: r.d.vars[k[1]].Name, Both: seen[k] == 2})
	}
	g, err := res.Graph()
	if err != nil {
		return fmt.Errorf("antecedent: internal error building the graph: %w", err)
	}
	for v := range res.Nodes {
		mb, _ := g.MarkovBlanket(res.Nodes[v].Name)
		if mb == nil {
			mb = []string{}
		}
		res.Nodes[v].MarkovBlanket = mb
	}
	if r.cfg.Stability.Pairs > 0 {
		rep := &StabilityReport{Pairs: r.cfg.Stability.Pairs, Threshold: r.cfg.Stability.Threshold}
		var total float64
		for v := range r.d.vars {
			if !res.Nodes[v].Fitted || fits[v].penalised == 0 {
				continue
			}
			b := StabilityBound(fits[v].meanSel, fits[v].penalised, r.cfg.Stability.Threshold)
			total += b
			rep.Nodes = append(rep.Nodes, StabilityNode{Name: res.Nodes[v].Name, Selected: fits[v].meanSel, Candidates: fits[v].penalised, Bound: Number(b)})
		}
		rep.ExpectedFalse = Number(total)
		res.Stability = rep
	}
	return nil
}
