// Command paths times lasso paths and cross-validated paths side by side
// with scikit-learn on the same data, grid and folds, in one run, and
// prints a Markdown table of wall times and ratios.
//
//	go run ./bench/paths                    # every case, best of 3 runs each
//	go run ./bench/paths -cases gaussian-gram-10k -repeats 1
//	go run ./bench/paths -skip-python       # antecedent's side only
//
// It needs Debian's python3-sklearn (run as /usr/bin/python3). Data are
// generated here with a fixed seed and passed to Python as raw float64
// files; the Python side is bench/paths_reference.py.
package main

import (
	"context"
	"encoding/binary"
	"encoding/json"
	"flag"
	"fmt"
	"log"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
	"time"

	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/lasso"
)

type benchCase struct {
	name     string
	task     string // as in paths_reference.py
	n, p     int
	binomial bool
	mode     lasso.Mode
	folds    int
	sklTol   float64
	slow     bool // scikit-learn needs tens of minutes; run with -slow
}

var cases = []benchCase{
	{"gaussian-gram-10k", "gaussian-gram", 10_000, 100, false, lasso.GramMode, 0, 1e-7, false},
	{"gaussian-residual-10k", "gaussian-residual", 10_000, 100, false, lasso.ResidualMode, 0, 1e-7, false},
	{"binomial-10k", "binomial", 10_000, 100, true, 0, 0, 1e-4, false},
	{"gaussian-gram-100k", "gaussian-gram", 100_000, 50, false, lasso.GramMode, 0, 1e-7, false},
	{"gaussian-residual-100k", "gaussian-residual", 100_000, 50, false, lasso.ResidualMode, 0, 1e-7, false},
	{"binomial-100k", "binomial", 100_000, 50, true, 0, 0, 1e-4, false},
	{"gaussian-cv-100k", "gaussian-cv", 100_000, 50, false, 0, 10, 1e-7, false},
	{"binomial-cv-10k", "binomial-cv", 10_000, 50, true, 0, 10, 1e-4, false},
	{"binomial-cv-100k", "binomial-cv", 100_000, 50, true, 0, 10, 1e-4, true},
}

func main() {
	only := flag.String("cases", "", "comma-separated case names (default all)")
	repeats := flag.Int("repeats", 3, "runs per side; the best is kept")
	python := flag.String("python", "/usr/bin/python3", "Python with scikit-learn")
	slow := flag.Bool("slow", false, "also run the cases where scikit-learn takes tens of minutes")
	skipPython := flag.Bool("skip-python", false, "time antecedent only (to compare versions of it)")
	flag.Parse()
	_, file, _, _ := runtime.Caller(0)
	script := filepath.Join(filepath.Dir(file), "..", "paths_reference.py")
	dir, err := os.MkdirTemp("", "antecedent-bench-")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)

	fmt.Printf("machine: %d cores (GOMAXPROCS %d), %s\n\n", runtime.NumCPU(), runtime.GOMAXPROCS(0), runtime.Version())
	fmt.Println("| case | n | p | antecedent (s) | scikit-learn (s) | ratio | agreement |")
	fmt.Println("|---|---|---|---|---|---|---|")
	for _, c := range cases {
		if *only != "" && !strings.Contains(","+*only+",", ","+c.name+",") {
			continue
		}
		if c.slow && !*slow && *only == "" {
			continue
		}
		py := *python
		if *skipPython {
			py = ""
		}
		row, err := run(c, dir, script, py, *repeats)
		if err != nil {
			log.Fatalf("%s: %v", c.name, err)
		}
		fmt.Println(row)
	}
}

func generate(n, p int, binomial bool) ([][]float64, []float64) {
	rng := rand.New(rand.NewPCG(2026, uint64(n*p)))
	x := make([][]float64, p)
	for j := range x {
		x[j] = make([]float64, n)
		for i := range x[j] {
			x[j][i] = rng.NormFloat64()
			if j > 0 {
				x[j][i] += 0.3 * x[j-1][i]
			}
		}
	}
	y := make([]float64, n)
	for i := range y {
		var eta float64
		for j := 0; j < p; j += 5 {
			eta += 0.4 / (1 + float64(j)/10) * x[j][i]
		}
		if binomial {
			if rng.Float64() < 1/(1+math.Exp(-eta)) {
				y[i] = 1
			}
		} else {
			y[i] = eta + rng.NormFloat64()
		}
	}
	return x, y
}

