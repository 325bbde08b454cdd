package lasso

import (
	"context"
	"fmt"
	"math"
	"slices"
)

// Data is the input of a fit. It refers to the caller's slices and never
// modifies them, so many fits (folds, nodes) can share one dataset.
type Data struct {
	// Columns holds the candidate predictors column-major: Columns[j][i]
	// is predictor j at row i. Every used column has len(Response) rows.
	Columns [][]float64
	// Response holds the response at every row.
	Response []float64
	// Weights holds non-negative observation weights; nil means ones.
	Weights []float64
	// Rows lists the rows to fit; nil means every row.
	Rows []int
	// Predictors lists the columns to use as predictors; nil means
	// every column.
	Predictors []int
	// Index, when set, is an index of Columns over rows that include
	// every row of the fit, in the same order (Rows must increase). The
	// fit then reads its 0/1 predictors' lists from it instead of
	// listing them itself (see Index); it then runs over all the index's
	// rows, those outside Rows at weight zero, and its predictors must be
	// finite on all of them. Gaussian fits that use the Gram engine
	// ignore it.
	Index *Index
}

// Fit fits a penalised path of the response on the predictors by pathwise
// coordinate descent (Friedman, Hastie & Tibshirani 2010) with sequential
// strong rules and a KKT check after each penalty (Tibshirani et al. 2012),
// so screening never changes the answer. It returns an error for bad input
// (mismatched lengths, NaN or Inf, no rows, no predictors, a constant
// response, a response the family refuses, bad weights or penalties) and
// ctx.Err() when ctx is cancelled. Fit is Start followed by Next until the
// path ends.
func Fit(ctx context.Context, d Data, s *Settings) (*Path, error) {
	st, err := Start(ctx, d, s)
	if err != nil {
		return nil, err
	}
	for {
		more, err := st.Next(ctx)
		if err != nil {
			return nil, err
		}
		if !more {
			return st.Path(), nil
		}
	}
}

// prepare checks d and s and returns the engine of their fit, the
// penalty factors, the resolved settings, the predictors and the number of
// rows.
func prepare(d Data, s *Settings) (engine, []float64, resolved, []int, int, error) {
	n := len(d.Response)
	pred := d.Predictors
	if pred == nil {
		pred = make([]int, len(d.Columns))
		for j := range pred {
			pred[j] = j
		}
	}
	if len(pred) == 0 {
		return nil, nil, resolved{}, nil, 0, ErrNoPredictors
	}
	for _, j := range pred {
		if j < 0 || j >= len(d.Columns) {
			return nil, nil, resolved{}, nil, 0, fmt.Errorf("%w: predictor column %d of %d", ErrIndex, j, len(d.Columns))
		}
		if len(d.Columns[j]) != n {
			return nil, nil, resolved{}, nil, 0, fmt.Errorf("%w: predictor column %d has %d rows, response has %d", ErrLength, j, len(d.Columns[j]), n)
		}
	}
	rows := d.Rows
	nr := n
	if rows != nil {
		nr = len(rows)
		for t, i := range rows {
			if i < 0 || i >= n {
				return nil, nil, resolved{}, nil, 0, fmt.Errorf("%w: row %d (entry %d of Rows) of %d", ErrIndex, i, t, n)
			}
		}
	}
	if nr == 0 {
		return nil, nil, resolved{}, nil, 0, ErrNoRows
	}
	if d.Weights != nil && len(d.Weights) != n {
		return nil, nil, resolved{}, nil, 0, fmt.Errorf("%w: %d weights for %d rows", ErrLength, len(d.Weights), n)
	}
	r, err := resolve(s, nr, len(pred))
	if err != nil {
		return nil, nil, resolved{}, nil, 0, err
	}
	v, err := penaltyScale(s, len(pred))
	if err != nil {
		return nil, nil, resolved{}, nil, 0, err
	}
	if err := checkWeights(d.Weights, rows); err != nil {
		return nil, nil, resolved{}, nil, 0, err
	}
	rows = dropZeroWeights(d.Weights, rows, n)
	if err := checkResponse(r.fam, d.Response, rows); err != nil {
		return nil, nil, resolved{}, nil, 0, err
	}
	useGram := r.gaussian && (r.mode == GramMode || (r.mode == AutoMode && len(pred) <= 500 && nr >= 2*len(pred)))
	checked := rows
	if d.Index != nil && !useGram {
		// The fit also passes over the index's other rows, at weight zero.
		if err := d.Index.check(d.Columns, pred); err != nil {
			return nil, nil, resolved{}, nil, 0, err
		}
		checked = d.Index.rows
	}
	for _, j := range pred {
		if err := checkFinite(d.Columns[j], checked, j); err != nil {
			return nil, nil, resolved{}, nil, 0, err
		}
	}
	if useGram {
		cols := make([][]float64, 0, len(pred)+1)
		for _, j := range pred {
			cols = append(cols, d.Columns[j])
		}
		cols = append(cols, d.Response)
		m := NewMoments(ColumnMeans(cols, d.Weights, rows))
		if err := m.Accumulate(cols, d.Weights, rows); err != nil {
			return nil, nil, r, nil, 0, err
		}
		local := make([]int, len(pred))
		for j := range local {
			local[j] = j
		}
		e, err := newGramEngine(m, len(pred), local, v, r)
		return e, v, r, pred, nr, err
	}
	e, err := newResidualEngine(d, pred, rows, v, r)
	return e, v, r, pred, nr, err
}

