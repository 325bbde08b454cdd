package refit

import (
	"context"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent/internal/opendata"
	"github.com/antecedent-lab/antecedent/lasso"
)

// TestRegressAgainstStatsmodels compares estimates, standard errors and
// 95% intervals with statsmodels OLS (diabetes data, Efron et al. 2004) and
// Logit (breast cancer data, Wolberg et al.), as stored by
// testdata/reference/refit_reference.py.
func TestRegressAgainstStatsmodels(t *testing.T) {
	ref, err := opendata.ReadRefit()
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name, file, response string
		fam                  lasso.Family
		want                 opendata.Coefficients
	}{
		{"least squares", "diabetes.csv", "progression", lasso.Gaussian{}, ref.OLS},
		{"logistic", "breast_cancer.csv", "benign", lasso.Binomial{}, ref.Logit},
	}
	for _, c := range cases {
		tab, err := opendata.ReadCSV(c.file)
		if err != nil {
			t.Fatal(err)
		}
		var x [][]float64
		for _, term := range c.want.Terms[1:] {
			x = append(x, tab.Column(term))
		}
		f, err := Regress(context.Background(), c.fam, x, tab.Column(c.response), nil)
		if err != nil {
			t.Fatal(err)
		}
		if f.Warning != "" && !strings.Contains(f.Warning, "beyond ±15") {
			t.Errorf("%s: warning %q", c.name, f.Warning)
		}
		rel := func(a, b float64) float64 { return math.Abs(a-b) / math.Max(1e-12, math.Abs(b)) }
		worst := rel(f.Intercept, c.want.Params[0])
		for k := range x {
			lo, hi := f.Coef[k]-f.Quantile*f.SE[k], f.Coef[k]+f.Quantile*f.SE[k]
			for _, p := range [][2]float64{{f.Coef[k], c.want.Params[k+1]}, {f.SE[k], c.want.BSE[k+1]}, {lo, c.want.Lower[k+1]}, {hi, c.want.Upper[k+1]}} {
				worst = math.Max(worst, rel(p[0], p[1]))
			}
		}
		// 1e-6 relative: both sides solve far more tightly (common practice).
		if worst > 1e-6 {
			t.Errorf("%s: largest relative difference from %s is %.2g", c.name, ref.Tool, worst)
		}
	}
}

// TestRegressDegenerate checks the warnings and reasons that replace
// numbers a reader must not trust.
func TestRegressDegenerate(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	n := 400
	a, b, y, yb, sep, thin, quasi := make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)
	for i := range n {
		a[i] = rng.NormFloat64()
		b[i] = 2 * a[i] // collinear with a
		y[i] = a[i] + rng.NormFloat64()
		if rng.Float64() < 1/(1+math.Exp(-a[i])) {
			yb[i] = 1
		}
		if a[i] > 0 {
			sep[i] = 1 // perfectly separated by a
		}
		if i < 3 {
			thin[i] = 1 // a level with three rows
		}
		if i%4 == 0 {
			quasi[i] = 1 // every row with it has yb = 1 (set below)
			yb[i] = 1
		}
	}
	cases := []struct {
		name    string
		fam     lasso.Family
		x       [][]float64
		y       []float64
		warning string // in Fit.Warning
		reason  string // in NotEstimable of the first predictor
	}{
		{"collinear least squares", lasso.Gaussian{}, [][]float64{a, b}, y, "collinear", ""},
		{"collinear logistic", lasso.Binomial{}, [][]float64{a, b}, yb, "collinear", ""},
		{"complete separation", lasso.Binomial{}, [][]float64{a}, sep, "", "separation"},
		{"quasi-complete separation by a level", lasso.Binomial{}, [][]float64{quasi, a}, yb, "", "all 100 rows with it have outcome 1"},
		{"thin level, logistic", lasso.Binomial{}, [][]float64{thin, a}, yb, "", "only 3 rows with it"},
		{"thin level, least squares", lasso.Gaussian{}, [][]float64{thin, a}, y, "", "only 3 rows with it"},
	}
	for _, c := range cases {
		f, err := Regress(context.Background(), c.fam, c.x, c.y, nil)
		if err != nil {
			t.Fatal(err)
		}
		if c.warning != "" && !strings.Contains(f.Warning, c.warning) {
			t.Errorf("%s: warning %q, want %q", c.name, f.Warning, c.warning)
		}
		if !strings.Contains(f.NotEstimable[0], c.reason) || (c.reason != "") != (f.NotEstimable[0] != "") {
			t.Errorf("%s: reason %q, want %q", c.name, f.NotEstimable[0], c.reason)
		}
		if !math.IsNaN(f.Coef[0]) {
			t.Errorf("%s: coefficient %g, want NaN (not estimable)", c.name, f.Coef[0])
		}
		if c.reason != "" && len(c.x) > 1 && math.IsNaN(f.Coef[1]) {
			t.Errorf("%s: the other predictor was not estimated", c.name)
		}
	}
}

