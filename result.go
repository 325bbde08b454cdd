package antecedent

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/dag"
	"github.com/antecedent-lab/antecedent/internal/jsonfloat"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/table"
)

// Number is a float64 that is written to JSON as null when it is NaN or
// infinite (unknown or undefined) and read back as NaN. It is the same
// type as the one dag's edges use for their JSON form.
type Number = jsonfloat.Float

func nan() Number { return Number(math.NaN()) }

// Result is the discovered network with everything needed to defend it:
// per-node fits, cross-validation curves, scores, effects and settings.
// It marshals to JSON and back without loss.
type Result struct {
	// Nodes holds one entry per variable, in the dataset's order.
	Nodes []Node `json:"nodes"`
	// Edges are the graph's directed edges, parent → child, with the
	// refit effect of the parent (for a categorical parent, of its
	// strongest level), its 95% interval and, under stability selection,
	// its selection frequency.
	Edges []dag.Edge `json:"edges"`
	// Links are same-tier associations (Config.SameTier), undirected and
	// outside the graph.
	Links []Link `json:"links"`
	// Order is the temporal order used.
	Order *order.Order `json:"order"`
	// Config is the configuration used, defaults filled in.
	Config Config `json:"config"`
	// Rows is the number of rows in the dataset.
	Rows int `json:"rows"`
	// Stability reports the stability selection, when it was on.
	Stability *StabilityReport `json:"stability"`
	// Warnings lists conditions a reader should know about (constant
	// variables, separation, dropped rows).
	Warnings []string `json:"warnings"`
	// Timings gives wall-clock seconds per stage.
	Timings Timings `json:"timings"`
}

// Timings are wall-clock seconds.
type Timings struct {
	Prepare   float64 `json:"prepare"`
	Nodes     float64 `json:"nodes"`
	Total     float64 `json:"total"`
	Workers   int     `json:"workers"`
	Moments   bool    `json:"shared_moments"`
	Penalised int     `json:"fits"`
}

// Node is the fit of one variable on its candidate parents.
type Node struct {
	Name   string     `json:"name"`
	Kind   table.Kind `json:"kind"`
	Family string     `json:"family"`
	// Levels holds a binary or categorical variable's values, the
	// reference first: a binary variable is coded 0 for Levels[0] and 1
	// for Levels[1] ("0" and "1" for a column of numbers); a categorical
	// one enters as one indicator per later level.
	Levels []string `json:"levels"`
	// Reference is the level the variable's effects are measured
	// against (Levels[0]).
	Reference string `json:"reference"`
	// Coding says the coding in words, for display.
	Coding string `json:"coding"`
	// Tier is the node's tier, counted from 1 for the earliest.
	Tier int `json:"tier"`
	// TierLabel is the tier's label from the order, if any.
	TierLabel string `json:"tier_label"`
	// Rows is the number of rows the node was fitted on.
	Rows       int      `json:"rows"`
	Candidates []string `json:"candidates"`
	Required   []string `json:"required"`
	Parents    []string `json:"parents"`
	// MarkovBlanket lists parents, children and the children's other
	// parents.
	MarkovBlanket []string `json:"markov_blanket"`
	// Fitted is false for nodes without candidates (the first tier) and
	// nodes that could not be fitted (see Warnings).
	Fitted bool `json:"fitted"`
	// Penalty is the selected penalty; BestPenalty and OneSEPenalty those
	// of the minimum and one-standard-error rules.
	Penalty      Number  `json:"penalty"`
	BestPenalty  Number  `json:"best_penalty"`
	OneSEPenalty Number  `json:"one_se_penalty"`
	Rule         cv.Rule `json:"rule"`
	// Margin is how many standard errors the rule allowed (cv.Result.Margin).
	Margin Number `json:"margin"`
	// RuleSE is the standard error the margin multiplied on the curve
	// (cv.Result.RuleSE): the best point's, except that the half- and
	// quarter-SE rules hold a binary node's deviance to at least √(2/(n−1))
	// (cv.Rule.Yardstick); NaN under the paired rule, whose standard errors
	// are per point. The relaxed lasso's choice among refitted sets reads
	// the refits' own, floored the same way, which is not recorded.
	RuleSE  Number     `json:"rule_se"`
	Measure cv.Measure `json:"measure"`
	// Score is the cross-validated score of the model whose effects are
	// shown: the parents refitted without penalty inside each training
	// fold and scored on the held-out rows (AUC averaged over folds for
	// binary nodes, R² for continuous ones, deviance explained for custom
	// families). A node without parents scores chance level exactly.
	Score Score `json:"score"`
	// PenalisedScore is the same measure for the penalised fit at the
	// selected penalty: the figure the penalty was chosen on.
	PenalisedScore Score `json:"penalised_score"`
	// Curve is the cross-validation curve.
	Curve []CurvePoint `json:"curve"`
	// Path holds the coefficient paths of the full-data fit.
	Path *CoefficientPath `json:"path"`
	// Selection names the procedure that chose the parents: "lasso",
	// "adaptive", "relaxed" or "stability".
	Selection string `json:"selection"`
	// Penalised holds the non-zero penalised coefficients at the
	// selected penalty (original scale), with their penalty factors.
	Penalised []Term `json:"penalised"`
	// Intercept and Effects come from the unpenalised refit on the parents.
	Intercept Number   `json:"intercept"`
	Effects   []Effect `json:"effects"`
	// Status is how the full-data path ended.
	Status   string   `json:"status"`
	Warnings []string `json:"warnings"`
}

