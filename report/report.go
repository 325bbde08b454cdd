package report

import (
	_ "embed"
	"fmt"
	"html/template"
	"io"
	"math"
	"slices"
	"strings"
	"time"
	"unicode/utf8"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/dag"
	"github.com/antecedent-lab/antecedent/intervention"
	"github.com/antecedent-lab/antecedent/sizing"
)

//go:embed report.html.tmpl
var pageTemplate string

var page = template.Must(template.New("report").Funcs(template.FuncMap{
	"num": func(x antecedent.Number, digits int) string {
		f := float64(x)
		if !finite(f) {
			return "–"
		}
		return fmt.Sprintf("%.*f", digits, f)
	},
	"sci": func(x antecedent.Number) string {
		f := float64(x)
		if !finite(f) {
			return "–"
		}
		return fmt.Sprintf("%.3g", f)
	},
	"pct":   func(x float64) string { return fmt.Sprintf("%.0f%%", 100*x) },
	"f1":    func(x float64) string { return fmt.Sprintf("%.1f", x) },
	"plus":  func(a, b float64) float64 { return a + b },
	"half":  func(a float64) float64 { return a / 2 },
	"plusi": func(a, b int) int { return a + b },
}).Parse(pageTemplate))

// Options configures Write. A nil *Options gives the defaults.
type Options struct {
	// Title heads the page; empty means "Discovered network". The page
	// states below it that the network is a hypothesis, not established
	// cause and effect.
	Title string
	// Truth, when set, is a known true graph (for simulated data) that the
	// summary compares the result with.
	Truth *dag.Graph
	// Generated is the time printed on the page; zero means now.
	Generated time.Time
	// Interventions are answers of package intervention to show in the
	// section "Questions asked of the network", one chart each, with
	// their cautions. Each must be about variables of the result.
	Interventions []*intervention.Answer
	// Plans are study plans of package sizing to show in the same
	// section, one chart each, marking the rows needed when the answer
	// carries them.
	Plans []*sizing.Answer
}

// Write renders res as a self-contained HTML page to w.
func Write(w io.Writer, res *antecedent.Result, opts *Options) error {
	var o Options
	if opts != nil {
		o = *opts
	}
	if o.Title == "" {
		o.Title = "Discovered network"
	}
	if o.Generated.IsZero() {
		o.Generated = time.Now()
	}
	v, err := build(res, &o)
	if err != nil {
		return err
	}
	return page.Execute(w, v)
}

type view struct {
	Title     string
	Generated string
	Res       *antecedent.Result
	Net       network
	Nodes     []nodeView
	Summary   summary
	Focus     map[string]focus
	Cautions  []string
	// Answers and Plans are the answered questions; QuestionCautions
	// the cautions printed above them.
	Answers          []answerView
	Plans            []planView
	QuestionCautions []string
}

type network struct {
	Width, Height float64
	// MinWidth is the narrowest the drawing is shown before the page
	// scrolls it sideways: its text never shrinks below 11 px.
	MinWidth float64
	Tiers    []tierView
	Boxes    []boxView
	Edges    []edgeView
	Links    []linkView
	BoxW     float64
}

// minScale is the smallest scale the network is drawn at: the smallest
// text in it, 13 units, then shows at 11 px.
const minScale = 11.0 / 13

// focus lists what focusing a node lights: its Markov blanket (N) and the
// edges of its own relations (E, indices into the result's edges): to its
// parents, to its children, and from its children's other parents to
// those children; and its same-tier links (L).
type focus struct {
	N []int `json:"n"`
	E []int `json:"e"`
	L []int `json:"l"`
}

type tierView struct {
	X, Width, Height float64
	Label            string
}

type boxView struct {
	ID     int
	X, Y   float64 // top-left
	H      float64 // height
	TextY  float64 // baseline of the name
	Name   string  // full name
	Short  string  // shown
	Kind   string
	Score  string
	ScoreW float64 // width of the score bar
	BarX   float64
	BarY   float64
	Anchor string
}

