package report

import (
	"fmt"
	"math"
	"math/rand/v2"
	"regexp"
	"strconv"
	"testing"

	"github.com/antecedent-lab/antecedent/simulate"
)

// This file checks the drawing as drawn: it reads the SVG path data the
// page carries, samples every curve finely, and measures how close each
// edge comes to the boxes it does not join.

// clearMargin is the least distance, in SVG units, from an edge's centre
// line to any box it does not join. The widest edge is 4.8 units, so
// 8 units leaves more than 5 units of white between stroke and box
// (common practice: a gap the eye reads as separate).
const clearMargin = 8

type rect struct{ X0, Y0, X1, Y1 float64 }

// distance returns the distance from p to r, zero inside it.
func (r rect) distance(p Point) float64 {
	dx := math.Max(0, math.Max(r.X0-p.X, p.X-r.X1))
	dy := math.Max(0, math.Max(r.Y0-p.Y, p.Y-r.Y1))
	return math.Hypot(dx, dy)
}

// drawnPath is a path read from a page: its ends' node indices and data.
type drawnPath struct {
	A, B int
	D    string
	Link bool
}

var pathToken = regexp.MustCompile(`[MLCQ]|-?[0-9]*\.?[0-9]+(?:e-?[0-9]+)?`)

// samplePath returns points along SVG path data made of absolute M, L, C
// and Q commands, no further apart than about step.
func samplePath(d string, step float64) ([]Point, error) {
	toks := pathToken.FindAllString(d, -1)
	var out []Point
	var cur Point
	var cmd string
	num := func(i int) (float64, error) {
		if i >= len(toks) {
			return 0, fmt.Errorf("path %q ends early", d)
		}
		return strconv.ParseFloat(toks[i], 64)
	}
	pts := func(i, k int) ([]Point, error) {
		p := make([]Point, k)
		for j := range k {
			x, err := num(i + 2*j)
			if err != nil {
				return nil, err
			}
			y, err := num(i + 2*j + 1)
			if err != nil {
				return nil, err
			}
			p[j] = Point{x, y}
		}
		return p, nil
	}
	for i := 0; i < len(toks); {
		switch toks[i] {
		case "M", "L", "C", "Q":
			cmd = toks[i]
			i++
		}
		need := map[string]int{"M": 1, "L": 1, "C": 3, "Q": 2}[cmd]
		if need == 0 {
			return nil, fmt.Errorf("path %q: no command before %q", d, toks[i])
		}
		p, err := pts(i, need)
		if err != nil {
			return nil, err
		}
		i += 2 * need
		ctrl := append([]Point{cur}, p...)
		length := 0.0
		for j := 1; j < len(ctrl); j++ {
			length += math.Hypot(ctrl[j].X-ctrl[j-1].X, ctrl[j].Y-ctrl[j-1].Y)
		}
		steps := int(math.Ceil(length/step)) + 1
		switch cmd {
		case "M":
			out = append(out, p[0])
		case "L", "C", "Q":
			for s := 1; s <= steps; s++ {
				out = append(out, bezier(ctrl, float64(s)/float64(steps)))
			}
		}
		cur = p[need-1]
	}
	return out, nil
}

// bezier evaluates the Bézier curve with control points c at t by de
// Casteljau's algorithm.
func bezier(c []Point, t float64) Point {
	q := append([]Point(nil), c...)
	for n := len(q) - 1; n > 0; n-- {
		for i := range n {
			q[i] = Point{q[i].X + t*(q[i+1].X-q[i].X), q[i].Y + t*(q[i+1].Y-q[i].Y)}
		}
	}
	return q[0]
}

// drawing is a network as drawn: box rectangles by node index and paths.
type drawing struct {
	Boxes map[int]rect
	Paths []drawnPath
}

