package lasso_test

import (
	"context"
	"encoding/csv"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"github.com/antecedent-lab/antecedent/lasso"
)

// accuracyFile is lasso/testdata/accuracy.json, written by
// accuracy_reference.py.
type accuracyFile struct {
	Tool  string `json:"tool"`
	Cases []struct {
		Name   string  `json:"name"`
		Family string  `json:"family"`
		Source string  `json:"source"`
		MaxKKT float64 `json:"max_kkt"`
		Fits   []struct {
			Index     int       `json:"index"` // grid point (binomial cases)
			Lambda    float64   `json:"lambda"`
			Intercept float64   `json:"intercept"`
			Coef      []float64 `json:"coef"`
		} `json:"fits"`
	} `json:"cases"`
}

// readColumns reads a numeric CSV file with a header from lasso/testdata,
// column-major.
func readColumns(t *testing.T, name string) [][]float64 {
	t.Helper()
	f, err := os.Open(filepath.Join("testdata", name))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	cols := make([][]float64, len(recs[0]))
	for _, r := range recs[1:] {
		for j, s := range r {
			x, err := strconv.ParseFloat(s, 64)
			if err != nil {
				t.Fatal(err)
			}
			cols[j] = append(cols[j], x)
		}
	}
	return cols
}

// TestDefaultAccuracy checks that default fits are close to the optimum
// along the whole default path, on collinear data where coordinate descent
// converges slowly: the diabetes data (Efron, Hastie, Johnstone & Tibshirani
// 2004) and two simulated collinear designs in both Gaussian modes, and the
// breast-cancer data (Wolberg, Street & Mangasarian 1995) for the binomial
// family at six grid points. The optima are scikit-learn's, solved far
// tighter than its defaults (lasso/testdata/accuracy_reference.py; the file
// records their KKT residuals, at most 6e-8 of the penalty).
func TestDefaultAccuracy(t *testing.T) {
	var ref accuracyFile
	raw, err := os.ReadFile(filepath.Join("testdata", "accuracy.json"))
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatal(err)
	}
	const (
		// Issue 12, item 4: every default fit within 1e-4 of the
		// largest coefficient of the optimum.
		coefTol = 1e-4
		// Largest KKT violation, as a share of the penalty: the issue
		// asks for "small relative to the penalty"; the old stopping
		// rule left violations above the penalty itself at the end of
		// the diabetes path.
		kktTol = 1e-3
	)
	data := map[string]func() problem{
		"diabetes": func() problem { x, y := diabetes(t); return problem{x: x, y: y} },
		"pairs": func() problem {
			c := readColumns(t, "collinear_pairs.csv")
			return problem{x: c[:len(c)-1], y: c[len(c)-1]}
		},
		"groups": func() problem {
			c := readColumns(t, "collinear_groups.csv")
			return problem{x: c[:len(c)-1], y: c[len(c)-1]}
		},
		"breast_cancer": func() problem { x, y := breastCancer(t); return problem{x: x, y: y} },
	}
	for _, c := range ref.Cases {
		load, ok := data[c.Name]
		if !ok {
			t.Fatalf("no data for reference case %q", c.Name)
		}
		pr := load()
		var runs []lasso.Settings
		if c.Family == "binomial" {
			runs = []lasso.Settings{{Family: lasso.Binomial{}}}
		} else {
			runs = []lasso.Settings{{Mode: lasso.GramMode}, {Mode: lasso.ResidualMode}}
		}
		for _, s := range runs {
			t.Run(c.Name+"/"+s.Mode.String(), func(t *testing.T) {
				path, err := lasso.Fit(context.Background(), lasso.Data{Columns: pr.x, Response: pr.y}, &s)
				if err != nil {
					t.Fatal(err)
				}
				if path.Status != lasso.Completed {
					t.Fatalf("path ended %v after %d penalties", path.Status, path.Len())
				}
				var worstCoef, worstKKT float64
				for i, f := range c.Fits {
					k := i
					if c.Family == "binomial" {
						k = f.Index
					}
					if k >= path.Len() {
						t.Fatalf("path has %d penalties, reference point %d", path.Len(), k)
					}
					// The default grid, as the script forms it.
					if lam := path.Penalties[k]; math.Abs(lam-f.Lambda) > 1e-10*f.Lambda {
						t.Fatalf("penalty %d is %.17g, reference grid %.17g", k, lam, f.Lambda)
					}
					b0, b := path.Dense(k)
					largest, diff := 0.0, 0.0
					for j := range b {
						largest = math.Max(largest, math.Abs(f.Coef[j]))
						diff = math.Max(diff, math.Abs(b[j]-f.Coef[j]))
					}
					if c.Family == "binomial" {
						largest = math.Max(largest, math.Abs(f.Intercept))
						diff = math.Max(diff, math.Abs(b0-f.Intercept))
					}
					if largest > 0 && diff > coefTol*largest {
						t.Errorf("penalty %d (λ=%.4g, %d non-zero): max difference %.3g of the largest coefficient (%s)",
							k, f.Lambda, path.NonZero[k], diff/largest, ref.Tool)
					}
					if largest > 0 {
						worstCoef = math.Max(worstCoef, diff/largest)
					}
					v := kktViolation(path, pr, &s, k)
					if v > kktTol {
						t.Errorf("penalty %d (λ=%.4g): KKT violation %.3g of the penalty", k, f.Lambda, v)
					}
					worstKKT = math.Max(worstKKT, v)
				}
				var sweeps int
				for _, n := range path.Sweeps {
					sweeps += n
				}
				t.Logf("%s: worst difference %.2g of the largest coefficient, worst KKT violation %.2g of the penalty, %d sweeps",
					c.Source, worstCoef, worstKKT, sweeps)
			})
		}
	}
}
