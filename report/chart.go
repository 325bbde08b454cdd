package report

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// chart is a small chart against the penalty, ready for the template:
// every coordinate is precomputed, every label is plain text the template
// escapes. The penalty axis is logarithmic with the strong end on the
// left, so reading left to right the model grows.
type chart struct {
	Width, Height float64
	Left, Top     float64 // plot area origin
	PlotW, PlotH  float64
	XTicks        []tick
	YTicks        []tick
	XLabel        string
	YLabel        string
	// Strong and Weak caption the two ends of the penalty axis.
	Strong, Weak string
	// ZeroY is the height of a zero line, when HasZero.
	ZeroY   float64
	HasZero bool
	// Band is the polygon of an uncertainty band, empty when none.
	Band  string
	Lines []series
	Rule  *segment
	// Reach is a vertical stroke from a point: the allowance a rule gave it.
	Reach  *stroke
	Dots   []dot
	Labels []chartLabel
	// Caption explains the chart in a sentence or two.
	Caption string
	// ID names the chart's clipping region; Clipped is set when the value
	// axis is cut short and lines must be clipped to the plot.
	ID      string
	Clipped bool
}

type tick struct {
	Pos   float64
	Label string
}

type series struct {
	Points string // "x,y x,y …"
	Class  string
	Title  string
}

type segment struct{ X1, X2, Y float64 }

type stroke struct{ X, Y1, Y2 float64 }

type dot struct {
	X, Y  float64
	Class string
}

// chartLabel is a text label; when Leader is set a thin line joins the
// point (LX, LY) it names.
type chartLabel struct {
	X, Y   float64
	Text   string
	Anchor string
	Class  string
	Leader bool
	LX, LY float64
}

const (
	chartW    = 300
	chartH    = 214
	padL      = 46
	padR      = 12
	padT      = 12
	padB      = 42
	labelLine = 13  // vertical distance between stacked labels
	charW     = 6.2 // average width of a chart label's character
)

// scale maps [lo, hi] to [a, b].
type scale struct{ lo, hi, a, b float64 }

func (s scale) at(v float64) float64 {
	if s.hi == s.lo {
		return (s.a + s.b) / 2
	}
	return s.a + (v-s.lo)/(s.hi-s.lo)*(s.b-s.a)
}

func newChart(ylabel string) *chart {
	return &chart{Width: chartW, Height: chartH, Left: padL, Top: padT, PlotW: chartW - padL - padR, PlotH: chartH - padT - padB,
		XLabel: "penalty, log scale", YLabel: ylabel, Strong: "◂ stronger", Weak: "weaker ▸"}
}

// ticks returns about n round tick values covering [lo, hi].
func ticks(lo, hi float64, n int) []float64 {
	if !(hi > lo) {
		return []float64{lo}
	}
	raw := (hi - lo) / float64(n)
	mag := math.Pow(10, math.Floor(math.Log10(raw)))
	step := mag
	for _, m := range []float64{1, 2, 2.5, 5, 10} {
		if m*mag >= raw {
			step = m * mag
			break
		}
	}
	var out []float64
	for v := math.Ceil(lo/step) * step; v <= hi+step*1e-9; v += step {
		out = append(out, v)
	}
	return out
}

// logTicks returns round penalties in [lo, hi] (both positive): the
// powers of ten, with 2× and 5× added when the range spans less than one
// and a half decades and 3× when it spans less than three, and only the
// even powers when it spans more than six.
func logTicks(lo, hi float64) []float64 {
	if !(hi > lo) || !(lo > 0) {
		return []float64{lo}
	}
	span := math.Log10(hi / lo)
	mults := []float64{1}
	switch {
	case span < 1.5:
		mults = []float64{1, 2, 5}
	case span < 3:
		mults = []float64{1, 3}
	}
	var out []float64
	for d := int(math.Floor(math.Log10(lo))); d <= int(math.Ceil(math.Log10(hi))); d++ {
		if span > 6 && d%2 != 0 {
			continue
		}
		for _, m := range mults {
			v, _ := strconv.ParseFloat(fmt.Sprintf("%ge%d", m, d), 64) // exact decimal
			if v >= lo*(1-1e-9) && v <= hi*(1+1e-9) {
				out = append(out, v)
			}
		}
	}
	return out
}