type edgeView struct {
	K        int
	From, To int
	D        string
	Class    string
	Width    float64
	Title    string
}

type linkView struct {
	A, B  int
	D     string
	Title string
}

type nodeView struct {
	ID        int
	Anchor    string
	Node      *antecedent.Node
	ScoreName string
	Effects   []effectView
	CV        *chart
	Path      *chart
	Blanket   string
}

type effectView struct {
	Term, Parent string
	// ChosenBy names the procedure that chose the parent and the evidence
	// the result carries for it.
	ChosenBy     string
	Estimate     string
	Interval     string
	Odds         string
	Contrast     string
	Standardized string
	Frequency    string
}

type summary struct {
	Variables, Rows, Tiers, Edges, Fitted int
	Folds                                 int
	Rule, Measure                         string
	Seed                                  uint64
	Mixing                                float64
	Stability                             *antecedent.StabilityReport
	Timings                               antecedent.Timings
	// Selection says in two sentences how the parents were chosen, and
	// Procedure names the procedure.
	Selection, Procedure string
	Truth                *dag.Comparison
	TruthEdges           int
	Warnings             []string
}

// shorten keeps names readable inside a node box.
func shorten(s string, max int) string {
	if utf8.RuneCountInString(s) <= max {
		return s
	}
	r := []rune(s)
	return string(r[:max-1]) + "…"
}

