package report

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/intervention"
	"github.com/antecedent-lab/antecedent/sizing"
)

// This file draws the answers to questions asked of the network: an
// intervention (intervention.Chart) as dots with intervals, one block per
// outcome; a study plan (sizing.Chart) as the share of studies finding
// each edge against the rows. The packages that answer own the numbers;
// this file owns where they go.

// answerView is one intervention answer, ready for the template.
type answerView struct {
	Title    string
	Figure   *forest
	Warnings []string
	Caption  string
	Caution  string
}

// planView is one study plan, ready for the template.
type planView struct {
	Title    string
	Figure   *planFigure
	Sizes    []int
	Rows     []planRow
	Needed   string
	Warnings []string
	Caption  string
	Caution  string
}

// planRow is a row of the table under a plan's chart.
type planRow struct {
	Label  string
	Values []string
}

// forest is a figure of estimates drawn as dots with horizontal
// intervals, in panels that each have their own axis.
type forest struct {
	Width, Height float64
	Texts         []chartLabel // outcome headings and notes
	Panels        []forestPanel
}

// forestPanel is one axis and the estimates drawn on it.
type forestPanel struct {
	Title       string
	TitleY      float64
	Left, Right float64 // the axis's extent
	Top, Bottom float64 // the rows' extent; the axis is drawn at Bottom
	Rows        []forestRow
	Ticks       []tick
	AxisLabel   string
	ZeroX       float64
	HasZero     bool
	// Broken marks an axis that does not start at zero.
	Broken bool
}

// forestRow is one estimate: a dot at X with its interval [Lo, Hi].
type forestRow struct {
	Label       string
	Y           float64
	X, Lo, Hi   float64
	HasPoint    bool
	HasInterval bool
	Value       string
	Class       string
}

// Sizes of the question figures, in SVG units.
const (
	figW       = 640
	figLabelR  = 196 // right edge of the row labels
	figPlotL   = 206
	figPlotR   = 410 // the values are printed from figPlotR + 12
	rowPitch   = 20
	panelTitle = 18 // from a panel's title baseline to its first row
	axisRoom   = 32 // below the last row: tick labels and the axis label
	panelGap   = 14
	headRoom   = 24 // an outcome heading
	noteLine   = 15
	figPad     = 6
	noteChars  = 96 // characters of a line of a note (12 units)
	headChars  = 65 // characters of an outcome heading (bold, 14 units: (figW − 2 figPad) / (0.68 × 14))
)

// qWidth estimates the width of a label of the question figures (11.5
// units): 0.62 em a character, wider than most sans-serif text (common
// practice: average glyphs run 0.5–0.6 em).
func qWidth(s string) float64 { return 0.62 * 11.5 * float64(utf8.RuneCountInString(s)) }

// fit shortens s to fit width units of question-figure text.
func fit(s string, width float64) string {
	return shorten(s, max(2, int(width/qWidth("m"))))
}

// edgeName names the edge from → to in at most n characters, shortening
// each end rather than losing the arrow.
func edgeName(from, to string, n int) string {
	s := from + " → " + to
	if utf8.RuneCountInString(s) <= n {
		return s
	}
	half := max(2, (n-3)/2)
	a, b := utf8.RuneCountInString(from), utf8.RuneCountInString(to)
	switch {
	case b <= half:
		return shorten(from, n-3-b) + " → " + to
	case a <= half:
		return from + " → " + shorten(to, n-3-a)
	}
	return shorten(from, half) + " → " + shorten(to, n-3-half)
}

// fitBold shortens s to fit width units of bold 12-unit text (0.68 em a
// character).
func fitBold(s string, width float64) string {
	return shorten(s, max(2, int(width/(0.68*12))))
}

// estimate formats an estimate as "v [lo, hi]".
func estimate(e intervention.Estimate) string {
	s := fmtNum(e.Value)
	if finite(float64(e.Lower)) && finite(float64(e.Upper)) {
		s += " [" + fmtNum(e.Lower) + ", " + fmtNum(e.Upper) + "]"
	}
	return s
}

