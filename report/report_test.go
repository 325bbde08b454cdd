package report_test

import (
	"bytes"
	"context"
	"fmt"
	"html/template"
	"image"
	"image/png"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/demo"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/report"
	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/table"
)

var (
	demoOnce sync.Once
	demoHTML []byte
	demoRes  *antecedent.Result
	demoErr  error
)

func demoReport(t *testing.T) ([]byte, *antecedent.Result) {
	t.Helper()
	demoOnce.Do(func() {
		d, o, g, err := demo.Load()
		if err != nil {
			demoErr = err
			return
		}
		demoRes, demoErr = antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Seed: 1})
		if demoErr != nil {
			return
		}
		var b bytes.Buffer
		demoErr = report.Write(&b, demoRes, &report.Options{Title: "Recovery after joint replacement — synthetic demonstration", Truth: g, Generated: time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)})
		demoHTML = b.Bytes()
	})
	if demoErr != nil {
		t.Fatal(demoErr)
	}
	return demoHTML, demoRes
}

func TestStructure(t *testing.T) {
	html, res := demoReport(t)
	s := string(html)
	count := func(re string) int { return len(regexp.MustCompile(re).FindAllStringIndex(s, -1)) }
	if n := count(`<g class="node `); n != len(res.Nodes) {
		t.Errorf("%d node groups for %d nodes", n, len(res.Nodes))
	}
	if n := count(`<g class="edge `); n != len(res.Edges) {
		t.Errorf("%d edge groups for %d edges", n, len(res.Edges))
	}
	if n := count(`<article class="card`); n != len(res.Nodes) {
		t.Errorf("%d node sections", n)
	}
	fitted := 0
	for _, n := range res.Nodes {
		if n.Fitted {
			fitted++
		}
	}
	// Two charts (CV curve and coefficient paths) per fitted node.
	if n := count(`<figure class="chart">`); n != 2*fitted {
		t.Errorf("%d charts for %d fitted nodes", n, fitted)
	}
	for _, want := range []string{"hypothesis", "confounding", "clinical judgement", "Markov blanket", "precision / recall",
		"Quarter-standard-error rule: the strongest penalty (dark point) within a quarter of a standard error of the best (open circle)", "±1 standard error", "chosen: ", "penalty, log scale", "◂ stronger", "categorical"} {
		if !strings.Contains(s, want) {
			t.Errorf("report lacks %q", want)
		}
	}
	// Self-contained: nothing fetched from anywhere.
	for _, bad := range []string{"<script src", "<link", "@import", "http://", "https://", "<img"} {
		if strings.Contains(s, bad) {
			t.Errorf("report refers to an external resource: %q", bad)
		}
	}
}

// TestTitleNamesAHypothesis checks that the default heading does not
// claim causes and that every page says at once what the drawing is.
func TestTitleNamesAHypothesis(t *testing.T) {
	_, res := demoReport(t)
	var b bytes.Buffer
	if err := report.Write(&b, res, nil); err != nil {
		t.Fatal(err)
	}
	s := b.String()
	if !strings.Contains(s, "<h1>Discovered network</h1>") {
		t.Error("default heading is not \"Discovered network\"")
	}
	if strings.Contains(strings.ToLower(s), "causal network") {
		t.Error("the page calls the result a causal network")
	}
	if !strings.Contains(s, `<p class="lede">A network discovered from observational data: a hypothesis`) {
		t.Error("no statement under the heading that the network is a hypothesis")
	}
}

// TestDemoRoutesClearBoxes is the geometric check of the demonstration's
// drawing as the page carries it: every edge path, sampled finely, keeps
// at least report.ClearMargin units from every box but its two ends, and
// runs left to right from its parent's right side to its child's left side.
func TestDemoRoutesClearBoxes(t *testing.T) {
	html, res := demoReport(t)
	clear, where, faults, paths, err := report.CheckPage(string(html))
	if err != nil {
		t.Fatal(err)
	}
	if paths != len(res.Edges)+len(res.Links) {
		t.Errorf("read %d paths for %d edges and %d links", paths, len(res.Edges), len(res.Links))
	}
	for _, f := range faults {
		t.Error(f)
	}
	if clear < report.ClearMargin {
		t.Errorf("%s (margin %d)", where, report.ClearMargin)
	}
	t.Logf("least clearance between an edge and a box it does not join: %.2f units", clear)
}

