package lasso

import (
	"fmt"
	"math"
	"sort"
)

// Status says how a path fit ended.
type Status int

const (
	// Completed means every penalty of the sequence was fitted to
	// tolerance.
	Completed Status = iota
	// Saturated means the path ended early because the deviance explained
	// reached the saturation limit, as under perfect separation; the
	// penalties fitted so far are kept.
	Saturated
	// IterationLimit means a penalty did not converge within the sweep or
	// reweighting limit; the path holds the penalties fitted before it.
	IterationLimit
	// Stopped means the caller ended the path (Stepper.Stop) before its
	// last penalty.
	Stopped
)

// String returns the status's name.
func (s Status) String() string {
	switch s {
	case Completed:
		return "completed"
	case Saturated:
		return "saturated"
	case IterationLimit:
		return "iteration limit"
	case Stopped:
		return "stopped"
	}
	return fmt.Sprintf("Status(%d)", int(s))
}

// Sparse holds the non-zero coefficients of one fit: Index holds positions
// in the path's predictor list, in increasing order, and Value the
// coefficients on the original scale.
type Sparse struct {
	Index []int
	Value []float64
}

// Path is the solution of a penalised fit along a decreasing penalty
// sequence. Entry k of every per-penalty slice belongs to Penalties[k].
type Path struct {
	// Family is the loss that was fitted.
	Family Family
	// Predictors lists the column indices of the predictors, in the
	// order used by coefficient positions.
	Predictors []int
	// Penalties is the penalty sequence actually fitted; it may be
	// shorter than requested when Status is not Completed.
	Penalties []float64
	// Intercept holds the intercept at each penalty (0 without one).
	Intercept []float64
	// Coefficients holds the non-zero coefficients at each penalty, on
	// the original scale of the predictors.
	Coefficients []Sparse
	// Explained holds the share of the null deviance explained.
	Explained []float64
	// Deviance holds the weighted deviance Σ w_i·Deviance(y_i, mu_i).
	Deviance []float64
	// NonZero holds the number of non-zero coefficients.
	NonZero []int
	// Sweeps holds the coordinate-descent sweeps used at each penalty
	// (Newton steps on the active set are not counted).
	Sweeps []int
	// NullDeviance is the deviance of the intercept-only model (of the
	// zero linear predictor when there is no intercept).
	NullDeviance float64
	// MaxPenalty is the smallest penalty at which every penalised
	// coefficient is zero.
	MaxPenalty float64
	// Excluded lists positions of predictors that never enter a model:
	// constant over the fitted rows, or given an infinite penalty factor.
	Excluded []int
	// Status says how the path ended.
	Status Status
	// Mode is the method used (GramMode or ResidualMode).
	Mode Mode
	// Rows is the number of rows fitted and Weight their total weight.
	Rows   int
	Weight float64
}

// Len returns the number of penalties fitted.
func (p *Path) Len() int { return len(p.Penalties) }

// CoefficientsTo writes the coefficients at penalty index k into dst,
// which must have length len(p.Predictors), and returns the intercept.
func (p *Path) CoefficientsTo(dst []float64, k int) float64 {
	if len(dst) != len(p.Predictors) {
		panic("lasso: destination length mismatch")
	}
	clear(dst)
	s := p.Coefficients[k]
	for t, j := range s.Index {
		dst[j] = s.Value[t]
	}
	return p.Intercept[k]
}

// Dense returns the intercept and the dense coefficient vector at penalty
// index k.
func (p *Path) Dense(k int) (float64, []float64) {
	b := make([]float64, len(p.Predictors))
	return p.CoefficientsTo(b, k), b
}

// At returns the intercept and dense coefficients at any penalty between
// the smallest and largest fitted, interpolating linearly in log penalty
// between neighbouring fits (exact at fitted penalties). Above the first
// penalty of an automatic path the first fit is returned, since every
// penalised coefficient is then zero. It returns an error for a penalty
// below the path's range or not positive.
func (p *Path) At(penalty float64) (float64, []float64, error) {
	n := len(p.Penalties)
	if n == 0 {
		return 0, nil, fmt.Errorf("%w: empty path", ErrPenalty)
	}
	if !(penalty > 0) {
		return 0, nil, fmt.Errorf("%w: penalty %g is not positive", ErrPenalty, penalty)
	}
	if penalty >= p.Penalties[0] {
		if penalty > p.Penalties[0] && p.Penalties[0] < p.MaxPenalty {
			return 0, nil, fmt.Errorf("%w: penalty %g above the path's first penalty %g", ErrPenalty, penalty, p.Penalties[0])
		}
		b0, b := p.Dense(0)
		return b0, b, nil
	}
	if penalty < p.Penalties[n-1] {
		return 0, nil, fmt.Errorf("%w: penalty %g below the path's last penalty %g", ErrPenalty, penalty, p.Penalties[n-1])
	}
	// Penalties decrease; find k with Penalties[k] >= penalty > Penalties[k+1].
	k := sort.Search(n, func(i int) bool { return p.Penalties[i] < penalty }) - 1
	b0, b := p.Dense(k)
	if p.Penalties[k] == penalty || k == n-1 {
		return b0, b, nil
	}
	c0, c := p.Dense(k + 1)
	t := math.Log(p.Penalties[k]/penalty) / math.Log(p.Penalties[k]/p.Penalties[k+1])
	for j := range b {
		b[j] += t * (c[j] - b[j])
	}
	return b0 + t*(c0-b0), b, nil
}

// LinearPredictorTo writes the linear predictor of the fit at penalty
// index k for the given rows (nil means every row) of cols into dst, which
// must have one entry per row. cols is indexed like the data that were
// fitted: column p.Predictors[j] holds predictor j.
func (p *Path) LinearPredictorTo(dst []float64, k int, cols [][]float64, rows []int) {
	b0 := p.Intercept[k]
	for i := range dst {
		dst[i] = b0
	}
	s := p.Coefficients[k]
	for t, j := range s.Index {
		col := cols[p.Predictors[j]]
		bj := s.Value[t]
		if rows == nil {
			for i := range dst {
				dst[i] += bj * col[i]
			}
		} else {
			for i, r := range rows {
				dst[i] += bj * col[r]
			}
		}
	}
}

// MeanTo writes the fitted mean (for example a probability) of the fit at
// penalty index k for the given rows of cols into dst.
func (p *Path) MeanTo(dst []float64, k int, cols [][]float64, rows []int) {
	p.LinearPredictorTo(dst, k, cols, rows)
	for i, e := range dst {
		dst[i] = p.Family.Mean(e)
	}
}