// check measures the drawing. It returns the least clearance between an
// edge or link and a box it does not join, where that was, and a list of
// faults: a path that does not leave its parent's right side or reach its
// child's left side, or that turns back to the left.
func (dr drawing) check() (clear float64, where string, faults []string) {
	clear = math.Inf(1)
	for _, p := range dr.Paths {
		s, err := samplePath(p.D, 0.25)
		if err != nil {
			faults = append(faults, err.Error())
			continue
		}
		a, b := dr.Boxes[p.A], dr.Boxes[p.B]
		first, last := s[0], s[len(s)-1]
		if math.Abs(first.X-a.X1) > 0.11 || first.Y <= a.Y0 || first.Y >= a.Y1 {
			faults = append(faults, fmt.Sprintf("path %d→%d starts at %v, not on its parent's right side %v", p.A, p.B, first, a))
		}
		if p.Link {
			if math.Abs(last.X-b.X1) > 0.11 || last.Y <= b.Y0 || last.Y >= b.Y1 {
				faults = append(faults, fmt.Sprintf("link %d—%d ends at %v, not on the right side of %v", p.A, p.B, last, b))
			}
		} else {
			if d := b.X0 - last.X; d < 0 || d > arrowGap+0.11 || last.Y <= b.Y0 || last.Y >= b.Y1 {
				faults = append(faults, fmt.Sprintf("edge %d→%d ends at %v, not at its child's left side %v", p.A, p.B, last, b))
			}
			for j := 1; j < len(s); j++ {
				if s[j].X < s[j-1].X-1e-9 {
					faults = append(faults, fmt.Sprintf("edge %d→%d turns back at %v", p.A, p.B, s[j]))
					break
				}
			}
		}
		for id, r := range dr.Boxes {
			if id == p.A || id == p.B {
				continue
			}
			for _, q := range s {
				if d := r.distance(q); d < clear {
					clear = d
					where = fmt.Sprintf("path %d→%d passes %.2f units from box %d at (%.1f, %.1f)", p.A, p.B, d, id, q.X, q.Y)
				}
			}
		}
	}
	return clear, where, faults
}

var (
	boxTag  = regexp.MustCompile(`<g class="node [^"]*" data-id="(\d+)">[^<]*<a [^>]*>(?:<title>[^<]*</title>)?\s*<rect class="box" x="([0-9.-]+)" y="([0-9.-]+)" width="([0-9.-]+)" height="([0-9.-]+)"`)
	edgeTag = regexp.MustCompile(`<g class="edge [^"]*" data-k="\d+" data-from="(\d+)" data-to="(\d+)"><title>[^<]*</title><path d="([^"]+)"`)
	linkTag = regexp.MustCompile(`<g class="link" data-a="(\d+)" data-b="(\d+)"><title>[^<]*</title><path d="([^"]+)"`)
)

// readDrawing reads the network drawing from a report page.
func readDrawing(page string) (drawing, error) {
	dr := drawing{Boxes: map[int]rect{}}
	f := func(s string) float64 { v, _ := strconv.ParseFloat(s, 64); return v }
	for _, m := range boxTag.FindAllStringSubmatch(page, -1) {
		id, _ := strconv.Atoi(m[1])
		x, y := f(m[2]), f(m[3])
		dr.Boxes[id] = rect{x, y, x + f(m[4]), y + f(m[5])}
	}
	for _, tag := range []*regexp.Regexp{edgeTag, linkTag} {
		for _, m := range tag.FindAllStringSubmatch(page, -1) {
			a, _ := strconv.Atoi(m[1])
			b, _ := strconv.Atoi(m[2])
			if _, ok := dr.Boxes[a]; !ok {
				return dr, fmt.Errorf("path from unknown box %d", a)
			}
			if _, ok := dr.Boxes[b]; !ok {
				return dr, fmt.Errorf("path to unknown box %d", b)
			}
			dr.Paths = append(dr.Paths, drawnPath{A: a, B: b, D: m[3], Link: tag == linkTag})
		}
	}
	if len(dr.Boxes) == 0 {
		return dr, fmt.Errorf("no boxes found in the page")
	}
	return dr, nil
}

// layoutDrawing is the drawing of a layout, through the same path data
// the page uses.
func layoutDrawing(l *Layout, edges, links [][2]int) drawing {
	dr := drawing{Boxes: map[int]rect{}}
	for i, p := range l.Pos {
		dr.Boxes[i] = rect{p.X - l.BoxWidth/2, p.Y - l.Heights[i]/2, p.X + l.BoxWidth/2, p.Y + l.Heights[i]/2}
	}
	for k, e := range edges {
		dr.Paths = append(dr.Paths, drawnPath{A: e[0], B: e[1], D: l.Edges[k].Path()})
	}
	for k, e := range links {
		dr.Paths = append(dr.Paths, drawnPath{A: e[0], B: e[1], D: l.Links[k].Path(), Link: true})
	}
	return dr
}

// randomNetwork draws a random tiered network with package simulate and
// returns its tiers and edges as node indices.
func randomNetwork(t *testing.T, s simulate.RandomSettings, seed uint64) ([]int, [][2]int) {
	t.Helper()
	m, o, err := simulate.Random(s, seed)
	if err != nil {
		t.Fatal(err)
	}
	index := map[string]int{}
	for i, nd := range m.Nodes {
		index[nd.Name] = i
	}
	tier := make([]int, len(m.Nodes))
	for c, names := range o.Tiers {
		for _, name := range names {
			tier[index[name]] = c
		}
	}
	var edges [][2]int
	for i, nd := range m.Nodes {
		for _, p := range nd.Parents {
			edges = append(edges, [2]int{index[p], i})
		}
	}
	return tier, edges
}

