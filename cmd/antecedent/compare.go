package main

import (
	"bytes"
	"context"
	"fmt"
	"io"
	"os"
	"strings"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/dag"
)

func runCompare(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := newFlags("compare", "--estimate FILE --truth FILE", stderr)
	estPath := fs.String("estimate", "", "estimated network: a result JSON or an edge-list CSV (required)")
	truthPath := fs.String("truth", "", "true network: an edge-list CSV or graph JSON (required)")
	if err := parse(fs, args); err != nil {
		return err
	}
	if *estPath == "" || *truthPath == "" {
		return usageError{"--estimate and --truth are required"}
	}
	est, err := readEdges(*estPath)
	if err != nil {
		return err
	}
	tru, err := readEdges(*truthPath)
	if err != nil {
		return err
	}
	s, err := dag.Compare(est, tru)
	if err != nil {
		return err
	}
	fmt.Fprintf(stdout, "estimated edges   %d\ntrue edges        %d\ncorrect           %d\nreversed          %d\nextra             %d\nmissing           %d\n",
		len(est), len(tru), s.Correct, s.Reversed, s.Extra, s.Missing)
	fmt.Fprintf(stdout, "precision         %.3f\nrecall            %.3f\nF1                %.3f\nskeleton precision %.3f\nskeleton recall   %.3f\nstructural Hamming distance %d (a reversal counts once)\n",
		s.Precision, s.Recall, s.F1, s.SkeletonPrecision, s.SkeletonRecall, s.SHD)
	return nil
}

// readEdges reads edges from a result JSON, a graph JSON or an edge-list CSV.
func readEdges(path string) ([]dag.Edge, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	if t := bytes.TrimSpace(b); len(t) > 0 && t[0] == '{' {
		if strings.Contains(string(t[:min(len(t), 1<<16)]), `"nodes": [`) || bytes.Contains(t, []byte(`"config"`)) {
			if res, err := antecedent.ReadResult(bytes.NewReader(b)); err == nil {
				return res.Edges, nil
			}
		}
		g, err := dag.ReadJSON(bytes.NewReader(b))
		if err != nil {
			return nil, fmt.Errorf("%s: %w", path, err)
		}
		return g.Edges(), nil
	}
	g, err := dag.ReadEdgeCSV(bytes.NewReader(b))
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return g.Edges(), nil
}
