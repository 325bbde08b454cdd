package metrics_test

import (
	"errors"
	"math"
	"math/rand/v2"
	"sort"
	"testing"

	"gonum.org/v1/gonum/integrate"
	"gonum.org/v1/gonum/stat"

	"github.com/antecedent-lab/antecedent/internal/opendata"
	"github.com/antecedent-lab/antecedent/metrics"
)

// hanleyMcNeil expands the rating-scale table of Hanley & McNeil (1982),
// Radiology 143:29–36: 109 CT images rated 1 (definitely normal) to 5
// (definitely abnormal), 58 truly normal and 51 truly abnormal.
func hanleyMcNeil() (ratings, abnormal []float64) {
	normal := []int{33, 6, 6, 11, 2}
	abn := []int{3, 2, 2, 11, 33}
	for r := range 5 {
		for range normal[r] {
			ratings = append(ratings, float64(r+1))
			abnormal = append(abnormal, 0)
		}
		for range abn[r] {
			ratings = append(ratings, float64(r+1))
			abnormal = append(abnormal, 1)
		}
	}
	return ratings, abnormal
}

func TestAUCHanleyMcNeil(t *testing.T) {
	r, y := hanleyMcNeil()
	a, err := metrics.AUC(r, y, nil)
	if err != nil {
		t.Fatal(err)
	}
	// Mann–Whitney count with ties as one half: exactly 1321/1479, which
	// rounds to the published 0.893.
	if math.Abs(a-1321.0/1479) > 1e-15 || math.Round(a*1000) != 893 {
		t.Errorf("AUC = %.6f, want 1321/1479 = %.6f (published 0.893)", a, 1321.0/1479)
	}
	// Their standard-error formula at this AUC gives 0.0325 (recomputed);
	// the paper prints 0.032 (from memory).
	se := metrics.HanleyMcNeilSE(a, 51, 58)
	if math.Abs(se-0.0325) > 0.00005 {
		t.Errorf("Hanley–McNeil SE = %.5f, want 0.0325", se)
	}
}

type metricsCase struct {
	Labels        []float64 `json:"labels"`
	Scores        []float64 `json:"scores"`
	Probabilities []float64 `json:"probabilities"`
	Weights       []float64 `json:"weights"`
	Continuous    []float64 `json:"continuous"`
	MannWhitney   float64   `json:"mann_whitney_auc"`
	AUCWeighted   float64   `json:"roc_auc_weighted"`
	LogLoss       float64   `json:"log_loss_weighted"`
	Brier         float64   `json:"brier_weighted"`
	MSE           float64   `json:"mse_weighted"`
	MAE           float64   `json:"mae_weighted"`
	R2Weighted    float64   `json:"r2_weighted"`
	R2            float64   `json:"r2"`
}

// TestAgainstReference compares with SciPy's Mann–Whitney U / (n₁n₀) and
// scikit-learn's weighted metrics (testdata/reference/metrics_reference.py).
func TestAgainstReference(t *testing.T) {
	var ref struct {
		Tool  string        `json:"tool"`
		Cases []metricsCase `json:"cases"`
	}
	if err := opendata.ReadJSON("reference/metrics.json", &ref); err != nil {
		t.Fatal(err)
	}
	for i, c := range ref.Cases {
		checks := []struct {
			name string
			f    func() (float64, error)
			want float64
		}{
			{"AUC (Mann–Whitney)", func() (float64, error) { return metrics.AUC(c.Scores, c.Labels, nil) }, c.MannWhitney},
			{"weighted AUC", func() (float64, error) { return metrics.AUC(c.Scores, c.Labels, c.Weights) }, c.AUCWeighted},
			{"weighted log-loss", func() (float64, error) { return metrics.LogLoss(c.Probabilities, c.Labels, c.Weights) }, c.LogLoss},
			{"weighted Brier", func() (float64, error) { return metrics.Brier(c.Probabilities, c.Labels, c.Weights) }, c.Brier},
			{"weighted MSE", func() (float64, error) { return metrics.MSE(c.Scores, c.Continuous, c.Weights) }, c.MSE},
			{"weighted MAE", func() (float64, error) { return metrics.MAE(c.Scores, c.Continuous, c.Weights) }, c.MAE},
			{"weighted R²", func() (float64, error) { return metrics.RSquared(c.Scores, c.Continuous, c.Weights) }, c.R2Weighted},
			{"R²", func() (float64, error) { return metrics.RSquared(c.Scores, c.Continuous, nil) }, c.R2},
		}
		for _, ch := range checks {
			got, err := ch.f()
			if err != nil {
				t.Fatalf("case %d %s: %v", i, ch.name, err)
			}
			if math.Abs(got-ch.want) > 1e-12*math.Max(1, math.Abs(ch.want)) {
				t.Errorf("case %d %s = %.15g, want %.15g (%s)", i, ch.name, got, ch.want, ref.Tool)
			}
		}
	}
}

