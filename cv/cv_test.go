package cv_test

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"reflect"
	"slices"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/internal/opendata"
	"github.com/antecedent-lab/antecedent/lasso"
	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/distuv"
)

type cvReference struct {
	Tool      string      `json:"tool"`
	Folds     []int       `json:"folds"`
	Penalties []float64   `json:"penalties"`
	MSEPath   [][]float64 `json:"mse_path"`
	Alpha     float64     `json:"alpha"`
}

// TestAgainstLassoCV compares the cross-validated mean-squared-error curve
// with scikit-learn's LassoCV (mse_path_) on the diabetes data of Efron,
// Hastie, Johnstone & Tibshirani (2004) with identical fold ids and penalty
// grid (testdata/reference/cv_reference.py); issue requirement 1e-6. The
// minimum rule must choose LassoCV's alpha_.
func TestAgainstLassoCV(t *testing.T) {
	var ref cvReference
	if err := opendata.ReadJSON("reference/cv.json", &ref); err != nil {
		t.Fatal(err)
	}
	tab, err := opendata.ReadCSV("diabetes.csv")
	if err != nil {
		t.Fatal(err)
	}
	x := opendata.UnitNorm(tab.Columns[:10])
	y := tab.Columns[10]
	folds, err := cv.Given(ref.Folds)
	if err != nil {
		t.Fatal(err)
	}
	s := &cv.Settings{Path: lasso.Settings{NoStandardize: true, Penalties: ref.Penalties, Tolerance: 1e-22}}
	check := func(name string, r *cv.Result) {
		worst := 0.0
		for k, p := range r.Curve {
			for f := range folds.K {
				worst = math.Max(worst, math.Abs(r.FoldValues[f][k]-ref.MSEPath[k][f]))
			}
			var mean float64
			for _, v := range ref.MSEPath[k] {
				mean += v / float64(folds.K)
			}
			worst = math.Max(worst, math.Abs(p.Mean-mean))
		}
		if worst > 1e-6 {
			t.Errorf("%s: largest difference from mse_path_ %g (%s)", name, worst, ref.Tool)
		}
		if got := r.Curve[r.Best].Penalty; got != ref.Alpha {
			t.Errorf("%s: minimum at %g, LassoCV alpha_ %g", name, got, ref.Alpha)
		}
		t.Logf("%s: largest difference from mse_path_ %.2g", name, worst)
	}
	for _, mode := range []lasso.Mode{lasso.GramMode, lasso.ResidualMode} {
		s.Path.Mode = mode
		r, err := cv.Fit(context.Background(), lasso.Data{Columns: x, Response: y}, folds, s)
		if err != nil {
			t.Fatal(err)
		}
		check(mode.String(), r)
	}
	// The same from moments alone.
	total, held := foldMoments(t, x, y, folds)
	r, err := cv.FitMoments(context.Background(), total, held, nil, 10, []int{0, 1, 2, 3, 4, 5, 6, 7, 8, 9}, s)
	if err != nil {
		t.Fatal(err)
	}
	check("moments", r)
}

// TestChoose works the one-standard-error rule by hand (common practice):
// means 5.0 4.2 3.9 3.7 3.8 with SE 0.3 at the minimum (index 3) give the
// bound 4.0, and the largest penalty (smallest index) with mean ≤ 4.0 is
// index 2.
func TestChoose(t *testing.T) {
	curve := []cv.Point{{Mean: 5.0, SE: 0.2}, {Mean: 4.2, SE: 0.2}, {Mean: 3.9, SE: 0.25}, {Mean: 3.7, SE: 0.3}, {Mean: 3.8, SE: 0.3}}
	if best, one := cv.Choose(curve, false); best != 3 || one != 2 {
		t.Errorf("loss: best %d one-SE %d, want 3 and 2", best, one)
	}
	// AUC-like: larger is better. Means 0.60 0.71 0.74 0.75 0.73, SE 0.02
	// at the best (index 3): bound 0.73, first index reaching it is 2.
	auc := []cv.Point{{Mean: 0.60}, {Mean: 0.71}, {Mean: 0.74}, {Mean: 0.75, SE: 0.02}, {Mean: 0.73}}
	if best, one := cv.Choose(auc, true); best != 3 || one != 2 {
		t.Errorf("AUC: best %d one-SE %d, want 3 and 2", best, one)
	}
	// Ties go to the larger penalty; NaN never wins.
	tie := []cv.Point{{Mean: math.NaN()}, {Mean: 2}, {Mean: 2}}
	if best, one := cv.Choose(tie, false); best != 1 || one != 1 {
		t.Errorf("tie: best %d one-SE %d, want 1 and 1", best, one)
	}
}