func TestRegressCancelled(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	rng := rand.New(rand.NewPCG(8, 9))
	x, y := make([]float64, 200), make([]float64, 200)
	for i := range x {
		x[i] = rng.NormFloat64()
		if rng.Float64() < 0.4 {
			y[i] = 1
		}
	}
	if _, err := Regress(ctx, lasso.Binomial{}, [][]float64{x}, y, nil); err != context.Canceled {
		t.Errorf("error %v, want context.Canceled", err)
	}
}

func BenchmarkRegressLogistic10kP8(b *testing.B) { benchRegress(b, lasso.Binomial{}, 10_000, 8) }
func BenchmarkRegressLinear10kP8(b *testing.B)   { benchRegress(b, lasso.Gaussian{}, 10_000, 8) }

func benchRegress(b *testing.B, fam lasso.Family, n, p int) {
	rng := rand.New(rand.NewPCG(3, 4))
	x := make([][]float64, p)
	y := make([]float64, n)
	for j := range x {
		x[j] = make([]float64, n)
		for i := range n {
			x[j][i] = rng.NormFloat64()
		}
	}
	for i := range n {
		eta := 0.3*x[0][i] - 0.2*x[1][i]
		if _, ok := fam.(lasso.Binomial); ok {
			if rng.Float64() < 1/(1+math.Exp(-eta)) {
				y[i] = 1
			}
		} else {
			y[i] = eta + rng.NormFloat64()
		}
	}
	b.ResetTimer()
	for range b.N {
		if _, err := Regress(context.Background(), fam, x, y, nil); err != nil {
			b.Fatal(err)
		}
	}
}

// TestGroupedRows checks that merging equal rows of 0/1 parents and a 0/1
// response (group) changes no number: the same data with one parent coded
// 0/2, which is not merged, must give half its coefficient and standard
// error and the same of everything else. The per-row path is the one
// checked against statsmodels above.
func TestGroupedRows(t *testing.T) {
	cases := []struct {
		name    string
		n, k    int
		rows    bool // fit a subset of the rows
		grouped bool // whether group may merge the 0/1 version
	}{
		{"three parents", 5000, 3, false, true},
		{"eight parents, rows subset", 4000, 8, true, true},
		{"too many distinct rows", 60, 8, false, false},
	}
	for _, c := range cases {
		r := rand.New(rand.NewPCG(7, uint64(c.n+c.k)))
		x := make([][]float64, c.k)
		for a := range x {
			x[a] = make([]float64, c.n)
			for i := range x[a] {
				if r.Float64() < 0.2+0.05*float64(a) {
					x[a][i] = 1
				}
			}
		}
		y := make([]float64, c.n)
		for i := range y {
			eta := -0.5
			for a := range x {
				eta += 0.3 * float64(a%3-1) * x[a][i]
			}
			if r.Float64() < 1/(1+math.Exp(-eta)) {
				y[i] = 1
			}
		}
		var rows []int
		if c.rows {
			for i := 0; i < c.n; i += 2 {
				rows = append(rows, i)
			}
		}
		if _, _, _, ok := group(x, y, rows); ok != c.grouped {
			t.Fatalf("%s: grouped %v, want %v", c.name, ok, c.grouped)
		}
		got, err := Regress(context.Background(), lasso.Binomial{}, x, y, rows)
		if err != nil {
			t.Fatal(err)
		}
		x2 := append([][]float64(nil), x...)
		x2[0] = make([]float64, c.n)
		for i, v := range x[0] {
			x2[0][i] = 2 * v
		}
		want, err := Regress(context.Background(), lasso.Binomial{}, x2, y, rows)
		if err != nil {
			t.Fatal(err)
		}
		want.Coef[0] *= 2
		want.SE[0] *= 2
		rel := func(a, b float64) float64 { return math.Abs(a-b) / math.Max(1e-12, math.Abs(b)) }
		worst := rel(got.Intercept, want.Intercept)
		for a := range x {
			worst = math.Max(worst, math.Max(rel(got.Coef[a], want.Coef[a]), rel(got.SE[a], want.SE[a])))
		}
		if worst > 1e-9 || got.Warning != want.Warning {
			t.Errorf("%s: largest relative difference %.2g, warnings %q and %q", c.name, worst, got.Warning, want.Warning)
		}
	}
}
