package main

import (
	"context"
	"fmt"
	"io"
	"path/filepath"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/intervention"
	"github.com/antecedent-lab/antecedent/sizing"
	"github.com/antecedent-lab/antecedent/table"
)

// The demo's two questions of the fitted network: what giving tranexamic
// acid to every patient rather than to none would change, and how many
// patients a new study needs to find that a transfusion lengthens the
// stay. The README shows both.
var (
	demoQuestion = intervention.Question{Cause: "tranexamic_acid", A: intervention.SetTo(1), B: intervention.SetTo(0)}
	demoEdge     = [2]string{"transfusion", "length_of_stay"}
	demoSizes    = []int{100, 200, 400, 800}
)

const (
	demoResamples  = 200
	demoReplicates = 20
)

// demoAnswers are the demo's two answers.
type demoAnswers struct {
	effect *intervention.Answer
	plan   *sizing.Answer
}

// askDemo asks the demo's network one intervention and one planning
// question.
func askDemo(ctx context.Context, res *antecedent.Result, d *table.Dataset, s *settings, stderr io.Writer) (*demoAnswers, error) {
	m, err := intervention.New(ctx, res, d)
	if err != nil {
		return nil, err
	}
	bar := func(stage string) (func(done, total int), func()) {
		if s.quiet || !isTerminal(stderr) {
			return nil, func() {}
		}
		b := newProgressBar(stderr)
		return func(done, total int) { b.update(antecedent.Progress{Done: done, Total: total, Stage: stage}) }, b.finish
	}
	progress, finish := bar("resamples")
	ans, err := m.Effect(ctx, demoQuestion, &intervention.Settings{Resamples: demoResamples, Seed: s.seed, Workers: s.workers, Progress: progress})
	finish()
	if err != nil {
		return nil, err
	}
	progress, finish = bar("studies")
	plan, err := sizing.Run(ctx, m, res.Order, &res.Config, &sizing.Settings{
		Sizes: demoSizes, Replicates: demoReplicates, Seed: s.seed, Workers: s.workers, Progress: progress,
	})
	finish()
	if err != nil {
		return nil, err
	}
	need, err := plan.RowsFor(demoEdge[0], demoEdge[1], 0.8)
	if err != nil {
		return nil, err
	}
	return &demoAnswers{ans, &sizing.Answer{Plan: plan, Needed: &need}}, nil
}

// write prints the answers (unless quiet) and writes them as JSON into
// dir (when not empty).
func (a *demoAnswers) write(dir string, quiet bool, stdout io.Writer) error {
	if !quiet {
		fmt.Fprintln(stdout, "\n── An intervention question ──")
		writeAnswer(stdout, a.effect)
		fmt.Fprintln(stdout, "\n── A planning question ──")
		writePlan(stdout, a.plan, "the demo's result")
		fmt.Fprintln(stdout, "(A quick run; \"antecedent studysize\" takes more replicates and other sizes.)")
	}
	if dir == "" {
		return nil
	}
	if err := writeJSONFile(filepath.Join(dir, "effect.json"), a.effect); err != nil {
		return err
	}
	return writeJSONFile(filepath.Join(dir, "studysize.json"), a.plan)
}
