package main

import (
	"bufio"
	"context"
	"fmt"
	"io"
	"strconv"

	"github.com/antecedent-lab/antecedent/internal/atomicfile"
	"github.com/antecedent-lab/antecedent/simulate"
)

func runSimulate(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := newFlags("simulate", "--data FILE.csv --order FILE --truth FILE.csv [options]", stderr)
	vars := fs.Int("variables", 20, "number of variables")
	tiers := fs.Int("tiers", 4, "number of tiers")
	rows := fs.Int("rows", 2000, "number of rows")
	binary := fs.Float64("binary", 0.3, "share of binary variables")
	density := fs.Float64("edge-probability", 0, "chance of each forward edge (0 = 2/variables)")
	seed := fs.Uint64("seed", 1, "seed")
	dataPath := fs.String("data", "", "write the data here (required)")
	orderPath := fs.String("order", "", "write the order here (required)")
	truthPath := fs.String("truth", "", "write the true edge list here (required)")
	if err := parse(fs, args); err != nil {
		return err
	}
	if *dataPath == "" || *orderPath == "" || *truthPath == "" {
		return usageError{"--data, --order and --truth are required"}
	}
	if *rows < 1 {
		return usageError{fmt.Sprintf("--rows %d: need at least 1", *rows)}
	}
	m, o, err := simulate.Random(simulate.RandomSettings{Variables: *vars, Tiers: *tiers, BinaryShare: *binary, EdgeProbability: *density}, *seed)
	if err != nil {
		return err
	}
	s, err := m.Sample(*rows, *seed)
	if err != nil {
		return err
	}
	if err := writeFile(ctx, *dataPath, func(w *bufio.Writer) error {
		for j, n := range s.Names {
			if j > 0 {
				w.WriteByte(',')
			}
			w.WriteString(n)
		}
		w.WriteByte('\n')
		for i := range *rows {
			for j, c := range s.Columns {
				if j > 0 {
					w.WriteByte(',')
				}
				w.WriteString(strconv.FormatFloat(c[i], 'g', 8, 64))
			}
			w.WriteByte('\n')
		}
		return nil
	}); err != nil {
		return err
	}
	if err := writeFile(ctx, *orderPath, func(w *bufio.Writer) error { return o.WriteText(w) }); err != nil {
		return err
	}
	g, err := m.Graph()
	if err != nil {
		return err
	}
	if err := writeFile(ctx, *truthPath, func(w *bufio.Writer) error {
		fmt.Fprintln(w, "from,to,weight")
		for _, e := range g.Edges() {
			fmt.Fprintf(w, "%s,%s,%g\n", e.From, e.To, e.Coefficient)
		}
		return nil
	}); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "wrote %d rows of %d variables (%d true edges) to %s, %s and %s\n", *rows, *vars, len(g.Edges()), *dataPath, *orderPath, *truthPath)
	return nil
}

// writeFile writes a file whole beside path and renames it into place.
func writeFile(ctx context.Context, path string, fill func(*bufio.Writer) error) error {
	return atomicfile.Write(ctx, path, 0o644, func(w io.Writer) error {
		bw := bufio.NewWriter(w)
		if err := fill(bw); err != nil {
			return err
		}
		return bw.Flush()
	})
}
