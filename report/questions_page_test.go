package report_test

import (
	"bytes"
	"fmt"
	"html"
	"image"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/antecedent-lab/antecedent/intervention"
	"github.com/antecedent-lab/antecedent/report"
	"github.com/antecedent-lab/antecedent/sizing"
)

// questionsPage renders the page of the simulated study with its answered
// questions.
func questionsPage(t *testing.T) (string, []*intervention.Answer, []*sizing.Answer) {
	t.Helper()
	res, answers, plans := report.QuestionAnswers(t)
	var b bytes.Buffer
	err := report.Write(&b, res, &report.Options{Title: "Simulated study with questions", Generated: time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC),
		Interventions: answers, Plans: plans})
	if err != nil {
		t.Fatal(err)
	}
	return b.String(), answers, plans
}

// g3 formats a number as the page does: three significant digits, a dash
// when unknown.
func g3(x intervention.Number) string {
	if f := float64(x); !math.IsNaN(f) && !math.IsInf(f, 0) {
		return strconv.FormatFloat(f, 'g', 3, 64)
	}
	return "–"
}

func interval(e intervention.Estimate) string {
	return g3(e.Value) + " [" + g3(e.Lower) + ", " + g3(e.Upper) + "]"
}

var valueText = regexp.MustCompile(`<text class="val" [^>]*>([^<]*)</text>`)

// TestQuestionsSection checks that the section shows each answer's own
// numbers, in order: for every outcome the means under both settings, the
// difference by g-computation and by each adjustment set, the ratio of
// risks and the path decomposition; for every plan each coloured edge's
// shares and the false edges per study with their Monte Carlo standard
// errors, and the rows needed; and the cautions of both packages.
func TestQuestionsSection(t *testing.T) {
	raw, answers, plans := questionsPage(t)
	page := html.UnescapeString(raw) // html/template escapes + and quotes
	if n := strings.Count(page, `<figure class="qchart">`); n != len(answers)+len(plans) {
		t.Errorf("%d question figures for %d answers and %d plans", n, len(answers), len(plans))
	}
	var want []string
	paths := 0
	for _, a := range answers {
		for _, o := range a.Outcomes {
			want = append(want, interval(o.MeanA), interval(o.MeanB))
			if !o.Downstream {
				continue
			}
			want = append(want, interval(o.Difference))
			for _, adj := range o.Adjusted {
				want = append(want, interval(adj.Difference))
			}
			if o.Paths != nil {
				paths++
				want = append(want, interval(o.Paths.Total), interval(o.Paths.Direct))
				for _, m := range o.Paths.Mediators {
					want = append(want, interval(m.Effect))
				}
			}
			if o.Binary && !strings.Contains(page, fmt.Sprintf("Ratio of risks, %s ÷ %s: %s", a.A.String(), a.B.String(), interval(o.Ratio))) {
				t.Errorf("%s: no ratio of risks %s", o.Name, interval(o.Ratio))
			}
		}
	}
	var got []string
	for _, m := range valueText.FindAllStringSubmatch(page, -1) {
		got = append(got, m[1])
	}
	if strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("values drawn:\n%s\nwant:\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
	if paths == 0 {
		t.Error("no answer of the simulated study has a path decomposition")
	}
	for k, p := range plans {
		ch := p.Chart()
		rows := []sizing.Curve{ch.FalseEdges}
		for _, c := range ch.Curves {
			if p.Needed == nil || c.From == p.Needed.From && c.To == p.Needed.To {
				rows = append(rows, c)
			}
		}
		for _, c := range rows {
			var cells []string
			for i := range c.Values {
				cells = append(cells, fmt.Sprintf(`<td class="n">%.2f ± %.2f</td>`, c.Values[i], c.SE[i]))
			}
			if row := "<td>" + c.Label + "</td>" + strings.Join(cells, ""); !strings.Contains(page, row) {
				t.Errorf("plan %d: no table row %s", k, row)
			}
		}
		if n := p.Needed; n != nil && n.Status == sizing.Reached {
			if s := fmt.Sprintf("in %.0f%% of studies: about %d (between %d and %d rows", 100*n.Probability, n.Rows, n.Below, n.Above); !strings.Contains(page, s) {
				t.Errorf("plan %d: no %q", k, s)
			}
			if s := fmt.Sprintf("≈ %d rows</text>", n.Rows); !strings.Contains(page, s) {
				t.Errorf("plan %d: the chart does not mark %q", k, s)
			}
		}
	}
	for _, c := range append(append([]string{}, intervention.Cautions...), sizing.Cautions...) {
		if !strings.Contains(page, c) {
			t.Errorf("the section lacks the caution %q", c)
		}
	}
}

// TestQuestionsRefused checks that answers the page cannot draw are
// refused with an error, not drawn or panicked on.
func TestQuestionsRefused(t *testing.T) {
	res, answers, plans := report.QuestionAnswers(t)
	other := *answers[0]
	other.Cause = "blood_type"
	for _, c := range []struct {
		name string
		opts report.Options
		want string
	}{
		{"nil answer", report.Options{Interventions: []*intervention.Answer{nil}}, "is nil"},
		{"unknown cause", report.Options{Interventions: []*intervention.Answer{&other}}, `"blood_type", which is not a variable`},
		{"nil plan", report.Options{Plans: []*sizing.Answer{{}}}, "has no sizes"},
		{"short shares", report.Options{Plans: []*sizing.Answer{{Plan: &sizing.Plan{Sizes: []int{10, 20}, Edges: plans[0].Plan.Edges}}}}, "shares for 2 sizes"},
	} {
		var b bytes.Buffer
		if err := report.Write(&b, res, &c.opts); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: err %v, want one saying %q", c.name, err, c.want)
		}
	}
}

