package antecedent

import (
	"context"
	"fmt"
	"math"
	"slices"

	"github.com/antecedent-lab/antecedent/cv"
)

// Selection is how a node's parents are chosen from its cross-validated
// lasso path (stability selection, when on, replaces it).
type Selection int

const (
	// AdaptiveLasso, the default, is the adaptive lasso (Zou 2006, JASA
	// 101:1418–1429): a second cross-validated lasso on the predictors
	// that are non-zero at the first path's minimum-loss penalty, each
	// penalised in inverse proportion to the size of its first-stage
	// coefficient per standard deviation; the non-zero predictors at the
	// penalty chosen by Config.CV.Rule are the parents. The second
	// stage's cross-validation learns each fold's weights from that
	// fold's training rows alone, so that its curve judges the whole
	// procedure on rows it has not seen. On the validity
	// harness (bench/validity) it reports far fewer false parents than the
	// plain lasso at the same rule (see the README's defaults section).
	AdaptiveLasso Selection = iota
	// PenalisedLasso is the textbook procedure: the predictors that are
	// non-zero in the lasso fit at the penalty chosen by Config.CV.Rule.
	PenalisedLasso
	// RelaxedLasso (Meinshausen 2007, CSDA 52:374–393, with the
	// relaxation fully relaxed) takes each distinct set of predictors met
	// along the first path down to its minimum-loss penalty, refits it
	// without penalty on every training fold, and keeps the set whose
	// refit has the best cross-validated loss, or under a standard-error
	// rule (one-SE by default) the smallest set within that share of its
	// standard error (cv.Rule.Yardstick's, over the rows the node uses).
	RelaxedLasso
)

var selectionNames = []string{"adaptive", "lasso", "relaxed"}

// String returns the selection's name.
func (s Selection) String() string {
	if s >= 0 && int(s) < len(selectionNames) {
		return selectionNames[s]
	}
	return fmt.Sprintf("Selection(%d)", int(s))
}

// MarshalText implements encoding.TextMarshaler.
func (s Selection) MarshalText() ([]byte, error) { return []byte(s.String()), nil }

// UnmarshalText implements encoding.TextUnmarshaler.
func (s *Selection) UnmarshalText(b []byte) error {
	i := slices.Index(selectionNames, string(b))
	if i < 0 {
		return fmt.Errorf("antecedent: unknown selection %q (want adaptive, lasso or relaxed)", b)
	}
	*s = Selection(i)
	return nil
}

// adaptive runs the second stage of the adaptive lasso on node p after the
// first cross-validated path out. The full-data second stage weighs each
// predictor by its full-data first-stage coefficient; each fold's second
// stage by the coefficient of that fold's own first-stage path at the same
// penalty, so that the held-out rows take no part in the weights they are
// used to judge (a predictor that fold's first stage left at zero stays
// out of its second stage). Weights learnt on every row would favour, in
// every fold, the predictors that fit the held-out rows by chance.
func (r *run) adaptive(ctx context.Context, p *nodePlan, out cvOut) (cvOut, error) {
	_, b := out.res.Full.Dense(out.res.Best)
	k := len(out.res.FoldValues)
	fold := make([][]float64, k)
	for f := range fold {
		fp := out.res.FoldPath(f)
		_, fold[f] = fp.Dense(min(out.res.Best, fp.Len()-1))
	}
	factor := func(coef, sd float64) float64 {
		if size := math.Abs(coef) * sd; size > 0 {
			return 1 / size
		}
		return math.Inf(1)
	}
	var cols, owner []int
	var scale []float64
	foldScales := make([][]float64, k)
	entered := false
	for t, c := range out.cols {
		required := slices.Contains(p.required, out.owner[t])
		used := b[t] != 0
		entered = entered || (used && !required)
		for f := range fold {
			used = used || fold[f][t] != 0
		}
		if !required && !used {
			continue
		}
		cols, owner = append(cols, c), append(owner, out.owner[t])
		if required {
			scale = append(scale, 0)
			for f := range foldScales {
				foldScales[f] = append(foldScales[f], 0)
			}
			continue
		}
		sd := r.sd(c, out.rows)
		scale = append(scale, factor(b[t], sd))
		for f := range foldScales {
			foldScales[f] = append(foldScales[f], factor(fold[f][t], sd))
		}
	}
	if !entered {
		// Nothing entered the full-data first stage: the second stage
		// holds the required predictors alone, or there is none and the
		// first stage's empty model stands.
		var req, reqOwner []int
		for t, q := range owner {
			if scale[t] == 0 {
				req, reqOwner = append(req, cols[t]), append(reqOwner, q)
			}
		}
		if len(req) == 0 {
			return out, nil
		}
		return r.crossValidate(ctx, p, req, reqOwner, out.rows, make([]float64, len(req)), nil)
	}
	return r.crossValidate(ctx, p, cols, owner, out.rows, scale, foldScales)
}

