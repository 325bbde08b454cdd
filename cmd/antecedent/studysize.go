package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"slices"
	"strconv"
	"strings"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/dag"
	"github.com/antecedent-lab/antecedent/intervention"
	"github.com/antecedent-lab/antecedent/sizing"
)

func runStudySize(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := newFlags("studysize", "--result FILE.json --data FILE.csv [options]", stderr)
	resultPath := fs.String("result", "", "result JSON written by discover --json (required)")
	dataPath := fs.String("data", "", "the data the result was discovered on (a CSV file, a Parquet file or a directory of Parquet parts), read with the reading options discover was given (required)")
	sizes := fs.String("sizes", "250,500,1000,2000", "comma-separated study sizes (rows), increasing")
	replicates := fs.Int("replicates", 50, "simulated studies of each size")
	edge := fs.String("edge", "", `answer "rows needed" for this edge, written FROM->TO`)
	prob := fs.Float64("probability", 0.8, "share of studies that should find --edge")
	seed := fs.Uint64("seed", 1, "seed for the simulated studies")
	workers := fs.Int("workers", 0, "studies run at once (0 = number of CPUs)")
	jsonOut := fs.String("json", "", "write the plan as JSON to this file")
	quiet := fs.Bool("quiet", false, "print nothing but errors")
	var rs reading
	rs.register(fs)
	if err := parse(fs, args); err != nil {
		return err
	}
	if *resultPath == "" || *dataPath == "" {
		return usageError{"--result and --data are required"}
	}
	ns, err := parseSizes(*sizes)
	if err != nil {
		return err
	}
	from, to, err := parseEdge(*edge)
	if err != nil {
		return err
	}
	res, d, err := readResultAndData(ctx, *resultPath, *dataPath, &rs)
	if err != nil {
		return err
	}
	m, err := intervention.New(ctx, res, d)
	if err != nil {
		return err
	}
	if from != "" {
		if !slices.ContainsFunc(m.Edges(), func(e dag.Edge) bool { return e.From == from && e.To == to }) {
			return usageError{fmt.Sprintf("--edge: %s → %s is not an edge of the network in %s (a plan can only ask about edges the network has)", from, to, *resultPath)}
		}
	}
	s := &sizing.Settings{Sizes: ns, Replicates: *replicates, Seed: *seed, Workers: *workers}
	if !*quiet && isTerminal(stderr) {
		bar := newProgressBar(stderr)
		s.Progress = func(done, total int) { bar.update(antecedent.Progress{Done: done, Total: total, Stage: "studies"}) }
		defer bar.finish()
	}
	p, err := sizing.Run(ctx, m, res.Order, &res.Config, s)
	if err != nil {
		if errors.Is(err, sizing.ErrSettings) {
			return usageError{err.Error()}
		}
		return err
	}
	var need *sizing.Needed
	if from != "" {
		n, err := p.RowsFor(from, to, *prob)
		if err != nil {
			return usageError{err.Error()}
		}
		need = &n
	}
	answer := &sizing.Answer{Plan: p, Needed: need}
	if *jsonOut != "" {
		if err := writeJSONFile(*jsonOut, answer, *resultPath, *dataPath); err != nil {
			return err
		}
	}
	if !*quiet {
		writePlan(stdout, answer, *resultPath)
	}
	return nil
}

func parseSizes(s string) ([]int, error) {
	var out []int
	for _, f := range strings.Split(s, ",") {
		n, err := strconv.Atoi(strings.TrimSpace(f))
		if err != nil || n < 1 {
			return nil, usageError{fmt.Sprintf("--sizes: %q is not a number of rows", f)}
		}
		out = append(out, n)
	}
	return out, nil
}

func parseEdge(s string) (string, string, error) {
	if s == "" {
		return "", "", nil
	}
	from, to, ok := strings.Cut(s, "->")
	from, to = strings.TrimSpace(from), strings.TrimSpace(to)
	if !ok || from == "" || to == "" {
		return "", "", usageError{fmt.Sprintf("--edge %q: write FROM->TO", s)}
	}
	return from, to, nil
}

// writePlan prints a plan and its rows needed as text.
func writePlan(w io.Writer, a *sizing.Answer, source string) {
	p, need := a.Plan, a.Needed
	fmt.Fprintf(w, "Studies drawn from the network in %s, %d of each size, each discovered with the same settings.\n", source, p.Replicates)
	fmt.Fprintln(w, "Share of studies that find each edge (± Monte Carlo standard error):")
	fmt.Fprintln(w)
	width := len("edge")
	for _, e := range p.Edges {
		width = max(width, len(e.From)+len(e.To)+4)
	}
	fmt.Fprintf(w, "  %-*s", width, "edge")
	for _, n := range p.Sizes {
		fmt.Fprintf(w, "  %13s", fmt.Sprintf("%d rows", n))
	}
	fmt.Fprintln(w)
	for _, e := range p.Edges {
		fmt.Fprintf(w, "  %-*s", width, e.From+" -> "+e.To)
		for _, r := range e.Found {
			fmt.Fprintf(w, "  %13s", fmt.Sprintf("%.2f ± %.2f", r.Value, r.SE))
		}
		fmt.Fprintln(w)
	}
	fmt.Fprintf(w, "  %-*s", width, "false edges")
	for _, f := range p.False {
		fmt.Fprintf(w, "  %13s", fmt.Sprintf("%.2f ± %.2f", f.Mean, f.SE))
	}
	fmt.Fprintf(w, "\n  (false edges: mean number per study of edges the network lacks, among %d candidate pairs)\n", p.Pairs)
	if need != nil {
		fmt.Fprintln(w)
		switch need.Status {
		case sizing.Reached:
			fmt.Fprintf(w, "Rows needed to find %s -> %s in %.0f%% of studies: about %d (between %d and %d rows; interpolated).\n",
				need.From, need.To, 100*need.Probability, need.Rows, need.Below, need.Above)
		case sizing.AtSmallest:
			fmt.Fprintf(w, "%s -> %s is found in %.0f%% of studies already at %d rows; try smaller sizes to narrow it down.\n",
				need.From, need.To, 100*need.Probability, need.Rows)
		default:
			fmt.Fprintf(w, "%s -> %s is not found in %.0f%% of studies even at %d rows; try larger sizes.\n",
				need.From, need.To, 100*need.Probability, p.Sizes[len(p.Sizes)-1])
		}
	}
	for _, s := range p.Warnings {
		fmt.Fprintln(w, "Warning: "+s)
	}
	fmt.Fprintln(w, "\nCaution:")
	for _, s := range p.Cautions {
		fmt.Fprintln(w, "  "+s)
	}
}
