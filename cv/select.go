package cv

import (
	"fmt"
	"math"

	"github.com/antecedent-lab/antecedent/lasso"
	"gonum.org/v1/gonum/stat/distuv"
)

// Rule chooses a penalty from the cross-validation curve.
type Rule int

const (
	// DefaultRule, the zero value, leaves the choice to the caller's
	// default: in this package OneStandardError.
	DefaultRule Rule = iota
	// OneStandardError picks the largest penalty whose mean is within
	// one standard error of the best mean, the standard error taken at
	// the best penalty (Breiman, Friedman, Olshen & Stone 1984, CART,
	// sec. 3.4.3; Hastie, Tibshirani & Friedman, The Elements of
	// Statistical Learning, 2nd ed., sec. 7.10). It gives a sparser model
	// whose loss is statistically indistinguishable from the best, which
	// suits structure discovery, where a spurious edge costs more than a
	// slightly better prediction.
	OneStandardError
	// MinimumLoss picks the penalty with the best mean held-out measure
	// (the largest such penalty when several tie).
	MinimumLoss
	// HalfStandardError picks the largest penalty whose mean is within half
	// of the rule's standard error (Rule.Yardstick) of the best mean:
	// between the two rules above. It is not a published rule; it was the
	// adaptive lasso's default before QuarterStandardError.
	HalfStandardError
	// PairedDifference picks the largest penalty whose mean exceeds the
	// best mean by at most PairedMargin standard errors of that
	// difference, taken from paired differences (Point.PairSE): each
	// held-out row's loss at the penalty minus its loss at the best
	// penalty, whose spread is the noise of the comparison itself. The
	// standard error at the best penalty, which the rules above read,
	// measures how well the best mean is known, not how well two penalties
	// are told apart: it is large for a continuous response (squared errors
	// vary widely from row to row) and small for a 0/1 response whose
	// prevalence is near one half (every row's loss under a near-empty
	// model is then about the same); Rule.Yardstick's floor answers that for
	// the half- and quarter-SE rules, this rule by reading the comparison's
	// own noise. Under it binary nodes get no more false parents than
	// continuous ones at the same signal on the validity harness; it also
	// admits more candidates into continuous nodes, and at small samples
	// fewer into binary ones (figures in bench/README.md, section
	// Validity). Comparing models on the same held-out rows is common
	// practice; the margin is not a published rule.
	PairedDifference
	// QuarterStandardError picks the largest penalty whose mean is within
	// a quarter of the rule's standard error (Rule.Yardstick) of the best
	// mean. It is not a published rule: it is the default of the adaptive
	// lasso's second stage, whose penalty factors already do much of the
	// pruning the one-standard-error rule is there for, and its multiple
	// was chosen on the validity harness together with the yardstick's
	// floor for binary nodes, under which binary and continuous nodes of
	// the same signal get as many false parents and as high an F1 (figures
	// in bench/README.md, section Validity).
	QuarterStandardError
)

// PairedMargin is how many standard errors of the paired difference
// PairedDifference allows when the pairs are the held-out rows': 1.5,
// between 1 (many more false parents at no signal) and 2 (binary recall
// lost at 1,000 rows and fewer) on the validity harness. With the folds'
// pairs the margin is the Student t quantile of the same level
// (StudentMargin; Result.Margin holds the one used).
const PairedMargin = 1.5

// StandardErrors returns how many standard errors above the best mean
// rule r allows.
func (r Rule) StandardErrors() float64 {
	switch r {
	case OneStandardError:
		return 1
	case HalfStandardError:
		return 0.5
	case QuarterStandardError:
		return 0.25
	case PairedDifference:
		return PairedMargin
	}
	return 0
}

