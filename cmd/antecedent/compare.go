package main

import (
	"context"
	"fmt"
	"io"
	"os"

	"github.com/antecedent-lab/antecedent/dag"
)

func runCompare(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := newFlags("compare", "--estimate FILE --truth FILE", stderr)
	estPath := fs.String("estimate", "", "estimated network: a result JSON, GraphML, DOT or edge-list CSV file (required)")
	truthPath := fs.String("truth", "", "true network, in any of the same forms (required)")
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

// readEdges reads the edges of any graph file the tool writes: a result
// JSON, a graph JSON, GraphML, DOT or an edge-list CSV.
func readEdges(path string) ([]dag.Edge, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	g, format, err := dag.Read(f)
	if err != nil {
		return nil, fmt.Errorf("%s (read as %v): %w", path, format, err)
	}
	return g.Edges(), nil
}
