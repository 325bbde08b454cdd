package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/internal/atomicfile"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/report"
	"github.com/antecedent-lab/antecedent/table"
)

// settings are the options shared by demo and discover.
type settings struct {
	folds     int
	rule      string
	selection string
	measure   string
	seed      uint64
	pairs     int
	threshold float64
	workers   int
	missing   string
	sameTier  bool
	quiet     bool
	jsonOut   string
	dotOut    string
	graphml   string
	edges     string
	report    string
}

// outPaths lists the output files asked for, in the order they are
// written.
func (s *settings) outPaths() []string {
	var ps []string
	for _, p := range []string{s.jsonOut, s.dotOut, s.graphml, s.edges, s.report} {
		if p != "" {
			ps = append(ps, p)
		}
	}
	return ps
}

// registerGraphOutputs registers the graph exports (and the report), which
// discover, demo and render share.
func (s *settings) registerGraphOutputs(fs *flag.FlagSet) {
	fs.StringVar(&s.dotOut, "dot", "", "write the graph in DOT to this file (tiers as rows)")
	fs.StringVar(&s.graphml, "graphml", "", "write the graph as GraphML to this file")
	fs.StringVar(&s.edges, "edges", "", "write the edges as a CSV edge list to this file")
	fs.StringVar(&s.report, "report", "", "write a self-contained HTML report to this file")
}

func (s *settings) register(fs *flag.FlagSet) {
	fs.IntVar(&s.folds, "folds", 10, "cross-validation folds")
	fs.StringVar(&s.rule, "rule", "default", "penalty choice: one-se, half-se, quarter-se, paired or minimum; default is quarter-se for the adaptive lasso's second stage, one-se for the others and for stability selection")
	fs.StringVar(&s.selection, "selection", "adaptive", "how parents are chosen: adaptive (adaptive lasso), lasso (the textbook lasso) or relaxed (relaxed lasso)")
	fs.StringVar(&s.measure, "measure", "deviance", "cross-validated loss: deviance, mse, mae, auc or misclassification (auc and misclassification score binary nodes; continuous ones then use deviance)")
	fs.Uint64Var(&s.seed, "seed", 1, "seed for folds and subsamples")
	fs.IntVar(&s.pairs, "stability-pairs", 0, "complementary pairs for stability selection (0 = off)")
	fs.Float64Var(&s.threshold, "stability-threshold", 0.75, "selection frequency an edge needs, in (0.5, 1]")
	fs.IntVar(&s.workers, "workers", 0, "goroutines fitting nodes (0 = number of CPUs); on tables of 5·10⁷ cells or more the folds of one node at a time")
	fs.StringVar(&s.missing, "missing", "error", "missing values: error, complete-case or available-case")
	fs.BoolVar(&s.sameTier, "same-tier", false, "also report same-tier associations as undirected links")
	fs.BoolVar(&s.quiet, "quiet", false, "print nothing but errors")
	fs.StringVar(&s.jsonOut, "json", "", "write the result as JSON to this file")
	s.registerGraphOutputs(fs)
}

// config maps the flags onto a Config and lets the Config check them; a
// value it refuses is a usage error.
func (s *settings) config() (*antecedent.Config, error) {
	c := &antecedent.Config{Folds: s.folds, Seed: s.seed, Workers: s.workers, SameTier: s.sameTier,
		Stability: antecedent.Stability{Pairs: s.pairs, Threshold: s.threshold}}
	var err error
	if err := c.Selection.UnmarshalText([]byte(s.selection)); err != nil {
		return nil, usageError{"--selection: " + err.Error()}
	}
	if c.CV.Rule, err = cv.ParseRule(s.rule); err != nil {
		return nil, usageError{"--rule: " + err.Error()}
	}
	if c.CV.Measure, err = cv.ParseMeasure(s.measure); err != nil {
		return nil, usageError{"--measure: " + err.Error()}
	}
	if err := c.Missing.UnmarshalText([]byte(s.missing)); err != nil {
		return nil, usageError{"--missing: " + err.Error()}
	}
	if err := c.Validate(); err != nil {
		var ce *antecedent.ConfigError
		if errors.As(err, &ce) && flagOf[ce.Field] != "" {
			return nil, usageError{fmt.Sprintf("%s %s: %s", flagOf[ce.Field], ce.Value, ce.Reason)}
		}
		return nil, usageError{err.Error()}
	}
	return c, nil
}

// flagOf names the flag that sets a Config field.
var flagOf = map[string]string{
	"Folds": "--folds", "Workers": "--workers",
	"Stability.Pairs": "--stability-pairs", "Stability.Threshold": "--stability-threshold",
}