func TestFoldInvariants(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := range 50 {
		n := 20 + rng.IntN(500)
		k := 2 + rng.IntN(9)
		labels := make([]float64, n)
		ones := 0
		for i := range labels {
			if rng.Float64() < 0.1+0.8*rng.Float64() {
				labels[i] = 1
				ones++
			}
		}
		seed := rng.Uint64()
		r, err := cv.Random(n, k, seed)
		if err != nil {
			t.Fatal(err)
		}
		sizes := count(r.ID, k, nil)
		if spread(sizes) > 1 {
			t.Errorf("trial %d random fold sizes %v", trial, sizes)
		}
		again, _ := cv.Random(n, k, seed)
		if !reflect.DeepEqual(r, again) {
			t.Errorf("trial %d: same seed, different folds", trial)
		}
		s, err := cv.Stratified(labels, k, seed)
		if err != nil {
			t.Fatal(err)
		}
		pos := count(s.ID, k, func(i int) bool { return labels[i] == 1 })
		neg := count(s.ID, k, func(i int) bool { return labels[i] == 0 })
		all := count(s.ID, k, nil)
		if spread(pos) > 1 || spread(neg) > 1 || spread(all) > 1 {
			t.Errorf("trial %d stratified ones %v zeros %v sizes %v", trial, pos, neg, all)
		}
		groups := make([]string, n)
		for i := range groups {
			groups[i] = string(rune('A' + rng.IntN(26)))
		}
		g, err := cv.Grouped(groups, k, seed)
		if err != nil {
			if errors.Is(err, cv.ErrFolds) {
				continue
			}
			t.Fatal(err)
		}
		foldOf := map[string]int{}
		for i, name := range groups {
			if f, ok := foldOf[name]; ok && f != g.ID[i] {
				t.Fatalf("trial %d: group %s split across folds %d and %d", trial, name, f, g.ID[i])
			}
			foldOf[name] = g.ID[i]
		}
		for f, c := range count(g.ID, k, nil) {
			if c == 0 {
				t.Errorf("trial %d: grouped fold %d empty", trial, f)
			}
		}
	}
}

func count(ids []int, k int, keep func(int) bool) []int {
	c := make([]int, k)
	for i, f := range ids {
		if keep == nil || keep(i) {
			c[f]++
		}
	}
	return c
}

func spread(c []int) int {
	lo, hi := c[0], c[0]
	for _, v := range c {
		lo, hi = min(lo, v), max(hi, v)
	}
	return hi - lo
}

func binaryProblem(n, p int, seed uint64) ([][]float64, []float64) {
	rng := rand.New(rand.NewPCG(seed, 3))
	x := make([][]float64, p)
	for j := range x {
		x[j] = make([]float64, n)
		for i := range x[j] {
			x[j][i] = rng.NormFloat64()
		}
	}
	y := make([]float64, n)
	for i := range y {
		eta := x[0][i] - 0.7*x[1][i] + 0.4*x[2][i]
		if rng.Float64() < 1/(1+math.Exp(-eta)) {
			y[i] = 1
		}
	}
	return x, y
}

