package metrics

import "math"

// probabilityFloor keeps log-loss finite for predictions of exactly 0 or 1.
const probabilityFloor = 1e-15

// LogLoss returns the weighted mean negative log-likelihood of 0/1 labels
// under predicted probabilities p, each clipped to [1e-15, 1−1e-15].
func LogLoss(p, labels, weights []float64) (float64, error) {
	if err := check(p, labels, weights, true); err != nil {
		return math.NaN(), err
	}
	return weightedMean(p, labels, weights, func(q, y float64) float64 {
		q = math.Min(math.Max(q, probabilityFloor), 1-probabilityFloor)
		// A 0/1 label needs one of the two logarithms; the other term
		// is an exact zero (q is floored away from 0 and 1).
		switch y {
		case 1:
			return -math.Log(q)
		case 0:
			return -math.Log1p(-q)
		}
		return -(y*math.Log(q) + (1-y)*math.Log1p(-q))
	}), nil
}

// BinomialDeviance returns the weighted mean binomial unit deviance, twice
// LogLoss.
func BinomialDeviance(p, labels, weights []float64) (float64, error) {
	l, err := LogLoss(p, labels, weights)
	return 2 * l, err
}

// GaussianDeviance returns the weighted mean Gaussian unit deviance
// (y − ŷ)², which equals MSE.
func GaussianDeviance(pred, y, weights []float64) (float64, error) { return MSE(pred, y, weights) }

// MSE returns the weighted mean squared error.
func MSE(pred, y, weights []float64) (float64, error) {
	if err := check(pred, y, weights, false); err != nil {
		return math.NaN(), err
	}
	return weightedMean(pred, y, weights, func(q, y float64) float64 { return (y - q) * (y - q) }), nil
}

// MAE returns the weighted mean absolute error.
func MAE(pred, y, weights []float64) (float64, error) {
	if err := check(pred, y, weights, false); err != nil {
		return math.NaN(), err
	}
	return weightedMean(pred, y, weights, func(q, y float64) float64 { return math.Abs(y - q) }), nil
}

// Brier returns the weighted mean squared difference between predicted
// probabilities and 0/1 labels.
func Brier(p, labels, weights []float64) (float64, error) {
	if err := check(p, labels, weights, true); err != nil {
		return math.NaN(), err
	}
	return weightedMean(p, labels, weights, func(q, y float64) float64 { return (y - q) * (y - q) }), nil
}

// Misclassification returns the weighted share of labels on the wrong side
// of probability ½ (a probability of exactly ½ counts as predicting 1).
func Misclassification(p, labels, weights []float64) (float64, error) {
	if err := check(p, labels, weights, true); err != nil {
		return math.NaN(), err
	}
	return weightedMean(p, labels, weights, func(q, y float64) float64 {
		if (q >= 0.5) != (y == 1) {
			return 1
		}
		return 0
	}), nil
}

// RSquared returns 1 − Σw(y−ŷ)² / Σw(y−ȳ)², the share of variance
// explained, with ȳ the weighted mean of y. It is NaN (with an error) when
// y is constant.
func RSquared(pred, y, weights []float64) (float64, error) {
	if err := check(pred, y, weights, false); err != nil {
		return math.NaN(), err
	}
	var sw, sy float64
	for i, v := range y {
		w := weight(weights, i)
		sw += w
		sy += w * v
	}
	mean := sy / sw
	var rss, tss float64
	for i, v := range y {
		w := weight(weights, i)
		rss += w * (v - pred[i]) * (v - pred[i])
		tss += w * (v - mean) * (v - mean)
	}
	if tss == 0 {
		return math.NaN(), ErrConstant
	}
	return 1 - rss/tss, nil
}

func weightedMean(pred, y, weights []float64, f func(q, y float64) float64) float64 {
	var s, sw float64
	for i := range y {
		w := weight(weights, i)
		if w == 0 {
			continue
		}
		s += w * f(pred[i], y[i])
		sw += w
	}
	return s / sw
}
