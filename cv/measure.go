package cv

import (
	"fmt"
	"math"

	"github.com/antecedent-lab/antecedent/lasso"
	"github.com/antecedent-lab/antecedent/metrics"
)

// Measure is the held-out loss used to compare penalties.
type Measure int

const (
	// DefaultMeasure means Deviance.
	DefaultMeasure Measure = iota
	// Deviance is the weighted mean unit deviance of the family: mean
	// squared error for Gaussian responses, twice the log-loss for
	// binomial ones.
	Deviance
	// MeanSquaredError of the fitted mean.
	MeanSquaredError
	// MeanAbsoluteError of the fitted mean.
	MeanAbsoluteError
	// AreaUnderCurve is the AUC of the fitted probabilities (binomial
	// only); larger is better.
	AreaUnderCurve
	// Misclassification is the share of 0/1 responses on the wrong side
	// of probability ½ (binomial only).
	Misclassification
)

var measureNames = map[Measure]string{
	DefaultMeasure:    "default",
	Deviance:          "deviance",
	MeanSquaredError:  "mse",
	MeanAbsoluteError: "mae",
	AreaUnderCurve:    "auc",
	Misclassification: "misclassification",
}

// String returns the measure's short name.
func (m Measure) String() string {
	if s, ok := measureNames[m]; ok {
		return s
	}
	return fmt.Sprintf("Measure(%d)", int(m))
}

// ParseMeasure returns the measure with the given short name.
func ParseMeasure(s string) (Measure, error) {
	for m, n := range measureNames {
		if n == s {
			return m, nil
		}
	}
	return 0, fmt.Errorf("cv: unknown measure %q (want deviance, mse, mae, auc or misclassification)", s)
}

// LargerIsBetter reports whether larger values of the measure are better.
func (m Measure) LargerIsBetter() bool { return m == AreaUnderCurve }

func (m Measure) resolve(fam lasso.Family) (Measure, error) {
	if m == DefaultMeasure {
		m = Deviance
	}
	if _, ok := measureNames[m]; !ok {
		return m, fmt.Errorf("%w: unknown measure %d", ErrMeasure, int(m))
	}
	if m == AreaUnderCurve || m == Misclassification {
		if _, ok := fam.(lasso.Binomial); !ok {
			return m, fmt.Errorf("%w: %v needs a binomial response, not %s", ErrMeasure, m, fam.Name())
		}
	}
	return m, nil
}

// evaluate returns the measure of means mu against y with weights w.
func evaluate(m Measure, fam lasso.Family, mu, y, w []float64) (float64, error) {
	switch m {
	case Deviance:
		switch fam.(type) {
		case lasso.Gaussian:
			return metrics.MSE(mu, y, w)
		case lasso.Binomial:
			return metrics.BinomialDeviance(mu, y, w)
		}
		var s, sw float64
		for i, v := range y {
			wi := 1.0
			if w != nil {
				wi = w[i]
			}
			s += wi * fam.Deviance(v, mu[i])
			sw += wi
		}
		if d := s / sw; !math.IsNaN(d) {
			return d, nil
		}
		return math.Inf(1), nil
	case MeanSquaredError:
		return metrics.MSE(mu, y, w)
	case MeanAbsoluteError:
		return metrics.MAE(mu, y, w)
	case AreaUnderCurve:
		return metrics.AUC(mu, y, w)
	case Misclassification:
		return metrics.Misclassification(mu, y, w)
	}
	return math.NaN(), fmt.Errorf("%w: %v", ErrMeasure, m)
}

// perRow reports whether the measure is a weighted mean of per-row
// losses (AUC is not).
func (m Measure) perRow() bool { return m != AreaUnderCurve }

// sumRows returns the sums of the per-row losses behind evaluate's mean:
// the unit deviance for Deviance, (y − μ)², |y − μ| and the 0/1 error.
func sumRows(m Measure, fam lasso.Family, mu, y, w []float64) rowSums {
	var s rowSums
	for i, v := range y {
		l := m.rowLoss(fam, v, mu[i])
		if math.IsInf(l, 0) || math.IsNaN(l) {
			continue // a prediction of exactly 0 or 1 that was wrong
		}
		s.addRow(w, i, l)
	}
	return s
}

// rowLoss returns the loss of one row with response v and fitted mean mu
// under a per-row measure.
func (m Measure) rowLoss(fam lasso.Family, v, mu float64) float64 {
	switch m {
	case Deviance:
		return fam.Deviance(v, mu)
	case MeanSquaredError:
		return (v - mu) * (v - mu)
	case MeanAbsoluteError:
		return math.Abs(v - mu)
	case Misclassification:
		if (mu >= 0.5) != (v == 1) {
			return 1
		}
	}
	return 0
}

// MarshalText implements encoding.TextMarshaler.
func (m Measure) MarshalText() ([]byte, error) { return []byte(m.String()), nil }

// UnmarshalText implements encoding.TextUnmarshaler.
func (m *Measure) UnmarshalText(b []byte) error {
	v, err := ParseMeasure(string(b))
	if err != nil {
		return err
	}
	*m = v
	return nil
}
