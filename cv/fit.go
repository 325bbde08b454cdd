package cv

import (
	"context"
	"fmt"
	"math"
	"slices"

	"github.com/antecedent-lab/antecedent/internal/pool"
	"github.com/antecedent-lab/antecedent/lasso"
)

// Settings configures a cross-validated path. The zero value, or a nil
// *Settings, gives the documented defaults.
type Settings struct {
	// Path configures every fit; its Penalties, when set, fix the grid.
	Path lasso.Settings `json:"path"`
	// Measure is the held-out measure. Zero means Deviance.
	Measure Measure `json:"measure"`
	// Rule chooses the penalty. Zero (DefaultRule) means OneStandardError.
	Rule Rule `json:"rule"`
	// Workers bounds the folds fitted at once. Zero means GOMAXPROCS.
	Workers int `json:"workers,omitempty"`
	// WholePath fits every penalty of the grid. By default Fit fits the
	// full-data path and the folds' paths in step and ends them all once
	// the mean held-out loss has risen at each of the last ten penalties
	// (see Fit); FitMoments always fits the whole grid.
	WholePath bool `json:"whole_path,omitempty"`
	// FoldScales, when set, holds one penalty-factor vector per fold:
	// fold f's path uses FoldScales[f] in place of Path.PenaltyScale
	// (same length and meaning; +Inf keeps a predictor out of that fold's
	// models). It serves procedures whose penalty factors are learnt from
	// the data, such as the adaptive lasso's weights: learnt on each
	// fold's training rows alone, they keep the held-out rows out of the
	// whole procedure, as cross-validation requires (Hastie, Tibshirani &
	// Friedman, The Elements of Statistical Learning, 2nd ed., sec.
	// 7.10.2). The full-data path uses Path.PenaltyScale.
	FoldScales [][]float64 `json:"-"`
}

// Validate returns the error Fit would return for these settings, as far
// as it can be known without data (a measure that does not suit the
// response's family is found only by Fit). A nil *Settings is valid.
func (s *Settings) Validate() error {
	if s == nil {
		return nil
	}
	if _, ok := measureNames[s.Measure]; !ok {
		return fmt.Errorf("%w: unknown measure %d", ErrMeasure, int(s.Measure))
	}
	if _, _, err := resolveSettings(&Settings{Rule: s.Rule, Workers: s.Workers}); err != nil {
		return err
	}
	return s.Path.Validate()
}

// Result is a cross-validated penalty path.
type Result struct {
	// Full is the path fitted on every row; its penalties are the grid.
	Full *lasso.Path
	// Curve holds one point per penalty of Full.
	Curve []Point
	// FoldValues holds the held-out measure of each fold at each penalty.
	FoldValues [][]float64
	// FoldPaths holds each fold's training path (nil from FitMoments and
	// the Gaussian shortcut, which keep no per-row predictions; FoldPath
	// gives their paths too).
	FoldPaths []*lasso.Path
	// Measure and Rule are those used (defaults resolved).
	Measure Measure
	Rule    Rule
	// Best is the index of the best mean; OneSE the index chosen by the
	// one-standard-error rule; Selected the index chosen by Rule.
	Best, OneSE, Selected int
	// Margin is how many standard errors Rule allowed: Rule.StandardErrors(),
	// except under PairedDifference when the pairs are the folds' (AUC, or
	// FitMoments without rows; see Point.PairSE), where the standard error
	// rests on K−1 degrees of freedom and the margin is the Student t quantile
	// of the same one-sided level as PairedMargin's normal one (1.649 for ten
	// folds).
	Margin float64
	// RuleSE is the standard error Margin multiplied under a rule that
	// reads the best point's (all but PairedDifference, where it is NaN):
	// the best point's SE, raised for the deviance of a binomial response
	// under the package's own margins to the floor of Rule.Yardstick.
	RuleSE float64

	// paths holds each fold's training path, whichever way it was fitted.
	paths []*lasso.Path

	// rows holds, per fold and penalty, sums of the held-out rows' own
	// losses (nil when the measure is not a mean of per-row losses or the
	// rows' predictions were not formed).
	rows [][]rowSums
	// pairRows, when set, returns for every penalty up to best the sums
	// of the held-out rows' losses there minus their losses at best,
	// pooled over the folds (see Point.PairSE).
	pairRows func(best int) []rowSums
}