func build(res *antecedent.Result, o *Options) (*view, error) {
	index := map[string]int{}
	for i, n := range res.Nodes {
		index[n.Name] = i
	}
	tier := make([]int, len(res.Nodes))
	for i, n := range res.Nodes {
		if n.Tier < 1 {
			return nil, fmt.Errorf("report: node %q has tier %d; tiers are counted from 1", n.Name, n.Tier)
		}
		tier[i] = n.Tier - 1 // the layout's columns count from 0
	}
	var pairs [][2]int
	for _, e := range res.Edges {
		a, ok1 := index[e.From]
		b, ok2 := index[e.To]
		if !ok1 || !ok2 {
			return nil, fmt.Errorf("report: edge %s -> %s names an unknown node", e.From, e.To)
		}
		pairs = append(pairs, [2]int{a, b})
	}
	var links [][2]int
	for _, l := range res.Links {
		a, ok1 := index[l.A]
		b, ok2 := index[l.B]
		if !ok1 || !ok2 {
			return nil, fmt.Errorf("report: link %s — %s names an unknown node", l.A, l.B)
		}
		links = append(links, [2]int{a, b})
	}
	lay, err := LayoutGraph(tier, pairs, links)
	if err != nil {
		return nil, err
	}
	v := &view{Title: o.Title, Generated: o.Generated.UTC().Format("2006-01-02 15:04 UTC"), Res: res}
	net := network{Width: lay.Width, Height: lay.Height, BoxW: lay.BoxWidth, MinWidth: math.Min(lay.Width, lay.Width*minScale)}
	cols := 0
	for _, t := range tier {
		cols = max(cols, t+1)
	}
	for c := range cols {
		label := fmt.Sprintf("Tier %d", c+1)
		if res.Order != nil && c < len(res.Order.Labels) && res.Order.Labels[c] != "" {
			label = fmt.Sprintf("%d · %s", c+1, res.Order.Labels[c])
		}
		net.Tiers = append(net.Tiers, tierView{X: colLeft(c) - 12, Width: boxWidth + 24, Height: lay.Height - 8, Label: shorten(label, 24)})
	}
	for i, n := range res.Nodes {
		p, h := lay.Pos[i], lay.Heights[i]
		b := boxView{ID: i, X: p.X - boxWidth/2, Y: p.Y - h/2, H: h, TextY: p.Y - 5, Name: n.Name, Short: shorten(n.Name, 20),
			Kind: n.Kind.String(), Anchor: fmt.Sprintf("node-%d", i)}
		switch {
		case !n.Fitted && len(n.Candidates) == 0:
			b.Score = "first tier"
		case !n.Fitted:
			b.Score = "not fitted"
		case n.Score.Measure == "auc":
			b.Score = "AUC " + fixed2(float64(n.Score.Value))
			b.ScoreW = clamp01((float64(n.Score.Value) - 0.5) / 0.5)
		case n.Score.Measure == "r2":
			b.Score = "R² " + fixed2(float64(n.Score.Value))
			b.ScoreW = clamp01(float64(n.Score.Value))
		default:
			b.Score = fixed2(float64(n.Score.Value)) + " explained"
			b.ScoreW = clamp01(float64(n.Score.Value))
		}
		b.ScoreW *= boxWidth - 16
		b.BarX, b.BarY = b.X+8, b.Y+h-8
		net.Boxes = append(net.Boxes, b)
	}
	for k, e := range res.Edges {
		ev := edgeView{K: k, From: pairs[k][0], To: pairs[k][1], D: lay.Edges[k].Path()}
		ev.Class = "pos"
		if e.Sign < 0 {
			ev.Class = "neg"
		}
		if f := float64(e.Frequency); finite(f) {
			ev.Width = 0.8 + 4*f
		} else if s := math.Abs(float64(e.Standardized)); finite(s) {
			ev.Width = 1 + 3.5*math.Min(1, s/0.8)
		} else {
			ev.Width = 1.5
		}
		ev.Title = edgeTitle(e)
		net.Edges = append(net.Edges, ev)
	}
	for k, l := range res.Links {
		net.Links = append(net.Links, linkView{A: links[k][0], B: links[k][1], Title: l.A + " — " + l.B + " (same tier, undirected)",
			D: lay.Links[k].Path()})
	}
	v.Focus = focusSets(len(res.Nodes), pairs, links)
	v.Net = net
	for i := range res.Nodes {
		v.Nodes = append(v.Nodes, nodeSection(res, i))
	}
	v.Summary = summarise(res, o)
	if err := checkAnswers(res, o); err != nil {
		return nil, err
	}
	for _, a := range o.Interventions {
		v.Answers = append(v.Answers, answerSection(a))
	}
	for _, a := range o.Plans {
		v.Plans = append(v.Plans, planSection(a))
	}
	if len(v.Answers)+len(v.Plans) > 0 {
		v.QuestionCautions = append(slices.Clone(intervention.Cautions), sizing.Cautions...)
	}
	v.Cautions = []string{
		"This network is a hypothesis drawn from observational data, not a proof of cause and effect.",
		"Unmeasured confounding, selection of the patients in the table, and measurement error can create edges that are not causal or hide ones that are.",
		"Directions rest entirely on the time order supplied; an error in the order can reverse or invent an effect.",
		"It does not replace clinical judgement, local rules and approvals, or review by licensed statisticians and clinicians.",
	}
	return v, nil
}

// focusSets returns, for each node of a graph with n nodes, edges and
// same-tier links, what focusing it lights.
func focusSets(n int, edges, links [][2]int) map[string]focus {
	parents := make([][]int, n)
	children := make([][]int, n)
	into := make([][]int, n) // edge indices into each node
	for k, e := range edges {
		parents[e[1]] = append(parents[e[1]], e[0])
		children[e[0]] = append(children[e[0]], e[1])
		into[e[1]] = append(into[e[1]], k)
	}
	out := make(map[string]focus, n)
	for i := range n {
		var f focus
		nodes := map[int]bool{}
		for k, e := range edges {
			if e[0] == i || e[1] == i {
				f.E = append(f.E, k)
			}
		}
		for _, p := range parents[i] {
			nodes[p] = true
		}
		for _, c := range children[i] {
			nodes[c] = true
			for _, k := range into[c] {
				if p := edges[k][0]; p != i {
					f.E = append(f.E, k)
					nodes[p] = true
				}
			}
		}
		for k, l := range links {
			if l[0] == i || l[1] == i {
				f.L = append(f.L, k)
				nodes[l[0]], nodes[l[1]] = true, true
			}
		}
		delete(nodes, i)
		for j := range n {
			if nodes[j] {
				f.N = append(f.N, j)
			}
		}
		slices.Sort(f.E)
		out[fmt.Sprint(i)] = f
	}
	return out
}

