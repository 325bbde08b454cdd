package report_test

import (
	"bytes"
	"context"
	"image"
	"image/png"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/report"
	"github.com/antecedent-lab/antecedent/simulate"
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
		d, o, g, err := antecedent.Demo()
		if err != nil {
			demoErr = err
			return
		}
		demoRes, demoErr = antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Seed: 1})
		if demoErr != nil {
			return
		}
		var b bytes.Buffer
		demoErr = report.Write(&b, demoRes, &report.Options{Title: "Demo", Truth: g, Generated: time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)})
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
		"One-SE rule", "±1 standard error", "chosen: ", "penalty, log scale", "◂ stronger"} {
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
	d, err := antecedent.NewDataset(s.Names, s.Columns)
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

// browse opens page headless and returns the console lines it logged, the
// serialised DOM after scripts ran, and the screenshot.
func browse(t *testing.T, page string) ([]string, string, image.Image) {
	bin := chromium(t)
	dir := t.TempDir()
	shot := filepath.Join(dir, "shot.png")
	common := []string{"--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
		"--disable-background-networking", "--disable-component-update", "--disable-sync", "--hide-scrollbars",
		"--user-data-dir=" + filepath.Join(dir, "profile"), "--enable-logging=stderr", "--v=0"}
	ctx, cancel := context.WithTimeout(context.Background(), 90*time.Second)
	defer cancel()
	var stderr bytes.Buffer
	cmd := exec.CommandContext(ctx, bin, append(common, "--window-size=1400,1000", "--screenshot="+shot, "file://"+page)...)
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

// openPage writes html to a file, opens it in the browser, and fails the
// test on console messages or a script that did not run to the end.
func openPage(t *testing.T, name string, html []byte) (string, image.Image) {
	t.Helper()
	page := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(page, html, 0o644); err != nil {
		t.Fatal(err)
	}
	console, dom, img := browse(t, page)
	for _, line := range console {
		t.Errorf("console: %s", line)
	}
	if !strings.Contains(dom, `data-ready="1"`) {
		t.Error("the page's script did not run to the end")
	}
	return dom, img
}

func TestBrowserDemo(t *testing.T) {
	html, _ := demoReport(t)
	_, img := openPage(t, "demo.html", html)
	// Not blank: many colours and a fair share of non-white pixels.
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
	if dir := os.Getenv("ANTECEDENT_SCREENSHOT_DIR"); dir != "" {
		f, _ := os.Create(filepath.Join(dir, "report.png"))
		png.Encode(f, img)
		f.Close()
	}
}

func TestBrowserHostileNames(t *testing.T) {
	var b bytes.Buffer
	if err := report.Write(&b, hostileResult(t), &report.Options{Title: "<script>alert(3)</script>"}); err != nil {
		t.Fatal(err)
	}
	dom, _ := openPage(t, "hostile.html", b.Bytes())
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