// FitMoments fits a Gaussian penalised path from precomputed moments (see
// Moments): variable response on the variables listed in predictors. The
// result's Predictors are those moment variables, so predictions use
// columns indexed like the moments. The Family setting must be nil or
// Gaussian and Mode is ignored. The cost does not depend on the number of
// rows behind the moments.
func FitMoments(ctx context.Context, m *Moments, response int, predictors []int, s *Settings) (*Path, error) {
	return fitMoments(ctx, m, m.Vars, response, predictors, s)
}

// FitMomentsExcluding fits like FitMoments on the rows behind total that
// are not behind held (a cross-validation training set as the total minus
// a held-out fold), without forming their moments: entries are
// subtracted as the solver reads them. Both must share one shift.
func FitMomentsExcluding(ctx context.Context, total, held *Moments, response int, predictors []int, s *Settings) (*Path, error) {
	if err := sameShift(total, held); err != nil {
		return nil, err
	}
	return fitMoments(ctx, momentsDiff{total, held}, total.Vars, response, predictors, s)
}

// sameShift returns an error unless total and held are moments of as many
// variables about one shift.
func sameShift(total, held *Moments) error {
	if held.Vars != total.Vars || len(held.Shift) != len(total.Shift) {
		return fmt.Errorf("%w: moments of %d and %d variables", ErrLength, total.Vars, held.Vars)
	}
	for j, x := range held.Shift {
		if x != total.Shift[j] {
			return fmt.Errorf("%w: moments have different shifts at variable %d", ErrSettings, j)
		}
	}
	return nil
}

func fitMoments(ctx context.Context, m momentSource, vars, response int, predictors []int, s *Settings) (*Path, error) {
	st, err := startMoments(ctx, m, vars, response, predictors, s)
	if err != nil {
		return nil, err
	}
	for {
		more, err := st.Next(ctx)
		if err != nil {
			return nil, err
		}
		if !more {
			return st.Path(), nil
		}
	}
}

func startMoments(ctx context.Context, m momentSource, vars, response int, predictors []int, s *Settings) (*Stepper, error) {
	if len(predictors) == 0 {
		return nil, ErrNoPredictors
	}
	if response < 0 || response >= vars {
		return nil, fmt.Errorf("%w: response variable %d of %d", ErrIndex, response, vars)
	}
	for _, j := range predictors {
		if j < 0 || j >= vars {
			return nil, fmt.Errorf("%w: predictor variable %d of %d", ErrIndex, j, vars)
		}
	}
	w := m.weight()
	if !(w > 0) {
		return nil, ErrNoRows
	}
	r, err := resolve(s, int(w), len(predictors))
	if err != nil {
		return nil, err
	}
	if !r.gaussian {
		return nil, fmt.Errorf("%w: moments serve the Gaussian family only, not %s", ErrSettings, r.fam.Name())
	}
	v, err := penaltyScale(s, len(predictors))
	if err != nil {
		return nil, err
	}
	if err := m.finite(append(slices.Clone(predictors), response)); err != nil {
		return nil, err
	}
	e, err := newGramEngine(m, response, predictors, v, r)
	if err != nil {
		return nil, err
	}
	wk, err := newWalk(ctx, e, v, r, int(w))
	if err != nil {
		return nil, err
	}
	wk.path.Predictors = append([]int(nil), predictors...)
	return &Stepper{w: wk}, nil
}