// TestWorkersDoNotMatter checks identical output for 1, 2 and 8 workers.
func TestWorkersDoNotMatter(t *testing.T) {
	x, y := binaryProblem(400, 8, 5)
	folds, err := cv.Stratified(y, 5, 11)
	if err != nil {
		t.Fatal(err)
	}
	var first *cv.Result
	for _, w := range []int{1, 2, 8} {
		r, err := cv.Fit(context.Background(), lasso.Data{Columns: x, Response: y}, folds,
			&cv.Settings{Path: lasso.Settings{Family: lasso.Binomial{}, NumPenalties: 30}, Measure: cv.AreaUnderCurve, Rule: cv.OneStandardError, Workers: w})
		if err != nil {
			t.Fatal(err)
		}
		if first == nil {
			first = r
			continue
		}
		if !reflect.DeepEqual(first.Curve, r.Curve) || !reflect.DeepEqual(first.FoldValues, r.FoldValues) || first.Selected != r.Selected {
			t.Errorf("%d workers changed the result", w)
		}
	}
	// The one-SE choice is never a smaller penalty than the best.
	if first.OneSE > first.Best {
		t.Errorf("one-SE index %d after best %d", first.OneSE, first.Best)
	}
	// The selected model keeps the strong predictors.
	_, b := first.Model()
	if b[0] == 0 || b[1] == 0 {
		t.Errorf("selected model %v misses a strong predictor", b)
	}
}

func TestErrors(t *testing.T) {
	x, y := binaryProblem(40, 3, 1)
	d := lasso.Data{Columns: x, Response: y}
	bin := lasso.Settings{Family: lasso.Binomial{}}
	allOnesInFold := make([]int, 40)
	for i := range allOnesInFold {
		if y[i] == 1 {
			allOnesInFold[i] = 1
		}
	}
	cases := []struct {
		name     string
		run      func() error
		want     error
		contains string
	}{
		{"more folds than rows", func() error { _, err := cv.Random(5, 6, 1); return err }, cv.ErrFolds, "6 folds for 5 rows"},
		{"one fold", func() error { _, err := cv.Random(5, 1, 1); return err }, cv.ErrFolds, "at least 2"},
		{"stratified bad label", func() error { _, err := cv.Stratified([]float64{0, 1, 2}, 2, 1); return err }, cv.ErrFolds, "row 2"},
		{"grouped too few groups", func() error { _, err := cv.Grouped([]string{"a", "a", "b"}, 3, 1); return err }, cv.ErrFolds, "2 groups"},
		{"given empty fold", func() error { _, err := cv.Given([]int{0, 2, 2}); return err }, cv.ErrFolds, "fold 1"},
		{"fold length", func() error {
			f, _ := cv.Random(10, 2, 1)
			_, err := cv.Fit(context.Background(), d, f, nil)
			return err
		}, cv.ErrLength, "10 fold ids for 40 rows"},
		{"AUC fold one class", func() error {
			f, _ := cv.Given(allOnesInFold)
			_, err := cv.Fit(context.Background(), d, f, &cv.Settings{Path: bin, Measure: cv.AreaUnderCurve})
			return err
		}, cv.ErrFoldClasses, "fold 0 has 0 positive"},
		{"AUC for Gaussian", func() error {
			f, _ := cv.Random(40, 4, 1)
			_, err := cv.Fit(context.Background(), d, f, &cv.Settings{Measure: cv.AreaUnderCurve})
			return err
		}, cv.ErrMeasure, "binomial"},
		{"fold with no rows among the subset", func() error {
			f, _ := cv.Random(40, 4, 1)
			sub := d
			train, _ := f.Split(0, nil)
			sub.Rows = train
			_, err := cv.Fit(context.Background(), sub, f, nil)
			return err
		}, cv.ErrFolds, "no rows"},
	}
	for _, c := range cases {
		err := c.run()
		if !errors.Is(err, c.want) || !strings.Contains(err.Error(), c.contains) {
			t.Errorf("%s: error %v, want %v mentioning %q", c.name, err, c.want, c.contains)
		}
	}
}

func TestCancel(t *testing.T) {
	x, y := binaryProblem(200, 5, 2)
	f, _ := cv.Random(200, 5, 1)
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	_, err := cv.Fit(ctx, lasso.Data{Columns: x, Response: y}, f, nil)
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("error %v", err)
	}
}