// forestAxis returns the scale of a panel holding the estimates es, and
// ticks. With zero set the axis always shows zero (differences); otherwise
// it starts at zero when the estimates' smallest value is at most half
// their largest, and else is cut short and marked broken. A risk axis
// stays within [0, 1].
func forestAxis(p *forestPanel, es []intervention.Estimate, zero, risk bool) scale {
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, e := range es {
		for _, v := range []antecedent.Number{e.Value, e.Lower, e.Upper} {
			if f := float64(v); finite(f) {
				lo, hi = math.Min(lo, f), math.Max(hi, f)
			}
		}
	}
	if !finite(lo) {
		lo, hi = 0, 1
	}
	pad := (hi - lo) * 0.08
	if pad == 0 {
		pad = math.Max(math.Abs(hi)*0.1, 0.5)
	}
	switch {
	case zero || lo >= 0 && lo <= hi/2 || hi <= 0 && hi >= lo/2:
		lo, hi = math.Min(lo-pad, 0), math.Max(hi+pad, 0)
		if lo > -pad/2 && lo < 0 {
			lo = 0
		}
		if hi < pad/2 && hi > 0 {
			hi = 0
		}
		if lo == 0 && hi == 0 {
			hi = 1
		}
	default:
		lo, hi = lo-pad, hi+pad
		if lo < 0 && hi > 0 { // the padding reached zero: the axis spans it
			break
		}
		p.Broken = true
	}
	if risk {
		lo, hi = math.Max(lo, 0), math.Min(hi, 1)
		p.Broken = lo > 0
	}
	sx := scale{lo, hi, p.Left, p.Right}
	t := ticks(lo, hi, 4)
	first := p.Left - 0.5
	if p.Broken {
		first = p.Left + 14 // clear of the break mark
	}
	for _, v := range t {
		if x := sx.at(v); x >= first && x <= p.Right+0.5 {
			p.Ticks = append(p.Ticks, tick{x, label(v, step(t))})
		}
	}
	for len(p.Ticks) > 2 && ticksCrowded(p.Ticks) {
		var thin []tick
		for i, t := range p.Ticks {
			if i%2 == 0 {
				thin = append(thin, t)
			}
		}
		p.Ticks = thin
	}
	if lo <= 0 && hi >= 0 {
		p.ZeroX, p.HasZero = sx.at(0), true
	}
	return sx
}

// ticksCrowded reports whether neighbouring tick labels, centred on their
// ticks, come closer than 8 units.
func ticksCrowded(ts []tick) bool {
	for i := 1; i < len(ts); i++ {
		if ts[i].Pos-ts[i-1].Pos < (qWidth(ts[i].Label)+qWidth(ts[i-1].Label))/2+8 {
			return true
		}
	}
	return false
}

// addPanel adds a panel of labelled estimates below y and returns the
// height below it.
func (f *forest) addPanel(y float64, title, axis string, labels []string, es []intervention.Estimate, classes []string, zero, risk bool) float64 {
	p := forestPanel{Title: fitBold(title, figW-2*figPad), TitleY: y + 12, Left: figPlotL, Right: figPlotR}
	p.Top = y + panelTitle
	p.Bottom = p.Top + float64(len(es))*rowPitch
	sx := forestAxis(&p, es, zero, risk)
	// The axis label is centred under the axis and may reach the
	// figure's edges; a cut axis says so, whatever the label's length.
	room := 2*math.Min((p.Left+p.Right)/2, figW-(p.Left+p.Right)/2) - 2*figPad
	if p.Broken {
		const cut = " (axis does not start at 0)"
		p.AxisLabel = fit(axis, room-qWidth(cut)) + cut
	} else {
		p.AxisLabel = fit(axis, room)
	}
	for k, e := range es {
		r := forestRow{Label: fit(labels[k], p.Left-10-figPad), Y: p.Top + (float64(k)+0.5)*rowPitch, Value: fit(estimate(e), figW-figPad-p.Right-12), Class: classes[k]}
		if v := float64(e.Value); finite(v) {
			r.X, r.HasPoint = sx.at(v), true
		}
		if l, u := float64(e.Lower), float64(e.Upper); finite(l) && finite(u) {
			r.Lo, r.Hi, r.HasInterval = sx.at(l), sx.at(u), true
		}
		p.Rows = append(p.Rows, r)
	}
	f.Panels = append(f.Panels, p)
	return p.Bottom + axisRoom + panelGap
}

// addNote adds a note under the panel that ends at y (a panel's height
// includes the gap below it), wrapped to noteChars, and returns the new
// end.
func (f *forest) addNote(y float64, text string) float64 {
	for _, line := range strings.Split(wrapText(text, noteChars), "\n") {
		f.Texts = append(f.Texts, chartLabel{X: figPad, Y: y - panelGap + 12, Text: line, Class: "note", Anchor: "start"})
		y += noteLine
	}
	return y
}