func penaltyScale(s *Settings, p int) ([]float64, error) {
	v := make([]float64, p)
	if s == nil || s.PenaltyScale == nil {
		for j := range v {
			v[j] = 1
		}
		return v, nil
	}
	if len(s.PenaltyScale) != p {
		return nil, fmt.Errorf("%w: %d penalty factors for %d predictors", ErrPenalty, len(s.PenaltyScale), p)
	}
	for j, x := range s.PenaltyScale {
		if !(x >= 0) {
			return nil, fmt.Errorf("%w: penalty factor %d is %g, want ≥ 0 or +Inf", ErrPenalty, j, x)
		}
		v[j] = x
	}
	return v, nil
}

func checkWeights(w []float64, rows []int) error {
	if w == nil {
		return nil
	}
	var sum float64
	bad := &DataError{Column: -2, Err: ErrWeight}
	forRows(len(w), rows, func(i int) {
		x := w[i]
		if !(x >= 0) || math.IsInf(x, 0) {
			if bad.Count == 0 {
				bad.Row, bad.Value = i, x
			}
			bad.Count++
			return
		}
		sum += x
	})
	if bad.Count > 0 {
		return bad
	}
	if !(sum > 0) {
		return fmt.Errorf("%w: weights sum to zero", ErrWeight)
	}
	return nil
}

// dropZeroWeights returns rows without the rows of zero weight, which
// contribute nothing to a fit; it returns rows itself when there are none.
func dropZeroWeights(w []float64, rows []int, n int) []int {
	if w == nil {
		return rows
	}
	zeros := 0
	forRows(n, rows, func(i int) {
		if w[i] == 0 {
			zeros++
		}
	})
	if zeros == 0 {
		return rows
	}
	kept := make([]int, 0, n-zeros)
	forRows(n, rows, func(i int) {
		if w[i] != 0 {
			kept = append(kept, i)
		}
	})
	return kept
}

func checkResponse(fam Family, y []float64, rows []int) error {
	bad := &DataError{Column: -1}
	var first, distinct = math.NaN(), false
	forRows(len(y), rows, func(i int) {
		x := y[i]
		var err error
		if math.IsNaN(x) || math.IsInf(x, 0) {
			err = ErrNotFinite
		} else {
			err = fam.CheckResponse(x)
		}
		if err != nil {
			if bad.Count == 0 {
				bad.Row, bad.Value, bad.Err = i, x, err
			}
			bad.Count++
			return
		}
		if math.IsNaN(first) {
			first = x
		} else if x != first {
			distinct = true
		}
	})
	if bad.Count > 0 {
		return bad
	}
	if !distinct {
		return fmt.Errorf("%w: every fitted row has value %g", ErrConstantResponse, first)
	}
	return nil
}

func checkFinite(c []float64, rows []int, col int) error {
	bad := &DataError{Column: col, Err: ErrNotFinite}
	forRows(len(c), rows, func(i int) {
		if x := c[i]; math.IsNaN(x) || math.IsInf(x, 0) {
			if bad.Count == 0 {
				bad.Row, bad.Value = i, x
			}
			bad.Count++
		}
	})
	if bad.Count > 0 {
		return bad
	}
	return nil
}

// engine is one of the two coordinate-descent back ends.
type engine interface {
	// solve fits penalty lam with coefficients outside set held at zero.
	// It returns the sweeps used and false when a limit was reached.
	solve(lam float64, set []int) (int, bool)
	// gradient writes the negative gradient of the smooth part of the
	// objective, in standardised coordinates, at the current fit, for
	// every predictor with skip[j] false (nil skip means all).
	gradient(g []float64, skip []bool)
	// coefficients returns the standardised coefficients (live slice).
	coefficients() []float64
	// toOriginal converts the current fit to the original scale.
	toOriginal(b []float64) (intercept float64)
	deviance() float64
	nullDeviance() float64
	excluded() []bool
	mode() Mode
	weight() float64
}

// walk is a path fitted one penalty at a time: the state carried from one
// penalty to the next.
type walk struct {
	e     engine
	v     []float64
	r     resolved
	path  *Path
	pens  []float64 // the whole sequence
	done  bool
	g     []float64
	inSet []bool
	set   []int
	b     []float64
	prev  float64
	// With an engine that bounds the gradients' drift (see drifter),
	// g[j] of a predictor outside the set may be stale: it was exact
	// when formed, and the gradient has moved by at most slack[j] since.
	drift drifter
	slack []float64
	skip  []bool
}