// TestStandardErrorFoldScheme checks that the standard error behind the
// one-standard-error rule does not collapse when folds are stratified. On a
// binary response with weak signal, stratified folds make the fold means
// of held-out deviance nearly equal (their spread falls by an order of
// magnitude against random folds), which made the rule admit spurious
// predictors. The standard error now comes from the rows' own losses, so
// the two schemes give standard errors of the same size; and with random
// folds it agrees with the spread of the fold means, its usual estimate
// (common practice: the SD of K fold means over √K estimates the same
// quantity as the SD of n row losses over √n).
func TestStandardErrorFoldScheme(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	n, p := 3000, 10
	x := make([][]float64, p)
	for j := range x {
		x[j] = make([]float64, n)
		for i := range n {
			x[j][i] = rng.NormFloat64()
		}
	}
	y := make([]float64, n)
	for i := range n {
		if rng.Float64() < 1/(1+math.Exp(-(-1+0.15*x[0][i]))) {
			y[i] = 1
		}
	}
	d := lasso.Data{Columns: x, Response: y}
	// The whole path: the check reads the standard error at its end.
	s := &cv.Settings{Path: lasso.Settings{Family: lasso.Binomial{}, NumPenalties: 30}, WholePath: true}
	strat, err := cv.Stratified(y, 10, 3)
	if err != nil {
		t.Fatal(err)
	}
	random, err := cv.Random(n, 10, 3)
	if err != nil {
		t.Fatal(err)
	}
	rs, err := cv.Fit(context.Background(), d, strat, s)
	if err != nil {
		t.Fatal(err)
	}
	rr, err := cv.Fit(context.Background(), d, random, s)
	if err != nil {
		t.Fatal(err)
	}
	for _, k := range []int{0, 10, 29} {
		ratio := rs.Curve[k].SE / rr.Curve[k].SE
		if ratio < 0.8 || ratio > 1.25 {
			t.Errorf("penalty %d: stratified SE %.4g, random SE %.4g (ratio %.2f)", k, rs.Curve[k].SE, rr.Curve[k].SE, ratio)
		}
		spread := foldSpread(rr.FoldValues, k)
		if r := rr.Curve[k].SE / spread; r < 0.5 || r > 2 {
			t.Errorf("penalty %d: row SE %.4g against fold-mean SE %.4g with random folds", k, rr.Curve[k].SE, spread)
		}
	}
}

// foldSpread returns the SD of the fold values at penalty k over √K.
func foldSpread(v [][]float64, k int) float64 {
	var s, ss float64
	for _, f := range v {
		s += f[k]
	}
	m := s / float64(len(v))
	for _, f := range v {
		ss += (f[k] - m) * (f[k] - m)
	}
	return math.Sqrt(ss/float64(len(v)-1)) / math.Sqrt(float64(len(v)))
}

// TestRules checks each rule's choice on the diabetes data (Efron et al.
// 2004, as above) against its definition worked from the returned curve:
// the largest penalty whose mean is within m standard errors of the best,
// m = 1, ½ and 0; and that the three nest (one-SE ≤ half-SE ≤ best).
func TestRules(t *testing.T) {
	x, y, folds := diabetesFolds(t)
	chosen := map[cv.Rule]int{}
	for _, tc := range []struct {
		rule cv.Rule
		name string
		m    float64
	}{{cv.OneStandardError, "one-se", 1}, {cv.HalfStandardError, "half-se", 0.5}, {cv.QuarterStandardError, "quarter-se", 0.25}, {cv.MinimumLoss, "minimum", 0}} {
		if got, err := cv.ParseRule(tc.name); err != nil || got != tc.rule || tc.rule.String() != tc.name {
			t.Errorf("ParseRule(%q) = %v, %v; String %q", tc.name, got, err, tc.rule.String())
		}
		if !strings.HasSuffix(tc.rule.Title(), " rule") || (tc.rule.Reach() == "") != (tc.m == 0) {
			t.Errorf("%s: title %q, reach %q", tc.name, tc.rule.Title(), tc.rule.Reach())
		}
		r, err := cv.Fit(context.Background(), lasso.Data{Columns: x, Response: y}, folds, &cv.Settings{Rule: tc.rule, WholePath: true})
		if err != nil {
			t.Fatal(err)
		}
		bound := r.Curve[r.Best].Mean + tc.m*r.Curve[r.Best].SE
		want := slices.IndexFunc(r.Curve, func(p cv.Point) bool { return p.Mean <= bound })
		if r.Selected != want {
			t.Errorf("%s: selected %d, want %d (bound %g)", tc.name, r.Selected, want, bound)
		}
		if r.RuleSE != r.Curve[r.Best].SE {
			t.Errorf("%s: the rule read a standard error of %g, want the best point's %g (a Gaussian node's is not floored)", tc.name, r.RuleSE, r.Curve[r.Best].SE)
		}
		chosen[tc.rule] = r.Selected
	}
	if !(chosen[cv.OneStandardError] <= chosen[cv.HalfStandardError] && chosen[cv.HalfStandardError] <= chosen[cv.QuarterStandardError] &&
		chosen[cv.QuarterStandardError] <= chosen[cv.MinimumLoss]) ||
		chosen[cv.OneStandardError] == chosen[cv.MinimumLoss] {
		t.Errorf("choices %v do not nest, or the curve is too flat to tell the rules apart", chosen)
	}
	if _, err := cv.ParseRule("1se"); err == nil {
		t.Error("ParseRule accepted 1se")
	}
}

