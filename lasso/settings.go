package lasso

import "fmt"

// Mode chooses how a Gaussian path is computed. Other families always use
// residual updates inside their reweighting loop.
type Mode int

const (
	// AutoMode uses GramMode when the rows outnumber the predictors by a
	// wide margin and ResidualMode otherwise.
	AutoMode Mode = iota
	// GramMode works from the weighted cross-products of the predictors
	// and the response, formed once; after that pass the cost of each
	// coordinate update is independent of the number of rows.
	GramMode
	// ResidualMode keeps the residual vector and updates it after every
	// coefficient change; each update costs one pass over the rows.
	ResidualMode
)

// String returns the mode's name.
func (m Mode) String() string {
	switch m {
	case AutoMode:
		return "auto"
	case GramMode:
		return "gram"
	case ResidualMode:
		return "residual"
	}
	return fmt.Sprintf("Mode(%d)", int(m))
}

// Settings configures a path fit. The zero value, or a nil *Settings, gives
// the documented defaults. A Settings value is never modified by the
// package.
type Settings struct {
	// Family is the loss. Nil means Gaussian{}.
	Family Family `json:"-"`

	// Mixing is the share a of the L1 term in the penalty
	// λ·Σ v_j·(a|b_j| + (1−a)/2·b_j²); it must lie in (0, 1].
	// Zero means 1, the pure lasso.
	Mixing float64 `json:"mixing,omitempty"`

	// PenaltyScale holds one factor v_j ≥ 0 per predictor, in the order
	// of the predictors. A zero factor leaves that predictor unpenalised,
	// so it is in every model; an infinite one keeps it out of every
	// model (the path is that of the other predictors). Nil means every
	// factor is 1. Factors are used as given (they are not rescaled).
	PenaltyScale []float64 `json:"penalty_scale,omitempty"`

	// NoIntercept fits without an intercept (and so without centring the
	// predictors). The default fits an unpenalised intercept.
	NoIntercept bool `json:"no_intercept,omitempty"`

	// NoStandardize penalises the coefficients on the predictors' own
	// scales. By default each predictor is scaled internally to unit
	// weighted standard deviation, so the penalty treats predictors alike;
	// coefficients are always reported on the original scale.
	NoStandardize bool `json:"no_standardize,omitempty"`

	// Penalties is a caller-given penalty sequence: positive and strictly
	// decreasing. Nil means an automatic sequence.
	Penalties []float64 `json:"penalties,omitempty"`

	// NumPenalties is the length of the automatic sequence. Zero means 100.
	NumPenalties int `json:"num_penalties,omitempty"`

	// FloorRatio is the ratio of the smallest to the largest penalty of
	// the automatic sequence, in (0, 1). Zero means 1e-3 when the rows
	// outnumber the predictors and 1e-2 otherwise.
	FloorRatio float64 `json:"floor_ratio,omitempty"`

	// Tolerance sets how close each fit is to the optimum. Iteration at
	// a penalty stops when the Karush–Kuhn–Tucker residual of every
	// coordinate (the distance from zero to the subdifferential of the
	// objective along it, divided by the square root of its curvature,
	// on the standardised scale) is at most Tolerance times the square
	// root of the null deviance per unit weight, which for the Gaussian
	// family is the response's standard deviation; or when it is at the
	// level of rounding. The distance from the fit to the optimum is at
	// most about the residuals' norm over the smallest curvature of the
	// objective, so collinear predictors need a tight tolerance; Newton
	// steps on the active set make one cheap. For families other than
	// Gaussian the residual is that of the loss itself, not of a
	// reweighting step's quadratic model. Zero means 1e-7.
	Tolerance float64 `json:"tolerance,omitempty"`

	// MaxSweeps bounds the coordinate-descent sweeps spent on one
	// penalty. Zero means 100,000.
	MaxSweeps int `json:"max_sweeps,omitempty"`

	// MaxReweights bounds the outer reweighting iterations spent on one
	// penalty by families other than Gaussian. Zero means 100.
	MaxReweights int `json:"max_reweights,omitempty"`

	// SaturationLimit ends the path once the deviance explained reaches
	// it, as happens under perfect separation. Zero means 0.999.
	SaturationLimit float64 `json:"saturation_limit,omitempty"`

	// Mode chooses how Gaussian paths are computed. Zero means AutoMode.
	Mode Mode `json:"mode,omitempty"`
}