// drifter is an engine that bounds how far the gradients of all
// predictors have moved, in one pass over the rows rather than one per
// predictor.
type drifter interface {
	// drift returns D with |g_j(now) − g_j(then)| ≤ D·spread(j) for
	// every predictor, where then is the previous call (the first call
	// returns 0). It forms the working weights at the current fit, as
	// gradient does.
	drift() float64
	// spread returns the factor of predictor j in drift's bound.
	spread(j int) float64
}

// moved adds the engine's drift since the gradients were last formed to
// every predictor's slack.
func (w *walk) moved() {
	d := w.drift.drift()
	for j := range w.slack {
		w.slack[j] += d * w.drift.spread(j)
	}
}

// settle forms exactly the gradient of every predictor outside the set
// whose bound |g_j| + slack_j does not fall clearly below thr(j), so that
// comparing g_j with thr(j) decides as the exact gradient would. Others
// keep a stale g_j whose comparison gives the same answer (|g_j| + slack_j
// < thr(j)). Without a drifter every gradient is exact already.
func (w *walk) settle(thr func(j int) float64) {
	if w.drift == nil {
		return
	}
	excl := w.e.excluded()
	any := false
	for j := range w.skip {
		w.skip[j] = true
		if w.inSet[j] || excl[j] || w.slack[j] == 0 {
			continue
		}
		// A margin far above rounding in the sums keeps the bound safe.
		bound := (math.Abs(w.g[j]) + w.slack[j]) * (1 + 1e-8)
		if !(bound < thr(j)) {
			w.skip[j], any = false, true
		}
	}
	if !any {
		return
	}
	w.e.gradient(w.g, w.skip)
	for j, s := range w.skip {
		if !s {
			w.slack[j] = 0
		}
	}
}

// newWalk fits the unpenalised predictors and the intercept, and fixes the
// penalty sequence. A walk whose first fit failed is done, with Status
// IterationLimit.
func newWalk(ctx context.Context, e engine, v []float64, r resolved, rows int) (*walk, error) {
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	p := len(v)
	excl := e.excluded()
	path := &Path{Family: r.fam, Mode: e.mode(), Rows: rows, Weight: e.weight(), NullDeviance: e.nullDeviance()}
	for j, x := range excl {
		if x {
			path.Excluded = append(path.Excluded, j)
		}
	}
	w := &walk{e: e, v: v, r: r, path: path, inSet: make([]bool, p)}
	for j := 0; j < p; j++ {
		if v[j] == 0 && !excl[j] {
			w.inSet[j] = true
			w.set = append(w.set, j)
		}
	}
	// Fit the unpenalised predictors (and intercept) alone.
	if _, ok := e.solve(math.Inf(1), w.set); !ok {
		path.Status = IterationLimit
		w.finish()
		return w, nil
	}
	g := make([]float64, p)
	e.gradient(g, nil)
	am := math.Max(r.a, 1e-3)
	var lmax float64
	for j := 0; j < p; j++ {
		if v[j] > 0 && !excl[j] {
			lmax = math.Max(lmax, math.Abs(g[j])/(am*v[j]))
		}
	}
	if !(lmax > 0) || math.IsInf(lmax, 0) {
		lmax = 1
	}
	// At exactly lmax the leading coordinate sits on the threshold, where
	// rounding can leave it at ±1e-17; a hair above keeps the first fit
	// empty.
	lmax *= 1 + 1e-9
	path.MaxPenalty = lmax
	pens := r.penalties
	if pens == nil {
		pens = make([]float64, r.num)
		for k := range pens {
			if r.num == 1 {
				pens[k] = lmax
				break
			}
			pens[k] = lmax * math.Pow(r.floor, float64(k)/float64(r.num-1))
		}
	}
	w.pens, w.g, w.b = pens, g, make([]float64, p)
	if dr, ok := e.(drifter); ok && dr.drift() == 0 {
		w.drift, w.slack, w.skip = dr, make([]float64, p), make([]bool, p)
	}
	w.prev = math.Max(lmax, pens[0])
	return w, nil
}

// finish ends the walk and lets an engine that holds recycled arrays give
// them back (see Index): nothing reads the engine after.
func (w *walk) finish() {
	w.done = true
	if r, ok := w.e.(interface{ release() }); ok {
		r.release()
	}
}