func writeFloats(path string, cols ...[]float64) error {
	f, err := os.Create(path)
	if err != nil {
		return err
	}
	for _, c := range cols {
		if err := binary.Write(f, binary.LittleEndian, c); err != nil {
			f.Close()
			return err
		}
	}
	return f.Close()
}

func best(repeats int, f func() error) (float64, error) {
	b := math.Inf(1)
	for range repeats {
		start := time.Now()
		if err := f(); err != nil {
			return 0, err
		}
		b = math.Min(b, time.Since(start).Seconds())
	}
	return b, nil
}

// run times case c on both sides; an empty python skips scikit-learn's.
func run(c benchCase, dir, script, python string, repeats int) (string, error) {
	x, y := generate(c.n, c.p, c.binomial)
	d := lasso.Data{Columns: x, Response: y}
	s := lasso.Settings{Mode: c.mode}
	if c.binomial {
		s.Family = lasso.Binomial{}
	}
	ctx := context.Background()
	spec := map[string]any{
		"task": c.task, "n": c.n, "p": c.p, "tol": c.sklTol, "repeats": repeats, "jobs": runtime.GOMAXPROCS(0),
		"x": filepath.Join(dir, c.name+".x"), "y": filepath.Join(dir, c.name+".y"),
	}
	var ours float64
	var agreement func(map[string]any) string
	if c.folds == 0 {
		var path *lasso.Path
		t, err := best(repeats, func() (err error) { path, err = lasso.Fit(ctx, d, &s); return err })
		if err != nil {
			return "", err
		}
		ours = t
		spec["penalties"] = path.Penalties
		_, b := path.Dense(path.Len() - 1)
		agreement = func(out map[string]any) string {
			ref, _ := out["coef"].([]any)
			var worst, largest float64
			for j, v := range ref {
				r := v.(float64)
				largest = math.Max(largest, math.Abs(r))
				worst = math.Max(worst, math.Abs(r-b[j]))
			}
			return fmt.Sprintf("last fit: max coefficient difference %.1e of the largest", worst/largest)
		}
	} else {
		folds, err := cv.Random(c.n, c.folds, 1)
		if err != nil {
			return "", err
		}
		ids := make([]int64, c.n)
		for i, f := range folds.ID {
			ids[i] = int64(f)
		}
		fp := filepath.Join(dir, c.name+".folds")
		fh, err := os.Create(fp)
		if err != nil {
			return "", err
		}
		binary.Write(fh, binary.LittleEndian, ids)
		fh.Close()
		spec["folds"] = fp
		var res *cv.Result
		t, err := best(repeats, func() (err error) {
			// scikit-learn's estimators choose the minimum; so do we here.
			res, err = cv.Fit(ctx, d, folds, &cv.Settings{Path: s, Rule: cv.MinimumLoss})
			return err
		})
		if err != nil {
			return "", err
		}
		ours = t
		spec["penalties"] = res.Full.Penalties
		agreement = func(out map[string]any) string {
			a, _ := out["alpha"].(float64)
			return fmt.Sprintf("chosen penalty %.4g vs %.4g (%d grid steps apart)", res.Penalty(), a,
				int(math.Round(math.Abs(math.Log(res.Penalty()/a))/math.Log(res.Full.Penalties[0]/res.Full.Penalties[1]))))
		}
	}
	if python == "" {
		return fmt.Sprintf("| %s | %d | %d | %.3f | – | – | – |", c.name, c.n, c.p, ours), nil
	}
	if err := writeFloats(spec["x"].(string), x...); err != nil {
		return "", err
	}
	if err := writeFloats(spec["y"].(string), y); err != nil {
		return "", err
	}
	sp := filepath.Join(dir, c.name+".json")
	b, _ := json.Marshal(spec)
	if err := os.WriteFile(sp, b, 0o644); err != nil {
		return "", err
	}
	cmd := exec.Command(python, script, sp)
	cmd.Stderr = os.Stderr
	outb, err := cmd.Output()
	if err != nil {
		return "", fmt.Errorf("python: %v", err)
	}
	var out map[string]any
	if err := json.Unmarshal(outb, &out); err != nil {
		return "", err
	}
	theirs := out["seconds"].(float64)
	return fmt.Sprintf("| %s | %d | %d | %.3f | %.3f | %.1f× | %s |", c.name, c.n, c.p, ours, theirs, theirs/ours, agreement(out)), nil
}