// Yardstick returns the standard error whose multiple rule r allows above
// the best mean (StandardErrors), given the best point's standard error se
// (Point.SE) over n held-out rows (their effective number), for measure m
// of a response of family fam. It is se, except that the package's own
// margins (HalfStandardError, QuarterStandardError) hold the deviance of a
// binomial response to at least DevianceSE(n).
//
// The reason is the size of se itself. A candidate with no effect lowers a
// node's deviance by chance about as much whatever its kind, by φ·χ²₁ over
// the rows, with dispersion φ = σ² for a Gaussian response and 1 for a
// binomial one. A Gaussian node's unit deviance is σ²·χ²₁ row by row, so
// its standard error is about √2·σ²/√n, in step with those chance gains;
// a binomial node's unit deviance varies far less from row to row (not at
// all for an empty model at prevalence ½), so a margin of its se is a
// narrower allowance for the same chance gain and lets chance candidates
// in that a continuous node of the same signal keeps out. DevianceSE is the
// Gaussian's standard error at unit dispersion: with it as the floor, both
// kinds are held to one yardstick (common practice: Var χ²₁ = 2). The
// published one-standard-error rule keeps its own standard error.
func (r Rule) Yardstick(se float64, m Measure, fam lasso.Family, n float64) float64 {
	if r != HalfStandardError && r != QuarterStandardError {
		return se
	}
	if m != Deviance && m != DefaultMeasure {
		return se
	}
	if _, ok := fam.(lasso.Binomial); !ok {
		return se
	}
	if f := DevianceSE(n); f > se || math.IsNaN(se) {
		return f
	}
	return se
}

// DevianceSE returns √(2/(n−1)), the standard error of the mean of n
// values that vary as a χ² variable on one degree of freedom (variance 2),
// with n − 1 as in Point.SE; NaN when n ≤ 1 or n is NaN.
func DevianceSE(n float64) float64 {
	if !(n > 1) {
		return math.NaN()
	}
	return math.Sqrt(2 / (n - 1))
}

// Paired reports whether rule r reads the standard error of the paired
// difference from the best point (Point.PairSE) rather than the standard
// error at the best point (Point.SE).
func (r Rule) Paired() bool { return r == PairedDifference }

// String returns the rule's short name.
func (r Rule) String() string {
	switch r {
	case DefaultRule:
		return "default"
	case MinimumLoss:
		return "minimum"
	case OneStandardError:
		return "one-se"
	case HalfStandardError:
		return "half-se"
	case QuarterStandardError:
		return "quarter-se"
	case PairedDifference:
		return "paired"
	}
	return fmt.Sprintf("Rule(%d)", int(r))
}

// Reach says in words how far from the best mean rule r reaches: "one
// standard error", "half a standard error", "a quarter of a standard
// error", that of the paired rule, or "" for the minimum (and an
// unresolved DefaultRule). Texts for readers compose from it.
func (r Rule) Reach() string {
	switch r {
	case OneStandardError:
		return "one standard error"
	case HalfStandardError:
		return "half a standard error"
	case QuarterStandardError:
		return "a quarter of a standard error"
	case PairedDifference:
		return "one and a half standard errors of the difference"
	}
	return ""
}

// Title is the rule's name in words: "one-standard-error rule",
// "half-standard-error rule" or "minimum-loss rule".
func (r Rule) Title() string {
	switch r {
	case OneStandardError:
		return "one-standard-error rule"
	case HalfStandardError:
		return "half-standard-error rule"
	case QuarterStandardError:
		return "quarter-standard-error rule"
	case PairedDifference:
		return "paired-difference rule"
	case MinimumLoss:
		return "minimum-loss rule"
	}
	return r.String()
}

// ParseRule returns the rule with the given short name.
func ParseRule(s string) (Rule, error) {
	switch s {
	case "default":
		return DefaultRule, nil
	case "minimum":
		return MinimumLoss, nil
	case "one-se":
		return OneStandardError, nil
	case "half-se":
		return HalfStandardError, nil
	case "quarter-se":
		return QuarterStandardError, nil
	case "paired":
		return PairedDifference, nil
	}
	return 0, fmt.Errorf("cv: unknown rule %q (want paired, one-se, half-se, quarter-se, minimum or default)", s)
}