// fixed2 formats x with two decimals, without a minus sign on a value
// that rounds to zero.
func fixed2(x float64) string {
	s := fmt.Sprintf("%.2f", x)
	if s == "-0.00" {
		return "0.00"
	}
	return s
}

func clamp01(x float64) float64 {
	if !finite(x) {
		return 0
	}
	return math.Max(0, math.Min(1, x))
}

func edgeTitle(e dag.Edge) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s → %s", e.From, e.To)
	if c := float64(e.Coefficient); finite(c) {
		fmt.Fprintf(&b, ": coefficient %.3g", c)
		if finite(float64(e.Lower)) {
			fmt.Fprintf(&b, " [%.3g, %.3g]", float64(e.Lower), float64(e.Upper))
		}
	}
	if s := float64(e.Standardized); finite(s) {
		fmt.Fprintf(&b, "; strength %.2f (%s)", s, dag.StandardizedMeaning)
	}
	if f := float64(e.Frequency); finite(f) {
		fmt.Fprintf(&b, "; selected in %.0f%% of subsamples", 100*f)
	}
	if e.Required {
		b.WriteString("; required by the order")
	}
	return b.String()
}

func nodeSection(res *antecedent.Result, i int) nodeView {
	n := &res.Nodes[i]
	nv := nodeView{ID: i, Anchor: fmt.Sprintf("node-%d", i), Node: n, Blanket: strings.Join(n.MarkovBlanket, ", ")}
	switch n.Score.Measure {
	case "auc":
		nv.ScoreName = "AUC"
	case "r2":
		nv.ScoreName = "R²"
	default:
		nv.ScoreName = n.Score.Measure
	}
	freq := map[string]float64{}
	required := map[string]bool{}
	for _, e := range res.Edges {
		if e.To == n.Name {
			freq[e.From] = float64(e.Frequency)
			required[e.From] = e.Required
		}
	}
	for _, e := range n.Effects {
		ev := effectView{Term: e.Term, Parent: e.Parent,
			Estimate: fmtNum(e.Estimate), Interval: "[" + fmtNum(e.Lower) + ", " + fmtNum(e.Upper) + "]",
			Contrast: e.Contrast, Standardized: fmtNum(e.Standardized)}
		if finite(float64(e.OddsRatio)) {
			ev.Odds = fmtNum(e.OddsRatio) + " [" + fmtNum(e.OddsLower) + ", " + fmtNum(e.OddsUpper) + "]"
		}
		if f, ok := freq[e.Parent]; ok && finite(f) {
			ev.Frequency = fmt.Sprintf("%.0f%%", 100*f)
		}
		ev.ChosenBy = chosenBy(n, e, required[e.Parent], freq[e.Parent])
		if e.NotEstimable != "" {
			ev.Estimate, ev.Interval = "not estimable", e.NotEstimable
		}
		nv.Effects = append(nv.Effects, ev)
	}
	if len(n.Curve) > 1 {
		nv.CV = cvChart(n, fmt.Sprintf("cv-%d", i))
	}
	if n.Path != nil && len(n.Path.Penalties) > 1 {
		nv.Path = pathChart(n)
	}
	return nv
}

