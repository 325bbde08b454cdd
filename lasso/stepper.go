package lasso

import "context"

// Stepper fits a path one penalty at a time, so that a caller can stop it
// once the rest of the path is of no use (package cv stops its paths a
// stretch past the cross-validation minimum). The fits are exactly those
// of Fit: each penalty depends only on the penalties before it.
type Stepper struct {
	w *walk
}

// Start checks d and s as Fit does, fits the unpenalised predictors and the
// intercept, and fixes the penalty sequence; Next then fits it penalty by
// penalty. It returns the errors Fit returns for bad input and ctx.Err()
// when ctx is cancelled. The caller's slices are never modified.
func Start(ctx context.Context, d Data, s *Settings) (*Stepper, error) {
	e, v, r, pred, nr, err := prepare(d, s)
	if err != nil {
		return nil, err
	}
	w, err := newWalk(ctx, e, v, r, nr)
	if err != nil {
		return nil, err
	}
	w.path.Predictors = append([]int(nil), pred...)
	return &Stepper{w: w}, nil
}

// StartMoments is Start for the fit of FitMoments.
func StartMoments(ctx context.Context, m *Moments, response int, predictors []int, s *Settings) (*Stepper, error) {
	return startMoments(ctx, m, m.Vars, response, predictors, s)
}

// StartMomentsExcluding is Start for the fit of FitMomentsExcluding.
func StartMomentsExcluding(ctx context.Context, total, held *Moments, response int, predictors []int, s *Settings) (*Stepper, error) {
	if err := sameShift(total, held); err != nil {
		return nil, err
	}
	return startMoments(ctx, momentsDiff{total, held}, total.Vars, response, predictors, s)
}

// Penalties returns the whole penalty sequence, fitted or not (nil when the
// first fit failed; the path's Status then says why). The caller must not
// modify it.
func (s *Stepper) Penalties() []float64 { return s.w.pens }

// Next fits the next penalty and reports whether it did. It returns false
// once the path has ended: every penalty fitted (Status Completed), the
// fit saturated or reached an iteration limit, or Stop was called. It
// returns ctx.Err() when ctx is cancelled.
func (s *Stepper) Next(ctx context.Context) (bool, error) { return s.w.next(ctx) }

// Path returns the fits so far. Later calls of Next append to it; its
// Status is Completed until the path ends otherwise.
func (s *Stepper) Path() *Path { return s.w.path }

// Stop ends the path at the penalties fitted so far; if some are left
// unfitted its Status becomes Stopped. Next then returns false.
func (s *Stepper) Stop() {
	w := s.w
	if !w.done && w.path.Len() < len(w.pens) {
		w.path.Status = Stopped
	}
	w.finish()
}