// penaltyLabel formats a round penalty briefly: 0.05, 20, 1e-5.
func penaltyLabel(v float64) string {
	if a := math.Abs(v); a >= 1e-4 && a < 1e5 {
		return strconv.FormatFloat(v, 'f', -1, 64)
	}
	s := strconv.FormatFloat(v, 'e', -1, 64) // "1e-05"
	m, e, _ := strings.Cut(s, "e")
	exp, _ := strconv.Atoi(e)
	return m + "e" + strconv.Itoa(exp)
}

// label formats a tick value with as many decimals as the tick step needs.
func label(v, step float64) string {
	if math.Abs(v) < step*1e-9 {
		return "0"
	}
	if a := math.Abs(v); a >= 1e5 || a < 1e-4 {
		return strconv.FormatFloat(v, 'g', 3, 64)
	}
	d := 0
	for s := step; s < 1 && d < 6; s *= 10 {
		d++
	}
	if r := step * math.Pow(10, float64(d)); math.Abs(r-math.Round(r)) > 1e-9 {
		d++
	}
	return strconv.FormatFloat(v, 'f', d, 64)
}

func step(t []float64) float64 {
	if len(t) < 2 {
		return 1
	}
	return t[1] - t[0]
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// axes sets the scales and ticks for penalties in [pmin, pmax] (positive),
// strong on the left, and y in [y0, y1].
func (c *chart) axes(pmin, pmax, y0, y1 float64) (scale, scale) {
	if y1 == y0 {
		y0, y1 = y0-1, y1+1
	}
	pad := (y1 - y0) * 0.06
	y0, y1 = y0-pad, y1+pad
	sx := scale{math.Log10(pmax), math.Log10(pmin), c.Left, c.Left + c.PlotW}
	sy := scale{y0, y1, c.Top + c.PlotH, c.Top}
	for _, v := range logTicks(pmin, pmax) {
		c.XTicks = append(c.XTicks, tick{sx.at(math.Log10(v)), penaltyLabel(v)})
	}
	yt := ticks(y0, y1, 4)
	for _, v := range yt {
		c.YTicks = append(c.YTicks, tick{sy.at(v), label(v, step(yt))})
	}
	if y0 <= 0 && y1 >= 0 {
		c.ZeroY, c.HasZero = sy.at(0), true
	}
	return sx, sy
}

// points returns the polyline through (lx[i], ys[i]), lx being log10 of
// the penalties, skipping non-finite values.
func points(sx, sy scale, lx, ys []float64) string {
	b := make([]byte, 0, len(lx)*14)
	for i, x := range lx {
		if !finite(ys[i]) || !finite(x) {
			continue
		}
		if len(b) > 0 {
			b = append(b, ' ')
		}
		b = fmt.Appendf(b, "%.1f,%.1f", sx.at(x), sy.at(ys[i]))
	}
	return string(b)
}

// textWidth estimates the width of a chart label.
func textWidth(s string) float64 { return charW * float64(utf8.RuneCountInString(s)) }

// stack returns label heights as close as possible to want (in order of
// want, which must be sorted) but at least labelLine apart, kept inside
// [lo, hi] when they fit.
func stack(want []float64, lo, hi float64) []float64 {
	if len(want) == 0 {
		return nil
	}
	w := make([]float64, len(want))
	gap := make([]float64, len(want)-1)
	for i := range w {
		w[i] = 1
	}
	for i := range gap {
		gap[i] = labelLine
	}
	got := spread(nil, want, w, gap)
	if d := lo - got[0]; d > 0 {
		for i := range got {
			got[i] += d
		}
	}
	if d := got[len(got)-1] - hi; d > 0 {
		d = math.Min(d, got[0]-lo)
		for i := range got {
			got[i] -= d
		}
	}
	return got
}