// relaxed returns the variables of the relaxed lasso's choice for node p
// along its first path out.
func (r *run) relaxed(ctx context.Context, p *nodePlan, out cvOut) (map[int]bool, error) {
	full := out.res.Full
	var sets [][]int // design columns, in order of entry
	var means, ses []float64
	var foldLoss [][]float64 // by set, each fold's mean loss
	seen := map[string]bool{}
	for k := 0; k <= min(out.res.Best, full.Len()-1); k++ {
		var set []int
		for _, t := range full.Coefficients[k].Index {
			set = append(set, t)
		}
		for t, q := range out.owner {
			if slices.Contains(p.required, q) && !slices.Contains(set, t) {
				set = append(set, t)
			}
		}
		slices.Sort(set)
		key := fmt.Sprint(set)
		if seen[key] {
			continue
		}
		seen[key] = true
		cols := make([]int, len(set))
		for i, t := range set {
			cols[i] = out.cols[t]
		}
		m, se, fl, err := r.refitLoss(ctx, p, cols, out)
		if err != nil {
			return nil, err
		}
		sets, means, ses, foldLoss = append(sets, set), append(means, m), append(ses, se), append(foldLoss, fl)
	}
	best := 0
	for i := range means {
		if means[i] < means[best] {
			best = i
		}
	}
	pick := best // the first (smallest) set within the rule's standard errors
	rule := r.cfg.CV.Rule
	yardstick := rule.Yardstick(ses[best], cv.Deviance, p.family, float64(p.used()))
	for i := range means {
		allowed := rule.StandardErrors() * yardstick
		if rule.Paired() {
			// Pairs of fold values: the margin of their K−1 degrees of freedom.
			allowed = cv.StudentMargin(rule.StandardErrors(), len(foldLoss[i])-1) * pairSE(foldLoss[i], foldLoss[best])
		}
		if means[i] <= means[best]+allowed {
			pick = i
			break
		}
	}
	chosen := map[int]bool{}
	for _, t := range sets[pick] {
		chosen[out.owner[t]] = true
	}
	return chosen, nil
}

// pairSE returns the standard error of the mean of the fold-by-fold
// differences a − b (see cv.Point.PairSE).
func pairSE(a, b []float64) float64 {
	d := make([]float64, len(a))
	for f := range a {
		d[f] = a[f] - b[f]
	}
	_, se := meanSE(d)
	return se
}

// Explanation returns two sentences that say, in words a clinician can
// follow, how the procedure s chooses each variable's parents when the
// penalty is chosen by rule. The README and the report print them; an
// unknown selection gets a sentence saying so.
func (s Selection) Explanation(rule cv.Rule) string {
	penalty := "when the penalty is set, by cross-validation, to the one that predicts rows left out of the fit best"
	if rule.Paired() {
		penalty = "when the penalty is set, by cross-validation, to the strongest one whose predictions of rows left out of the fit are worse than the best penalty's by at most " + rule.Reach() + " between them"
	} else if within := rule.Reach(); within != "" {
		penalty = "when the penalty is set, by cross-validation, to the strongest one that predicts rows left out of the fit within " + within + " of the best"
	}
	switch s {
	case AdaptiveLasso:
		return "Each variable is predicted from the variables measured before it in two rounds of lasso regression: " +
			"the first measures how strongly each earlier variable is linked to it, and the second penalises weakly linked variables more " +
			"and strongly linked ones less, so that weak, spurious links drop out. " +
			"Its parents are the earlier variables still in the second model " + penalty + "."
	case PenalisedLasso:
		return "Each variable is predicted from the variables measured before it by one lasso regression, " +
			"which shrinks every link towards zero and drops the weakest entirely. " +
			"Its parents are the earlier variables still in the model " + penalty + "."
	case RelaxedLasso:
		best := "the set whose refit predicts rows left out of the fit best (cross-validation)"
		if rule.Paired() {
			best = "the smallest set whose refit predicts rows left out of the fit worse than the best set's by at most " + rule.Reach() + " between them (cross-validation)"
		} else if within := rule.Reach(); within != "" {
			best = "the smallest set whose refit predicts rows left out of the fit within " + within + " of the best set (cross-validation)"
		}
		return "Each variable is predicted from the variables measured before it by one lasso regression, " +
			"and each set of earlier variables that enters as the penalty weakens is refitted without penalty. " +
			"Its parents are the variables of " + best + "."
	}
	return fmt.Sprintf("%v is not a procedure this version knows.", s)
}

// SelectionExplanation returns the two sentences that say how the run
// configured by c chooses parents: stability selection's when it is on,
// otherwise those of c.Selection under c.CV.Rule (Selection.Explanation).
func (c *Config) SelectionExplanation() string {
	r, err := c.resolve()
	if err != nil && c != nil {
		r = *c
	}
	if r.Stability.Pairs > 0 {
		return fmt.Sprintf("Each variable is predicted from the variables measured before it by lasso regressions on %d pairs of complementary random halves of the rows, "+
			"each at the penalty chosen for that variable by cross-validation. "+
			"An earlier variable is a parent when it is chosen in at least %.0f%% of the halves.", r.Stability.Pairs, 100*r.Stability.Threshold)
	}
	return r.Selection.Explanation(r.CV.Rule)
}
