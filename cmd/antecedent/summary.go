package main

import (
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/dag"
)

const caution = `Caution: this network is a hypothesis drawn from observational data. Unmeasured
confounding, selection and measurement error can create or hide edges, and the
directions rest on the time order you supplied. It does not replace clinical
judgement, local rules, or licensed statistical and medical review.`

func num(x antecedent.Number, digits int) string {
	f := float64(x)
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return "n/a"
	}
	return fmt.Sprintf("%.*f", digits, f)
}

// writeSummary prints the network tier by tier, each node's score and its
// parents with effects, and, when truth is given, how the result compares.
func writeSummary(w io.Writer, res *antecedent.Result, truth *dag.Graph) {
	tiers := res.Order.Tiers
	fmt.Fprintf(w, "antecedent: %d variables, %d rows, %d tiers, %d edges\n", len(res.Nodes), res.Rows, len(tiers), len(res.Edges))
	fmt.Fprintln(w, "Scores are cross-validated, of the parents refitted without penalty (± one standard error).")
	for _, n := range res.Nodes {
		if n.Fitted {
			fmt.Fprintf(w, "Each penalty chosen by %d-fold cross-validation (%s, %s); seed %d; %.1f s.\n",
				res.Config.Folds, n.Measure, n.Rule.Title(), res.Config.Seed, res.Timings.Total)
			fmt.Fprintln(w, wrap("How parents were chosen: "+res.Config.SelectionExplanation(), 100))
			fmt.Fprintln(w, "Effects: a continuous variable's in its own units, a binary variable's as odds ratios of its value coded 1;")
			fmt.Fprintln(w, "per unit of a continuous parent, value coded 1 vs reference for a binary parent, each level vs reference for a categorical one.")
			break
		}
	}
	width := 0
	for _, n := range res.Nodes {
		width = max(width, len([]rune(n.Name)))
	}
	for t, names := range tiers {
		label := ""
		if t < len(res.Order.Labels) && res.Order.Labels[t] != "" {
			label = " — " + res.Order.Labels[t]
		}
		fmt.Fprintf(w, "\nTier %d%s\n", t+1, label)
		for _, name := range names {
			n, err := res.Node(name)
			if err != nil {
				continue
			}
			writeNode(w, res, n, width)
		}
	}
	if st := res.Stability; st != nil {
		fmt.Fprintf(w, "\nStability selection: %d complementary pairs, threshold %.2f.\n%s\n", st.Pairs, st.Threshold, wrap(st.Explanation, 100))
	}
	if len(res.Links) > 0 {
		fmt.Fprintln(w, "\nSame-tier associations (undirected, not in the graph):")
		for _, l := range res.Links {
			both := ""
			if l.Both {
				both = " (selected both ways)"
			}
			fmt.Fprintf(w, "  %s — %s%s\n", l.A, l.B, both)
		}
	}
	if truth != nil {
		est, tru := res.Edges, truth.Edges()
		if s, err := dag.Compare(est, tru); err == nil {
			fmt.Fprintf(w, "\nAgainst the known true graph (%d edges): precision %.2f, recall %.2f, F1 %.2f, structural Hamming distance %d.\n",
				len(tru), s.Precision, s.Recall, s.F1, s.SHD)
			var missing []string
			for _, e := range tru {
				found := false
				for _, f := range est {
					if (f.From == e.From && f.To == e.To) || (f.From == e.To && f.To == e.From) {
						found = true
					}
				}
				if !found {
					missing = append(missing, e.From+" → "+e.To)
				}
			}
			if len(missing) > 0 {
				fmt.Fprintf(w, "Missed: %s.\n", strings.Join(missing, ", "))
			}
		}
	}
	if len(res.Warnings) > 0 {
		fmt.Fprintln(w, "\nWarnings:")
		for _, m := range res.Warnings {
			fmt.Fprintln(w, "  "+m)
		}
	}
	fmt.Fprintln(w, "\n"+caution)
}

func writeNode(w io.Writer, res *antecedent.Result, n *antecedent.Node, width int) {
	pad := strings.Repeat(" ", width-len([]rune(n.Name)))
	kind := n.Kind.String()
	if !n.Fitted {
		note := "first tier: no earlier variables"
		if len(n.Candidates) > 0 {
			note = "not fitted (see warnings)"
		}
		fmt.Fprintf(w, "  %s%s  %-11s  %s\n", n.Name, pad, kind, note)
		writeCoding(w, n, width)
		return
	}
	score := "R²"
	if n.Score.Measure == "auc" {
		score = "AUC"
	} else if n.Score.Measure != "r2" {
		score = n.Score.Measure
	}
	value := fmt.Sprintf("%s %s ± %s", score, num(n.Score.Value, 3), num(n.Score.SE, 3))
	if n.Score.Note != "" {
		value = n.Score.Note
	}
	fmt.Fprintf(w, "  %s%s  %-11s  %s  (%d rows, %d of %d candidates)\n", n.Name, pad, kind, value, n.Rows, len(n.Parents), len(n.Candidates))
	writeCoding(w, n, width)
	for _, p := range n.Parents {
		for _, e := range n.Effects {
			if e.Parent != p {
				continue
			}
			contrast := "per unit"
			if e.Contrast != "" && e.Contrast != "per unit" {
				contrast = "for " + e.Contrast
			}
			var effect string
			if e.NotEstimable != "" {
				effect = "not estimable: " + e.NotEstimable
			} else if !math.IsNaN(float64(e.OddsRatio)) {
				effect = fmt.Sprintf("odds ratio %s [%s, %s] %s", num(e.OddsRatio, 2), num(e.OddsLower, 2), num(e.OddsUpper, 2), contrast)
			} else {
				effect = fmt.Sprintf("%+.3g [%s, %s] %s", float64(e.Estimate), num(e.Lower, 3), num(e.Upper, 3), contrast)
			}
			freq := ""
			for _, ed := range res.Edges {
				if ed.From == p && ed.To == n.Name && !math.IsNaN(float64(ed.Frequency)) {
					freq = fmt.Sprintf("  selected in %.0f%% of subsamples", 100*float64(ed.Frequency))
				}
			}
			fmt.Fprintf(w, "  %s    ← %s: %s%s\n", strings.Repeat(" ", width), e.Term, effect, freq)
		}
	}
}

// wrap breaks text into lines of at most width bytes at spaces.
func wrap(text string, width int) string {
	var b strings.Builder
	line := 0
	for i, word := range strings.Fields(text) {
		if i > 0 && line+1+len(word) > width {
			b.WriteByte('\n')
			line = 0
		} else if i > 0 {
			b.WriteByte(' ')
			line++
		}
		b.WriteString(word)
		line += len(word)
	}
	return b.String()
}

// writeCoding prints the coding of a binary or categorical node under its
// line.
func writeCoding(w io.Writer, n *antecedent.Node, width int) {
	if n.Coding != "" {
		fmt.Fprintf(w, "  %s    coded %s\n", strings.Repeat(" ", width), n.Coding)
	}
}
