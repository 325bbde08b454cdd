package main

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"strings"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/intervention"
	"github.com/antecedent-lab/antecedent/report"
	"github.com/antecedent-lab/antecedent/sizing"
)

// files is a repeatable FILE flag.
type files []string

func (f *files) String() string { return strings.Join(*f, ",") }

func (f *files) Set(s string) error {
	if s == "" {
		return fmt.Errorf("want a file name")
	}
	*f = append(*f, s)
	return nil
}

// runRender draws the HTML report, the summary and the graph exports from
// a result JSON written by any run: this command, the Beam pipeline, or
// the library; answers written by effect and studysize join the report.
func runRender(ctx context.Context, args []string, stdout, stderr io.Writer) error {
	fs := newFlags("render", "--result FILE [--report FILE] [--effect FILE]... [--studysize FILE]... [--dot FILE] [--graphml FILE] [--edges FILE]", stderr)
	in := fs.String("result", "", "result JSON to render (required)")
	var s settings
	var effects, plans files
	s.registerGraphOutputs(fs)
	fs.Var(&effects, "effect", "an answer written by effect --json, shown in the report (repeatable)")
	fs.Var(&plans, "studysize", "a plan written by studysize --json, shown in the report (repeatable)")
	quiet := fs.Bool("quiet", false, "print nothing but errors")
	if err := parse(fs, args); err != nil {
		return err
	}
	if *in == "" {
		return usageError{"--result is required"}
	}
	if len(effects)+len(plans) > 0 && s.report == "" {
		return usageError{"--effect and --studysize are shown in the report: give --report FILE"}
	}
	inputs := append(append([]string{*in}, effects...), plans...)
	if err := s.checkOutputs(inputs...); err != nil {
		return err
	}
	b, err := os.ReadFile(*in)
	if err != nil {
		return err
	}
	res, err := antecedent.ReadResult(bytes.NewReader(b))
	if err != nil {
		return err
	}
	ropts := &report.Options{}
	for _, p := range effects {
		var a intervention.Answer
		if err := readAnswer(p, &a); err != nil {
			return err
		}
		if a.Cause == "" {
			return fmt.Errorf("%s: not an answer written by effect --json (no cause)", p)
		}
		ropts.Interventions = append(ropts.Interventions, &a)
	}
	for _, p := range plans {
		var a sizing.Answer
		if err := readAnswer(p, &a); err != nil {
			return err
		}
		if a.Plan == nil || len(a.Plan.Sizes) == 0 {
			return fmt.Errorf("%s: not a plan written by studysize --json (no sizes)", p)
		}
		ropts.Plans = append(ropts.Plans, &a)
	}
	if !*quiet {
		writeSummary(stdout, res, nil)
	}
	return s.outputs(ctx, res, ropts, inputs...)
}

// readAnswer decodes the JSON file at path into v, refusing fields v does
// not have.
func readAnswer(path string, v any) error {
	b, err := os.ReadFile(path)
	if err != nil {
		return err
	}
	dec := json.NewDecoder(bytes.NewReader(b))
	dec.DisallowUnknownFields()
	if err := dec.Decode(v); err != nil {
		return fmt.Errorf("%s: %w", path, err)
	}
	return nil
}
