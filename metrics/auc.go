package metrics

import (
	"fmt"
	"math"
	"sort"
)

// AUC returns the area under the ROC curve of scores for 0/1 labels, with
// optional weights (nil means ones): the probability that a random positive
// scores above a random negative, ties counting one half (the Mann–Whitney
// statistic). It costs O(n log n). It returns ErrOneClass when either class
// has zero weight.
func AUC(scores, labels, weights []float64) (float64, error) {
	if err := check(scores, labels, weights, true); err != nil {
		return math.NaN(), err
	}
	idx := sortedByScore(scores)
	var pos, neg, below, area float64
	for i := 0; i < len(idx); {
		// A run of tied scores.
		s := scores[idx[i]]
		var p, q float64
		for ; i < len(idx) && scores[idx[i]] == s; i++ {
			k := idx[i]
			if labels[k] == 1 {
				p += weight(weights, k)
			} else {
				q += weight(weights, k)
			}
		}
		area += p * (below + q/2)
		below += q
		pos += p
		neg += q
	}
	if pos == 0 || neg == 0 {
		return math.NaN(), fmt.Errorf("%w: %g positive and %g negative weight", ErrOneClass, pos, neg)
	}
	return area / (pos * neg), nil
}

// sortedByScore returns the indices of scores in increasing score order.
func sortedByScore(scores []float64) []int {
	idx := make([]int, len(scores))
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return scores[idx[a]] < scores[idx[b]] })
	return idx
}

// ROC returns the points of the ROC curve: for each distinct score taken as
// a threshold, from the highest down, the false- and true-positive rates of
// calling every score at or above it positive. The first point is (0, 0)
// with threshold +Inf; the last is (1, 1).
func ROC(scores, labels, weights []float64) (fpr, tpr, thresholds []float64, err error) {
	if err := check(scores, labels, weights, true); err != nil {
		return nil, nil, nil, err
	}
	idx := sortedByScore(scores)
	var pos, neg float64
	for i, y := range labels {
		if y == 1 {
			pos += weight(weights, i)
		} else {
			neg += weight(weights, i)
		}
	}
	if pos == 0 || neg == 0 {
		return nil, nil, nil, fmt.Errorf("%w: %g positive and %g negative weight", ErrOneClass, pos, neg)
	}
	fpr, tpr, thresholds = []float64{0}, []float64{0}, []float64{math.Inf(1)}
	var tp, fp float64
	for i := len(idx) - 1; i >= 0; {
		s := scores[idx[i]]
		for ; i >= 0 && scores[idx[i]] == s; i-- {
			k := idx[i]
			if labels[k] == 1 {
				tp += weight(weights, k)
			} else {
				fp += weight(weights, k)
			}
		}
		fpr = append(fpr, fp/neg)
		tpr = append(tpr, tp/pos)
		thresholds = append(thresholds, s)
	}
	return fpr, tpr, thresholds, nil
}

// HanleyMcNeilSE returns the standard error of an AUC estimate a from
// nPos positive and nNeg negative cases by the formula of Hanley & McNeil
// (1982), Radiology 143:29–36:
//
//	Q1 = a/(2−a),  Q2 = 2a²/(1+a)
//	SE² = [a(1−a) + (nPos−1)(Q1−a²) + (nNeg−1)(Q2−a²)] / (nPos·nNeg)
func HanleyMcNeilSE(a float64, nPos, nNeg int) float64 {
	q1 := a / (2 - a)
	q2 := 2 * a * a / (1 + a)
	np, nn := float64(nPos), float64(nNeg)
	v := (a*(1-a) + (np-1)*(q1-a*a) + (nn-1)*(q2-a*a)) / (np * nn)
	return math.Sqrt(math.Max(v, 0))
}