// resolved holds settings with defaults filled in.
type resolved struct {
	fam        Family
	gaussian   bool
	a          float64
	intercept  bool
	standard   bool
	penalties  []float64
	num        int
	floor      float64
	tol        float64
	maxSweeps  int
	maxReweigh int
	saturation float64
	mode       Mode
}

func resolve(s *Settings, n, p int) (resolved, error) {
	if s == nil {
		s = &Settings{}
	}
	r := resolved{
		fam:        s.Family,
		a:          s.Mixing,
		intercept:  !s.NoIntercept,
		standard:   !s.NoStandardize,
		num:        s.NumPenalties,
		floor:      s.FloorRatio,
		tol:        s.Tolerance,
		maxSweeps:  s.MaxSweeps,
		maxReweigh: s.MaxReweights,
		saturation: s.SaturationLimit,
		mode:       s.Mode,
	}
	if r.fam == nil {
		r.fam = Gaussian{}
	}
	_, r.gaussian = r.fam.(Gaussian)
	if r.a == 0 {
		r.a = 1
	}
	if !(r.a > 0 && r.a <= 1) {
		return r, fmt.Errorf("%w: Mixing %g outside (0, 1]", ErrSettings, s.Mixing)
	}
	if r.num == 0 {
		r.num = 100
	}
	if r.num < 0 {
		return r, fmt.Errorf("%w: NumPenalties %d is negative", ErrSettings, r.num)
	}
	if r.floor == 0 {
		r.floor = 1e-3
		if n <= p {
			r.floor = 1e-2
		}
	}
	if !(r.floor > 0 && r.floor < 1) {
		return r, fmt.Errorf("%w: FloorRatio %g outside (0, 1)", ErrSettings, s.FloorRatio)
	}
	if r.tol == 0 {
		r.tol = 1e-7
	}
	if !(r.tol > 0) {
		return r, fmt.Errorf("%w: Tolerance %g must be positive", ErrSettings, s.Tolerance)
	}
	if r.maxSweeps == 0 {
		r.maxSweeps = 100_000
	}
	if r.maxReweigh == 0 {
		r.maxReweigh = 100
	}
	if r.maxSweeps < 0 || r.maxReweigh < 0 {
		return r, fmt.Errorf("%w: negative iteration limit", ErrSettings)
	}
	if r.saturation == 0 {
		r.saturation = 0.999
	}
	if !(r.saturation > 0 && r.saturation <= 1) {
		return r, fmt.Errorf("%w: SaturationLimit %g outside (0, 1]", ErrSettings, s.SaturationLimit)
	}
	if r.mode < AutoMode || r.mode > ResidualMode {
		return r, fmt.Errorf("%w: unknown mode %d", ErrSettings, int(r.mode))
	}
	if s.Penalties != nil {
		if len(s.Penalties) == 0 {
			return r, fmt.Errorf("%w: empty penalty sequence", ErrPenalty)
		}
		for i, l := range s.Penalties {
			if !(l > 0) || l > maxFinite {
				return r, fmt.Errorf("%w: penalty %d is %g, want positive and finite", ErrPenalty, i, l)
			}
			if i > 0 && !(l < s.Penalties[i-1]) {
				return r, fmt.Errorf("%w: penalties must strictly decrease, but penalty %d (%g) follows %g", ErrPenalty, i, l, s.Penalties[i-1])
			}
		}
		r.penalties = s.Penalties
	}
	return r, nil
}

const maxFinite = 1.7976931348623157e308

// Validate returns the error Fit would return for these settings, as far
// as it can be known without data. A nil *Settings is valid.
func (s *Settings) Validate() error {
	_, err := resolve(s, 2, 1)
	return err
}