// TestPairedDifference checks the paired-difference rule on the diabetes
// data (Efron et al. 2004, as above), fitted from moments without the rows
// behind them, against its definition worked from the returned curve and
// fold values: PairSE is the SD (K−1) over the folds
// of each fold's loss minus its loss at the best penalty, over √K (common
// practice for a paired comparison), and the choice is the largest penalty
// whose mean exceeds the best by at most PairedMargin of them. Under
// random folds whose losses move together, the paired standard error is
// far below the one at the best point, so the rule reaches less far than
// the one-SE rule with the same multiple would.
func TestPairedDifference(t *testing.T) {
	x, y, folds := diabetesFolds(t)
	if got, err := cv.ParseRule("paired"); err != nil || got != cv.PairedDifference || got.String() != "paired" || !got.Paired() || cv.OneStandardError.Paired() {
		t.Errorf("ParseRule(paired) = %v, %v", got, err)
	}
	total, held := foldMoments(t, x, y, folds)
	r, err := cv.FitMoments(context.Background(), total, held, nil, 10, []int{0, 1, 2, 3, 4, 5, 6, 7, 8, 9}, &cv.Settings{Rule: cv.PairedDifference})
	if err != nil {
		t.Fatal(err)
	}
	k := float64(len(r.FoldValues))
	want := -1
	for j, p := range r.Curve {
		d := make([]float64, len(r.FoldValues))
		for f, v := range r.FoldValues {
			d[f] = v[j] - v[r.Best]
		}
		se := stat.StdDev(d, nil) / math.Sqrt(k)
		if math.Abs(p.PairSE-se) > 1e-12*(1+se) {
			t.Fatalf("point %d: PairSE %g, want %g", j, p.PairSE, se)
		}
		if want < 0 && j <= r.Best && p.Mean-r.Curve[r.Best].Mean <= r.Margin*se {
			want = j
		}
	}
	if r.Selected != want || r.Curve[r.Best].PairSE != 0 {
		t.Errorf("selected %d, want %d; PairSE at the best %g", r.Selected, want, r.Curve[r.Best].PairSE)
	}
	// The fold pairs' standard error rests on 9 degrees of freedom: the
	// margin is the t quantile at the normal margin's level: 1.64868 by
	// scipy 1.10.1 (python3 -c "from scipy.stats import t, norm;
	// print(t.ppf(norm.cdf(1.5), 9))"), and by gonum's t distribution.
	if lvl := (distuv.StudentsT{Mu: 0, Sigma: 1, Nu: 9}).CDF(r.Margin); math.Abs(lvl-distuv.UnitNormal.CDF(cv.PairedMargin)) > 1e-9 || math.Abs(r.Margin-1.6486804351256144) > 1e-9 {
		t.Errorf("margin %g at level %g, want the t quantile of level Φ(%g)", r.Margin, lvl, cv.PairedMargin)
	}
	one := slices.IndexFunc(r.Curve, func(p cv.Point) bool { return p.Mean <= r.Curve[r.Best].Mean+r.Margin*r.Curve[r.Best].SE })
	if !(one < r.Selected) {
		t.Errorf("paired rule chose %d, the best point's SE with the same multiple %d: want the paired rule nearer the best", r.Selected, one)
	}
}