// chosenBy says which procedure chose the parent of effect e of node n and
// with what evidence the result carries: the selection frequency under
// stability selection, the penalty weight under the adaptive lasso, the
// penalised coefficient under the lasso.
func chosenBy(n *antecedent.Node, e antecedent.Effect, required bool, freq float64) string {
	if required {
		return "required by the order"
	}
	var term *antecedent.Term
	for k := range n.Penalised {
		if n.Penalised[k].Term == e.Term {
			term = &n.Penalised[k]
		}
	}
	switch n.Selection {
	case "stability":
		if finite(freq) {
			return fmt.Sprintf("stability selection: %.0f%% of halves", 100*freq)
		}
		return "stability selection"
	case "adaptive":
		if term != nil && finite(float64(term.Weight)) {
			return "adaptive lasso, penalty weight " + fmtNum(term.Weight)
		}
		return "adaptive lasso"
	case "lasso":
		if term != nil && finite(float64(term.Value)) {
			return "lasso, penalised coefficient " + fmtNum(term.Value)
		}
		return "lasso"
	case "relaxed":
		return "relaxed lasso"
	}
	return n.Selection
}

func fmtNum(x antecedent.Number) string {
	f := float64(x)
	if !finite(f) {
		return "–"
	}
	return fmt.Sprintf("%.3g", f)
}

// measureName names a cross-validation measure for a chart's axis.
func measureName(m cv.Measure) string {
	switch m {
	case cv.Deviance, cv.DefaultMeasure:
		return "deviance"
	case cv.MeanSquaredError:
		return "squared error"
	case cv.MeanAbsoluteError:
		return "absolute error"
	case cv.AreaUnderCurve:
		return "AUC"
	case cv.Misclassification:
		return "misclassified share"
	}
	return m.String()
}

// nearest returns the index of the positive penalty in ps closest to p on
// a log scale, or -1.
func nearest(ps []float64, p float64) int {
	k := -1
	if !(p > 0) || !finite(p) {
		return k
	}
	best := math.Inf(1)
	for i, q := range ps {
		if d := math.Abs(math.Log(q / p)); q > 0 && d < best {
			k, best = i, d
		}
	}
	return k
}

func parentCount(k int) string {
	switch k {
	case 0:
		return "no parents"
	case 1:
		return "1 parent"
	}
	return fmt.Sprintf("%d parents", k)
}