// heldRows returns the effective number of held-out rows behind point k's
// per-row standard error (see rowSums.se), NaN when the rows' losses were
// not kept.
func (r *Result) heldRows(k int) float64 {
	if len(r.rows) == 0 {
		return math.NaN()
	}
	for _, f := range r.rows {
		if k >= len(f) {
			return math.NaN()
		}
	}
	return pooled(r.rows, k).effective()
}

// FoldPath returns fold f's training path, fitted on the same grid as
// Full (from rows or from moments).
func (r *Result) FoldPath(f int) *lasso.Path { return r.paths[f] }

// foldScale returns the penalty settings of fold f's path under c.
func foldScale(c *Settings, f int) lasso.Settings {
	ps := c.Path
	if c.FoldScales != nil {
		ps.PenaltyScale = c.FoldScales[f]
	}
	return ps
}

// checkFoldScales returns an error unless c's fold scales, if any, number k.
func checkFoldScales(c *Settings, k int) error {
	if c.FoldScales != nil && len(c.FoldScales) != k {
		return fmt.Errorf("%w: %d fold penalty-factor vectors for %d folds", ErrFolds, len(c.FoldScales), k)
	}
	return nil
}

// Penalty returns the selected penalty.
func (r *Result) Penalty() float64 { return r.Full.Penalties[r.Selected] }

// Model returns the intercept and dense coefficients of the full-data fit
// at the selected penalty.
func (r *Result) Model() (float64, []float64) { return r.Full.Dense(r.Selected) }

func resolveSettings(s *Settings) (Settings, lasso.Family, error) {
	var c Settings
	if s != nil {
		c = *s
	}
	fam := c.Path.Family
	if fam == nil {
		fam = lasso.Gaussian{}
	}
	m, err := c.Measure.resolve(fam)
	if err != nil {
		return c, fam, err
	}
	c.Measure = m
	if c.Rule == DefaultRule {
		c.Rule = OneStandardError
	}
	if c.Rule != MinimumLoss && c.Rule != OneStandardError && c.Rule != HalfStandardError && c.Rule != QuarterStandardError && c.Rule != PairedDifference {
		return c, fam, fmt.Errorf("cv: unknown rule %d", int(c.Rule))
	}
	if c.Workers < 0 {
		return c, fam, fmt.Errorf("cv: %d workers", c.Workers)
	}
	return c, fam, nil
}

