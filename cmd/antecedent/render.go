package main

import (
	"bytes"
	"context"
	"io"
	"os"

	"github.com/antecedent-lab/antecedent"
)

// runRender draws the HTML report, the summary and the graph exports from
// a result JSON written by any run: this command, the Beam pipeline, or
// the library.
func runRender(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := newFlags("render", "--result FILE [--report FILE] [--dot FILE] [--graphml FILE] [--edges FILE]", stderr)
	in := fs.String("result", "", "result JSON to render (required)")
	var s settings
	s.registerGraphOutputs(fs)
	quiet := fs.Bool("quiet", false, "print nothing but errors")
	if err := parse(fs, args); err != nil {
		return err
	}
	if *in == "" {
		return usageError{"--result is required"}
	}
	b, err := os.ReadFile(*in)
	if err != nil {
		return err
	}
	res, err := antecedent.ReadResult(bytes.NewReader(b))
	if err != nil {
		return err
	}
	if !*quiet {
		writeSummary(stdout, res, nil)
	}
	return s.outputs(ctx, res, nil, *in)
}