// cvChart draws the cross-validation curve against the penalty: the
// uncertainty as a band of ±1 standard error, the chosen penalty as one
// labelled point on the curve giving the number of parents there, and,
// under the one-SE rule, the lowest point and the level within one
// standard error of it that the choice had to reach; under the
// paired-difference rule, the lowest point's level and, at the chosen
// point, the allowance (its multiple of the standard error of the
// difference) that had to reach that level. When the strong end
// of the curve rises far beyond the region of the choice, the value axis
// is cut to that region and the curve leaves the plot at the top.
func cvChart(n *antecedent.Node, id string) *chart {
	var pen, lx, ys, lo, hi, pair []float64
	for _, p := range n.Curve {
		l, m := float64(p.Penalty), float64(p.Mean)
		if !(l > 0) || !finite(l) || !finite(m) {
			continue
		}
		se := float64(p.SE)
		pair = append(pair, float64(p.PairSE))
		pen, lx, ys = append(pen, l), append(lx, math.Log10(l)), append(ys, m)
		lo, hi = append(lo, m-se), append(hi, m+se)
	}
	if len(pen) < 2 {
		return nil
	}
	ymin, ymax := math.Inf(1), math.Inf(-1)
	for i := range ys {
		for _, y := range []float64{lo[i], ys[i], hi[i]} {
			if finite(y) {
				ymin, ymax = math.Min(ymin, y), math.Max(ymax, y)
			}
		}
	}
	larger := n.Measure == cv.AreaUnderCurve
	chosen := nearest(pen, float64(n.Penalty))
	best := nearest(pen, float64(n.BestPenalty))
	// The level the rule compared with: the best mean plus (or minus) the
	// rule's multiple of the standard error it read (hi and lo are ±1 of
	// the best point's own; a binary node's may have been raised). The
	// paired rule compares each point's mean, less its allowance, with the
	// best mean itself.
	lvl, raised := math.NaN(), false
	if best >= 0 {
		se := hi[best] - ys[best]
		if r := float64(n.RuleSE); finite(r) && finite(se) && r > se*(1+1e-9) {
			se, raised = r, true // the floor of cv.Rule.Yardstick for binary nodes
		}
		switch {
		case n.Rule.Paired():
			lvl = ys[best]
		case larger:
			lvl = ys[best] - n.Rule.StandardErrors()*se
		default:
			lvl = ys[best] + n.Rule.StandardErrors()*se
		}
		if finite(lvl) && chosen >= 0 && chosen != best {
			ymin, ymax = math.Min(ymin, lvl), math.Max(ymax, lvl)
		}
	}
	c := newChart("held-out " + measureName(n.Measure))
	c.ID = id
	if chosen >= 0 && best >= 0 {
		// Keep the worse side of the choice within 2.5 times the choice's
		// distance from the best edge of the band.
		const reach = 2.5
		if larger {
			key := math.Min(math.Min(ys[chosen], finiteOr(lo[best], ys[best])), finiteOr(lvl, ys[chosen]))
			if floor := key - reach*(ymax-key); floor > ymin {
				ymin, c.Clipped = floor, true
			}
		} else {
			key := math.Max(math.Max(ys[chosen], finiteOr(hi[best], ys[best])), finiteOr(lvl, ys[chosen]))
			if ceil := key + reach*(key-ymin); ceil < ymax {
				ymax, c.Clipped = ceil, true
			}
		}
	}
	sx, sy := c.axes(slices.Min(pen), slices.Max(pen), ymin, ymax)
	var upper, lower []string
	for i := range lx {
		if finite(lo[i]) && finite(hi[i]) {
			upper = append(upper, fmt.Sprintf("%.1f,%.1f", sx.at(lx[i]), sy.at(hi[i])))
			lower = append(lower, fmt.Sprintf("%.1f,%.1f", sx.at(lx[i]), sy.at(lo[i])))
		}
	}
	slices.Reverse(lower)
	c.Band = strings.Join(append(upper, lower...), " ")
	c.Lines = append(c.Lines, series{Points: points(sx, sy, lx, ys), Class: "cv"})

	better := "lower is better"
	if larger {
		better = "higher is better"
	}
	c.Caption = fmt.Sprintf("Held-out %s (%s); band: ±1 standard error of the mean held-out loss.", measureName(n.Measure), better)
	margin := n.Rule.StandardErrors()
	if m := float64(n.Margin); finite(m) && m > 0 {
		margin = m
	}
	if n.Rule.Paired() {
		c.Caption += fmt.Sprintf(" %s: the strongest penalty whose held-out %s is worse than the best's (open circle) by at most %.3g standard errors of the difference between them (dark point); the vertical stroke from it is that allowance, which reaches the best's level (the line).", capital(n.Rule.Title()), measureName(n.Measure), margin)
	} else if reach := n.Rule.Reach(); reach != "" {
		c.Caption += fmt.Sprintf(" %s: the strongest penalty (dark point) within %s of the best (open circle), shown by the level line.", capital(n.Rule.Title()), reach)
		if raised {
			c.Caption += fmt.Sprintf(" For a 0/1 variable that standard error is taken as at least %.3g, √(2/(n−1)) for the n rows held out in turn: the standard error of a continuous variable's mean deviance at unit variance, so that both kinds are held to one yardstick.", float64(n.RuleSE))
		}
	} else if n.Rule == cv.MinimumLoss {
		c.Caption += fmt.Sprintf(" Minimum-loss rule: the penalty with the best held-out %s.", measureName(n.Measure))
	}
	if chosen < 0 {
		return c
	}
	x, y := sx.at(lx[chosen]), sy.at(ys[chosen])
	key := c.place(x, y, "chosen: "+parentCount(len(n.Parents)), larger, true)
	key.Class = "key"
	if best >= 0 && best != chosen {
		if n.Rule.Paired() {
			reach := margin * pair[chosen]
			if larger {
				reach = -reach
			}
			if finite(reach) {
				end := math.Min(math.Max(sy.at(ys[chosen]-reach), c.Top), c.Top+c.PlotH)
				c.Reach = &stroke{X: x, Y1: y, Y2: end}
			}
		}
		if finite(lvl) {
			c.Rule = &segment{X1: sx.at(lx[best]), X2: x, Y: sy.at(lvl)}
		}
		bx, by := sx.at(lx[best]), sy.at(ys[best])
		c.Dots = append(c.Dots, dot{X: bx, Y: by, Class: "lowest"})
		name := "lowest"
		if larger {
			name = "highest"
		}
		for _, try := range [][2]bool{{!larger, true}, {!larger, false}, {larger, true}, {larger, false}} {
			l := c.place(bx, by, name, try[0], try[1])
			if !l.overlaps(key) && l.inside(c) {
				l.Class = "muted"
				c.Labels = append(c.Labels, l)
				break
			}
		}
	}
	c.Dots = append(c.Dots, dot{X: x, Y: y, Class: "chosen"})
	c.Labels = append(c.Labels, key)
	return c
}