// TestBinomialYardstick checks the standard error the rules read for a
// binomial deviance (cv.Rule.Yardstick): the one-SE rule reads the best
// point's own; the half- and quarter-SE rules at least √(2/(n−1)), the
// standard error of a mean of n values with the variance of χ²₁ (common
// practice: Var χ²₁ = 2), n the rows held out in turn; and each rule
// chooses the strongest penalty within its multiple of that standard error
// of the best mean, worked from the returned curve. On the breast cancer
// data (Wolberg et al.; scikit-learn's copy: 0/1 benign from the first ten
// features) and on the diabetes data (Efron et al. 2004: the 0/1 sex from
// the other nine variables, a weak signal, where every row's deviance is
// about the same). On both the floor binds: a binomial deviance rarely
// spreads as widely as χ²₁ (for an empty model its SD is at most about 1.33
// against √2), so cv.TestYardstick checks the case where it does not.
func TestBinomialYardstick(t *testing.T) {
	cancer, err := opendata.ReadCSV("breast_cancer.csv")
	if err != nil {
		t.Fatal(err)
	}
	dx, _, _ := diabetesFolds(t)
	sex := make([]float64, len(dx[1]))
	for i, v := range dx[1] {
		if v > 0 {
			sex[i] = 1
		}
	}
	others := append(append([][]float64{}, dx[:1]...), dx[2:]...)
	for _, tc := range []struct {
		name string
		x    [][]float64
		y    []float64
	}{
		{"breast cancer", opendata.UnitNorm(cancer.Columns[:10]), cancer.Column("benign")},
		{"diabetes, sex", others, sex},
	} {
		folds, err := cv.Stratified(tc.y, 10, 7)
		if err != nil {
			t.Fatal(err)
		}
		floor := math.Sqrt(2 / float64(len(tc.y)-1))
		for _, rc := range []struct {
			rule    cv.Rule
			m       float64
			floored bool
		}{{cv.OneStandardError, 1, false}, {cv.HalfStandardError, 0.5, true}, {cv.QuarterStandardError, 0.25, true}} {
			r, err := cv.Fit(context.Background(), lasso.Data{Columns: tc.x, Response: tc.y}, folds,
				&cv.Settings{Path: lasso.Settings{Family: lasso.Binomial{}}, Rule: rc.rule, WholePath: true})
			if err != nil {
				t.Fatal(err)
			}
			se := r.Curve[r.Best].SE
			want := se
			if rc.floored {
				want = math.Max(se, floor)
			}
			if math.Abs(r.RuleSE-want) > 1e-12*want {
				t.Errorf("%s, %v: the rule read %g, want %g (best point's %g, floor %g)", tc.name, rc.rule, r.RuleSE, want, se, floor)
			}
			if rc.floored && !(floor > se) {
				t.Errorf("%s: the best point's standard error %g is not below the floor %g", tc.name, se, floor)
			}
			bound := r.Curve[r.Best].Mean + rc.m*want
			if k := slices.IndexFunc(r.Curve, func(p cv.Point) bool { return p.Mean <= bound }); r.Selected != k {
				t.Errorf("%s, %v: selected %d, want %d (bound %g)", tc.name, rc.rule, r.Selected, k, bound)
			}
		}
	}
}