// wideTier returns a network whose middle tier holds 30 variables, with
// edges that skip it, edges into and out of it, and seeded links within it.
func wideTier(seed uint64) (tier []int, edges, links [][2]int) {
	rng := rand.New(rand.NewPCG(seed, 30))
	for i := range 4 {
		tier = append(tier, 0)
		_ = i
	}
	for range 30 {
		tier = append(tier, 1)
	}
	for range 4 {
		tier = append(tier, 2)
	}
	for a := range 38 {
		for b := range 38 {
			p := 0.08
			if tier[a] == 0 && tier[b] == 2 {
				p = 0.6 // the long edges that must thread the wide tier
			}
			if tier[a] < tier[b] && rng.Float64() < p {
				edges = append(edges, [2]int{a, b})
			}
		}
	}
	for range 4 {
		a, b := 4+rng.IntN(30), 4+rng.IntN(30)
		if a != b {
			links = append(links, [2]int{a, b})
		}
	}
	return tier, edges, links
}

// TestRoutesClearBoxes is the geometric check of the drawing: no edge
// comes within clearMargin of a box other than its two ends, every edge
// runs left to right from its parent's right side to its child's left
// side, on random networks of 10 to 80 variables drawn by package simulate,
// on a dense one, and on a tier of 30 variables that long edges must
// cross. (The demonstration result is checked in TestDemoRoutesClearBoxes.)
func TestRoutesClearBoxes(t *testing.T) {
	type netCase struct {
		name         string
		tier         []int
		edges, links [][2]int
	}
	var cases []netCase
	for v := 10; v <= 80; v += 10 {
		for seed := range uint64(3) {
			s := simulate.RandomSettings{Variables: v, Tiers: 3 + (v/10+int(seed))%6}
			tier, edges := randomNetwork(t, s, 100*uint64(v)+seed)
			cases = append(cases, netCase{fmt.Sprintf("random-%dvars-%dtiers-seed%d", v, s.Tiers, seed), tier, edges, nil})
		}
	}
	tier, edges := randomNetwork(t, simulate.RandomSettings{Variables: 40, Tiers: 6, EdgeProbability: 0.15}, 7)
	cases = append(cases, netCase{"random-40vars-dense", tier, edges, nil})
	tier, edges, links := wideTier(1)
	cases = append(cases, netCase{"wide-tier-30", tier, edges, links})

	worst, worstWhere := math.Inf(1), ""
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			l, err := LayoutGraph(c.tier, c.edges, c.links)
			if err != nil {
				t.Fatal(err)
			}
			clear, where, faults := layoutDrawing(l, c.edges, c.links).check()
			for _, f := range faults {
				t.Error(f)
			}
			if clear < clearMargin {
				t.Errorf("%d edges: %s (margin %d)", len(c.edges), where, clearMargin)
			}
			if clear < worst {
				worst, worstWhere = clear, c.name+": "+where
			}
		})
	}
	t.Logf("least clearance over all cases: %.2f units (%s)", worst, worstWhere)
}

// TestCheckCatchesEdgesBehindBoxes checks the checker on a case worked by
// hand: three boxes in a row and the straight edge from the first to the
// third drawn behind the second, as the page used to draw it, must be
// caught; the same edge routed above the middle box is clear by the
// distance from the route to that box's top.
func TestCheckCatchesEdgesBehindBoxes(t *testing.T) {
	boxes := map[int]rect{0: {0, 0, 100, 40}, 1: {200, 0, 300, 40}, 2: {400, 0, 500, 40}}
	behind := drawing{Boxes: boxes, Paths: []drawnPath{{A: 0, B: 2, D: "M100,20 L399,20"}}}
	if clear, _, faults := behind.check(); clear != 0 || len(faults) != 0 {
		t.Errorf("edge behind a box: clearance %g, faults %v; want 0 and none", clear, faults)
	}
	above := drawing{Boxes: boxes, Paths: []drawnPath{{A: 0, B: 2, D: "M100,20 C150,20 150,-30 199,-30 L300,-30 C350,-30 350,20 399,20"}}}
	clear, where, faults := above.check()
	if len(faults) != 0 {
		t.Errorf("routed edge: faults %v", faults)
	}
	// The lane at y = −30 passes 30 units above box 1 (0 ≤ y ≤ 40); the
	// curves come closer only near x = 200 and 300, at the box's corners.
	if clear > 30 || clear < 20 {
		t.Errorf("routed edge: clearance %g (%s), want between 20 and 30", clear, where)
	}
	back := drawing{Boxes: boxes, Paths: []drawnPath{{A: 0, B: 2, D: "M100,20 L150,60 L120,70 L399,20"}}}
	if _, _, faults := back.check(); len(faults) != 1 {
		t.Errorf("edge turning back: faults %v, want one", faults)
	}
}