// Point is one penalty of a cross-validation curve.
type Point struct {
	Penalty    float64 // the penalty λ
	LogPenalty float64 // −log λ, the usual horizontal axis
	Mean       float64 // mean held-out measure across folds
	// SE is the standard error of Mean: from the held-out rows' own
	// losses (their weighted SD over √(n−1)) when the measure is a mean of
	// per-row losses and the rows' predictions are formed (Fit), whatever
	// the fold scheme; otherwise (AUC, FitMoments) the SD of the fold
	// values (n−1) over √K.
	SE float64
	// PairSE is the standard error of Mean minus the best point's Mean,
	// from paired differences. When the measure is a mean of per-row
	// losses and the rows are at hand (Fit, and FitMoments given rows),
	// they are the held-out rows' own: each row's loss here minus its loss
	// at the best point, their weighted SD over √(n−1) as for SE, formed
	// for the penalties from the strongest to the best (the only ones the
	// rule reads) and left at 0 past the best. Otherwise (AUC, FitMoments
	// without rows) they are the folds': the SD (K−1) over the folds of
	// each fold's value here minus its value at the best point, over √K,
	// at every penalty. It is 0 at the best point. It is formed only under
	// PairedDifference (the rows' pairs cost a second pass over the
	// held-out predictions) and left at 0 otherwise.
	PairSE  float64
	NonZero int // non-zero coefficients of the full-data fit
}

// Choose returns the index of the best point and the index chosen by the
// one-standard-error rule, for a measure where larger is better when
// larger is true. NaN means are never chosen. It returns −1, −1 when every
// mean is NaN.
func Choose(curve []Point, larger bool) (best, oneSE int) {
	return chooseWithin(curve, larger, 1, false, math.NaN())
}

// chooseWithin returns the index of the best point and that of the first
// (largest) penalty whose mean is within m standard errors of the best:
// of se (Rule.Yardstick's; the best point's Point.SE when se is NaN), or
// with paired of the difference from it (Point.PairSE).
func chooseWithin(curve []Point, larger bool, m float64, paired bool, se float64) (best, within int) {
	best = -1
	for k, p := range curve {
		if math.IsNaN(p.Mean) {
			continue
		}
		if best < 0 || (larger && p.Mean > curve[best].Mean) || (!larger && p.Mean < curve[best].Mean) {
			best = k
		}
	}
	if best < 0 {
		return -1, -1
	}
	if paired {
		for k, p := range curve[:best+1] {
			d := p.Mean - curve[best].Mean
			if larger {
				d = -d
			}
			if d <= m*p.PairSE {
				return best, k
			}
		}
		return best, best
	}
	if math.IsNaN(se) {
		se = curve[best].SE
	}
	bound := curve[best].Mean + m*se
	if larger {
		bound = curve[best].Mean - m*se
	}
	for k, p := range curve[:best+1] {
		if (larger && p.Mean >= bound) || (!larger && p.Mean <= bound) {
			return best, k
		}
	}
	return best, best
}

// stopWindow is the number of penalties over which the mean held-out
// loss must have risen at every step before a path stops, and stopRise the
// least rise past the minimum, in standard errors of the minimum (see
// pastMinimum).
const (
	stopWindow = 10
	stopRise   = 0.3
)

// pastMinimum reports whether a cross-validated path whose mean held-out
// loss (lower is better) at the penalties fitted so far is mean, with
// standard errors se, may stop: the mean rose strictly at each of the last
// stopWindow penalties, and the last mean lies at least stopRise standard
// errors (of the minimum so far) above that minimum. The minimum then lies
// before the rising stretch, and the rule bets that the curve does not come
// back below it; in the U-shaped curves of sparse models the loss past the
// minimum rises as noise predictors enter. The least rise keeps nearly flat
// curves, whose rises and falls are noise, running to the end: without it
// the adaptive lasso's second stage moved its minimum on 11 of 1,280 node
// fits in bench/pathcut, and with a tenth of a standard error on 1; with
// 0.3 on none. It is a heuristic, checked rather than proved (figures
// in bench/README.md). A NaN never stops a path.
func pastMinimum(mean, se []float64) bool {
	k := len(mean)
	if k <= stopWindow {
		return false
	}
	for t := k - stopWindow; t < k; t++ {
		if !(mean[t] > mean[t-1]) {
			return false
		}
	}
	best := 0
	for t, m := range mean {
		if m < mean[best] {
			best = t
		}
	}
	return mean[k-1]-mean[best] >= stopRise*se[best]
}

