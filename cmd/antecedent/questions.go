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

// demoQuestions asks the demo's network one intervention and one planning
// question, prints the answers and writes them as JSON into dir (when not
// empty).
func demoQuestions(ctx context.Context, res *antecedent.Result, d *table.Dataset, s *settings, dir string, stdout, stderr io.Writer) error {
	m, err := intervention.New(ctx, res, d)
	if err != nil {
		return err
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
		return err
	}
	if !s.quiet {
		fmt.Fprintln(stdout, "\n── An intervention question ──")
		writeAnswer(stdout, ans)
	}
	progress, finish = bar("studies")
	plan, err := sizing.Run(ctx, m, res.Order, &res.Config, &sizing.Settings{
		Sizes: demoSizes, Replicates: demoReplicates, Seed: s.seed, Workers: s.workers, Progress: progress,
	})
	finish()
	if err != nil {
		return err
	}
	need, err := plan.RowsFor(demoEdge[0], demoEdge[1], 0.8)
	if err != nil {
		return err
	}
	if !s.quiet {
		fmt.Fprintln(stdout, "\n── A planning question ──")
		writePlan(stdout, plan, &need, "the demo's result")
		fmt.Fprintln(stdout, "(A quick run; \"antecedent studysize\" takes more replicates and other sizes.)")
	}
	if dir == "" {
		return nil
	}
	if err := writeJSONFile(filepath.Join(dir, "effect.json"), ans); err != nil {
		return err
	}
	return writeJSONFile(filepath.Join(dir, "studysize.json"), struct {
		Plan   *sizing.Plan   `json:"plan"`
		Needed *sizing.Needed `json:"rows_needed"`
	}{plan, &need})
}
