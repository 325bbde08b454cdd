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
	"github.com/antecedent-lab/antecedent/dag"
	"github.com/antecedent-lab/antecedent/metrics"
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
	// Title heads the page; empty means "Causal network report".
	Title string
	// Truth, when set, is a known true graph (for simulated data) that the
	// summary compares the result with.
	Truth *dag.Graph
	// Generated is the time printed on the page; zero means now.
	Generated time.Time
}

// Write renders res as a self-contained HTML page to w.
func Write(w io.Writer, res *antecedent.Result, opts *Options) error {
	var o Options
	if opts != nil {
		o = *opts
	}
	if o.Title == "" {
		o.Title = "Causal network report"
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
	Blankets  map[string][]int
	Cautions  []string
}

type network struct {
	Width, Height float64
	Tiers         []tierView
	Boxes         []boxView
	Edges         []edgeView
	Links         []linkView
	BoxW          float64
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
	Estimate     string
	Interval     string
	Odds         string
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
	Truth                                 *metrics.GraphScore
	TruthEdges                            int
	Warnings                              []string
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
		tier[i] = n.Tier
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
	v := &view{Title: o.Title, Generated: o.Generated.UTC().Format("2006-01-02 15:04 UTC"), Res: res, Blankets: map[string][]int{}}
	net := network{Width: lay.Width, Height: lay.Height, BoxW: lay.BoxWidth}
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
			b.Score = fmt.Sprintf("AUC %.2f", float64(n.Score.Value))
			b.ScoreW = clamp01((float64(n.Score.Value) - 0.5) / 0.5)
		case n.Score.Measure == "r2":
			b.Score = fmt.Sprintf("R² %.2f", float64(n.Score.Value))
			b.ScoreW = clamp01(float64(n.Score.Value))
		default:
			b.Score = fmt.Sprintf("%.2f explained", float64(n.Score.Value))
			b.ScoreW = clamp01(float64(n.Score.Value))
		}
		b.ScoreW *= boxWidth - 16
		b.BarX, b.BarY = b.X+8, b.Y+h-8
		net.Boxes = append(net.Boxes, b)
		var mb []int
		for _, m := range n.MarkovBlanket {
			mb = append(mb, index[m])
		}
		v.Blankets[fmt.Sprint(i)] = mb
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
	v.Net = net
	for i := range res.Nodes {
		v.Nodes = append(v.Nodes, nodeSection(res, i))
	}
	v.Summary = summarise(res, o)
	v.Cautions = []string{
		"This network is a hypothesis drawn from observational data, not a proof of cause and effect.",
		"Unmeasured confounding, selection of the patients in the table, and measurement error can create edges that are not causal or hide ones that are.",
		"Directions rest entirely on the time order supplied; an error in the order can reverse or invent an effect.",
		"It does not replace clinical judgement, local rules and approvals, or review by licensed statisticians and clinicians.",
	}
	return v, nil
}

func clamp01(x float64) float64 {
	if !finite(x) {
		return 0
	}
	return math.Max(0, math.Min(1, x))
}

func edgeTitle(e antecedent.Edge) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s → %s", e.From, e.To)
	if c := float64(e.Coefficient); finite(c) {
		fmt.Fprintf(&b, ": coefficient %.3g", c)
		if finite(float64(e.Lower)) {
			fmt.Fprintf(&b, " [%.3g, %.3g]", float64(e.Lower), float64(e.Upper))
		}
	}
	if s := float64(e.Standardized); finite(s) {
		fmt.Fprintf(&b, "; standardised %.2f", s)
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
	for _, e := range res.Edges {
		if e.To == n.Name {
			freq[e.From] = float64(e.Frequency)
		}
	}
	for _, e := range n.Effects {
		ev := effectView{Term: e.Term, Parent: e.Parent,
			Estimate: fmtNum(e.Estimate), Interval: "[" + fmtNum(e.Lower) + ", " + fmtNum(e.Upper) + "]",
			Standardized: fmtNum(e.Standardized)}
		if finite(float64(e.OddsRatio)) {
			ev.Odds = fmtNum(e.OddsRatio) + " [" + fmtNum(e.OddsLower) + ", " + fmtNum(e.OddsUpper) + "]"
		}
		if f, ok := freq[e.Parent]; ok && finite(f) {
			ev.Frequency = fmt.Sprintf("%.0f%%", 100*f)
		}
		nv.Effects = append(nv.Effects, ev)
	}
	if len(n.Curve) > 1 {
		nv.CV = cvChart(n)
	}
	if n.Path != nil && len(n.Path.Penalties) > 1 {
		nv.Path = pathChart(n)
	}
	return nv
}