// next fits the next penalty of the sequence and reports whether it did;
// false means the path has ended (its Status says how).
func (w *walk) next(ctx context.Context) (bool, error) {
	if w.done {
		return false, nil
	}
	path, e, r, v, g := w.path, w.e, w.r, w.v, w.g
	k := path.Len()
	if k == len(w.pens) {
		w.finish()
		return false, nil
	}
	if err := ctx.Err(); err != nil {
		return false, err
	}
	lam := w.pens[k]
	p := len(v)
	excl := e.excluded()
	// Sequential strong rule.
	w.settle(func(j int) float64 { return r.a * v[j] * (2*lam - w.prev) })
	for j := 0; j < p; j++ {
		if !w.inSet[j] && !excl[j] && math.Abs(g[j]) >= r.a*v[j]*(2*lam-w.prev) {
			w.inSet[j] = true
			w.set = append(w.set, j)
		}
	}
	var sweeps int
	for {
		sw, ok := e.solve(lam, w.set)
		sweeps += sw
		if !ok {
			path.Status = IterationLimit
			w.finish()
			return false, nil
		}
		if w.drift == nil {
			e.gradient(g, w.inSet)
		} else {
			w.moved()
			w.settle(func(j int) float64 { return r.a * v[j] * lam })
		}
		violated := false
		for j := 0; j < p; j++ {
			if !w.inSet[j] && !excl[j] && math.Abs(g[j]) > r.a*v[j]*lam {
				w.inSet[j] = true
				w.set = append(w.set, j)
				violated = true
			}
		}
		if !violated {
			break
		}
	}
	b := w.b
	b0 := e.toOriginal(b)
	var sp Sparse
	for j, x := range b {
		if x != 0 {
			sp.Index = append(sp.Index, j)
			sp.Value = append(sp.Value, x)
		}
	}
	dev := e.deviance()
	expl := 0.0
	if path.NullDeviance > 0 {
		expl = 1 - dev/path.NullDeviance
	}
	path.Penalties = append(path.Penalties, lam)
	path.Intercept = append(path.Intercept, b0)
	path.Coefficients = append(path.Coefficients, sp)
	path.Deviance = append(path.Deviance, dev)
	path.Explained = append(path.Explained, expl)
	path.NonZero = append(path.NonZero, len(sp.Index))
	path.Sweeps = append(path.Sweeps, sweeps)
	if expl >= r.saturation {
		path.Status = Saturated
		w.finish()
	}
	w.prev = lam
	return true, nil
}

// sweeper is what descend needs of an engine.
type sweeper interface {
	// sweep updates each coordinate of set once at penalty lam. It
	// returns a bound on the largest scaled KKT residual of set after
	// the sweep (see descend), and the level of rounding in that bound:
	// roundoff times Σ |u_j|/√h_j over the coordinates updated, where u_j
	// is the argument of the soft-thresholding.
	sweep(lam float64, set []int) (bound, noise float64)
	coefficients() []float64
}

// roundoff is 16 units in the last place: a sweep that moves coefficients
// by no more than that cannot be told from a fixed point.
const roundoff = 0x1p-48

