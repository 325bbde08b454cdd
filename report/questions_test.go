package report

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/antecedent-lab/antecedent/intervention"
	"github.com/antecedent-lab/antecedent/sizing"
)

// This file checks the question figures as laid out: no two texts
// overlap, every text stays inside its figure, and every estimate, interval
// and share is drawn inside its axes.

// textBox is the estimated extent of a text.
type textBox struct {
	x0, y0, x1, y1 float64
	text           string
}

// estimateBox returns the extent of text drawn at (x, y) with the given
// anchor and font size: 0.62 em a character (0.68 bold), from 0.8 em
// above the baseline to 0.25 em below it (common practice for sans-serif
// faces: capitals about 0.7 em, descenders about 0.2 em; widths run wide).
func estimateBox(x, y float64, anchor, text string, size float64, bold bool) textBox {
	per := 0.62
	if bold {
		per = 0.68
	}
	w := per * size * float64(utf8.RuneCountInString(text))
	x0 := x
	switch anchor {
	case "end":
		x0 -= w
	case "middle":
		x0 -= w / 2
	}
	return textBox{x0, y - 0.8*size, x0 + w, y + 0.25*size, text}
}

func (a textBox) overlaps(b textBox) bool {
	return a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1
}

// overlapping returns the first pair of boxes that overlap, and the first
// box outside [0, w] × [0, h].
func overlapping(boxes []textBox, w, h float64) []string {
	var faults []string
	for i, a := range boxes {
		if a.x0 < -0.5 || a.x1 > w+0.5 || a.y0 < -0.5 || a.y1 > h+0.5 {
			faults = append(faults, fmt.Sprintf("%q leaves the figure (%.0f×%.0f): %.1f..%.1f × %.1f..%.1f", a.text, w, h, a.x0, a.x1, a.y0, a.y1))
		}
		for _, b := range boxes[i+1:] {
			if a.overlaps(b) {
				faults = append(faults, fmt.Sprintf("%q overlaps %q", a.text, b.text))
			}
		}
	}
	return faults
}

// forestTexts returns the texts of f as the template draws them.
func forestTexts(f *forest) []textBox {
	var out []textBox
	for _, t := range f.Texts {
		size, bold := 12.0, false
		if t.Class == "head" {
			size, bold = 14, true
		}
		out = append(out, estimateBox(t.X, t.Y, t.Anchor, t.Text, size, bold))
	}
	for _, p := range f.Panels {
		out = append(out, estimateBox(6, p.TitleY, "start", p.Title, 12, true))
		for _, t := range p.Ticks {
			out = append(out, estimateBox(t.Pos, p.Bottom+15, "middle", t.Label, 11.5, false))
		}
		out = append(out, estimateBox((p.Left+p.Right)/2, p.Bottom+29, "middle", p.AxisLabel, 11.5, false))
		for _, r := range p.Rows {
			out = append(out, estimateBox(p.Left-10, r.Y+4, "end", r.Label, 11.5, false))
			out = append(out, estimateBox(p.Right+12, r.Y+4, "start", r.Value, 11.5, false))
		}
	}
	return out
}

// planTexts returns the texts of f as the template draws them, and the
// length of the rotated share label.
func planTexts(f *planFigure) []textBox {
	var out []textBox
	for _, t := range f.XTicks {
		out = append(out, estimateBox(t.Pos, f.Top+f.PlotH+16, "middle", t.Label, 11.5, false))
	}
	for _, t := range f.YTicks {
		out = append(out, estimateBox(f.Left-5, t.Pos+3.5, "end", t.Label, 11.5, false))
	}
	out = append(out, estimateBox(f.Left+f.PlotW/2, f.Height-8, "middle", f.XLabel, 11.5, false))
	labels := f.Labels
	if f.Target != nil {
		labels = append(labels, f.Target.Label)
	}
	if f.Needed != nil {
		labels = append(labels, f.Needed.Label)
	}
	for _, l := range labels {
		out = append(out, estimateBox(l.X, l.Y, l.Anchor, l.Text, 11.5, strings.Contains(l.Class, "key")))
	}
	return out
}

func within(v, lo, hi float64) bool { return v >= lo-0.01 && v <= hi+0.01 }

