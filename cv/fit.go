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
	// Rule chooses the penalty. Zero means OneStandardError.
	Rule Rule `json:"rule"`
	// Workers bounds the folds fitted at once. Zero means GOMAXPROCS.
	Workers int `json:"workers,omitempty"`
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
	// the Gaussian shortcut, which keep no per-row predictions).
	FoldPaths []*lasso.Path
	// Measure and Rule are those used (defaults resolved).
	Measure Measure
	Rule    Rule
	// Best is the index of the best mean; OneSE the index chosen by the
	// one-standard-error rule; Selected the index chosen by Rule.
	Best, OneSE, Selected int

	// rows holds, per fold and penalty, sums of the held-out rows' own
	// losses (nil when the measure is not a mean of per-row losses or the
	// rows' predictions were not formed).
	rows [][]rowSums
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
	if c.Rule != MinimumLoss && c.Rule != OneStandardError {
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
	if useMoments(c, fam, d) {
		return fitViaMoments(ctx, d, splits2rows(splits), &c)
	}
	all := d
	all.Rows = nil
	for _, sp := range splits {
		all.Rows = append(all.Rows, sp.held...)
	}
	slices.Sort(all.Rows)
	full, err := lasso.Fit(ctx, all, &c.Path)
	if err != nil {
		return nil, err
	}
	if full.Len() == 0 {
		return nil, fmt.Errorf("%w: the full-data path ended at its first penalty (%v)", ErrNoFit, full.Status)
	}
	r := &Result{Full: full, Measure: c.Measure, Rule: c.Rule, FoldValues: make([][]float64, folds.K), FoldPaths: make([]*lasso.Path, folds.K),
		rows: make([][]rowSums, folds.K)}
	grid := full.Penalties
	err = pool.Run(ctx, c.Workers, folds.K, func(ctx context.Context, f int) error {
		ps := c.Path
		ps.Penalties = grid
		fd := d
		fd.Rows = splits[f].train
		path, err := lasso.Fit(ctx, fd, &ps)
		if err != nil {
			return fmt.Errorf("cv: fold %d: %w", f, err)
		}
		if path.Len() == 0 {
			return fmt.Errorf("%w: fold %d ended at its first penalty (%v)", ErrNoFit, f, path.Status)
		}
		held := splits[f].held
		y := make([]float64, len(held))
		var w []float64
		if d.Weights != nil {
			w = make([]float64, len(held))
		}
		for t, i := range held {
			y[t] = d.Response[i]
			if w != nil {
				w[t] = d.Weights[i]
			}
		}
		mu := make([]float64, len(held))
		vals := make([]float64, len(grid))
		var rows []rowSums
		if c.Measure.perRow() {
			rows = make([]rowSums, len(grid))
		}
		ho := gatherHeldOut(path, d.Columns, held)
		for k := range grid {
			ho.meanTo(mu, path, min(k, path.Len()-1))
			v, err := evaluate(c.Measure, fam, mu, y, w)
			if err != nil {
				return fmt.Errorf("cv: fold %d: %w", f, err)
			}
			vals[k] = v
			if rows != nil {
				rows[k] = sumRows(c.Measure, fam, mu, y, w)
			}
		}
		r.FoldValues[f] = vals
		r.rows[f] = rows
		r.FoldPaths[f] = path
		return nil
	})
	if err != nil {
		return nil, err
	}
	r.finish(grid, full.NonZero)
	return r, nil
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
	r, err := FitMoments(ctx, total, fm, len(pred), local, s)
	if err != nil {
		return nil, err
	}
	r.Full.Predictors = append(r.Full.Predictors[:0], pred...)
	return r, nil
}

func (r *Result) finish(grid []float64, nonZero []int) {
	r.Curve = make([]Point, len(grid))
	for k, l := range grid {
		r.Curve[k] = Point{Penalty: l, LogPenalty: -math.Log(l), NonZero: nonZero[k]}
	}
	summarise(r.Curve, r.FoldValues, r.rows)
	r.Best, r.OneSE = Choose(r.Curve, r.Measure.LargerIsBetter())
	r.Selected = r.OneSE
	if r.Rule == MinimumLoss {
		r.Selected = r.Best
	}
	if r.Selected < 0 {
		r.Best, r.OneSE, r.Selected = 0, 0, 0
	}
}