// wrapText breaks text into lines of at most width characters at spaces.
func wrapText(text string, width int) string {
	var b strings.Builder
	line := 0
	for i, word := range strings.Fields(text) {
		n := utf8.RuneCountInString(word)
		if i > 0 && line+1+n > width {
			b.WriteByte('\n')
			line = 0
		} else if i > 0 {
			b.WriteByte(' ')
			line++
		}
		b.WriteString(word)
		line += n
	}
	return b.String()
}

// answerFigure draws an intervention answer's chart: for each outcome, its
// mean (or risk) under each setting, the difference by g-computation beside
// the adjustment-set regressions, the ratio of risks, and the path
// decomposition where the path rule applies.
func answerFigure(c intervention.Chart) *forest {
	f := &forest{Width: figW}
	y := float64(figPad)
	for _, r := range c.Rows {
		what, unit := "mean", r.Outcome
		if r.Scale == "risk" {
			what = "risk"
		}
		f.Texts = append(f.Texts, chartLabel{X: figPad, Y: y + 16, Text: shorten(r.Outcome, headChars), Class: "head", Anchor: "start"})
		y += headRoom
		y = f.addPanel(y, fmt.Sprintf("%s of %s under each setting", capital(what), unit), what+" of "+unit,
			[]string{c.LabelA, c.LabelB}, []intervention.Estimate{r.A, r.B}, []string{"set-a", "set-b"}, false, what == "risk")
		if !r.Downstream {
			y = f.addNote(y, "Not downstream of "+c.Cause+" in the network: the same under both settings.") + panelGap/2
			continue
		}
		labels := []string{"g-computation"}
		es := []intervention.Estimate{r.Difference}
		classes := []string{"gcomp"}
		for _, a := range r.Adjusted {
			labels, es, classes = append(labels, "adjusted: "+setName(a.Label)), append(es, a.Estimate), append(classes, "adjusted")
		}
		y = f.addPanel(y, fmt.Sprintf("Difference in %s: %s − %s", what, c.LabelA, c.LabelB), "difference in "+what+" of "+unit,
			labels, es, classes, true, false)
		if finite(float64(r.Ratio.Value)) {
			y = f.addNote(y, fmt.Sprintf("Ratio of risks, %s ÷ %s: %s", c.LabelA, c.LabelB, estimate(r.Ratio)))
		}
		if len(r.Paths) > 0 {
			labels, es, classes = nil, nil, nil
			for _, p := range r.Paths {
				labels, es, classes = append(labels, p.Label), append(es, p.Estimate), append(classes, "path")
			}
			y = f.addPanel(y, fmt.Sprintf("Paths from %s to %s, per unit of %s", c.Cause, r.Outcome, c.Cause), "effect per unit of "+c.Cause,
				labels, es, classes, true, false)
		} else if r.PathsNote != "" {
			y = f.addNote(y, "No path decomposition: "+r.PathsNote)
		}
		y += panelGap / 2
	}
	f.Height = y
	return f
}

// setName names an adjustment set briefly for a row label.
func setName(s string) string {
	switch s {
	case "parents of the cause":
		return "cause's parents"
	case "optimal":
		return "optimal set"
	}
	return s
}

func capital(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}

// planFigure is the chart of a study plan: the share of studies that find
// each edge against the rows, on a logarithmic axis of rows.
type planFigure struct {
	Width, Height float64
	Left, Top     float64
	PlotW, PlotH  float64
	XTicks        []tick
	YTicks        []tick
	XLabel        string
	YLabel        string
	Grey          []series
	Curves        []planCurve
	Labels        []chartLabel
	// Target is the target share's line and label; Needed marks the rows
	// read from the curve.
	Target *targetLine
	Needed *neededMark
}

type planCurve struct {
	Points string
	Bars   []errBar
	Dots   []dot
	Class  string
	Title  string
}

type errBar struct{ X, Y0, Y1 float64 }

type targetLine struct {
	Y     float64
	Label chartLabel
}

type neededMark struct {
	X, Y  float64
	Label chartLabel
}

const (
	planH     = 270
	planLeft  = 50
	planRight = 230 // room for the highlighted edges' names
	planTop   = 14
	planBot   = 46
	maxCurves = 4 // edges drawn in colour and named when none is asked about
)