// TestQuestionFigureGeometry lays out the figures of answers computed on a
// simulated study (QuestionAnswers) and checks them: texts apart and
// inside, estimates and intervals inside their axes, the zero line on a
// difference axis, an axis cut short marked as such, shares inside [0, 1].
func TestQuestionFigureGeometry(t *testing.T) {
	_, answers, plans := QuestionAnswers(t)
	for k, a := range answers {
		t.Run(fmt.Sprintf("intervention-%d", k), func(t *testing.T) {
			f := answerFigure(a.Chart())
			for _, fault := range overlapping(forestTexts(f), f.Width, f.Height) {
				t.Error(fault)
			}
			for _, p := range f.Panels {
				if strings.HasPrefix(p.AxisLabel, "risk of") {
					for _, tk := range p.Ticks {
						if v, err := strconv.ParseFloat(tk.Label, 64); err != nil || v < 0 || v > 1 {
							t.Errorf("%s: risk tick %q outside [0, 1]", p.Title, tk.Label)
						}
					}
				}
				if p.HasZero && !within(p.ZeroX, p.Left, p.Right) {
					t.Errorf("%s: zero line at %.1f outside %.1f..%.1f", p.Title, p.ZeroX, p.Left, p.Right)
				}
				if strings.HasPrefix(p.Title, "Difference") || strings.HasPrefix(p.Title, "Paths") {
					if !p.HasZero {
						t.Errorf("%s: a difference drawn without its zero", p.Title)
					}
				}
				if p.Broken != strings.Contains(p.AxisLabel, "does not start at 0") || p.Broken && p.HasZero {
					t.Errorf("%s: broken %v, zero %v, axis label %q", p.Title, p.Broken, p.HasZero, p.AxisLabel)
				}
				for _, r := range p.Rows {
					if !r.HasPoint || !r.HasInterval {
						t.Errorf("%s, %s: no point or interval", p.Title, r.Label)
						continue
					}
					for _, x := range []float64{r.X, r.Lo, r.Hi} {
						if !within(x, p.Left, p.Right) {
							t.Errorf("%s, %s: %.1f outside the axis %.1f..%.1f", p.Title, r.Label, x, p.Left, p.Right)
						}
					}
					if !(r.Lo <= r.X+0.01 && r.X <= r.Hi+0.01) || !within(r.Y, p.Top, p.Bottom) {
						t.Errorf("%s, %s: point %.1f outside its interval %.1f..%.1f, or row %.1f outside %.1f..%.1f", p.Title, r.Label, r.X, r.Lo, r.Hi, r.Y, p.Top, p.Bottom)
					}
				}
			}
		})
	}
	for k, a := range plans {
		t.Run(fmt.Sprintf("plan-%d", k), func(t *testing.T) {
			f, shown := planChart(a.Chart())
			for _, fault := range overlapping(planTexts(f), f.Width, f.Height) {
				t.Error(fault)
			}
			if w := 0.62 * 11.5 * float64(utf8.RuneCountInString(f.YLabel)); w > f.PlotH {
				t.Errorf("the share label (%.0f units) is longer than the axis (%.0f)", w, f.PlotH)
			}
			if len(f.Labels) != len(shown) || len(shown) == 0 {
				t.Errorf("%d edges in colour, %d named", len(shown), len(f.Labels))
			}
			inPlot := func(x, y float64) bool {
				return within(x, f.Left, f.Left+f.PlotW) && within(y, f.Top, f.Top+f.PlotH)
			}
			for _, c := range f.Curves {
				for _, d := range c.Dots {
					if !inPlot(d.X, d.Y) {
						t.Errorf("%s: point (%.1f, %.1f) outside the plot", c.Title, d.X, d.Y)
					}
				}
				for _, b := range c.Bars {
					if !inPlot(b.X, b.Y0) || !inPlot(b.X, b.Y1) {
						t.Errorf("%s: error bar %+v outside the plot", c.Title, b)
					}
				}
			}
			// The share axis runs from 0 to 1: its ticks read 0% at the
			// bottom and 100% at the top.
			if y := f.YTicks; y[0].Label != "0%" || y[0].Pos != f.Top+f.PlotH || y[len(y)-1].Label != "100%" || y[len(y)-1].Pos != f.Top {
				t.Errorf("share axis ticks %+v", y)
			}
			if n := a.Needed; n != nil && n.Rows > 0 {
				if f.Needed == nil || !inPlot(f.Needed.X, f.Needed.Y) {
					t.Errorf("rows needed %d not marked inside the plot: %+v", n.Rows, f.Needed)
				}
			}
		})
	}
}