// TestYardstick checks which rules, measures and families take the floor
// of cv.Rule.Yardstick, and its value √(2/(n−1)) (common practice: the
// standard error of a mean of n values of variance 2, that of χ²₁).
func TestYardstick(t *testing.T) {
	floor := math.Sqrt(2.0 / 99)
	for _, tc := range []struct {
		name    string
		rule    cv.Rule
		measure cv.Measure
		fam     lasso.Family
		se, n   float64
		want    float64
	}{
		{"quarter, binomial deviance, below the floor", cv.QuarterStandardError, cv.Deviance, lasso.Binomial{}, 0.05, 100, floor},
		{"half, binomial, default measure", cv.HalfStandardError, cv.DefaultMeasure, lasso.Binomial{}, 0.05, 100, floor},
		{"quarter, binomial, above the floor", cv.QuarterStandardError, cv.Deviance, lasso.Binomial{}, 0.3, 100, 0.3},
		{"quarter, Gaussian", cv.QuarterStandardError, cv.Deviance, lasso.Gaussian{}, 0.05, 100, 0.05},
		{"one-SE, binomial", cv.OneStandardError, cv.Deviance, lasso.Binomial{}, 0.05, 100, 0.05},
		{"quarter, binomial, misclassification", cv.QuarterStandardError, cv.Misclassification, lasso.Binomial{}, 0.05, 100, 0.05},
		{"quarter, binomial, rows unknown", cv.QuarterStandardError, cv.Deviance, lasso.Binomial{}, 0.05, math.NaN(), 0.05},
		{"quarter, binomial, no standard error", cv.QuarterStandardError, cv.Deviance, lasso.Binomial{}, math.NaN(), 100, floor},
	} {
		if got := tc.rule.Yardstick(tc.se, tc.measure, tc.fam, tc.n); math.Abs(got-tc.want) > 1e-15 {
			t.Errorf("%s: %g, want %g", tc.name, got, tc.want)
		}
	}
}

// TestPairSEPerRow checks Point.PairSE against its definition worked from
// the returned fold paths: each held-out row's loss at a penalty minus its
// loss at the best penalty, pooled over the folds, their SD over √(n−1)
// (common practice for a paired comparison), at every penalty up to the
// best and 0 past it. A binomial path on the breast cancer data (Wolberg
// et al.; scikit-learn's copy) with stratified folds, and a Gaussian one on
// the diabetes data (Efron et al. 2004), which Fit solves from moments and
// pairs from the rows behind them.
func TestPairSEPerRow(t *testing.T) {
	cancer, err := opendata.ReadCSV("breast_cancer.csv")
	if err != nil {
		t.Fatal(err)
	}
	cy := cancer.Column("benign")
	cfolds, err := cv.Stratified(cy, 10, 5)
	if err != nil {
		t.Fatal(err)
	}
	dx, dy, dfolds := diabetesFolds(t)
	for _, tc := range []struct {
		name  string
		x     [][]float64
		y     []float64
		folds *cv.Folds
		fam   lasso.Family
	}{
		{"breast cancer, binomial", opendata.UnitNorm(cancer.Columns[:10]), cy, cfolds, lasso.Binomial{}},
		{"diabetes, Gaussian from moments", dx, dy, dfolds, lasso.Gaussian{}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			x, y := tc.x, tc.y
			r, err := cv.Fit(context.Background(), lasso.Data{Columns: x, Response: y}, tc.folds,
				&cv.Settings{Path: lasso.Settings{Family: tc.fam}, Rule: cv.PairedDifference})
			if err != nil {
				t.Fatal(err)
			}
			loss := func(p *lasso.Path, k, i int) float64 {
				b0, b := p.Dense(k)
				eta := b0
				for t, j := range p.Predictors {
					eta += b[t] * x[j][i]
				}
				return tc.fam.Deviance(y[i], tc.fam.Mean(eta))
			}
			for k := range r.Curve {
				want := 0.0
				if k <= r.Best {
					var n, s, s2 float64
					for f := range tc.folds.K {
						p := r.FoldPath(f)
						_, held := tc.folds.Split(f, nil)
						for _, i := range held {
							d := loss(p, k, i) - loss(p, r.Best, i)
							n, s, s2 = n+1, s+d, s2+d*d
						}
					}
					m := s / n
					want = math.Sqrt(math.Max(s2/n-m*m, 0) / (n - 1))
				}
				if got := r.Curve[k].PairSE; math.Abs(got-want) > 1e-9*(want+1e-12) {
					t.Fatalf("point %d (best %d): PairSE %g, want %g", k, r.Best, got, want)
				}
			}
			if r.Margin != cv.PairedMargin {
				t.Errorf("per-row pairs: margin %g, want %g", r.Margin, cv.PairedMargin)
			}
			if r.Selected > r.Best || r.Curve[r.Selected].Mean-r.Curve[r.Best].Mean > cv.PairedMargin*r.Curve[r.Selected].PairSE {
				t.Errorf("selected %d beyond its reach (best %d)", r.Selected, r.Best)
			}
		})
	}
}