// planChart draws a plan's chart. The edge asked about (c.Needed), or
// every edge when there are at most maxCurves, is drawn in colour with
// ±1 Monte Carlo standard error bars and named at its right end; other
// edges are thin grey lines. The share axis runs from 0 to 1.
func planChart(c sizing.Chart) (*planFigure, []sizing.Curve) {
	f := &planFigure{Width: figW, Height: planH, Left: planLeft, Top: planTop, PlotW: figW - planLeft - planRight, PlotH: planH - planTop - planBot,
		XLabel: "rows per study (log scale)", YLabel: "share finding the edge"}
	if len(c.Rows) == 0 {
		return f, nil
	}
	lx := make([]float64, len(c.Rows))
	for i, n := range c.Rows {
		lx[i] = math.Log10(float64(max(n, 1)))
	}
	lo, hi := lx[0], lx[len(lx)-1]
	if hi <= lo {
		lo, hi = lo-0.5, hi+0.5
	}
	pad := (hi - lo) * 0.05
	sx := scale{lo - pad, hi + pad, f.Left, f.Left + f.PlotW}
	sy := scale{0, 1, f.Top + f.PlotH, f.Top}
	right := math.Inf(-1)
	for i, n := range c.Rows {
		t := tick{sx.at(lx[i]), strconv.Itoa(n)}
		if t.Pos-qWidth(t.Label)/2 < right+6 {
			continue // would touch the previous label
		}
		f.XTicks = append(f.XTicks, t)
		right = t.Pos + qWidth(t.Label)/2
	}
	for v := 0.0; v <= 1.0001; v += 0.2 {
		f.YTicks = append(f.YTicks, tick{sy.at(v), fmt.Sprintf("%.0f%%", 100*v)})
	}
	var shown []sizing.Curve
	for _, cv := range c.Curves {
		asked := c.Needed != nil && cv.From == c.Needed.From && cv.To == c.Needed.To
		if asked || c.Needed == nil && len(c.Curves) <= maxCurves {
			shown = append(shown, cv)
			continue
		}
		f.Grey = append(f.Grey, series{Points: points(sx, sy, lx, cv.Values), Class: "other", Title: cv.Label})
	}
	type end struct {
		y    float64
		name string
		k    int
	}
	var ends []end
	for k, cv := range shown {
		pc := planCurve{Points: points(sx, sy, lx, cv.Values), Class: fmt.Sprintf("c%d", k%maxCurves), Title: cv.Label}
		last := math.NaN()
		for i, v := range cv.Values {
			if i >= len(lx) || !finite(v) {
				continue
			}
			x := sx.at(lx[i])
			pc.Dots = append(pc.Dots, dot{X: x, Y: sy.at(v), Class: pc.Class})
			if i < len(cv.SE) && finite(cv.SE[i]) && cv.SE[i] > 0 {
				pc.Bars = append(pc.Bars, errBar{X: x, Y0: sy.at(math.Max(0, v-cv.SE[i])), Y1: sy.at(math.Min(1, v+cv.SE[i]))})
			}
			last = sy.at(v)
		}
		f.Curves = append(f.Curves, pc)
		if finite(last) {
			name := cv.Label
			if cv.From != "" {
				name = edgeName(cv.From, cv.To, int((planRight-8-figPad)/qWidth("m")))
			}
			ends = append(ends, end{last + 4, name, k})
		}
	}
	// Name the coloured curves at their right ends, kept a line apart.
	for i := 1; i < len(ends); i++ {
		for j := i; j > 0 && ends[j].y < ends[j-1].y; j-- {
			ends[j], ends[j-1] = ends[j-1], ends[j]
		}
	}
	want := make([]float64, len(ends))
	for i, e := range ends {
		want[i] = e.y
	}
	got := stack(want, f.Top+9, f.Top+f.PlotH+2)
	xEnd := sx.at(hi)
	for i, e := range ends {
		l := chartLabel{X: f.Left + f.PlotW + 8, Y: got[i], Text: e.name, Anchor: "start", Class: fmt.Sprintf("c%d", e.k%maxCurves)}
		if math.Abs(got[i]-e.y) > 2 {
			l.Leader, l.LX, l.LY = true, xEnd, e.y-4
		}
		f.Labels = append(f.Labels, l)
	}
	if n := c.Needed; n != nil && n.Probability > 0 && n.Probability < 1 {
		y := sy.at(n.Probability)
		f.Target = &targetLine{Y: y, Label: chartLabel{X: f.Left + 4, Y: y - 4, Text: fmt.Sprintf("target %.0f%%", 100*n.Probability), Anchor: "start", Class: "muted"}}
		if n.Rows > 0 {
			x := sx.at(math.Log10(float64(n.Rows)))
			m := &neededMark{X: x, Y: y, Label: chartLabel{X: x + 5, Y: f.Top + f.PlotH - 6, Text: fmt.Sprintf("≈ %d rows", n.Rows), Anchor: "start", Class: "key"}}
			if x+5+float64(utf8.RuneCountInString(m.Label.Text))*0.68*11.5 > f.Left+f.PlotW {
				m.Label.X, m.Label.Anchor = x-5, "end"
			}
			f.Needed = m
		}
	}
	return f, shown
}