// summarise fills mean and standard error per penalty from fold values
// loss[f][k]. The standard error comes from the held-out rows' own losses
// when rows holds their sums for every fold (see rowSums.se), and from the
// spread of the fold values otherwise.
func summarise(curve []Point, loss [][]float64, rows [][]rowSums) {
	k := float64(len(loss))
	perRow := len(rows) == len(loss)
	for _, r := range rows {
		perRow = perRow && r != nil
	}
	for j := range curve {
		var s float64
		for _, l := range loss {
			s += l[j]
		}
		m := s / k
		var ss float64
		for _, l := range loss {
			ss += (l[j] - m) * (l[j] - m)
		}
		curve[j].Mean = m
		curve[j].SE = math.Sqrt(ss/(k-1)) / math.Sqrt(k)
		if perRow {
			curve[j].SE = pooled(rows, j).se()
		}
	}
}

// StudentMargin returns the Student t quantile with df degrees of freedom
// at the one-sided level Φ(m) of a normal margin m: the margin that keeps
// m's level when the standard error is estimated from df+1 values.
func StudentMargin(m float64, df int) float64 {
	if df < 1 {
		return math.Inf(1)
	}
	return distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(df)}.Quantile(distuv.UnitNormal.CDF(m))
}

// pair sets PairSE of every point of curve from the fold values loss[f][k]
// (see Point.PairSE); larger says that larger is better.
func pair(curve []Point, loss [][]float64, larger bool) {
	best, _ := chooseWithin(curve, larger, 0, false, math.NaN())
	if best < 0 || len(loss) < 2 {
		for k := range curve {
			curve[k].PairSE = math.NaN()
		}
		return
	}
	k := float64(len(loss))
	for j := range curve {
		var s float64
		for _, l := range loss {
			s += l[j] - l[best]
		}
		m := s / k
		var ss float64
		for _, l := range loss {
			d := l[j] - l[best] - m
			ss += d * d
		}
		curve[j].PairSE = math.Sqrt(ss/(k-1)) / math.Sqrt(k)
	}
}

// rowSums accumulates weighted per-row losses: Σw·l, Σw·l², Σw and Σw².
type rowSums struct{ wl, wl2, w, w2 float64 }

// addRow adds loss l of row i, weighted by w[i] (1 when w is nil).
func (s *rowSums) addRow(w []float64, i int, l float64) {
	wi := 1.0
	if w != nil {
		wi = w[i]
	}
	s.wl += wi * l
	s.wl2 += wi * l * l
	s.w += wi
	s.w2 += wi * wi
}

// pooled returns the sums at penalty k of every fold's rows[f].
func pooled(rows [][]rowSums, k int) rowSums {
	var all rowSums
	for _, r := range rows {
		all.add(r[k])
	}
	return all
}

// effective returns the effective number of rows behind the sums, W²/Σw².
func (s rowSums) effective() float64 { return s.w * s.w / s.w2 }

func (s *rowSums) add(o rowSums) {
	s.wl += o.wl
	s.wl2 += o.wl2
	s.w += o.w
	s.w2 += o.w2
}

// se returns the standard error of the weighted mean loss, treating the
// rows as independent: the weighted standard deviation of the losses over
// the square root of the effective number of rows W²/Σw², less one. Unlike
// the spread of fold means, it does not shrink when folds are made alike
// (as stratified folds are), so the one-standard-error rule keeps its
// meaning under every fold scheme.
func (s rowSums) se() float64 {
	if s.w <= 0 {
		return math.NaN()
	}
	mean := s.wl / s.w
	v := math.Max(s.wl2/s.w-mean*mean, 0)
	neff := s.effective()
	if neff <= 1 {
		return math.NaN()
	}
	return math.Sqrt(v / (neff - 1))
}

// MarshalText implements encoding.TextMarshaler.
func (r Rule) MarshalText() ([]byte, error) { return []byte(r.String()), nil }

// UnmarshalText implements encoding.TextUnmarshaler.
func (r *Rule) UnmarshalText(b []byte) error {
	v, err := ParseRule(string(b))
	if err != nil {
		return err
	}
	*r = v
	return nil
}