// hostileResult discovers a small network whose variable names try to
// break out of the page.
func hostileResult(t *testing.T) *antecedent.Result {
	names := []string{"<script>alert(1)</script>", `"quotes"`, "a&b", "Ünïcødé — 長い名前の変数 with a very long name indeed 🩺", "y</title><img src=x onerror=alert(2)>"}
	m := &simulate.Model{Nodes: []simulate.Node{
		{Name: names[0]}, {Name: names[1]},
		{Name: names[2], Parents: names[:2], Weights: []float64{1, -1}},
		{Name: names[3], Parents: names[2:3], Weights: []float64{1}},
		{Name: names[4], Binary: true, Parents: names[3:4], Weights: []float64{1}, Prevalence: 0.3},
	}}
	s, err := m.Sample(400, 1)
	if err != nil {
		t.Fatal(err)
	}
	d, err := table.NewDataset(s.Names, s.Columns)
	if err != nil {
		t.Fatal(err)
	}
	o := &order.Order{Tiers: [][]string{names[:2], names[2:3], names[3:4], names[4:]}, Labels: []string{"<b>bold</b>", "", "", ""}}
	res, err := antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Folds: 5, SameTier: true})
	if err != nil {
		t.Fatal(err)
	}
	return res
}

func TestHostileNamesEscaped(t *testing.T) {
	var b bytes.Buffer
	if err := report.Write(&b, hostileResult(t), &report.Options{Title: "<script>alert(3)</script>"}); err != nil {
		t.Fatal(err)
	}
	s := b.String()
	for _, raw := range []string{"<script>alert(", "<img src=x", "<b>bold</b>"} {
		if strings.Contains(s, raw) {
			t.Errorf("unescaped %q in the page", raw)
		}
	}
	if !strings.Contains(s, "&lt;script&gt;alert(1)&lt;/script&gt;") {
		t.Error("escaped name not found")
	}
}

// chromium returns the browser for the real-browser tests, skipping when
// it is absent unless ANTECEDENT_BROWSER_TESTS=1 (set by CI) demands it.
func chromium(t *testing.T) string {
	for _, name := range []string{"chromium", "chromium-browser", "google-chrome"} {
		if p, err := exec.LookPath(name); err == nil {
			return p
		}
	}
	if os.Getenv("ANTECEDENT_BROWSER_TESTS") == "1" {
		t.Fatal("no chromium on PATH; .ci/run installs Debian's chromium")
	}
	t.Skip("no chromium on PATH (set ANTECEDENT_BROWSER_TESTS=1 to require it)")
	return ""
}

// browse opens page headless in a window of the given size and returns the
// console lines it logged, the serialised DOM after scripts ran, and the
// screenshot.
func browse(t *testing.T, page string, width, height int) ([]string, string, image.Image) {
	bin := chromium(t)
	dir := t.TempDir()
	shot := filepath.Join(dir, "shot.png")
	common := []string{"--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
		"--disable-background-networking", "--disable-component-update", "--disable-sync", "--hide-scrollbars",
		"--user-data-dir=" + filepath.Join(dir, "profile"), "--enable-logging=stderr", "--v=0",
		fmt.Sprintf("--window-size=%d,%d", width, height)}
	ctx, cancel := context.WithTimeout(context.Background(), 90*time.Second)
	defer cancel()
	var stderr bytes.Buffer
	cmd := exec.CommandContext(ctx, bin, append(common, "--screenshot="+shot, "file://"+page)...)
	cmd.Stderr = &stderr
	if err := cmd.Run(); err != nil {
		t.Fatalf("chromium: %v\n%s", err, stderr.String())
	}
	var console []string
	for _, line := range strings.Split(stderr.String(), "\n") {
		if strings.Contains(line, "CONSOLE") {
			console = append(console, line)
		}
	}
	dom, err := exec.CommandContext(ctx, bin, append(common, "--dump-dom", "file://"+page)...).Output()
	if err != nil {
		t.Fatalf("chromium --dump-dom: %v", err)
	}
	f, err := os.Open(shot)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatal(err)
	}
	return console, string(dom), img
}

// openPage writes html to a file, with the script probe (if any) added at
// the end of the body, opens it in a browser window of the given size, and
// fails the test on console messages or a script that did not run to the
// end.
func openPage(t *testing.T, name string, html []byte, width, height int, probe string) (string, image.Image) {
	t.Helper()
	if probe != "" {
		html = bytes.Replace(html, []byte("</body>"), []byte("<script>"+probe+"</script>\n</body>"), 1)
	}
	page := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(page, html, 0o644); err != nil {
		t.Fatal(err)
	}
	console, dom, img := browse(t, page, width, height)
	for _, line := range console {
		t.Errorf("console: %s", line)
	}
	if !strings.Contains(dom, `data-ready="1"`) {
		t.Error("the page's script did not run to the end")
	}
	return dom, img
}

// saveShot writes img to name in $ANTECEDENT_SCREENSHOT_DIR, when set.
func saveShot(t *testing.T, img image.Image, name string) {
	dir := os.Getenv("ANTECEDENT_SCREENSHOT_DIR")
	if dir == "" {
		return
	}
	f, err := os.Create(filepath.Join(dir, name))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if err := png.Encode(f, img); err != nil {
		t.Fatal(err)
	}
}