// diabetesFolds returns the diabetes data's ten predictors scaled to unit
// norm, its response (Efron et al. 2004, as above) and ten random folds
// (seed 3).
func diabetesFolds(t *testing.T) (x [][]float64, y []float64, folds *cv.Folds) {
	t.Helper()
	tab, err := opendata.ReadCSV("diabetes.csv")
	if err != nil {
		t.Fatal(err)
	}
	x = opendata.UnitNorm(tab.Columns[:10])
	folds, err = cv.Random(len(x[0]), 10, 3)
	if err != nil {
		t.Fatal(err)
	}
	return x, tab.Columns[10], folds
}

// foldMoments returns the moments of x's columns and y (the last variable)
// over every row and over each fold's held-out rows.
func foldMoments(t *testing.T, x [][]float64, y []float64, folds *cv.Folds) (*lasso.Moments, []*lasso.Moments) {
	t.Helper()
	cols := append(append([][]float64{}, x...), y)
	shift := lasso.ColumnMeans(cols, nil, nil)
	total := lasso.NewMoments(shift)
	if err := total.Accumulate(cols, nil, nil); err != nil {
		t.Fatal(err)
	}
	held := make([]*lasso.Moments, folds.K)
	for f := range held {
		held[f] = lasso.NewMoments(shift)
		if err := held[f].Accumulate(cols, nil, folds.Held(f, nil)); err != nil {
			t.Fatal(err)
		}
	}
	return total, held
}

// TestHeldRowsChecked checks that FitMoments refuses rows that cannot be
// those behind its moments, naming what does not fit.
func TestHeldRowsChecked(t *testing.T) {
	x, y, folds := diabetesFolds(t)
	total, held := foldMoments(t, x, y, folds)
	cols := append(append([][]float64{}, x...), y)
	good := make([][]int, folds.K)
	for f := range good {
		good[f] = folds.Held(f, nil)
	}
	pred := []int{0, 1, 2, 3, 4, 5, 6, 7, 8, 9}
	for _, tc := range []struct {
		name string
		rows cv.HeldRows
		want string
	}{
		{"too few folds", cv.HeldRows{Columns: cols, Held: good[:9]}, "held-out rows of 9 folds for moments of 10"},
		{"too few columns", cv.HeldRows{Columns: cols[:10], Held: good}, "variable 10 of the moments has no column among 10"},
		{"short column", cv.HeldRows{Columns: append(append([][]float64{}, x[:9]...), x[9][:400], y), Held: good}, "column 9 has 400 rows"},
		{"row out of range", cv.HeldRows{Columns: cols, Held: append([][]int{{0, 442}}, good[1:]...)}, "fold 0 holds row 442 of 442"},
		{"weights", cv.HeldRows{Columns: cols, Weights: make([]float64, 3), Held: good}, "3 weights for 442 rows"},
		{"other rows", cv.HeldRows{Columns: cols, Held: append([][]int{good[0][1:]}, good[1:]...)}, "fold 0's held-out rows weigh"},
		{"weights the moments lack", cv.HeldRows{Columns: cols, Weights: twos(442), Held: good}, "its moments"},
	} {
		_, err := cv.FitMoments(context.Background(), total, held, &tc.rows, 10, pred, &cv.Settings{Rule: cv.PairedDifference})
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want one saying %q", tc.name, err, tc.want)
		}
	}
	if _, err := cv.FitMoments(context.Background(), total, held, &cv.HeldRows{Columns: cols, Held: good}, 10, pred, &cv.Settings{Rule: cv.PairedDifference}); err != nil {
		t.Error(err)
	}
}

func twos(n int) []float64 {
	w := make([]float64, n)
	for i := range w {
		w[i] = 2
	}
	return w
}