// discover runs Discover with a progress bar on stderr when it is a
// terminal and output is not quiet.
func (s *settings) discover(ctx context.Context, d *table.Dataset, o *order.Order, cfg *antecedent.Config, stderr io.Writer) (*antecedent.Result, error) {
	if !s.quiet && isTerminal(stderr) {
		bar := newProgressBar(stderr)
		cfg.Progress = bar.update
		defer bar.finish()
	}
	return antecedent.DiscoverContext(ctx, d, o, cfg)
}

// outputs writes the requested exports, refusing to overwrite inputs. Each
// file is written whole beside its target and renamed into place, so an
// error or an interrupt (ctx) leaves the old file, never a truncated one.
// checkOutputs reports, before any work, an output path that is an input
// or whose folder cannot be written.
func (s *settings) checkOutputs(inputs ...string) error {
	for _, p := range s.outPaths() {
		for _, in := range inputs {
			if samePath(p, in) {
				return usageError{fmt.Sprintf("refusing to write %s over the input file %s", p, in)}
			}
		}
		if fi, err := os.Stat(p); err == nil && fi.IsDir() {
			return fmt.Errorf("%s is a folder, not a file to write", p)
		}
		f, err := os.CreateTemp(filepath.Dir(p), ".antecedent-check-*")
		if err != nil {
			return fmt.Errorf("cannot write %s: %w", p, err)
		}
		f.Close()
		os.Remove(f.Name())
	}
	return nil
}

func (s *settings) outputs(ctx context.Context, res *antecedent.Result, ropts *report.Options, inputs ...string) error {
	type out struct {
		path  string
		write func(io.Writer) error
	}
	g, err := res.Graph()
	if err != nil {
		return err
	}
	outs := []out{
		{s.jsonOut, res.WriteJSON},
		{s.dotOut, func(w io.Writer) error {
			b, err := g.DOT("antecedent")
			if err != nil {
				return err
			}
			_, err = w.Write(append(b, '\n'))
			return err
		}},
		{s.graphml, g.GraphML},
		{s.edges, g.WriteEdgeCSV},
		{s.report, func(w io.Writer) error { return report.Write(w, res, ropts) }},
	}
	for _, o := range outs {
		if o.path == "" {
			continue
		}
		for _, in := range inputs {
			if samePath(o.path, in) {
				return usageError{fmt.Sprintf("refusing to write %s over the input file %s", o.path, in)}
			}
		}
		if err := atomicfile.Write(ctx, o.path, 0o644, o.write); err != nil {
			return err
		}
	}
	return nil
}

func samePath(a, b string) bool {
	if a == "" || b == "" {
		return false
	}
	if fa, err := os.Stat(a); err == nil {
		if fb, err := os.Stat(b); err == nil {
			return os.SameFile(fa, fb)
		}
	}
	pa, _ := filepath.Abs(a)
	pb, _ := filepath.Abs(b)
	return pa == pb
}

func runDiscover(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := newFlags("discover", "--data FILE.csv|FILE.parquet|DIR --order FILE [options]", stderr)
	var s settings
	var rs reading
	dataPath := fs.String("data", "", "the data: a CSV file with a header row, a Parquet file (.parquet), or a directory of Parquet parts (required)")
	orderPath := fs.String("order", "", "order file, text or JSON form (required)")
	s.register(fs)
	rs.register(fs)
	if err := parse(fs, args); err != nil {
		return err
	}
	if *dataPath == "" || *orderPath == "" {
		return usageError{"--data and --order are required"}
	}
	cfg, err := s.config()
	if err != nil {
		return err
	}
	if err := s.checkOutputs(*dataPath, *orderPath); err != nil {
		return err
	}
	copts, err := rs.options()
	if err != nil {
		return err
	}
	d, err := readData(ctx, *dataPath, copts)
	if err != nil {
		return err
	}
	o, err := readOrder(*orderPath)
	if err != nil {
		return err
	}
	res, err := s.discover(ctx, d, o, cfg, stderr)
	if err != nil {
		return missingHint(err)
	}
	if err := s.outputs(ctx, res, &report.Options{Title: "Discovered network: " + filepath.Base(*dataPath)}, *dataPath, *orderPath); err != nil {
		return err
	}
	if !s.quiet {
		writeSummary(stdout, res, nil)
	}
	return nil
}

func readOrder(path string) (*order.Order, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	o, err := order.Parse(f)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return o, nil
}
