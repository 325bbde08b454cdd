package antecedent

import (
	"context"
	"fmt"

	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/internal/pool"
	"github.com/antecedent-lab/antecedent/lasso"
)

// Engine decides where discovery's two kinds of heavy work run: summing
// the fold moments of the design columns, which serve every continuous
// node, and fitting nodes, which are independent of one another. What is
// computed is decided by Discover alone; an engine only runs it, so any
// engine gives the result of Goroutines (to rounding in the order moments
// are summed).
//
// Goroutines, the default, runs both on this machine's cores. The module
// github.com/antecedent-lab/antecedent/beam runs them as an Apache Beam
// pipeline and hands their outcomes to a Job through an engine of its own.
type Engine interface {
	// FoldMoments returns w.Folds.K moments, one per fold: the moments of
	// w.Columns over the rows the fold holds (rows with fold id -1 are in
	// none). All must share one shift; w.Shift is a good one, and an
	// engine that sums moments elsewhere may use its own. It must not
	// modify w.
	FoldMoments(ctx context.Context, w *MomentsWork) ([]*lasso.Moments, error)
	// Fit calls w.Fit once for each task in [0, w.Tasks) and returns the
	// error of the lowest-numbered failed task, or ctx.Err().
	Fit(ctx context.Context, w *FitWork) error
}

// MomentsWork is the fold-moments work of one run.
type MomentsWork struct {
	Columns [][]float64 // the dataset's design columns
	Folds   *cv.Folds   // the fold of every row
	Shift   []float64   // a shift near each column's mean
	Workers int         // goroutines to use; 0 means GOMAXPROCS
}

// FitWork is the node-fitting work of one run.
type FitWork struct {
	Tasks   int // the number of tasks
	Workers int // goroutines to use; 0 means GOMAXPROCS
	// Fit runs task t. Tasks share nothing but read-only state and may run
	// in any order or at once.
	Fit func(ctx context.Context, t int) error
}

// Goroutines is the engine that runs everything in this process, on a
// bounded pool of goroutines.
type Goroutines struct{}

var _ Engine = Goroutines{}

// FoldMoments forms each fold's moments in one pass over its rows, one fold
// per goroutine.
func (Goroutines) FoldMoments(ctx context.Context, w *MomentsWork) ([]*lasso.Moments, error) {
	held := make([]*lasso.Moments, w.Folds.K)
	err := pool.Run(ctx, w.Workers, w.Folds.K, func(ctx context.Context, k int) error {
		m := lasso.NewMoments(w.Shift)
		if err := m.Accumulate(w.Columns, nil, w.Folds.Held(k, nil)); err != nil {
			return err
		}
		held[k] = m
		return nil
	})
	return held, err
}

// Fit runs the tasks on at most w.Workers goroutines.
func (Goroutines) Fit(ctx context.Context, w *FitWork) error {
	return pool.Run(ctx, w.Workers, w.Tasks, w.Fit)
}

// engineOf returns the run's engine, Goroutines when none was set.
func (r *run) engineOf() Engine {
	if r.engine == nil {
		return Goroutines{}
	}
	return r.engine
}

// foldMoments asks the engine for the fold moments and checks their shape.
func (r *run) foldMoments(ctx context.Context, shift []float64) ([]*lasso.Moments, error) {
	held, err := r.engineOf().FoldMoments(ctx, &MomentsWork{Columns: r.cols, Folds: r.folds, Shift: shift, Workers: r.cfg.Workers})
	if err != nil {
		return nil, err
	}
	if len(held) != r.folds.K {
		return nil, fmt.Errorf("antecedent: engine returned %d fold moments for %d folds", len(held), r.folds.K)
	}
	for k, m := range held {
		if m == nil || m.Vars != len(r.cols) || len(m.Shift) != m.Vars || len(m.Sum) != m.Vars || len(m.Cross) != m.Vars*m.Vars {
			return nil, fmt.Errorf("antecedent: engine returned malformed moments for fold %d", k)
		}
	}
	return held, nil
}
