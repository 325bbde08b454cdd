package main

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"strings"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/intervention"
	"github.com/antecedent-lab/antecedent/table"
)

func runEffect(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := newFlags("effect", "--result FILE.json --data FILE.csv --cause NAME [options]", stderr)
	resultPath := fs.String("result", "", "result JSON written by discover --json (required)")
	dataPath := fs.String("data", "", "the data the result was discovered on (a CSV file, a Parquet file or a directory of Parquet parts), read with the reading options discover was given (required)")
	cause := fs.String("cause", "", "the variable to act on (required)")
	ifA := fs.String("if", "", `the setting asked about: "set:VALUE", "shift:AMOUNT" or "observed" (default set:1 for a binary cause)`)
	versus := fs.String("versus", "", `the setting compared with (default set:0 for a binary cause, "observed" otherwise)`)
	outcomes := fs.String("outcomes", "", "comma-separated outcomes (default: every descendant of the cause)")
	resamples := fs.Int("resamples", 200, "bootstrap resamples")
	draws := fs.Int("draws", 20, "draws per row of binary variables that later variables depend on")
	seed := fs.Uint64("seed", 1, "seed for resamples and draws")
	workers := fs.Int("workers", 0, "resamples computed at once (0 = number of CPUs)")
	jsonOut := fs.String("json", "", "write the answer as JSON to this file")
	quiet := fs.Bool("quiet", false, "print nothing but errors")
	var rs reading
	rs.register(fs)
	if err := parse(fs, args); err != nil {
		return err
	}
	if *resultPath == "" || *dataPath == "" || *cause == "" {
		return usageError{"--result, --data and --cause are required"}
	}
	res, d, err := readResultAndData(ctx, *resultPath, *dataPath, &rs)
	if err != nil {
		return err
	}
	q := intervention.Question{Cause: *cause}
	if *outcomes != "" {
		for _, o := range strings.Split(*outcomes, ",") {
			q.Outcomes = append(q.Outcomes, strings.TrimSpace(o))
		}
	}
	if q.A, q.B, err = actions(res, *cause, *ifA, *versus); err != nil {
		return err
	}
	ctx, stop := context.WithCancel(ctx)
	defer stop()
	m, err := intervention.New(ctx, res, d)
	if err != nil {
		return err
	}
	s := &intervention.Settings{Resamples: *resamples, Draws: *draws, Seed: *seed, Workers: *workers}
	if !*quiet && isTerminal(stderr) {
		bar := newProgressBar(stderr)
		s.Progress = func(done, total int) { bar.update(antecedent.Progress{Done: done, Total: total, Stage: "resamples"}) }
		defer bar.finish()
	}
	ans, err := m.Effect(ctx, q, s)
	if err != nil {
		if errors.Is(err, intervention.ErrQuestion) {
			return usageError{err.Error()}
		}
		return err
	}
	if *jsonOut != "" {
		if err := writeJSONFile(*jsonOut, ans, *resultPath, *dataPath); err != nil {
			return err
		}
	}
	if !*quiet {
		writeAnswer(stdout, ans)
	}
	return nil
}

// actions reads the two settings, with the defaults for a binary cause
// (on versus off) and for a shift (versus as observed).
func actions(res *antecedent.Result, cause, a, b string) (intervention.Action, intervention.Action, error) {
	binary := false
	if n, err := res.Node(cause); err == nil {
		binary = n.Kind == table.Binary
	}
	if a == "" {
		if !binary {
			return intervention.Action{}, intervention.Action{}, usageError{"--if is required for a continuous cause (for example --if shift:-10 or --if set:60)"}
		}
		a = "set:1"
	}
	A, err := intervention.ParseAction(a)
	if err != nil {
		return A, A, usageError{"--if: " + err.Error()}
	}
	if b == "" {
		b = "observed"
		if binary {
			b = "set:0"
		}
	}
	B, err := intervention.ParseAction(b)
	if err != nil {
		return A, B, usageError{"--versus: " + err.Error()}
	}
	return A, B, nil
}