func finiteOr(v, alt float64) float64 {
	if finite(v) {
		return v
	}
	return alt
}

// place returns a label for the point (x, y): below or above it, to its
// right or left; a label that would leave the plot moves to the other
// side of x, or of y.
func (c *chart) place(x, y float64, text string, below, right bool) chartLabel {
	l := chartLabel{X: x + 6, Text: text, Anchor: "start"}
	if !right || x+6+textWidth(text) > c.Left+c.PlotW {
		l.X, l.Anchor = x-6, "end"
		if x-6-textWidth(text) < c.Left {
			l.X, l.Anchor = x+6, "start"
		}
	}
	l.Y = y - 8
	if below && y+16 <= c.Top+c.PlotH-2 || !below && y-18 < c.Top {
		l.Y = y + 16
	}
	return l
}

// box returns the extent of a label's text, estimated.
func (l chartLabel) box() (x0, y0, x1, y1 float64) {
	w := textWidth(l.Text)
	x0 = l.X
	if l.Anchor == "end" {
		x0 -= w
	}
	return x0, l.Y - 9, x0 + w, l.Y + 2
}

func (l chartLabel) overlaps(m chartLabel) bool {
	ax0, ay0, ax1, ay1 := l.box()
	bx0, by0, bx1, by1 := m.box()
	return ax0 < bx1+2 && bx0 < ax1+2 && ay0 < by1+1 && by0 < ay1+1
}

func (l chartLabel) inside(c *chart) bool {
	x0, y0, x1, y1 := l.box()
	return x0 >= c.Left && x1 <= c.Left+c.PlotW+4 && y0 >= c.Top-2 && y1 <= c.Top+c.PlotH
}