// attr returns the value of the body attribute name in a dumped DOM.
func attr(t *testing.T, dom, name string) string {
	t.Helper()
	m := regexp.MustCompile(name + `="([^"]*)"`).FindStringSubmatch(dom)
	if m == nil {
		t.Fatalf("the probe left no %s", name)
	}
	return m[1]
}

// notBlank fails the test when a screenshot is nearly all one colour.
func notBlank(t *testing.T, img image.Image) {
	t.Helper()
	colours := map[[3]uint32]bool{}
	b := img.Bounds()
	inked := 0
	for y := b.Min.Y; y < b.Max.Y; y += 2 {
		for x := b.Min.X; x < b.Max.X; x += 2 {
			r, g, bl, _ := img.At(x, y).RGBA()
			colours[[3]uint32{r >> 12, g >> 12, bl >> 12}] = true
			if r < 0xf000 || g < 0xf000 || bl < 0xf000 {
				inked++
			}
		}
	}
	total := (b.Dx() / 2) * (b.Dy() / 2)
	if len(colours) < 40 || float64(inked) < 0.05*float64(total) {
		t.Errorf("screenshot looks blank: %d colours, %d of %d pixels inked", len(colours), inked, total)
	}
}

// TestBrowserDemo opens the demonstration report. Run with
// ANTECEDENT_SCREENSHOT_DIR=docs it rewrites the README's screenshots,
// docs/report.png here and docs/random30.png in TestBrowserRandom30.
func TestBrowserDemo(t *testing.T) {
	html, _ := demoReport(t)
	_, img := openPage(t, "demo.html", html, 1400, 1000, "")
	notBlank(t, img)
	saveShot(t, img, "report.png")
}

// legibility is a probe that records the smallest text on the page as
// drawn (font size times the SVG scale), whether the page itself scrolls
// sideways, and how far the network's frame scrolls.
const legibility = `(function () {
  var least = 1e9, what = "";
  var w = document.createTreeWalker(document.body, NodeFilter.SHOW_TEXT);
  while (w.nextNode()) {
    var node = w.currentNode, el = node.parentElement;
    if (!node.nodeValue.trim() || !el || el.closest("script, style, title")) continue;
    var r = el.getBoundingClientRect();
    if (r.width === 0 && r.height === 0) continue;
    var px = parseFloat(getComputedStyle(el).fontSize);
    if (el instanceof SVGElement) { var m = el.getScreenCTM(); px *= Math.hypot(m.a, m.b); }
    if (px < least) { least = px; what = node.nodeValue.trim().slice(0, 40); }
  }
  var wrap = document.querySelector(".netwrap");
  document.body.setAttribute("data-least-font", least.toFixed(2));
  document.body.setAttribute("data-least-text", what);
  document.body.setAttribute("data-page-overflow", String(document.documentElement.scrollWidth - window.innerWidth));
  document.body.setAttribute("data-net-scroll", String(wrap.scrollWidth - wrap.clientWidth));
})();`

// TestBrowserNarrow opens the demonstration in a window 800 pixels wide:
// no text is drawn below 11 px (common practice for the smallest legible
// screen text), the page itself does not scroll sideways, and the network
// scrolls inside its frame instead of shrinking.
func TestBrowserNarrow(t *testing.T) {
	html, _ := demoReport(t)
	for _, width := range []int{800, 1400} {
		dom, _ := openPage(t, "narrow.html", html, width, 1000, legibility)
		least, err := strconv.ParseFloat(attr(t, dom, "data-least-font"), 64)
		if err != nil {
			t.Fatal(err)
		}
		if least < 11-0.01 {
			t.Errorf("%d px: text %q drawn at %.2f px", width, attr(t, dom, "data-least-text"), least)
		}
		if o := attr(t, dom, "data-page-overflow"); o != "0" {
			t.Errorf("%d px: the page scrolls sideways by %s px", width, o)
		}
		if width == 800 {
			if s, _ := strconv.Atoi(attr(t, dom, "data-net-scroll")); s <= 0 {
				t.Errorf("800 px: the network does not scroll (%d px), so it must have shrunk", s)
			}
		}
		t.Logf("%d px: smallest text %.2f px", width, least)
	}
}

