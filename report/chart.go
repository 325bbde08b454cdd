package report

import (
	"fmt"
	"math"
	"strconv"
)

// chart is a small line chart ready for the template: every coordinate is
// precomputed, every label is plain text the template escapes.
type chart struct {
	Width, Height float64
	Left, Top     float64 // plot area origin
	PlotW, PlotH  float64
	XTicks        []tick
	YTicks        []tick
	Series        []series
	Bars          []bar
	Marks         []mark
	XLabel        string
	YLabel        string
}

type tick struct {
	Pos   float64
	Label string
}

type series struct {
	Points string // "x,y x,y …"
	Class  string
	Name   string
	LabelX float64
	LabelY float64
}

type bar struct{ X, Y1, Y2 float64 }

type mark struct {
	X      float64
	Label  string
	Class  string
	LabelY float64
	Anchor string // text-anchor of the label
	DX     float64
}

const (
	chartW = 300
	chartH = 200
	padL   = 52
	padR   = 14
	padT   = 14
	padB   = 38
)

// scale maps [lo, hi] to [a, b].
type scale struct{ lo, hi, a, b float64 }

func (s scale) at(v float64) float64 {
	if s.hi == s.lo {
		return (s.a + s.b) / 2
	}
	return s.a + (v-s.lo)/(s.hi-s.lo)*(s.b-s.a)
}

func newChart(xlabel, ylabel string) *chart {
	return &chart{Width: chartW, Height: chartH, Left: padL, Top: padT, PlotW: chartW - padL - padR, PlotH: chartH - padT - padB, XLabel: xlabel, YLabel: ylabel}
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

// axes sets the scales and ticks for x in [x0, x1] and y in [y0, y1].
func (c *chart) axes(x0, x1, y0, y1 float64) (scale, scale) {
	if y1 == y0 {
		y0, y1 = y0-1, y1+1
	}
	pad := (y1 - y0) * 0.06
	y0, y1 = y0-pad, y1+pad
	sx := scale{x0, x1, c.Left, c.Left + c.PlotW}
	sy := scale{y0, y1, c.Top + c.PlotH, c.Top}
	xt := ticks(x0, x1, 5)
	for _, v := range xt {
		c.XTicks = append(c.XTicks, tick{sx.at(v), label(v, step(xt))})
	}
	yt := ticks(y0, y1, 4)
	for _, v := range yt {
		c.YTicks = append(c.YTicks, tick{sy.at(v), label(v, step(yt))})
	}
	return sx, sy
}

func points(sx, sy scale, xs, ys []float64) string {
	b := make([]byte, 0, len(xs)*14)
	for i, x := range xs {
		if !finite(ys[i]) {
			continue
		}
		if len(b) > 0 {
			b = append(b, ' ')
		}
		b = fmt.Appendf(b, "%.1f,%.1f", sx.at(x), sy.at(ys[i]))
	}
	return string(b)
}

// mark returns a vertical marker at x whose label stays inside the plot.
func (c *chart) mark(x float64, label, class string, y float64) mark {
	m := mark{X: x, Label: label, Class: class, LabelY: y, Anchor: "start", DX: 3}
	if x > c.Left+c.PlotW-60 {
		m.Anchor, m.DX = "end", -3
	}
	return m
}