// pathChart draws the coefficient paths of the full-data fit against the
// penalty. The terms chosen at the selected penalty are drawn in the
// colour of their sign, marked where they were chosen and labelled there;
// the other candidates are thin and grey.
func pathChart(n *antecedent.Node) *chart {
	p := n.Path
	var keep []int // penalty indices drawn
	var pen, lx []float64
	for k, l := range p.Penalties {
		if f := float64(l); f > 0 && finite(f) {
			keep, pen, lx = append(keep, k), append(pen, f), append(lx, math.Log10(f))
		}
	}
	if len(pen) < 2 {
		return nil
	}
	ymin, ymax := 0.0, 0.0
	for _, vals := range p.Values {
		for _, v := range vals {
			if f := float64(v); finite(f) {
				ymin, ymax = math.Min(ymin, f), math.Max(ymax, f)
			}
		}
	}
	c := newChart("coefficient")
	sx, sy := c.axes(slices.Min(pen), slices.Max(pen), ymin, ymax)
	chosen := nearest(pen, float64(n.Penalty))
	picked := map[string]bool{}
	for _, t := range n.Penalised {
		picked[t.Term] = true
	}
	type mark struct {
		y    float64
		name string
	}
	var marks []mark
	var strong []series
	for t, vals := range p.Values {
		if t >= len(p.Terms) {
			break
		}
		ys := make([]float64, len(keep))
		for i, k := range keep {
			ys[i] = math.NaN()
			if k < len(vals) {
				ys[i] = float64(vals[k])
			}
		}
		s := series{Points: points(sx, sy, lx, ys), Class: "other", Title: p.Terms[t]}
		if !picked[p.Terms[t]] || chosen < 0 || !finite(ys[chosen]) {
			c.Lines = append(c.Lines, s)
			continue
		}
		s.Class = "up"
		if ys[chosen] < 0 {
			s.Class = "down"
		}
		strong = append(strong, s)
		y := sy.at(ys[chosen])
		c.Dots = append(c.Dots, dot{X: sx.at(lx[chosen]), Y: y, Class: s.Class})
		marks = append(marks, mark{y, shorten(p.Terms[t], 22)})
	}
	c.Lines = append(c.Lines, strong...) // chosen paths on top
	slices.SortStableFunc(marks, func(a, b mark) int {
		switch {
		case a.y < b.y:
			return -1
		case a.y > b.y:
			return 1
		}
		return 0
	})
	if room := int(c.PlotH / labelLine); len(marks) > room {
		marks = marks[:room]
	}
	if len(marks) > 0 {
		x := sx.at(lx[chosen])
		var wide float64
		want := make([]float64, len(marks))
		for i, m := range marks {
			want[i] = m.y + 4 // baseline about a third of a line below the point
			wide = math.Max(wide, textWidth(m.name))
		}
		got := stack(want, c.Top+10, c.Top+c.PlotH-2)
		lab := chartLabel{X: x + 14, Anchor: "start"}
		if x+14+wide > c.Left+c.PlotW {
			lab.X, lab.Anchor = x-14, "end"
		}
		for i, m := range marks {
			l := lab
			l.Y, l.Text, l.Class = got[i], m.name, "key"
			l.Leader, l.LX, l.LY = true, x, m.y
			c.Labels = append(c.Labels, l)
		}
	}
	c.Caption = "Each candidate term's coefficient as the penalty weakens. Coloured and labelled at the chosen penalty: " +
		"the chosen terms (green positive, orange negative); grey: not chosen."
	if len(marks) == 0 {
		c.Caption = "Each candidate term's coefficient as the penalty weakens; none is chosen at the selected penalty."
	}
	return c
}

func summarise(res *antecedent.Result, o *Options) summary {
	s := summary{Variables: len(res.Nodes), Rows: res.Rows, Edges: len(res.Edges), Folds: res.Config.Folds,
		Rule: res.Config.CV.Rule.String(), Measure: res.Config.CV.Measure.String(), Seed: res.Config.Seed, Mixing: res.Config.CV.Path.Mixing,
		Stability: res.Stability, Timings: res.Timings, Warnings: res.Warnings, Selection: res.Config.SelectionExplanation()}
	s.Procedure = map[antecedent.Selection]string{antecedent.AdaptiveLasso: "adaptive lasso", antecedent.PenalisedLasso: "lasso",
		antecedent.RelaxedLasso: "relaxed lasso"}[res.Config.Selection]
	if res.Config.Stability.Pairs > 0 {
		s.Procedure = "stability selection"
	}
	if s.Mixing == 0 {
		s.Mixing = 1 // lasso.Settings: zero means the pure lasso
	}
	if res.Order != nil {
		s.Tiers = len(res.Order.Tiers)
	}
	for _, n := range res.Nodes {
		if n.Fitted {
			if s.Fitted == 0 {
				s.Rule, s.Measure = n.Rule.String(), n.Measure.String()
			}
			s.Fitted++
		}
	}
	if o.Truth != nil {
		tru := o.Truth.Edges()
		if sc, err := dag.Compare(res.Edges, tru); err == nil {
			s.Truth = &sc
			s.TruthEdges = len(tru)
		}
	}
	return s
}
