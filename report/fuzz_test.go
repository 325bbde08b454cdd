package report_test

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"html"
	"math"
	"os"
	"regexp"
	"strings"
	"sync"
	"testing"
	"time"
	"unicode/utf8"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/report"
	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/table"
)

// placeholders name the variables of the fuzz target's base result; the
// target replaces them with hostile names throughout the result.
var placeholders = []string{"zqPlaceA", "zqPlaceB", "zqPlaceC", "zqPlaceD"}

var (
	baseOnce sync.Once
	baseJSON []byte
	baseErr  error
)

// baseResult returns the JSON of a small discovery (two tiers, a binary
// node, same-tier links) with placeholder names.
func baseResult(t testing.TB) []byte {
	baseOnce.Do(func() {
		p := placeholders
		m := &simulate.Model{Nodes: []simulate.Node{
			{Name: p[0]}, {Name: p[1], Parents: p[:1], Weights: []float64{0.8}},
			{Name: p[2], Parents: p[:2], Weights: []float64{1, -1}},
			{Name: p[3], Binary: true, Parents: p[2:3], Weights: []float64{1}, Prevalence: 0.3},
		}}
		s, err := m.Sample(300, 1)
		if err != nil {
			baseErr = err
			return
		}
		d, err := table.NewDataset(s.Names, s.Columns)
		if err != nil {
			baseErr = err
			return
		}
		o := &order.Order{Tiers: [][]string{p[:2], p[2:]}, Labels: []string{"zqLabelA", "zqLabelB"}}
		res, err := antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Folds: 3, SameTier: true})
		if err != nil {
			baseErr = err
			return
		}
		var b bytes.Buffer
		baseErr = res.WriteJSON(&b)
		baseJSON = b.Bytes()
	})
	if baseErr != nil {
		t.Fatal(baseErr)
	}
	return baseJSON
}

// templateVocabulary returns the element and attribute names the report's
// template uses: the only ones a report may contain.
func templateVocabulary(t testing.TB) (tags, attrs map[string]bool) {
	b, err := os.ReadFile("report.html.tmpl")
	if err != nil {
		t.Fatal(err)
	}
	tags, attrs = map[string]bool{}, map[string]bool{}
	for _, m := range regexp.MustCompile(`<([a-zA-Z][a-zA-Z0-9]*)`).FindAllStringSubmatch(string(b), -1) {
		tags[strings.ToLower(m[1])] = true
	}
	for _, m := range regexp.MustCompile(`\s([a-zA-Z_:][-a-zA-Z0-9_:.]*)=`).FindAllStringSubmatch(string(b), -1) {
		attrs[strings.ToLower(m[1])] = true
	}
	return tags, attrs
}

// element is one start tag found in a page.
type element struct {
	name  string
	attrs map[string]string
}

// scan lists the start tags of page outside raw text (script and style
// bodies are skipped to their end tag, as a browser does), or a problem
// that makes the page malformed.
func scan(page string) ([]element, string) {
	var out []element
	low := strings.ToLower(page)
	i := 0
	for {
		j := strings.IndexByte(page[i:], '<')
		if j < 0 {
			return out, ""
		}
		i += j + 1
		switch {
		case strings.HasPrefix(page[i:], "!--"):
			k := strings.Index(page[i:], "-->")
			if k < 0 {
				return out, "unclosed comment"
			}
			i += k + 3
			continue
		case strings.HasPrefix(page[i:], "!") || strings.HasPrefix(page[i:], "/"):
			k := strings.IndexByte(page[i:], '>')
			if k < 0 {
				return out, "unclosed tag"
			}
			i += k + 1
			continue
		case i >= len(page) || !isLetter(page[i]):
			continue // a literal '<' in text
		}
		e := element{attrs: map[string]string{}}
		k := i
		for k < len(page) && !isSpace(page[k]) && page[k] != '>' && page[k] != '/' {
			k++
		}
		e.name = strings.ToLower(page[i:k])
		// Attributes: name, optionally = and a quoted or bare value.
		for {
			for k < len(page) && (isSpace(page[k]) || page[k] == '/') {
				k++
			}
			if k >= len(page) {
				return out, "unclosed tag " + e.name
			}
			if page[k] == '>' {
				k++
				break
			}
			a := k
			for k < len(page) && !isSpace(page[k]) && page[k] != '>' && page[k] != '=' && page[k] != '/' {
				k++
			}
			name, val := strings.ToLower(page[a:k]), ""
			if k < len(page) && page[k] == '=' {
				k++
				if k < len(page) && (page[k] == '"' || page[k] == '\'') {
					q := page[k]
					end := strings.IndexByte(page[k+1:], q)
					if end < 0 {
						return out, "unclosed attribute value in " + e.name
					}
					val = page[k+1 : k+1+end]
					k += end + 2
				} else {
					v := k
					for k < len(page) && !isSpace(page[k]) && page[k] != '>' {
						k++
					}
					val = page[v:k]
				}
			}
			e.attrs[name] = val
		}
		out = append(out, e)
		i = k
		if e.name == "script" || e.name == "style" {
			end := strings.Index(low[i:], "</"+e.name)
			if end < 0 {
				return out, "unclosed " + e.name
			}
			i += end
		}
	}
}

func isLetter(c byte) bool { return c|0x20 >= 'a' && c|0x20 <= 'z' }
func isSpace(c byte) bool  { return c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '\f' }

// external reports whether an attribute value would fetch something or
// run code: the report must be self-contained and script-free beyond its own.
func external(v string) bool {
	v = strings.ToLower(strings.TrimSpace(v))
	for _, p := range []string{"http:", "https:", "//", "javascript:", "vbscript:", "file:", "ftp:"} {
		if strings.HasPrefix(v, p) {
			return true
		}
	}
	return false
}