// descend runs coordinate descent on set until the Karush–Kuhn–Tucker
// residual of every coordinate j of set, scaled by 1/√h_j, is at most tol:
// a full sweep, then cycling on the non-zero coefficients until they
// settle, repeated until a full sweep ends within tol.
//
// The residual ρ_j (see kktResidual) is the distance from zero to the
// subdifferential of the objective along coordinate j, and h_j the
// curvature along it. An update leaves its own coordinate with ρ_j = 0, and
// a later change d_k of another coordinate moves g_j by |H_jk·d_k| ≤
// √(h_j h_k)·|d_k| (Cauchy–Schwarz; H is the positive semi-definite
// curvature matrix). So after a sweep, ρ_j/√h_j ≤ Σ_k √h_k·|d_k| over the
// sweep's changes, a bound each sweep gets for free; engines that keep the
// gradient may return the exact residual instead when it is smaller. A
// sweep whose bound is at the level of rounding ends the descent too.
//
// Engines that can take a Newton step on the active set (see newtoner)
// take one once the signs have stopped changing and the sweeps since have
// cost as much as the step, and first from the warm start when it costs
// no more than two sweeps; after a full step the exact residual decides
// whether to go on.
//
// An inner descent (inner true) solves a reweighting step's quadratic
// model: it stops as soon as cycling on the active set ends within tol,
// leaving the full sweep that confirms it to the next reweighting, whose
// first sweep at fresh weights bounds the residual of the loss itself.
// signs is scratch with one entry per predictor. descend returns the
// sweeps used, whether it converged within limit, and the bound after its
// first sweep (+Inf when it made none).
func descend(s sweeper, lam float64, set []int, tol float64, inner bool, limit int, active []int, signs []int8) (sweeps int, converged bool, first float64) {
	nt, canNewton := s.(newtoner)
	beta := s.coefficients()
	for _, j := range set {
		signs[j] = sign(beta[j])
	}
	// spent counts the cost, in sweeps over the active set, of the
	// sweeps since a sign last changed or a Newton step was last tried.
	spent := 0.0
	settled := func(swept []int) bool {
		same := true
		for _, j := range swept {
			if sg := sign(beta[j]); sg != signs[j] {
				signs[j] = sg
				same = false
			}
		}
		return same
	}
	first = math.Inf(1)
	if canNewton && !inner {
		// Along a path the signs rarely change from one penalty to the
		// next, and a step from the warm start often ends the descent.
		active = nonZero(append(active[:0], set...), beta)
		if len(active) > 0 && nt.newtonCost(active) <= 2 {
			moved, full := nt.newton(lam, active)
			if full && nt.residual(lam, set) <= tol {
				return 0, true, first
			}
			if moved {
				settled(set)
			}
		}
	}
	for sweeps < limit {
		r, noise := s.sweep(lam, set)
		sweeps++
		if r <= noise {
			r = 0
		}
		if sweeps == 1 {
			first = r
		}
		if r <= tol {
			return sweeps, true, first
		}
		active = nonZero(append(active[:0], set...), beta)
		spent += float64(len(set)) / float64(max(len(active), 1))
		if !settled(set) {
			spent = 0
		}
		for sweeps < limit {
			if canNewton && spent > 0 && spent >= nt.newtonCost(active) {
				spent = 0
				active = nonZero(active, beta)
				moved, full := nt.newton(lam, active)
				if full {
					if nt.residual(lam, set) <= tol {
						return sweeps, true, first
					}
					break
				}
				if moved {
					// The step stopped where a coefficient reached zero.
					settled(active)
					active = nonZero(active, beta)
				}
			}
			r, noise := s.sweep(lam, active)
			sweeps++
			if r <= tol || r <= noise {
				if inner {
					return sweeps, true, first
				}
				break
			}
			spent++
			if !settled(active) {
				spent = 0
			}
		}
	}
	return sweeps, false, first
}

// nonZero removes from list, in place, the indices of zero coefficients.
func nonZero(list []int, beta []float64) []int {
	out := list[:0]
	for _, j := range list {
		if beta[j] != 0 {
			out = append(out, j)
		}
	}
	return out
}

func sign(x float64) int8 {
	switch {
	case x > 0:
		return 1
	case x < 0:
		return -1
	}
	return 0
}

// kktResidual returns the KKT residual of a coordinate with coefficient b,
// negative gradient g of the smooth part of the objective and penalty
// terms l1, l2 (see penaltyTerms): the distance from zero to the
// subdifferential, min |g − l2·b − l1·s| over s in ∂|b|. It is zero
// exactly when the coordinate is optimal given the others.
func kktResidual(g, b, l1, l2 float64) float64 {
	if b == 0 {
		return math.Max(math.Abs(g)-l1, 0)
	}
	return math.Abs(g - l2*b - math.Copysign(l1, b))
}

// unstandardize writes the original-scale coefficients beta_j/scale_j into
// b and returns the original-scale intercept b0 − Σ b_j·center_j.
func unstandardize(b, beta, scale, center []float64, b0 float64) float64 {
	for j, x := range beta {
		b[j] = x / scale[j]
		b0 -= b[j] * center[j]
	}
	return b0
}

// soft returns the soft-thresholding S(u, t) = sign(u)·max(|u|−t, 0).
func soft(u, t float64) float64 {
	switch {
	case u > t:
		return u - t
	case u < -t:
		return u + t
	}
	return 0
}

// penaltyTerms returns the L1 and L2 parts of the penalty of a coordinate
// with factor v at penalty lam; lam = +Inf with v = 0 gives no penalty.
func penaltyTerms(lam, a, v float64) (l1, l2 float64) {
	if v == 0 {
		return 0, 0
	}
	return lam * a * v, lam * (1 - a) * v
}