// Fit cross-validates a penalised path: the path on every row of d that
// belongs to a fold fixes the penalty grid, each fold's training rows are fitted on the same grid,
// and each fold's held-out rows are scored at every penalty. A fold path
// that ends early (saturation) scores the remaining penalties with its last
// fit. Folds run in parallel on at most s.Workers goroutines; the result
// does not depend on the number of workers. It returns an error for folds
// that do not match the data, a held-out fold with no rows or, for AUC,
// without both classes, and ctx.Err() when ctx is cancelled. Gaussian
// responses scored by squared error in Gram mode (the automatic choice when
// rows far outnumber predictors) are cross-validated from moments formed in
// one pass over the data, as in FitMoments.
func Fit(ctx context.Context, d lasso.Data, folds *Folds, s *Settings) (*Result, error) {
	c, fam, err := resolveSettings(s)
	if err != nil {
		return nil, err
	}
	if folds == nil || len(folds.ID) != len(d.Response) {
		n := 0
		if folds != nil {
			n = len(folds.ID)
		}
		return nil, fmt.Errorf("%w: %d fold ids for %d rows", ErrLength, n, len(d.Response))
	}
	splits := make([]split, folds.K)
	for f := range splits {
		tr, he := folds.Split(f, d.Rows)
		if len(he) == 0 {
			return nil, fmt.Errorf("%w: fold %d holds no rows", ErrFolds, f)
		}
		if len(tr) == 0 {
			return nil, fmt.Errorf("%w: fold %d leaves no training rows", ErrFolds, f)
		}
		if c.Measure == AreaUnderCurve {
			var pos int
			for _, i := range he {
				if d.Response[i] == 1 {
					pos++
				}
			}
			if pos == 0 || pos == len(he) {
				return nil, fmt.Errorf("%w: held-out fold %d has %d positive and %d negative rows; AUC needs both",
					ErrFoldClasses, f, pos, len(he)-pos)
			}
		}
		splits[f] = split{tr, he}
	}
	if err := checkFoldScales(&c, folds.K); err != nil {
		return nil, err
	}
	if useMoments(c, fam, d) {
		return fitViaMoments(ctx, d, splits2rows(splits), &c)
	}
	all := d
	all.Rows = nil
	for _, sp := range splits {
		all.Rows = append(all.Rows, sp.held...)
	}
	slices.Sort(all.Rows)
	full, err := lasso.Start(ctx, all, &c.Path)
	if err != nil {
		return nil, err
	}
	grid := full.Penalties()
	folder := make([]foldPath, folds.K)
	stop, err := lockstep(ctx, &c, full, folder, func(ctx context.Context, f int) (foldPath, error) {
		return startFold(ctx, d, splits[f], grid, &c, fam, f)
	})
	if err != nil {
		return nil, err
	}
	r := &Result{Full: full.Path(), Measure: c.Measure, Rule: c.Rule, FoldValues: make([][]float64, folds.K), FoldPaths: make([]*lasso.Path, folds.K),
		rows: make([][]rowSums, folds.K)}
	for f, fp := range folder {
		fw := fp.(*foldWalk)
		r.FoldValues[f] = fw.vals[:stop]
		if fw.rows != nil {
			r.rows[f] = fw.rows[:stop]
		}
		r.FoldPaths[f] = fw.stepper.Path()
	}
	r.paths = r.FoldPaths
	if c.Measure.perRow() {
		r.pairRows = func(best int) []rowSums {
			out := make([]rowSums, best+1)
			for _, fp := range folder {
				fp.(*foldWalk).pairSums(best, out)
			}
			return out
		}
	}
	r.finish(r.Full.Penalties, r.Full.NonZero)
	return r, nil
}

// pairSums adds to out[k], for every penalty index k of out (those up to
// best), the sums of this fold's held-out rows' losses at k minus their
// losses at best (see addPairs).
func (fw *foldWalk) pairSums(best int, out []rowSums) {
	path := fw.stepper.Path()
	predict := func(k int) { fw.ho.meanTo(fw.mu, path, min(k, path.Len()-1)) }
	addPairs(out, best, predict, fw.measure, fw.fam, fw.y, fw.mu, fw.w)
}

// addPairs adds to out[k], for every penalty index k of out, the sums of
// the rows' losses at k minus their losses at best: predict(k) forms the
// rows' means at k in mu, y holds their responses and w their weights (nil:
// 1). Rows whose loss is infinite at either are left out, as sumRows
// leaves them out of the curve.
func addPairs(out []rowSums, best int, predict func(k int), m Measure, fam lasso.Family, y, mu, w []float64) {
	predict(best)
	base := make([]float64, len(y))
	for i, v := range y {
		base[i] = m.rowLoss(fam, v, mu[i])
	}
	for k := range out {
		predict(k)
		var s rowSums
		for i, v := range y {
			d := m.rowLoss(fam, v, mu[i]) - base[i]
			if math.IsInf(d, 0) || math.IsNaN(d) {
				continue
			}
			s.addRow(w, i, d)
		}
		out[k].add(s)
	}
}

// foldPath is one fold's path in a lockstep cross-validation.
type foldPath interface {
	// advance fits fold f's path up to penalty index end (exclusive) and
	// scores its held-out rows at each new penalty. A path that ended
	// early (saturation) scores the remaining penalties with its last
	// fit.
	advance(ctx context.Context, f, end int) error
	// scores returns the held-out measure at the penalties scored.
	scores() []float64
	path() *lasso.Stepper
}

