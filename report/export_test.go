package report

import (
	"context"
	"strings"
	"sync"
	"testing"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/intervention"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/sizing"
	"github.com/antecedent-lab/antecedent/table"
)

// ClearMargin is the least clearance the drawing keeps between an edge
// and a box it does not join.
const ClearMargin = clearMargin

// CheckPage reads the network drawing from a report page and measures it
// (see drawing.check): the least clearance between a path and a box it does
// not join, where that was, the faults found, and the number of paths.
func CheckPage(page string) (clear float64, where string, faults []string, paths int, err error) {
	dr, err := readDrawing(page)
	if err != nil {
		return 0, "", nil, 0, err
	}
	clear, where, faults = dr.check()
	return clear, where, faults, len(dr.Paths), nil
}

// QuestionAnswers returns answers computed on a network discovered from a
// simulated study of our own (package simulate, seeded): two intervention
// answers (a shift of a continuous cause whose effect on a continuous
// outcome runs directly and through a mediator, so its paths are charted,
// and a binary outcome; and a cause none of the outcomes descends from)
// and two study plans (one asking the rows needed for an edge, one over a
// network of four edges without a question). They are computed once.
func QuestionAnswers(tb testing.TB) (*antecedent.Result, []*intervention.Answer, []*sizing.Answer) {
	tb.Helper()
	questionsOnce.Do(func() { questionsRes, questionsAns, questionsPlans, questionsErr = questionAnswers() })
	if questionsErr != nil {
		tb.Fatal(questionsErr)
	}
	return questionsRes, questionsAns, questionsPlans
}

var (
	questionsOnce  sync.Once
	questionsRes   *antecedent.Result
	questionsAns   []*intervention.Answer
	questionsPlans []*sizing.Answer
	questionsErr   error
)

// longCause is a cause with a long name, so titles and labels must fit.
const longCause = "anticoagulant_dose_in_milligrams_per_day"

func questionModel(withEvent bool) *simulate.Model {
	m := &simulate.Model{Nodes: []simulate.Node{
		{Name: "age", Intercept: 60, NoiseSD: 10},
		{Name: longCause, Parents: []string{"age"}, Weights: []float64{0.05}, Intercept: 2, NoiseSD: 1},
		{Name: "marker", Parents: []string{longCause}, Weights: []float64{0.8}, NoiseSD: 1},
		{Name: "outcome", Parents: []string{"marker", longCause}, Weights: []float64{0.6, 0.4}, NoiseSD: 1},
	}}
	if withEvent {
		m.Nodes = append(m.Nodes, simulate.Node{Name: "event", Binary: true, Parents: []string{"marker"}, Weights: []float64{0.9}, Intercept: -2})
	}
	return m
}

func questionAnswers() (*antecedent.Result, []*intervention.Answer, []*sizing.Answer, error) {
	ctx := context.Background()
	m := questionModel(true)
	s, err := m.Sample(600, 5)
	if err != nil {
		return nil, nil, nil, err
	}
	d, err := table.NewDataset(s.Names, s.Columns)
	if err != nil {
		return nil, nil, nil, err
	}
	o, err := order.Parse(strings.NewReader("tier: age\ntier: " + longCause + "\ntier: marker\ntier: outcome event\n"))
	if err != nil {
		return nil, nil, nil, err
	}
	res, err := antecedent.DiscoverContext(ctx, d, o, &antecedent.Config{Folds: 5, Seed: 5})
	if err != nil {
		return nil, nil, nil, err
	}
	im, err := intervention.New(ctx, res, d)
	if err != nil {
		return nil, nil, nil, err
	}
	var answers []*intervention.Answer
	for _, q := range []intervention.Question{
		{Cause: longCause, A: intervention.ShiftBy(1), B: intervention.Action{}},
		{Cause: "marker", Outcomes: []string{"age", "outcome"}, A: intervention.ShiftBy(-0.5), B: intervention.Action{}},
	} {
		a, err := im.Effect(ctx, q, &intervention.Settings{Resamples: 20, Seed: 5})
		if err != nil {
			return nil, nil, nil, err
		}
		answers = append(answers, a)
	}
	settings := &sizing.Settings{Sizes: []int{40, 60, 90, 140, 200, 300}, Replicates: 6, Seed: 5}
	plan, err := sizing.Run(ctx, im, res.Order, &res.Config, settings)
	if err != nil {
		return nil, nil, nil, err
	}
	need, err := plan.RowsFor(longCause, "outcome", 0.8)
	if err != nil {
		return nil, nil, nil, err
	}
	small, err := sizing.FromModel(questionModel(false))
	if err != nil {
		return nil, nil, nil, err
	}
	o4, err := order.Parse(strings.NewReader("tier: age\ntier: " + longCause + "\ntier: marker\ntier: outcome\n"))
	if err != nil {
		return nil, nil, nil, err
	}
	plan4, err := sizing.Run(ctx, small, o4, &antecedent.Config{Folds: 5}, settings)
	if err != nil {
		return nil, nil, nil, err
	}
	return res, answers, []*sizing.Answer{{Plan: plan, Needed: &need}, {Plan: plan4}}, nil
}