// Score is a cross-validated score with its standard error.
type Score struct {
	Measure string `json:"measure"`
	Value   Number `json:"value"`
	// SE is the standard error of Value.
	SE Number `json:"se"`
	// Note qualifies the value ("no parents: chance level").
	Note string `json:"note"`
}

// CurvePoint is one penalty of a cross-validation curve.
type CurvePoint struct {
	Penalty Number `json:"penalty"`
	Mean    Number `json:"mean"`
	SE      Number `json:"se"`
	// PairSE is the standard error of Mean minus the best point's Mean,
	// from paired differences (cv.Point.PairSE); the paired-difference
	// rule reads it, and it is formed (and written) only under that rule:
	// from the strongest penalty to the best when the rows are paired
	// (absent past the best, and at the best, where it is 0), at every
	// penalty but the best when the folds are (AUC).
	PairSE  Number `json:"pair_se,omitempty"`
	NonZero int    `json:"nonzero"`
}

// CoefficientPath holds Values[t][k], the coefficient of term t at
// penalty k, for the terms that are non-zero at or before the selected
// penalty and the ten largest (per standard deviation) at the path's end.
type CoefficientPath struct {
	Penalties []Number   `json:"penalties"`
	Terms     []string   `json:"terms"`
	Values    [][]Number `json:"values"`
}

// Term is one coefficient: Term is the design column ("variable" or
// "variable=level").
type Term struct {
	Term     string `json:"term"`
	Variable string `json:"variable"`
	Value    Number `json:"value"`
	// Weight is the term's penalty factor: 1 under the plain lasso, the
	// inverse of its first-stage size per standard deviation under the
	// adaptive lasso, 0 for a required parent.
	Weight Number `json:"weight"`
}

// Effect is the unpenalised refit estimate of one parent term, with its
// standard error and 95% Wald confidence interval; for logistic nodes also
// as an odds ratio.
type Effect struct {
	Parent    string `json:"parent"`
	Term      string `json:"term"`
	Estimate  Number `json:"estimate"`
	SE        Number `json:"se"`
	Lower     Number `json:"lower"`
	Upper     Number `json:"upper"`
	OddsRatio Number `json:"odds_ratio"`
	OddsLower Number `json:"odds_lower"`
	OddsUpper Number `json:"odds_upper"`
	// Contrast says what Estimate compares, on the parent's natural
	// scale: "per unit" of a continuous parent, `"yes" vs "no"` (or
	// "1 vs 0") for a binary parent, `"north" vs "east"` for a level of a
	// categorical parent against its reference. Estimate is in the
	// child's units for a continuous child and in log odds of the child's
	// level coded 1 for a binary child (OddsRatio is its exponential).
	Contrast string `json:"contrast"`
	// Standardized is the effect on a common scale (see
	// dag.StandardizedMeaning): per standard deviation of a continuous
	// parent, for the contrast itself of a binary or categorical parent;
	// in standard deviations of a continuous child, in log odds for a
	// binary child.
	Standardized Number `json:"standardized"`
	// NotEstimable says why the effect was not estimated (its numbers are
	// then null): a level with too few rows, or a parent that separates a
	// binary child's outcome.
	NotEstimable string `json:"not_estimable"`
}

// Link is an undirected same-tier association.
type Link struct {
	A string `json:"a"`
	B string `json:"b"`
	// Both is true when each variable selected the other.
	Both bool `json:"both"`
}

// StabilityReport summarises stability selection.
type StabilityReport struct {
	Pairs     int     `json:"pairs"`
	Threshold float64 `json:"threshold"`
	// ExpectedFalse bounds the expected number of falsely selected edges
	// over all nodes: the sum of the per-node bounds.
	ExpectedFalse Number `json:"expected_false_edges"`
	// Vacuous is true when ExpectedFalse is at least the number of edges
	// selected by stability: the bound then cannot vouch for any of them.
	Vacuous bool `json:"vacuous"`
	// Explanation says in words what the bound assumes, whether it is
	// vacuous, and how to tighten it.
	Explanation string `json:"explanation"`
	// Nodes holds each fitted node's average selection count q, its
	// number of penalised candidates p and its bound q²/((2π−1)p).
	Nodes []StabilityNode `json:"nodes"`
}