// lockstep fits the full-data path and the folds' paths (started by start
// on first use, into folds) in blocks of penalties: the full path, then
// every fold in parallel, then, unless c.WholePath, the stopping rule on
// the mean curve so far (see pastMinimum). It returns the number of
// penalties kept and leaves every path cut to it: the full path's length,
// or fewer when the rule stopped the paths (Status Stopped).
func lockstep(ctx context.Context, c *Settings, full *lasso.Stepper, folds []foldPath, start func(ctx context.Context, f int) (foldPath, error)) (int, error) {
	grid := full.Penalties()
	if len(grid) == 0 {
		// The unpenalised fit failed before any penalty.
		return 0, fmt.Errorf("%w: the full-data path ended at its first penalty (%v)", ErrNoFit, full.Path().Status)
	}
	stop := len(grid)
	for done := 0; done < stop; {
		end := min(done+stopBlock, stop)
		if err := stepTo(ctx, full, end, -1); err != nil {
			return 0, err
		}
		if full.Path().Len() < end {
			stop = full.Path().Len() // the full path ended early
			end = stop
		}
		err := pool.Run(ctx, c.Workers, len(folds), func(ctx context.Context, f int) error {
			if folds[f] == nil {
				fp, err := start(ctx, f)
				if err != nil {
					return err
				}
				folds[f] = fp
			}
			return folds[f].advance(ctx, f, end)
		})
		if err != nil {
			return 0, err
		}
		if !c.WholePath {
			if k := stopAfter(folds, done, end, c.Measure.LargerIsBetter()); k > 0 {
				stop = k
			}
		}
		done = end
	}
	full.Stop()
	cut(full.Path(), stop, len(grid))
	for _, fp := range folds {
		fp.path().Stop()
		cut(fp.path().Path(), stop, len(grid))
	}
	return stop, nil
}

// stopBlock is the number of penalties every path of a cross-validation
// fits before the stopping rule looks at the curve again. The rule is
// applied penalty by penalty, so the result does not depend on it.
const stopBlock = 10

// foldWalk is one fold's path, fitted in step with the others, and its
// held-out scores.
type foldWalk struct {
	stepper *lasso.Stepper
	held    []int
	y, w    []float64
	mu      []float64
	ho      *heldOut
	gath    int // penalties whose predictors ho holds
	vals    []float64
	rows    []rowSums
	measure Measure
	fam     lasso.Family
	cols    [][]float64
}

func (fw *foldWalk) scores() []float64    { return fw.vals }
func (fw *foldWalk) path() *lasso.Stepper { return fw.stepper }

func startFold(ctx context.Context, d lasso.Data, sp split, grid []float64, c *Settings, fam lasso.Family, f int) (foldPath, error) {
	ps := foldScale(c, f)
	ps.Penalties = grid
	fd := d
	fd.Rows = sp.train
	st, err := lasso.Start(ctx, fd, &ps)
	if err != nil {
		return nil, err
	}
	fw := &foldWalk{stepper: st, held: sp.held, measure: c.Measure, fam: fam, cols: d.Columns,
		y: make([]float64, len(sp.held)), mu: make([]float64, len(sp.held)), vals: make([]float64, 0, len(grid))}
	if d.Weights != nil {
		fw.w = make([]float64, len(sp.held))
	}
	for t, i := range sp.held {
		fw.y[t] = d.Response[i]
		if fw.w != nil {
			fw.w[t] = d.Weights[i]
		}
	}
	if c.Measure.perRow() {
		fw.rows = make([]rowSums, 0, len(grid))
	}
	return fw, nil
}

// stepTo fits s's path on to end penalties, or until it ends; a path that
// ended before its first penalty is ErrNoFit, naming the fold (or the
// full-data path, for fold −1).
func stepTo(ctx context.Context, s *lasso.Stepper, end, fold int) error {
	for s.Path().Len() < end {
		more, err := s.Next(ctx)
		if err != nil {
			return err
		}
		if !more {
			break
		}
	}
	if s.Path().Len() == 0 {
		what := fmt.Sprintf("fold %d", fold)
		if fold < 0 {
			what = "the full-data path"
		}
		return fmt.Errorf("%w: %s ended at its first penalty (%v)", ErrNoFit, what, s.Path().Status)
	}
	return nil
}