// boxes is a probe that measures every text of the question figures as
// the browser draws it and records the pairs that overlap, the texts that
// leave their figure, and the smallest font drawn.
const boxes = `(function () {
  var bad = [], least = 1e9;
  document.querySelectorAll("figure.qchart svg").forEach(function (svg, f) {
    var frame = svg.getBoundingClientRect();
    var ts = Array.prototype.slice.call(svg.querySelectorAll("text")).filter(function (t) { return t.textContent.trim() !== ""; });
    var rs = ts.map(function (t) { return t.getBoundingClientRect(); });
    ts.forEach(function (t, i) {
      var m = t.getScreenCTM(), px = parseFloat(getComputedStyle(t).fontSize) * Math.hypot(m.a, m.b);
      least = Math.min(least, px);
      var r = rs[i];
      if (r.left < frame.left - 0.5 || r.right > frame.right + 0.5 || r.top < frame.top - 0.5 || r.bottom > frame.bottom + 0.5) {
        bad.push("figure " + f + ": '" + t.textContent + "' leaves the figure");
      }
      for (var j = i + 1; j < ts.length; j++) {
        var q = rs[j];
        var w = Math.min(r.right, q.right) - Math.max(r.left, q.left), h = Math.min(r.bottom, q.bottom) - Math.max(r.top, q.top);
        if (w > 0.5 && h > 1.5) bad.push("figure " + f + ": '" + t.textContent + "' overlaps '" + ts[j].textContent + "'");
      }
    });
  });
  document.body.setAttribute("data-text-faults", bad.length ? bad.join(" | ") : "none");
  document.body.setAttribute("data-least-font", least.toFixed(2));
})();`

// TestBrowserQuestions opens the page with answered questions in a real
// browser and measures its figures' texts as drawn: none overlaps another
// or leaves its figure, and none is smaller than 11 px (common practice for
// the smallest legible screen text), in windows 800 and 1400 pixels wide,
// and the page does not scroll sideways. Run with ANTECEDENT_SCREENSHOT_DIR set
// it saves the screenshot as questions.png.
func TestBrowserQuestions(t *testing.T) {
	page, _, _ := questionsPage(t)
	probe := boxes + `document.body.setAttribute("data-page-overflow", String(document.documentElement.scrollWidth - window.innerWidth));
document.body.setAttribute("data-questions-top", String(Math.round(document.getElementById("questions").getBoundingClientRect().top + window.scrollY)));`
	for _, width := range []int{800, 1400} {
		dom, img := openPage(t, "questions.html", []byte(page), width, 3200, probe)
		if f := attr(t, dom, "data-text-faults"); f != "none" {
			for _, s := range strings.Split(f, " | ") {
				t.Errorf("%d px: %s", width, s)
			}
		}
		if least, _ := strconv.ParseFloat(attr(t, dom, "data-least-font"), 64); least < 11-0.01 {
			t.Errorf("%d px: question figure text drawn at %.2f px", width, least)
		}
		if o := attr(t, dom, "data-page-overflow"); o != "0" {
			t.Errorf("%d px: the page scrolls sideways by %s px", width, o)
		}
		if width == 1400 {
			// The section, from its heading down.
			top, err := strconv.Atoi(attr(t, dom, "data-questions-top"))
			if err != nil {
				t.Fatal(err)
			}
			b := img.Bounds()
			section := image.Rect(b.Min.X, max(b.Min.Y, top-12), b.Min.X+1100, min(b.Max.Y, top+1600))
			sub, ok := img.(interface {
				SubImage(image.Rectangle) image.Image
			})
			if !ok || section.Dy() < 800 {
				t.Fatalf("cannot cut the section out of the screenshot (top %d, %v)", top, b)
			}
			shot := sub.SubImage(section)
			notBlank(t, shot)
			saveShot(t, shot, "questions.png")
		}
	}
}

// TestBrowserProbeCatchesOverlap checks the probe on a page worked by
// hand: two texts drawn on top of each other and one drawn past the
// figure's right edge must be reported; a third, apart, must not.
func TestBrowserProbeCatchesOverlap(t *testing.T) {
	page := `<!DOCTYPE html><html><head><meta charset="utf-8"><style>text{font:12px sans-serif}</style></head><body>
<figure class="qchart"><svg width="300" height="100" viewBox="0 0 300 100">
<text x="10" y="20">first label</text><text x="14" y="22">second label</text>
<text x="250" y="60">past the edge</text><text x="10" y="80">apart</text>
</svg></figure><script>document.body.setAttribute("data-ready", "1")</script></body></html>`
	dom, _ := openPage(t, "probe.html", []byte(page), 600, 400, boxes)
	f := attr(t, dom, "data-text-faults")
	for _, want := range []string{"'first label' overlaps 'second label'", "'past the edge' leaves the figure"} {
		if !strings.Contains(f, want) {
			t.Errorf("the probe missed %q: %s", want, f)
		}
	}
	if strings.Contains(f, "apart") {
		t.Errorf("the probe reported a text that is apart: %s", f)
	}
}
