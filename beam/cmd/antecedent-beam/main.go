// Command antecedent-beam runs antecedent's discovery as an Apache Beam
// pipeline, on Prism in this process or on a cluster (Dataflow, Flink,
// Spark) through Beam's runner flags, and writes the same result JSON as
// "antecedent discover --json". Draw the report from it with
// "antecedent render --result FILE --report FILE".
//
//	antecedent-beam --data 'shards/*.csv' --order o.txt --json result.json
//	antecedent-beam --runner dataflow --project P --region R \
//	    --temp_location gs://B/tmp --data 'gs://B/in/*.csv' --order gs://B/o.txt --json gs://B/result.json
//
// The result is a hypothesis drawn from observational data: confounding
// can mislead, and it is no substitute for clinical judgement, local rules
// or licensed statistical and medical review.
package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"slices"
	"strings"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/beam/pipeline"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/apache/beam/sdks/v2/go/pkg/beam"
	"github.com/apache/beam/sdks/v2/go/pkg/beam/io/filesystem"
	"github.com/apache/beam/sdks/v2/go/pkg/beam/x/beamx"

	_ "github.com/apache/beam/sdks/v2/go/pkg/beam/runners/dataflow"  // --runner dataflow
	_ "github.com/apache/beam/sdks/v2/go/pkg/beam/runners/prism"     // --runner prism (the default here)
	_ "github.com/apache/beam/sdks/v2/go/pkg/beam/runners/universal" // --runner universal: Flink and Spark job servers
)

var (
	data      = flag.String("data", "", "CSV shards, one header each: comma-separated paths or globs, local, gs:// (required); rows follow the listed order, files of one glob in name order")
	orderPath = flag.String("order", "", "order file, text or JSON form (required)")
	output    = flag.String("json", "", "where to write the result JSON (required)")
	folds     = flag.Int("folds", 10, "cross-validation folds")
	seed      = flag.Uint64("seed", 1, "seed for folds and subsamples")
	pairs     = flag.Int("stability-pairs", 0, "complementary pairs for stability selection (0 = off)")
	threshold = flag.Float64("stability-threshold", 0.75, "selection frequency an edge needs, in (0.5, 1]")
	sameTier  = flag.Bool("same-tier", false, "also report same-tier associations as undirected links")
)

func main() {
	flag.Usage = func() {
		fmt.Fprintln(os.Stderr, "Usage: antecedent-beam --data SHARDS --order FILE --json FILE [options] [Beam runner flags]")
		flag.PrintDefaults()
	}
	flag.Parse()
	if !slices.ContainsFunc(os.Args, func(a string) bool { return strings.HasPrefix(strings.TrimLeft(a, "-"), "runner") }) {
		flag.Set("runner", "prism")
	}
	beam.Init()
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	if err := run(ctx); err != nil {
		fmt.Fprintln(os.Stderr, "antecedent-beam: "+strings.ReplaceAll(err.Error(), "\n", "; "))
		os.Exit(1)
	}
}

func run(ctx context.Context) error {
	if *data == "" || *orderPath == "" || *output == "" {
		flag.Usage()
		return fmt.Errorf("--data, --order and --json are required")
	}
	shards, err := expand(ctx, *data)
	if err != nil {
		return err
	}
	o, err := readOrder(ctx, *orderPath)
	if err != nil {
		return err
	}
	cfg := &antecedent.Config{Folds: *folds, Seed: *seed, SameTier: *sameTier,
		Stability: antecedent.Stability{Pairs: *pairs, Threshold: *threshold}}
	if *pairs == 0 {
		cfg.Stability.Threshold = 0
	}
	p, s := beam.NewPipelineWithRoot()
	if err := pipeline.Build(s, pipeline.Settings{Shards: shards, Order: o, Config: cfg, Output: *output}); err != nil {
		return err
	}
	fmt.Fprintf(os.Stderr, "antecedent-beam: %d shards; the result goes to %s\n", len(shards), *output)
	if err := beamx.Run(ctx, p); err != nil {
		return err
	}
	fmt.Fprintln(os.Stderr, "antecedent-beam: done. The network is a hypothesis drawn from observational data; confounding can mislead; it is no substitute for clinical judgement, local rules or licensed statistical and medical review.")
	return nil
}

// expand turns the --data list into shard paths, each glob's files in
// name order.
func expand(ctx context.Context, list string) ([]string, error) {
	var out []string
	for _, pat := range strings.Split(list, ",") {
		pat = strings.TrimSpace(pat)
		if pat == "" {
			continue
		}
		fs, err := filesystem.New(ctx, pat)
		if err != nil {
			return nil, err
		}
		files, err := fs.List(ctx, pat)
		fs.Close()
		if err != nil {
			return nil, err
		}
		if len(files) == 0 {
			return nil, fmt.Errorf("no file matches %s", pat)
		}
		slices.Sort(files)
		out = append(out, files...)
	}
	return out, nil
}

func readOrder(ctx context.Context, path string) (*order.Order, error) {
	fs, err := filesystem.New(ctx, path)
	if err != nil {
		return nil, err
	}
	defer fs.Close()
	r, err := fs.OpenRead(ctx, path)
	if err != nil {
		return nil, err
	}
	defer r.Close()
	o, err := order.Parse(io.LimitReader(r, 16<<20))
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return o, nil
}