// readResultAndData reads a result JSON and the data (CSV or Parquet) it
// was discovered on, with the reading options rs (those discover was
// given).
func readResultAndData(ctx context.Context, resultPath, dataPath string, rs *reading) (*antecedent.Result, *table.Dataset, error) {
	copts, err := rs.options()
	if err != nil {
		return nil, nil, err
	}
	f, err := os.Open(resultPath)
	if err != nil {
		return nil, nil, err
	}
	defer f.Close()
	res, err := antecedent.ReadResult(f)
	if err != nil {
		return nil, nil, fmt.Errorf("%s: %w", resultPath, err)
	}
	d, err := readData(ctx, dataPath, copts)
	if err != nil {
		return nil, nil, err
	}
	return res, d, nil
}

// writeJSONFile writes v as indented JSON to path, refusing to write over
// an input.
func writeJSONFile(path string, v any, inputs ...string) error {
	for _, in := range inputs {
		if samePath(path, in) {
			return usageError{fmt.Sprintf("refusing to write %s over the input file %s", path, in)}
		}
	}
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetIndent("", "  ")
	if err := enc.Encode(v); err != nil {
		return err
	}
	return os.WriteFile(path, buf.Bytes(), 0o644)
}

// writeAnswer prints an answer as text.
func writeAnswer(w io.Writer, a *intervention.Answer) {
	fmt.Fprintf(w, "What if %s were %v rather than %v?\n", a.Cause, a.A, a.B)
	fmt.Fprintf(w, "g-computation over %d rows; %g%% bootstrap intervals from %d resamples (equations refitted on each, parent sets fixed).\n\n",
		a.Rows, 100*a.Level, a.Resamples-a.Failed)
	width := len("outcome")
	for _, o := range a.Outcomes {
		width = max(width, len(o.Name))
	}
	fmt.Fprintf(w, "  %-*s  %-24s  %-24s  %-26s  %s\n", width, "outcome", a.A.String(), a.B.String(), "difference", "ratio")
	for _, o := range a.Outcomes {
		ratio := ""
		if o.Binary {
			ratio = interval(o.Ratio, 2)
		}
		digits := 2
		if o.Binary {
			digits = 3
		}
		note := ""
		if !o.Downstream {
			note = "  (not downstream: unchanged)"
		}
		fmt.Fprintf(w, "  %-*s  %-24s  %-24s  %-26s  %s%s\n", width, o.Name,
			interval(o.MeanA, digits), interval(o.MeanB, digits), interval(o.Difference, digits), ratio, note)
	}
	fmt.Fprintln(w, "\nThe same difference from one regression of the outcome on the cause and an adjustment set:")
	for _, o := range a.Outcomes {
		for _, adj := range o.Adjusted {
			digits := 2
			if o.Binary {
				digits = 3
			}
			fmt.Fprintf(w, "  %-*s  %-22s {%s}: %s\n", width, o.Name, adj.Name, strings.Join(adj.Set, ", "), interval(adj.Difference, digits))
		}
	}
	paths := false
	for _, o := range a.Outcomes {
		if o.Paths == nil || !o.Downstream {
			continue
		}
		if !paths {
			fmt.Fprintf(w, "\nPath decomposition of linear parts (per unit of %s):\n", a.Cause)
			paths = true
		}
		fmt.Fprintf(w, "  %s: total %s = direct %s", o.Name, num(o.Paths.Total.Value, 3), num(o.Paths.Direct.Value, 3))
		for _, m := range o.Paths.Mediators {
			fmt.Fprintf(w, "; through %s %s", m.Name, num(m.Effect.Value, 3))
		}
		fmt.Fprintln(w)
	}
	if len(a.Warnings) > 0 {
		fmt.Fprintln(w, "\nWarnings:")
		for _, s := range a.Warnings {
			fmt.Fprintln(w, "  "+s)
		}
	}
	fmt.Fprintln(w, "\nCaution:")
	for _, s := range a.Cautions {
		fmt.Fprintln(w, "  "+s)
	}
}

// interval formats an estimate as "v [lo, hi]".
func interval(e intervention.Estimate, digits int) string {
	return fmt.Sprintf("%s [%s, %s]", num(e.Value, digits), num(e.Lower, digits), num(e.Upper, digits))
}
