package refit

import (
	"context"
	"errors"
	"math"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/antecedent-lab/antecedent/lasso"
)

// z975 is the 97.5% point of the standard normal distribution.
const z975 = 1.959963984540054

// Fit is an unpenalised regression of a response on k predictors. Values
// that could not be estimated are NaN, and Warning says why.
type Fit struct {
	Intercept float64
	// Coef and SE hold each predictor's coefficient and standard error.
	Coef, SE []float64
	// Quantile is the critical value of two-sided 95% intervals
	// Coef ± Quantile·SE.
	Quantile float64
	// SD holds the population standard deviations of the predictors and,
	// last, of the response, over the rows used.
	SD []float64
	// NotEstimable says, for each predictor, why its effect was not
	// estimated ("" when it was): a level with too few rows, or a
	// predictor that separates a 0/1 response. Such predictors are left
	// out of the fit; their Coef and SE are NaN.
	NotEstimable []string
	// Warning is empty when all went well.
	Warning string
}

// Regress fits y on the columns x over rows (nil means every row): least
// squares when fam is lasso.Gaussian, maximum likelihood otherwise. It
// never modifies its inputs and returns an error only for inputs the
// moment accumulation refuses (such as mismatched lengths) or ctx.Err().
func Regress(ctx context.Context, fam lasso.Family, x [][]float64, y []float64, rows []int) (Fit, error) {
	_, binomial := fam.(lasso.Binomial)
	reasons := screen(x, y, rows, binomial)
	var keep []int
	for a, r := range reasons {
		if r == "" {
			keep = append(keep, a)
		}
	}
	if len(keep) == len(x) {
		f, err := regress(ctx, fam, x, y, rows)
		f.NotEstimable = reasons
		return f, err
	}
	sub := make([][]float64, len(keep))
	for t, a := range keep {
		sub[t] = x[a]
	}
	f, err := regress(ctx, fam, sub, y, rows)
	if err != nil {
		return Fit{}, err
	}
	// Spread the kept predictors' results back over all of them.
	full := Fit{Intercept: f.Intercept, Quantile: f.Quantile, Warning: f.Warning, NotEstimable: reasons,
		Coef: make([]float64, len(x)), SE: make([]float64, len(x)), SD: make([]float64, len(x)+1)}
	for a := range x {
		full.Coef[a], full.SE[a] = math.NaN(), math.NaN()
		full.SD[a] = spread(x[a], rows)
	}
	for t, a := range keep {
		full.Coef[a], full.SE[a], full.SD[a] = f.Coef[t], f.SE[t], f.SD[t]
	}
	full.SD[len(x)] = f.SD[len(keep)]
	return full, nil
}

// spread returns the population standard deviation of x over rows.
func spread(x []float64, rows []int) float64 {
	m := lasso.NewMoments(lasso.ColumnMeans([][]float64{x}, nil, rows))
	if err := m.Accumulate([][]float64{x}, nil, rows); err != nil {
		return math.NaN()
	}
	return math.Sqrt(math.Max(m.Covariance(0, 0), 0))
}

// regress is Regress on predictors that passed the screen.
func regress(ctx context.Context, fam lasso.Family, x [][]float64, y []float64, rows []int) (Fit, error) {
	k := len(x)
	n := len(y)
	if rows != nil {
		n = len(rows)
	}
	local := append(x[:k:k], y)
	m := lasso.NewMoments(lasso.ColumnMeans(local, nil, rows))
	if err := m.Accumulate(local, nil, rows); err != nil {
		return Fit{}, err
	}
	if _, ok := fam.(lasso.Gaussian); ok {
		return LeastSquares(m, n), nil
	}
	f := newFit(m)
	f.Intercept = fam.Link(m.Mean(k))
	if k > 0 {
		if err := f.fitGLM(ctx, fam, x, y, rows); err != nil {
			return Fit{}, err
		}
	}
	return f, nil
}

// newFit returns a fit of the moments' last variable on the others with
// the spreads filled in, no coefficient estimated and normal intervals.
func newFit(m *lasso.Moments) Fit {
	k := m.Vars - 1
	f := Fit{Coef: make([]float64, k), SE: make([]float64, k), SD: make([]float64, k+1), Quantile: z975}
	for t := range f.SD {
		f.SD[t] = math.Sqrt(math.Max(m.Covariance(t, t), 0))
	}
	for t := range f.SE {
		f.SE[t] = math.NaN()
	}
	return f
}

// LeastSquares fits the last variable of m on the others by least squares
// from the moments alone, for n rows (n sets the degrees of freedom of the
// standard errors and of the Student's t intervals, n − k − 1). Collinear
// predictors give NaN coefficients and a warning.
func LeastSquares(m *lasso.Moments, n int) Fit {
	k := m.Vars - 1
	f := newFit(m)
	f.Intercept = m.Mean(k)
	if k > 0 {
		f.leastSquares(m, n)
	}
	if n-k-1 > 0 {
		f.Quantile = distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(n - k - 1)}.Quantile(0.975)
	}
	return f
}

// leastSquares solves the normal equations from the moments m of the k
// predictors and the response (last), on the correlation scale.
func (f *Fit) leastSquares(m *lasso.Moments, n int) {
	k := len(f.Coef)
	scale := make([]float64, k)
	for a := range k {
		scale[a] = f.SD[a]
		if scale[a] == 0 {
			scale[a] = 1
		}
	}
	c := mat.NewSymDense(k, nil)
	rhs := mat.NewVecDense(k, nil)
	for a := range k {
		rhs.SetVec(a, m.Covariance(a, k)/scale[a])
		for b := a; b < k; b++ {
			c.SetSym(a, b, m.Covariance(a, b)/(scale[a]*scale[b]))
		}
	}
	var ch mat.Cholesky
	var b mat.VecDense
	ok := ch.Factorize(c)
	if ok {
		if err := ch.SolveVecTo(&b, rhs); err != nil {
			var cond mat.Condition
			ok = errors.As(err, &cond) && float64(cond) < 1e14
		}
	}
	if !ok {
		f.Warning = "parents are collinear; effects not estimated"
		for t := range f.Coef {
			f.Coef[t] = math.NaN()
		}
		f.Intercept = math.NaN()
		return
	}
	rss := m.Covariance(k, k)
	for a := range k {
		f.Coef[a] = b.AtVec(a) / scale[a]
		rss -= b.AtVec(a) * rhs.AtVec(a)
		f.Intercept -= f.Coef[a] * m.Mean(a)
	}
	df := float64(n - k - 1)
	if df <= 0 {
		return
	}
	sigma2 := math.Max(rss, 0) * m.Weight / df
	var inv mat.SymDense
	if err := ch.InverseTo(&inv); err == nil || isCondition(err) {
		for a := range k {
			f.SE[a] = math.Sqrt(sigma2*inv.At(a, a)/m.Weight) / scale[a]
		}
	}
}
