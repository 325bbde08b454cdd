package lasso

import (
	"fmt"
	"math"
)

// Family is a loss for the response: a generalised linear model family with
// its link. The solver owns the iteration; a family supplies evaluations
// only. Methods must not modify shared state and must be safe for
// concurrent use.
//
// The solver minimises, over the intercept b0 and coefficients b,
//
//	(1/W) Σ_i w_i · ½ Deviance(y_i, Mean(b0 + x_i·b)) + penalty
//
// using a sequence of weighted least-squares problems built from Working
// (iteratively reweighted least squares, a proximal Newton method).
type Family interface {
	// Name returns a short lower-case name such as "gaussian".
	Name() string

	// CheckResponse returns a non-nil error when y is not a valid
	// response value for the family.
	CheckResponse(y float64) error

	// Mean returns the mean response for the linear predictor eta (the
	// inverse link).
	Mean(eta float64) float64

	// Link returns the linear predictor for the mean mu. For an
	// intercept-only model the fitted mean is the weighted mean of the
	// response, so Link gives the null model's intercept.
	Link(mu float64) float64

	// Working returns the working weight h > 0 and the working residual
	// z − eta of the quadratic approximation of the loss at eta. For a
	// canonical link, h is the second derivative of ½·Deviance with
	// respect to eta and −h·(z−eta) its first derivative. The solver
	// takes −h·(z−eta) as that first derivative when it checks a fit's
	// optimality; the Fisher-scoring weight and residual of a
	// generalised linear model satisfy this for any link.
	Working(y, eta float64) (weight, residual float64)

	// Deviance returns the unit deviance of response y at mean mu,
	// 2·(loglik(y; y) − loglik(y; mu)).
	Deviance(y, mu float64) float64
}

// Gaussian is the squared-error loss with the identity link. The solver
// recognises it and solves each penalty exactly by coordinate descent,
// without an outer reweighting loop.
type Gaussian struct{}

// Binomial is the logistic loss for 0/1 responses with the logit link.
// Fitted probabilities are kept inside [ProbabilityBound, 1−ProbabilityBound]
// when forming working weights.
type Binomial struct{}

var (
	_ Family = Gaussian{}
	_ Family = Binomial{}
)

// ProbabilityBound is how close to 0 or 1 a fitted probability may come
// when the binomial family forms its working weights.
const ProbabilityBound = 1e-5

// Name returns "gaussian".
func (Gaussian) Name() string { return "gaussian" }

// CheckResponse accepts every finite value.
func (Gaussian) CheckResponse(y float64) error {
	if math.IsNaN(y) || math.IsInf(y, 0) {
		return ErrNotFinite
	}
	return nil
}

// Mean returns eta.
func (Gaussian) Mean(eta float64) float64 { return eta }

// Link returns mu.
func (Gaussian) Link(mu float64) float64 { return mu }

// Working returns weight 1 and residual y − eta.
func (Gaussian) Working(y, eta float64) (float64, float64) { return 1, y - eta }

// Deviance returns (y − mu)².
func (Gaussian) Deviance(y, mu float64) float64 { d := y - mu; return d * d }

// Name returns "binomial".
func (Binomial) Name() string { return "binomial" }

// CheckResponse accepts 0 and 1 only.
func (Binomial) CheckResponse(y float64) error {
	if y != 0 && y != 1 {
		return fmt.Errorf("%w: binomial response must be 0 or 1", ErrResponse)
	}
	return nil
}

// Mean returns the logistic function of eta.
func (Binomial) Mean(eta float64) float64 {
	if eta >= 0 {
		return 1 / (1 + math.Exp(-eta))
	}
	e := math.Exp(eta)
	return e / (1 + e)
}

// Link returns log(mu/(1−mu)).
func (Binomial) Link(mu float64) float64 { return math.Log(mu / (1 - mu)) }

// Working returns the weight h = mu(1−mu), with mu bounded away from 0 and 1
// by ProbabilityBound so that h never vanishes, and the residual (y−mu)/h
// with the unbounded mu, so that h·residual is the exact gradient and a
// converged fit is the exact optimum.
func (b Binomial) Working(y, eta float64) (float64, float64) {
	mu := b.Mean(eta)
	m := math.Min(math.Max(mu, ProbabilityBound), 1-ProbabilityBound)
	h := m * (1 - m)
	return h, (y - mu) / h
}

// Deviance returns −2·(y·log mu + (1−y)·log(1−mu)).
func (Binomial) Deviance(y, mu float64) float64 {
	var d float64
	if y > 0 {
		d -= y * math.Log(mu)
	}
	if y < 1 {
		d -= (1 - y) * math.Log1p(-mu)
	}
	return 2 * d
}

// binomialDevianceEta returns the binomial unit deviance at linear
// predictor eta without forming mu, stable for large |eta|.
func binomialDevianceEta(y, eta float64) float64 {
	// ½·dev = log(1+e^η) − y·η = log1p(e^−|η|) + max(η, 0) − y·η.
	pos := eta
	if pos < 0 {
		pos = 0
	}
	return 2 * (log1pUnit(expNonPositive(-math.Abs(eta))) + pos - y*eta)
}