func fmtNum(x antecedent.Number) string {
	f := float64(x)
	if !finite(f) {
		return "–"
	}
	return fmt.Sprintf("%.3g", f)
}

func cvChart(n *antecedent.Node) *chart {
	c := newChart("−log penalty", "CV "+n.Measure.String())
	var xs, ys, lo, hi []float64
	for _, p := range n.Curve {
		xs = append(xs, -math.Log(float64(p.Penalty)))
		ys = append(ys, float64(p.Mean))
		lo = append(lo, float64(p.Mean)-float64(p.SE))
		hi = append(hi, float64(p.Mean)+float64(p.SE))
	}
	ymin, ymax := math.Inf(1), math.Inf(-1)
	for i := range ys {
		for _, y := range []float64{lo[i], hi[i]} {
			if finite(y) {
				ymin, ymax = math.Min(ymin, y), math.Max(ymax, y)
			}
		}
	}
	if !finite(ymin) {
		return nil
	}
	sx, sy := c.axes(xs[0], xs[len(xs)-1], ymin, ymax)
	for i := range xs {
		if finite(lo[i]) && finite(hi[i]) {
			c.Bars = append(c.Bars, bar{sx.at(xs[i]), sy.at(lo[i]), sy.at(hi[i])})
		}
	}
	c.Series = append(c.Series, series{Points: points(sx, sy, xs, ys), Class: "cv"})
	add := func(pen antecedent.Number, name, class string, y float64) {
		if f := float64(pen); finite(f) && f > 0 {
			c.Marks = append(c.Marks, c.mark(sx.at(-math.Log(f)), name, class, y))
		}
	}
	add(n.BestPenalty, "minimum", "best", c.Top+10)
	add(n.OneSEPenalty, "one SE", "onese", c.Top+22)
	return c
}

func pathChart(n *antecedent.Node) *chart {
	c := newChart("−log penalty", "coefficient")
	p := n.Path
	xs := make([]float64, len(p.Penalties))
	for k, l := range p.Penalties {
		xs[k] = -math.Log(float64(l))
	}
	ymin, ymax := 0.0, 0.0
	for _, vals := range p.Values {
		for _, v := range vals {
			if f := float64(v); finite(f) {
				ymin, ymax = math.Min(ymin, f), math.Max(ymax, f)
			}
		}
	}
	sx, sy := c.axes(xs[0], xs[len(xs)-1], ymin, ymax)
	type ranked struct {
		t    int
		size float64
	}
	var order []ranked
	for t, vals := range p.Values {
		last := float64(vals[len(vals)-1])
		order = append(order, ranked{t, math.Abs(last)})
	}
	slices.SortFunc(order, func(a, b ranked) int {
		switch {
		case a.size > b.size:
			return -1
		case a.size < b.size:
			return 1
		}
		return a.t - b.t
	})
	for rank, r := range order {
		ys := make([]float64, len(xs))
		for k, v := range p.Values[r.t] {
			ys[k] = float64(v)
		}
		s := series{Points: points(sx, sy, xs, ys), Class: fmt.Sprintf("c%d", rank%8)}
		if rank < 5 && r.size > 0 {
			s.Name = shorten(p.Terms[r.t], 18)
			s.LabelX = c.Left + c.PlotW - 2
			s.LabelY = sy.at(ys[len(ys)-1])
		}
		c.Series = append(c.Series, s)
	}
	if f := float64(n.Penalty); finite(f) && f > 0 {
		c.Marks = append(c.Marks, c.mark(sx.at(-math.Log(f)), "selected", "sel", c.Top+10))
	}
	return c
}

func summarise(res *antecedent.Result, o *Options) summary {
	s := summary{Variables: len(res.Nodes), Rows: res.Rows, Edges: len(res.Edges), Folds: res.Config.Folds,
		Rule: res.Config.Rule.String(), Measure: res.Config.Measure.String(), Seed: res.Config.Seed, Mixing: res.Config.Mixing,
		Stability: res.Stability, Timings: res.Timings, Warnings: res.Warnings}
	if res.Order != nil {
		s.Tiers = len(res.Order.Tiers)
	}
	for _, n := range res.Nodes {
		if n.Fitted {
			s.Fitted++
		}
	}
	if o.Truth != nil {
		var est, tru []metrics.Edge
		for _, e := range res.Edges {
			est = append(est, metrics.Edge{From: e.From, To: e.To})
		}
		for _, e := range o.Truth.Edges() {
			tru = append(tru, metrics.Edge{From: e.From, To: e.To})
		}
		if sc, err := metrics.CompareGraphs(est, tru); err == nil {
			s.Truth = &sc
			s.TruthEdges = len(tru)
		}
	}
	return s
}