// TestAUCAgainstGonum checks AUC against gonum's stat.ROC integrated with
// integrate.Trapezoidal on seeded random data with ties.
func TestAUCAgainstGonum(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := range 20 {
		n := 10 + rng.IntN(300)
		scores := make([]float64, n)
		labels := make([]float64, n)
		weights := make([]float64, n)
		for i := range scores {
			if rng.Float64() < 0.3 {
				labels[i] = 1
			}
			scores[i] = math.Round((rng.NormFloat64()+labels[i])*3) / 3
			weights[i] = 0.1 + rng.Float64()
		}
		labels[0], labels[1] = 0, 1
		for _, w := range [][]float64{nil, weights} {
			got, err := metrics.AUC(scores, labels, w)
			if err != nil {
				t.Fatal(err)
			}
			idx := make([]int, n)
			for i := range idx {
				idx[i] = i
			}
			sort.Slice(idx, func(a, b int) bool { return scores[idx[a]] < scores[idx[b]] })
			y := make([]float64, n)
			classes := make([]bool, n)
			var ws []float64
			if w != nil {
				ws = make([]float64, n)
			}
			for k, i := range idx {
				y[k] = scores[i]
				classes[k] = labels[i] == 1
				if w != nil {
					ws[k] = w[i]
				}
			}
			tpr, fpr, _ := stat.ROC(nil, y, classes, ws)
			want := integrate.Trapezoidal(fpr, tpr)
			if math.Abs(got-want) > 1e-12 {
				t.Errorf("trial %d weighted=%v: AUC %.15f, gonum %.15f", trial, w != nil, got, want)
			}
			fp, tp, _, err := metrics.ROC(scores, labels, w)
			if err != nil {
				t.Fatal(err)
			}
			if area := integrate.Trapezoidal(fp, tp); math.Abs(area-got) > 1e-12 {
				t.Errorf("trial %d: ROC area %.15f, AUC %.15f", trial, area, got)
			}
		}
	}
}

func TestErrors(t *testing.T) {
	nan := math.NaN()
	cases := []struct {
		name string
		f    func() error
		want error
	}{
		{"empty", func() error { _, err := metrics.AUC(nil, nil, nil); return err }, metrics.ErrEmpty},
		{"lengths", func() error { _, err := metrics.MSE([]float64{1}, []float64{1, 2}, nil); return err }, metrics.ErrLength},
		{"weights length", func() error { _, err := metrics.MSE([]float64{1}, []float64{1}, []float64{1, 1}); return err }, metrics.ErrLength},
		{"NaN score", func() error { _, err := metrics.AUC([]float64{nan, 1}, []float64{0, 1}, nil); return err }, metrics.ErrNotFinite},
		{"label 2", func() error { _, err := metrics.AUC([]float64{0, 1}, []float64{0, 2}, nil); return err }, metrics.ErrLabel},
		{"one class", func() error { _, err := metrics.AUC([]float64{0, 1}, []float64{1, 1}, nil); return err }, metrics.ErrOneClass},
		{"ROC one class", func() error { _, _, _, err := metrics.ROC([]float64{0, 1}, []float64{0, 0}, nil); return err }, metrics.ErrOneClass},
		{"negative weight", func() error { _, err := metrics.Brier([]float64{0.5}, []float64{1}, []float64{-1}); return err }, metrics.ErrWeight},
		{"constant R²", func() error { _, err := metrics.RSquared([]float64{1, 2}, []float64{3, 3}, nil); return err }, metrics.ErrConstant},
	}
	for _, c := range cases {
		if err := c.f(); !errors.Is(err, c.want) {
			t.Errorf("%s: error %v, want %v", c.name, err, c.want)
		}
	}
}

func TestLosses(t *testing.T) {
	// Small cases worked by hand (common practice definitions).
	p := []float64{0.9, 0.2, 0.6, 0.5}
	y := []float64{1, 0, 0, 1}
	if m, _ := metrics.Misclassification(p, y, nil); m != 0.25 {
		t.Errorf("misclassification %g, want 0.25 (only 0.6 for a 0 is wrong)", m)
	}
	// Brier: (0.01 + 0.04 + 0.36 + 0.25)/4 = 0.165.
	if b, _ := metrics.Brier(p, y, nil); math.Abs(b-0.165) > 1e-15 {
		t.Errorf("Brier %g, want 0.165", b)
	}
	l, _ := metrics.LogLoss(p, y, nil)
	want := -(math.Log(0.9) + math.Log(0.8) + math.Log(0.4) + math.Log(0.5)) / 4
	if math.Abs(l-want) > 1e-15 {
		t.Errorf("log-loss %g, want %g", l, want)
	}
	if d, _ := metrics.BinomialDeviance(p, y, nil); math.Abs(d-2*want) > 1e-15 {
		t.Errorf("deviance %g, want %g", d, 2*want)
	}
	// Zero weight removes a row.
	if m, _ := metrics.MAE([]float64{1, 100}, []float64{2, 0}, []float64{1, 0}); m != 1 {
		t.Errorf("MAE with a zero weight %g, want 1", m)
	}
}

func same(a, b float64) bool { return a == b || (math.IsNaN(a) && math.IsNaN(b)) }

func BenchmarkAUC100k(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 2))
	n := 100_000
	s, y := make([]float64, n), make([]float64, n)
	for i := range s {
		s[i] = rng.NormFloat64()
		if rng.Float64() < 0.3 {
			y[i] = 1
		}
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := metrics.AUC(s, y, nil); err != nil {
			b.Fatal(err)
		}
	}
}