func (fw *foldWalk) advance(ctx context.Context, f, end int) error {
	if err := stepTo(ctx, fw.stepper, end, f); err != nil {
		return err
	}
	path := fw.stepper.Path()
	if fw.ho == nil {
		fw.ho = gatherHeldOut(path, fw.cols, fw.held)
	} else {
		fw.ho.extend(path, fw.cols, fw.held, fw.gath)
	}
	fw.gath = path.Len()
	for k := len(fw.vals); k < end; k++ {
		fw.ho.meanTo(fw.mu, path, min(k, path.Len()-1))
		v, err := evaluate(fw.measure, fw.fam, fw.mu, fw.y, fw.w)
		if err != nil {
			return fmt.Errorf("cv: fold %d: %w", f, err)
		}
		fw.vals = append(fw.vals, v)
		if fw.rows != nil {
			fw.rows = append(fw.rows, sumRows(fw.measure, fw.fam, fw.mu, fw.y, fw.w))
		}
	}
	return nil
}

// stopAfter returns the number of penalties to keep when the stopping rule
// (see pastMinimum) holds at a penalty index in [from, to), the first such;
// 0 when it holds at none. The curve is summarised as finish will (mean
// and standard error), so the rule reads the means the choice reads. Its
// least rise is in the best point's own standard error, not the floored
// one the half- and quarter-SE rules read for binary nodes
// (Rule.Yardstick): the rule was checked in those terms (bench/pathcut),
// and the choice reads only penalties up to the minimum.
func stopAfter(folds []foldPath, from, to int, larger bool) int {
	loss := make([][]float64, len(folds))
	var rows [][]rowSums
	for f, fp := range folds {
		loss[f] = fp.scores()[:to]
		if fw, ok := fp.(*foldWalk); ok && fw.rows != nil {
			rows = append(rows, fw.rows[:to])
		}
	}
	curve := make([]Point, to)
	summarise(curve, loss, rows)
	mean, se := make([]float64, to), make([]float64, to)
	for k, p := range curve {
		mean[k], se[k] = p.Mean, p.SE
		if larger {
			mean[k] = -mean[k]
		}
	}
	for k := from; k < to; k++ {
		if pastMinimum(mean[:k+1], se[:k+1]) {
			return k + 1
		}
	}
	return 0
}

// cut shortens path to its first k penalties of a grid of n, if longer;
// a path cut short of the grid that had not ended otherwise is Stopped.
func cut(p *lasso.Path, k, n int) {
	if p.Status == lasso.Completed && k < n {
		p.Status = lasso.Stopped
	}
	if p.Len() <= k {
		return
	}
	p.Penalties = p.Penalties[:k]
	p.Intercept = p.Intercept[:k]
	p.Coefficients = p.Coefficients[:k]
	p.Explained = p.Explained[:k]
	p.Deviance = p.Deviance[:k]
	p.NonZero = p.NonZero[:k]
	p.Sweeps = p.Sweeps[:k]
}

type split struct{ train, held []int }

func splits2rows(s []split) [][]int {
	held := make([][]int, len(s))
	for f := range s {
		held[f] = s[f].held
	}
	return held
}

// useMoments reports whether the Gaussian shortcut applies: squared-error
// measure, Gram mode chosen (or left automatic with many rows per
// predictor), and data the moments can be checked on.
func useMoments(c Settings, fam lasso.Family, d lasso.Data) bool {
	if _, ok := fam.(lasso.Gaussian); !ok {
		return false
	}
	if c.Measure != Deviance && c.Measure != MeanSquaredError {
		return false
	}
	p := len(d.Predictors)
	if d.Predictors == nil {
		p = len(d.Columns)
	}
	n := len(d.Response)
	if d.Rows != nil {
		n = len(d.Rows)
	}
	switch c.Path.Mode {
	case lasso.GramMode:
		return true
	case lasso.AutoMode:
		return p <= 500 && n >= 2*p
	}
	return false
}