// planSection returns the view of a study plan: its chart, and a table of
// the shares of the coloured edges and the false edges per study.
func planSection(a *sizing.Answer) planView {
	c := a.Chart()
	fig, shown := planChart(c)
	v := planView{Title: c.Title, Figure: fig, Sizes: c.Rows, Warnings: a.Plan.Warnings, Caution: c.Caution}
	pm := func(x, se float64) string {
		if !finite(x) {
			return "–"
		}
		return fmt.Sprintf("%.2f ± %.2f", x, se)
	}
	for _, cv := range append(shown, c.FalseEdges) {
		r := planRow{Label: cv.Label}
		for i := range c.Rows {
			x, se := math.NaN(), math.NaN()
			if i < len(cv.Values) {
				x = cv.Values[i]
			}
			if i < len(cv.SE) {
				se = cv.SE[i]
			}
			r.Values = append(r.Values, pm(x, se))
		}
		v.Rows = append(v.Rows, r)
	}
	v.Caption = fmt.Sprintf("Each point: the share of %d simulated studies of that size whose discovery found the edge; bars: ±1 Monte Carlo standard error.", a.Plan.Replicates)
	if len(fig.Grey) > 0 {
		v.Caption += fmt.Sprintf(" Grey: the network's other %d edges.", len(fig.Grey))
	}
	if n := c.Needed; n != nil {
		switch n.Status {
		case sizing.Reached:
			v.Needed = fmt.Sprintf("Rows needed to find %s → %s in %.0f%% of studies: about %d (between %d and %d rows; read from the shares made non-decreasing, interpolated in log rows).",
				n.From, n.To, 100*n.Probability, n.Rows, n.Below, n.Above)
		case sizing.AtSmallest:
			v.Needed = fmt.Sprintf("%s → %s is found in %.0f%% of studies already at %d rows, the smallest size simulated; fewer rows may do.",
				n.From, n.To, 100*n.Probability, n.Rows)
		default:
			v.Needed = fmt.Sprintf("%s → %s is not found in %.0f%% of studies even at %d rows, the largest size simulated: more rows are needed.",
				n.From, n.To, 100*n.Probability, c.Rows[len(c.Rows)-1])
		}
	}
	return v
}

// answerSection returns the view of an intervention answer.
func answerSection(a *intervention.Answer) answerView {
	c := a.Chart()
	v := answerView{Title: fmt.Sprintf("What if %s were %s rather than %s?", c.Cause, c.LabelA, c.LabelB), Figure: answerFigure(c), Warnings: a.Warnings, Caution: c.Caution}
	v.Caption = fmt.Sprintf("Dots: estimates; lines: %.0f%% percentile bootstrap intervals from %d resamples whose equations were refitted with the discovered parents held fixed "+
		"(they do not include the uncertainty of discovery). g-computation over %d rows; \"adjusted\": one regression of the outcome on %s and an adjustment set the network implies.",
		100*c.Level, a.Resamples-a.Failed, a.Rows, a.Cause)
	return v
}

// checkAnswers returns an error for an answer the report cannot draw: a
// nil one, a plan without sizes, or one about a variable the result lacks.
func checkAnswers(res *antecedent.Result, o *Options) error {
	for k, a := range o.Interventions {
		if a == nil {
			return fmt.Errorf("report: intervention answer %d is nil", k)
		}
		if _, err := res.Node(a.Cause); err != nil {
			return fmt.Errorf("report: intervention answer %d is about %q, which is not a variable of the result", k, a.Cause)
		}
		for _, out := range a.Outcomes {
			if _, err := res.Node(out.Name); err != nil {
				return fmt.Errorf("report: intervention answer %d has the outcome %q, which is not a variable of the result", k, out.Name)
			}
		}
	}
	for k, a := range o.Plans {
		if a == nil || a.Plan == nil || len(a.Plan.Sizes) == 0 {
			return fmt.Errorf("report: study plan %d has no sizes", k)
		}
		for _, e := range a.Plan.Edges {
			if len(e.Found) != len(a.Plan.Sizes) {
				return fmt.Errorf("report: study plan %d: edge %s → %s has %d shares for %d sizes", k, e.From, e.To, len(e.Found), len(a.Plan.Sizes))
			}
		}
	}
	return nil
}