// FuzzReport renames the variables and tier labels of a real result with
// hostile strings, sets hostile numbers in it, and checks that the report
// is valid UTF-8, well formed, self-contained, uses only the template's own
// elements and attributes, and holds exactly the template's script blocks.
func FuzzReport(f *testing.F) {
	f.Add("<script>alert(1)</script>", `"><img src=x onerror=alert(2)>`, "</script><script>alert(3)//", "a&b", "</style><b>x", math.NaN(), "<!--")
	f.Add("x", "y", "z", "w", "\u2028\u2029 ]]> {{.}}", math.Inf(1), "tier <i>one</i>")
	f.Add("javascript:alert(1)", "https://example.invalid/x.js", "' onmouseover='alert(4)", "\\u003cscript", "<svg onload=alert(5)>", -1e308, "<title>")
	f.Add("Ünïcødé 長い名前 🩺", "\x00nul", "\xff\xfe bad utf-8", strings.Repeat("long ", 60), "<![CDATA[", 0.0, "")
	tags, attrs := templateVocabulary(f)
	benign := render(f, baseResult(f), placeholders, 0.5, "zqLabelA", "Benign")
	benignEls, _ := scan(benign)
	scripts := count(benignEls, "script")
	if problem := check(benign, tags, attrs, scripts); problem != "" {
		f.Fatalf("the benign report: %s", problem)
	}
	f.Fuzz(func(t *testing.T, a, b, c, d, label string, value float64, title string) {
		names := []string{a, b, c, d}
		for i, n := range names {
			if n == "" || !utf8.ValidString(n) {
				names[i] = placeholders[i] // names must be valid and non-empty to be a result
			}
			for j := range i {
				if names[j] == names[i] {
					names[i] = placeholders[i]
				}
			}
		}
		page := render(t, baseResult(t), names, value, label, title)
		if !utf8.ValidString(page) {
			t.Fatal("report is not valid UTF-8")
		}
		// A short name must be on the page, as text.
		if n := names[0]; n != placeholders[0] && utf8.RuneCountInString(n) < 20 && !strings.ContainsRune(n, 0) &&
			!strings.Contains(html.UnescapeString(page), n) {
			t.Fatalf("name %q not shown on the page", n)
		}
		if problem := check(page, tags, attrs, scripts); problem != "" {
			t.Fatal(problem)
		}
	})
}

// check returns what is wrong with a report page, or "".
func check(page string, tags, attrs map[string]bool, scripts int) string {
	els, problem := scan(page)
	if problem != "" {
		return "malformed report: " + problem
	}
	if n := count(els, "script"); n != scripts {
		return fmt.Sprintf("%d script elements, the template has %d", n, scripts)
	}
	for _, e := range els {
		if !tags[e.name] {
			return fmt.Sprintf("element <%s> the template never writes", e.name)
		}
		for k, v := range e.attrs {
			if !attrs[k] {
				return fmt.Sprintf("attribute %s=%q on <%s> the template never writes", k, v, e.name)
			}
			if (k == "href" || k == "src" || k == "xlink:href" || k == "action") && external(v) {
				return fmt.Sprintf("<%s %s=%q> reaches outside the page", e.name, k, v)
			}
		}
	}
	return ""
}

// TestCheckCatchesInjection shows the fuzz target's check fails on
// injected markup, so its passing means something.
func TestCheckCatchesInjection(t *testing.T) {
	tags, attrs := templateVocabulary(t)
	page := render(t, baseResult(t), placeholders, 0.5, "zqLabelA", "Benign")
	els, _ := scan(page)
	scripts := count(els, "script")
	if p := check(page, tags, attrs, scripts); p != "" {
		t.Fatalf("benign page: %s", p)
	}
	for _, inject := range []string{"<img src=x onerror=alert(1)>", "<script>alert(1)</script>", `<span onclick="alert(1)">`,
		`<a href="https://example.invalid/">`, "<b title='x", "<style>", `<div title="x" onload=alert(1)>`} {
		bad := strings.Replace(page, "<h1>", inject+"<h1>", 1)
		if bad == page {
			t.Fatal("no <h1> to inject before")
		}
		if check(bad, tags, attrs, scripts) == "" {
			t.Errorf("check passed a page with %q", inject)
		}
	}
}

func count(els []element, name string) int {
	n := 0
	for _, e := range els {
		if e.name == name {
			n++
		}
	}
	return n
}

// render replaces the placeholders of the base result with names and the
// first tier's label with label, sets value into several numbers, and
// returns the report.
func render(t testing.TB, base []byte, names []string, value float64, label, title string) string {
	t.Helper()
	js := string(base)
	for i, n := range names {
		q, _ := json.Marshal(n)
		js = strings.ReplaceAll(js, placeholders[i], string(q[1:len(q)-1]))
	}
	q, _ := json.Marshal(label)
	js = strings.ReplaceAll(js, "zqLabelA", string(q[1:len(q)-1]))
	res, err := antecedent.ReadResult(strings.NewReader(js))
	if err != nil {
		t.Skip("not a result:", err) // names JSON cannot carry are not the report's concern
	}
	for i := range res.Nodes {
		if i%2 == 0 {
			res.Nodes[i].Penalty = antecedent.Number(value)
			res.Nodes[i].Intercept = antecedent.Number(value)
		}
	}
	if len(res.Edges) > 0 {
		res.Edges[0].Coefficient, res.Edges[0].Upper = value, value
	}
	var b bytes.Buffer
	if err := report.Write(&b, res, &report.Options{Title: title, Generated: time.Date(2024, 1, 2, 3, 4, 5, 0, time.UTC)}); err != nil {
		t.Fatalf("Write: %v", err)
	}
	return b.String()
}