// fitViaMoments validates d through a direct fit's checks, forms the
// moments of every fold in one pass, and cross-validates from them.
func fitViaMoments(ctx context.Context, d lasso.Data, held [][]int, s *Settings) (*Result, error) {
	// A one-penalty direct fit reports bad data exactly as Fit would.
	check := s.Path
	check.Penalties = []float64{math.MaxFloat64}
	check.Mode = lasso.ResidualMode
	check.MaxSweeps = 1
	var rows []int
	for _, h := range held {
		rows = append(rows, h...)
	}
	slices.Sort(rows)
	if _, err := lasso.Fit(ctx, lasso.Data{Columns: d.Columns, Response: d.Response, Weights: d.Weights, Rows: rows, Predictors: d.Predictors}, &check); err != nil {
		return nil, err
	}
	pred := d.Predictors
	if pred == nil {
		pred = make([]int, len(d.Columns))
		for j := range pred {
			pred[j] = j
		}
	}
	cols := make([][]float64, 0, len(pred)+1)
	for _, j := range pred {
		cols = append(cols, d.Columns[j])
	}
	cols = append(cols, d.Response)
	shift := lasso.ColumnMeans(cols, d.Weights, rows)
	total := lasso.NewMoments(shift)
	fm := make([]*lasso.Moments, len(held))
	for f, h := range held {
		fm[f] = lasso.NewMoments(shift)
		if err := fm[f].Accumulate(cols, d.Weights, h); err != nil {
			return nil, err
		}
		if err := total.Add(fm[f]); err != nil {
			return nil, err
		}
	}
	local := make([]int, len(pred))
	for j := range local {
		local[j] = j
	}
	r, err := FitMoments(ctx, total, fm, &HeldRows{Columns: cols, Weights: d.Weights, Held: held}, len(pred), local, s)
	if err != nil {
		return nil, err
	}
	r.Full.Predictors = append(r.Full.Predictors[:0], pred...)
	for _, fp := range r.paths {
		fp.Predictors = append(fp.Predictors[:0], pred...)
	}
	return r, nil
}

func (r *Result) finish(grid []float64, nonZero []int) {
	r.Curve = make([]Point, len(grid))
	for k, l := range grid {
		r.Curve[k] = Point{Penalty: l, LogPenalty: -math.Log(l), NonZero: nonZero[k]}
	}
	summarise(r.Curve, r.FoldValues, r.rows)
	// The paired differences cost a second pass over the held-out
	// predictions: they are formed for the rule that reads them only.
	best, _ := chooseWithin(r.Curve, r.Measure.LargerIsBetter(), 0, false, math.NaN())
	switch {
	case !r.Rule.Paired():
	case best >= 0 && r.pairRows != nil:
		for k, s := range r.pairRows(best) {
			r.Curve[k].PairSE = s.se()
		}
	default:
		pair(r.Curve, r.FoldValues, r.Measure.LargerIsBetter())
		r.pairRows = nil // the margin below reads which pairs were used
	}
	r.Best, r.OneSE = Choose(r.Curve, r.Measure.LargerIsBetter())
	r.Selected = r.OneSE
	r.Margin = r.Rule.StandardErrors()
	if r.Rule.Paired() && r.pairRows == nil {
		r.Margin = StudentMargin(r.Margin, len(r.FoldValues)-1)
	}
	r.RuleSE = math.NaN()
	if best >= 0 && !r.Rule.Paired() {
		r.RuleSE = r.Rule.Yardstick(r.Curve[best].SE, r.Measure, r.Full.Family, r.heldRows(best))
	}
	if r.Rule != OneStandardError {
		_, r.Selected = chooseWithin(r.Curve, r.Measure.LargerIsBetter(), r.Margin, r.Rule.Paired(), r.RuleSE)
	}
	if r.Selected < 0 {
		r.Best, r.OneSE, r.Selected = 0, 0, 0
	}
}