// TestQuestionFigureCrowded lays out figures under strain: an answer with
// a dozen outcomes with long names, extreme and unknown values, and a plan
// of twelve sizes, forty edges and a rows-needed mark at the right edge.
func TestQuestionFigureCrowded(t *testing.T) {
	_, answers, plans := QuestionAnswers(t)
	c := answers[0].Chart()
	base := c.Rows[0]
	for k := range 12 {
		r := base
		r.Outcome = strings.Repeat("very_long_outcome_name_", 4) + fmt.Sprint(k)
		scale := intervention.Number(math.Pow(10, float64(k-6)))
		for _, e := range []*intervention.Estimate{&r.A, &r.B, &r.Difference} {
			*e = intervention.Estimate{Value: e.Value * scale, Lower: e.Lower * scale, Upper: e.Upper * scale, SE: e.SE}
		}
		if k == 3 {
			r.Difference.Lower, r.Difference.Upper = intervention.Number(math.NaN()), intervention.Number(math.NaN())
		}
		c.Rows = append(c.Rows, r)
	}
	// A risk near 1: its axis must stop at 1.
	high := c.Rows[0]
	high.Scale, high.Outcome = "risk", "nearly_certain"
	high.A = intervention.Estimate{Value: 0.985, Lower: 0.97, Upper: 0.999}
	high.B = intervention.Estimate{Value: 0.99, Lower: 0.98, Upper: 1}
	c.Rows = append(c.Rows, high)
	f := answerFigure(c)
	for _, fault := range overlapping(forestTexts(f), f.Width, f.Height) {
		t.Error(fault)
	}
	for _, p := range f.Panels {
		if !strings.HasPrefix(p.AxisLabel, "risk of nearly_certain") {
			continue
		}
		if !p.Broken {
			t.Errorf("a risk axis from 0.97 to 1 is not marked as cut: %q", p.AxisLabel)
		}
		// The axis ends at 1: the tick there is the axis's right end.
		one := false
		for _, tk := range p.Ticks {
			if v, err := strconv.ParseFloat(tk.Label, 64); err == nil && v == 1 {
				one = math.Abs(tk.Pos-p.Right) < 0.01
			}
		}
		if !one {
			t.Errorf("the risk axis does not end at 1: ticks %+v, right end %.1f", p.Ticks, p.Right)
		}
	}
	p := plans[0]
	wide := *p.Plan
	wide.Sizes = []int{40, 50, 60, 70, 80, 90, 100, 120, 140, 170, 200, 1000}
	for len(wide.Edges) < 40 {
		wide.Edges = append(wide.Edges, p.Plan.Edges...)
	}
	for i := range wide.Edges {
		e := wide.Edges[i]
		found := make([]sizing.Rate, len(wide.Sizes))
		for j := range found {
			found[j] = sizing.Rate{Value: math.Min(1, float64(j)/10), SE: 0.2}
		}
		e.Found = found
		wide.Edges[i] = e
	}
	need := *p.Needed
	need.Rows = 1000
	pf, _ := planChart((&sizing.Answer{Plan: &wide, Needed: &need}).Chart())
	for _, fault := range overlapping(planTexts(pf), pf.Width, pf.Height) {
		t.Error(fault)
	}
	if len(pf.XTicks) < 3 || len(pf.XTicks) == len(wide.Sizes) {
		t.Errorf("%d of %d sizes labelled: crowded labels should be dropped, not all", len(pf.XTicks), len(wide.Sizes))
	}
}

func BenchmarkAnswerFigure(b *testing.B) {
	_, answers, _ := QuestionAnswers(b)
	c := answers[0].Chart()
	for b.Loop() {
		answerFigure(c)
	}
}

func BenchmarkPlanChart(b *testing.B) {
	_, _, plans := QuestionAnswers(b)
	c := plans[0].Chart()
	for b.Loop() {
		planChart(c)
	}
}

// TestEdgeName checks that a long edge keeps its arrow and both ends'
// beginnings within the characters allowed.
func TestEdgeName(t *testing.T) {
	for _, c := range []struct {
		from, to string
		n        int
		want     string
	}{
		{"age", "bmi", 30, "age → bmi"},
		{"transfusion", "length_of_stay", 28, "transfusion → length_of_stay"},
		{"transfusion", "length_of_stay", 20, "transfu… → length_o…"},
		{"anticoagulant_dose_in_milligrams", "outcome", 20, "anticoagu… → outcome"},
		{"age", "anticoagulant_dose_in_milligrams", 20, "age → anticoagulant…"},
	} {
		got := edgeName(c.from, c.to, c.n)
		if got != c.want || utf8.RuneCountInString(got) > c.n {
			t.Errorf("edgeName(%q, %q, %d) = %q, want %q", c.from, c.to, c.n, got, c.want)
		}
	}
}

// TestOverlappingCatches checks the geometric checker on boxes worked by
// hand: at 10 units, 0.62 em a character, "abcd" spans 24.8 units.
func TestOverlappingCatches(t *testing.T) {
	a := estimateBox(0, 20, "start", "abcd", 10, false) // x 0..24.8, y 12..22.5
	b := estimateBox(20, 22, "start", "efgh", 10, false)
	c := estimateBox(30, 20, "start", "ijkl", 10, false)
	d := estimateBox(95, 60, "start", "mnop", 10, false) // ends at 119.8
	faults := overlapping([]textBox{a, b, c, d}, 100, 100)
	want := []string{`"abcd" overlaps "efgh"`, `"efgh" overlaps "ijkl"`, `"mnop" leaves the figure`}
	if len(faults) != len(want) {
		t.Fatalf("faults %q, want %d", faults, len(want))
	}
	for i, w := range want {
		if !strings.HasPrefix(faults[i], w) && !strings.Contains(strings.Join(faults, "|"), w) {
			t.Errorf("missed %s in %q", w, faults)
		}
	}
	if math.Abs(estimateBox(50, 20, "middle", "abcd", 10, false).x0-(50-12.4)) > 1e-9 || math.Abs(estimateBox(50, 20, "end", "abcd", 10, true).x0-(50-27.2)) > 1e-9 {
		t.Error("anchors misplaced")
	}
}