// explain says in words what the stability bound assumes, whether it is
// vacuous, and how to tighten it.
func (s *StabilityReport) explain() string {
	var b strings.Builder
	fmt.Fprintf(&b, "The expected number of false edges is at most %.2f (Meinshausen & Bühlmann 2010, Theorem 1). "+
		"The bound assumes that each false candidate is no more likely than the others to be selected on a half of the rows "+
		"(exchangeability) and that selection is no worse than random guessing; it grows with the square of the number of "+
		"parents picked per half and shrinks with the number of candidates.", float64(s.ExpectedFalse))
	if s.Vacuous {
		b.WriteString(" Here it is vacuous: it is no smaller than the number of edges kept, so it cannot vouch for any of them.")
	}
	b.WriteString(" To tighten it, raise the threshold, give fewer candidates (forbidden edges, a sparser order) or select fewer parents " +
		"per half; more pairs sharpen the frequencies but not the bound.")
	return b.String()
}

// StabilityNode is one node's share of the stability bound.
type StabilityNode struct {
	Name       string  `json:"name"`
	Selected   float64 `json:"mean_selected"`
	Candidates int     `json:"candidates"`
	Bound      Number  `json:"bound"`
}

// Graph returns the result as a dag.Graph whose nodes carry their tier,
// tier label, kind, levels and coding, so that every export of it (DOT,
// GraphML, JSON) says them.
func (r *Result) Graph() (*dag.Graph, error) {
	names := make([]string, len(r.Nodes))
	data := make(map[string]dag.NodeData, len(r.Nodes))
	for i, n := range r.Nodes {
		names[i] = n.Name
		data[n.Name] = dag.NodeData{Tier: n.Tier, TierLabel: n.TierLabel, Kind: n.Kind.String(), Levels: n.Levels, Coding: n.Coding}
	}
	g, err := dag.New(names, r.Edges)
	if err != nil {
		return nil, err
	}
	return g.WithNodeData(data)
}

// Node returns the named node's result.
func (r *Result) Node(name string) (*Node, error) {
	for i := range r.Nodes {
		if r.Nodes[i].Name == name {
			return &r.Nodes[i], nil
		}
	}
	return nil, fmt.Errorf("%w: %q", table.ErrVariable, name)
}

// WriteGraphML writes the graph as GraphML with each node's tier, kind
// and coding (see dag.Graph.GraphML).
func (r *Result) WriteGraphML(w io.Writer) error {
	g, err := r.Graph()
	if err != nil {
		return err
	}
	return g.GraphML(w)
}

// WriteJSON writes the result as indented JSON, the same bytes as
// json.MarshalIndent(r, "", "  ") and a line break. Nodes, the bulk of a
// large result, are encoded and written one at a time, so memory holds one
// node's text at a time, not the document's.
func (r *Result) WriteJSON(w io.Writer) error {
	rest := *r
	rest.Nodes = nil
	head, err := json.MarshalIndent(&rest, "", "  ")
	if err != nil {
		return err
	}
	// "nodes" is the first field: split the document at its null.
	const slot = "{\n  \"nodes\": null"
	if !bytes.HasPrefix(head, []byte(slot)) {
		return fmt.Errorf("antecedent: internal error: result JSON starts %q", head[:min(len(head), 40)])
	}
	bw := bufio.NewWriterSize(w, 64<<10)
	if r.Nodes == nil {
		bw.WriteString("{\n  \"nodes\": null")
	} else if len(r.Nodes) == 0 {
		bw.WriteString("{\n  \"nodes\": []")
	} else {
		bw.WriteString("{\n  \"nodes\": [\n    ")
		for i := range r.Nodes {
			b, err := json.MarshalIndent(&r.Nodes[i], "    ", "  ")
			if err != nil {
				return err
			}
			if i > 0 {
				bw.WriteString(",\n    ")
			}
			bw.Write(b)
		}
		bw.WriteString("\n  ]")
	}
	bw.Write(head[len(slot):])
	bw.WriteByte('\n')
	return bw.Flush()
}

// ReadResult reads a result written by WriteJSON (or json.Marshal).
func ReadResult(rd io.Reader) (*Result, error) {
	var r Result
	dec := json.NewDecoder(io.LimitReader(rd, 1<<30))
	if err := dec.Decode(&r); err != nil {
		return nil, fmt.Errorf("antecedent: reading result: %w", err)
	}
	if _, err := r.Graph(); err != nil {
		return nil, fmt.Errorf("antecedent: reading result: %w", err)
	}
	return &r, nil
}