// TestBrowserFocus focuses wound_infection in the demonstration and checks
// that exactly its own relations light: edges into and out of it, and the
// edges from its children's other parents into those children; not, for
// example, an edge between two of its parents.
func TestBrowserFocus(t *testing.T) {
	html, res := demoReport(t)
	const focus = "wound_infection"
	id := -1
	for i, n := range res.Nodes {
		if n.Name == focus {
			id = i
		}
	}
	if id < 0 {
		t.Fatalf("no %s in the demonstration", focus)
	}
	probe := fmt.Sprintf(`(function () {
  var a = document.querySelector('#net .node[data-id="%d"] a');
  a.dispatchEvent(new FocusEvent("focusin", {bubbles: true}));
  var lit = [];
  document.querySelectorAll("#net .edge.on").forEach(function (e) { lit.push(e.getAttribute("data-k")); });
  document.body.setAttribute("data-lit", lit.join(" "));
})();`, id)
	dom, _ := openPage(t, "focus.html", html, 1400, 1000, probe)
	children := map[string]bool{}
	for _, e := range res.Edges {
		if e.From == focus {
			children[e.To] = true
		}
	}
	var want []string
	for k, e := range res.Edges {
		if e.From == focus || e.To == focus || children[e.To] {
			want = append(want, strconv.Itoa(k))
		}
	}
	if got := attr(t, dom, "data-lit"); got != strings.Join(want, " ") {
		t.Errorf("focusing %s lit edges %q, want %q", focus, got, strings.Join(want, " "))
	}
	if len(children) == 0 || len(want) == len(children) {
		t.Errorf("the demonstration no longer tests co-parents: %d children, %d edges lit", len(children), len(want))
	}
}

// TestBrowserRandom30 draws a network discovered on a random model of 30
// variables in five tiers (package simulate, seeded), opens it in a
// browser, and checks the drawing geometrically as for the demonstration.
func TestBrowserRandom30(t *testing.T) {
	if testing.Short() {
		t.Skip("discovers a 30-variable network")
	}
	m, o, err := simulate.Random(simulate.RandomSettings{Variables: 30, Tiers: 5, BinaryShare: 0.3}, 30)
	if err != nil {
		t.Fatal(err)
	}
	s, err := m.Sample(2000, 30)
	if err != nil {
		t.Fatal(err)
	}
	d, err := table.NewDataset(s.Names, s.Columns)
	if err != nil {
		t.Fatal(err)
	}
	res, err := antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Folds: 5, Seed: 30})
	if err != nil {
		t.Fatal(err)
	}
	truth, err := m.Graph()
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	opts := &report.Options{Title: "Random network of 30 variables — simulated", Truth: truth, Generated: time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)}
	if err := report.Write(&b, res, opts); err != nil {
		t.Fatal(err)
	}
	clear, where, faults, _, err := report.CheckPage(b.String())
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range faults {
		t.Error(f)
	}
	if clear < report.ClearMargin {
		t.Errorf("%s (margin %d)", where, report.ClearMargin)
	}
	t.Logf("%d edges; least clearance %.2f units", len(res.Edges), clear)
	_, img := openPage(t, "random30.html", b.Bytes(), 1400, 1600, "")
	notBlank(t, img)
	saveShot(t, img, "random30.png")
}

func TestBrowserHostileNames(t *testing.T) {
	var b bytes.Buffer
	if err := report.Write(&b, hostileResult(t), &report.Options{Title: "<script>alert(3)</script>"}); err != nil {
		t.Fatal(err)
	}
	dom, _ := openPage(t, "hostile.html", b.Bytes(), 1400, 1000, "")
	// Injected markup would appear as elements in the live DOM.
	for _, bad := range []string{"<script>alert(", "<img src=\"x\"", "<b>bold</b>"} {
		if strings.Contains(dom, bad) {
			t.Errorf("hostile name became markup: %q", bad)
		}
	}
	if !strings.Contains(dom, "&lt;script&gt;alert(1)&lt;/script&gt;") {
		t.Error("hostile name is not shown as text")
	}
}

// TestSelectionExplained checks that the page says in the run's own two
// sentences how parents were chosen (issue 21), and that each effect row
// names the procedure and the evidence the result carries for it: the
// demonstration runs the default adaptive lasso, so each chosen parent's
// penalty weight, as the result stores it.
func TestSelectionExplained(t *testing.T) {
	html, res := demoReport(t)
	s := string(html)
	if want := template.HTMLEscapeString(res.Config.SelectionExplanation()); !strings.Contains(s, want) {
		t.Errorf("the page lacks the run's explanation %q", want)
	}
	rows := 0
	for _, n := range res.Nodes {
		for _, e := range n.Effects {
			for _, p := range n.Penalised {
				if p.Term == e.Term && n.Selection == "adaptive" {
					rows++
					want := fmt.Sprintf("<td>adaptive lasso, penalty weight %.3g</td>", float64(p.Weight))
					if !strings.Contains(s, want) {
						t.Errorf("%s ← %s: the page lacks %q", n.Name, e.Term, want)
					}
				}
			}
		}
	}
	if rows == 0 {
		t.Error("no effect of the demonstration was chosen by the adaptive lasso")
	}
}
