package report

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

func randomTiered(seed uint64, n, tiers int, p float64) ([]int, [][2]int) {
	rng := rand.New(rand.NewPCG(seed, 9))
	tier := make([]int, n)
	for i := range tier {
		tier[i] = i * tiers / n
	}
	var edges [][2]int
	for a := range n {
		for b := range n {
			if tier[a] < tier[b] && rng.Float64() < p {
				edges = append(edges, [2]int{a, b})
			}
		}
	}
	return tier, edges
}

// startCrossings returns the crossings of the starting order: boxes in
// index order, lanes where the straight lines would pass.
func startCrossings(tier []int, edges [][2]int) int {
	cols := slices.Max(tier) + 1
	h := make([]float64, len(tier))
	for i := range h {
		h[i] = boxHeight
	}
	return newLayered(tier, cols, edges, h).crossings()
}

func TestLayoutInvariants(t *testing.T) {
	for seed := range uint64(30) {
		tier, edges := randomTiered(seed, 6+int(seed)%25, 2+int(seed)%5, 0.15)
		l, err := LayoutGraph(tier, edges, nil)
		if err != nil {
			t.Fatal(err)
		}
		box := func(i int) rect {
			p, h := l.Pos[i], l.Heights[i]
			return rect{p.X - l.BoxWidth/2, p.Y - h/2, p.X + l.BoxWidth/2, p.Y + h/2}
		}
		// No two boxes overlap, and columns keep rowGap between boxes.
		for i := range l.Pos {
			for j := i + 1; j < len(l.Pos); j++ {
				a, b := box(i), box(j)
				if a.X0 < b.X1 && b.X0 < a.X1 && a.Y0 < b.Y1+rowGap-1e-9 && b.Y0 < a.Y1+rowGap-1e-9 {
					t.Fatalf("seed %d: boxes %d %v and %d %v overlap or touch", seed, i, a, j, b)
				}
			}
			if b := box(i); b.Y0 < labelRoom || b.Y1 > l.Height || b.X0 < 0 || b.X1 > l.Width {
				t.Errorf("seed %d: box %d %v outside the drawing %g × %g", seed, i, b, l.Width, l.Height)
			}
		}
		// Columns follow tiers, earliest on the left.
		for _, e := range edges {
			if !(box(e[0]).X1 < box(e[1]).X0) {
				t.Fatalf("seed %d: edge %v does not go left to right", seed, e)
			}
		}
		// Never more crossings than the starting (index) order.
		if start := startCrossings(tier, edges); l.Crossings > start {
			t.Errorf("seed %d: %d crossings, index order has %d", seed, l.Crossings, start)
		}
		// The count is the drawing's: count crossings of the drawn curves.
		if got := drawnCrossings(t, l, edges); got != l.Crossings {
			t.Errorf("seed %d: reported %d crossings, the drawing has %d", seed, l.Crossings, got)
		}
	}
}

// drawnCrossings counts the points where two drawn edge paths cross, by
// resampling each path (left to right, as checked elsewhere) on a common
// grid of x and counting sign changes of the difference in height.
func drawnCrossings(t *testing.T, l *Layout, edges [][2]int) int {
	t.Helper()
	const dx = 0.5
	type curve struct {
		x0 float64
		y  []float64
	}
	curves := make([]curve, len(edges))
	for k := range edges {
		s, err := samplePath(l.Edges[k].Path(), 0.2)
		if err != nil {
			t.Fatal(err)
		}
		c := curve{x0: math.Ceil(s[0].X/dx) * dx}
		j := 0
		for x := c.x0; x <= s[len(s)-1].X; x += dx {
			for j+1 < len(s)-1 && s[j+1].X < x {
				j++
			}
			a, b := s[j], s[j+1]
			f := 0.0
			if b.X > a.X {
				f = (x - a.X) / (b.X - a.X)
			}
			c.y = append(c.y, a.Y+f*(b.Y-a.Y))
		}
		curves[k] = c
	}
	n := 0
	for p := range curves {
		for q := p + 1; q < len(curves); q++ {
			a, b := curves[p], curves[q]
			lo := math.Max(a.x0, b.x0)
			ia, ib := int(math.Round((lo-a.x0)/dx)), int(math.Round((lo-b.x0)/dx))
			prev := 0.0
			for ia < len(a.y) && ib < len(b.y) {
				d := a.y[ia] - b.y[ib]
				if d*prev < 0 {
					n++
				}
				if d != 0 {
					prev = d
				}
				ia++
				ib++
			}
		}
	}
	return n
}

// TestLayoutReducesCrossings checks a case worked by hand: two columns,
// edges 0→3 and 1→2 cross in index order; swapping one column removes the
// crossing (barycentre heuristic, Sugiyama, Tagawa & Toda 1981).
func TestLayoutReducesCrossings(t *testing.T) {
	tier := []int{0, 0, 1, 1}
	edges := [][2]int{{0, 3}, {1, 2}}
	if c := startCrossings(tier, edges); c != 1 {
		t.Fatalf("index order has %d crossings, want 1", c)
	}
	l, err := LayoutGraph(tier, edges, nil)
	if err != nil {
		t.Fatal(err)
	}
	if l.Crossings != 0 {
		t.Errorf("layout keeps %d crossings", l.Crossings)
	}
}

// TestLongEdgeGetsLanes checks the virtual points of layered drawing
// (Sugiyama, Tagawa & Toda 1981) on a case worked by hand: an edge from
// tier 0 to tier 3 crosses tiers 1 and 2, so its route has the start, an
// entry and exit in each of the two columns, and the end; the lanes lie
// outside every box of those columns.
func TestLongEdgeGetsLanes(t *testing.T) {
	tier := []int{0, 1, 1, 1, 2, 3}
	edges := [][2]int{{0, 5}, {0, 1}, {1, 4}, {4, 5}, {0, 2}, {0, 3}}
	l, err := LayoutGraph(tier, edges, nil)
	if err != nil {
		t.Fatal(err)
	}
	r := l.Edges[0]
	if len(r.Points) != 6 {
		t.Fatalf("route of 0→5 has %d points, want 6: %v", len(r.Points), r.Points)
	}
	for j := 1; j < 5; j += 2 {
		in, out := r.Points[j], r.Points[j+1]
		if in.Y != out.Y {
			t.Errorf("lane %d is not level: %v %v", j/2, in, out)
		}
		for i := range tier {
			if tier[i] != tier[0]+1+j/2 {
				continue
			}
			if d := math.Abs(in.Y - l.Pos[i].Y); d < l.Heights[i]/2+laneClear-1e-9 {
				t.Errorf("lane at %g passes %g from the centre of box %d (height %g)", in.Y, d, i, l.Heights[i])
			}
		}
	}
	for k, e := range edges {
		if want := 2*(tier[e[1]]-tier[e[0]]-1) + 2; len(l.Edges[k].Points) != want {
			t.Errorf("edge %v: %d points, want %d", e, len(l.Edges[k].Points), want)
		}
	}
}

// TestPortsSpread checks that arrivals into one box, and departures from
// one, end at distinct heights at least portPitch apart, ordered like their
// other ends so they never cross at the box.
func TestPortsSpread(t *testing.T) {
	// Five parents into node 5; node 0 also has four children.
	tier := []int{0, 0, 0, 0, 0, 1, 1, 1, 1}
	edges := [][2]int{{0, 5}, {1, 5}, {2, 5}, {3, 5}, {4, 5}, {0, 6}, {0, 7}, {0, 8}}
	l, err := LayoutGraph(tier, edges, nil)
	if err != nil {
		t.Fatal(err)
	}
	type end struct{ port, other float64 }
	var into, from []end
	for k, e := range edges {
		p := l.Edges[k].Points
		if e[1] == 5 {
			into = append(into, end{p[len(p)-1].Y, p[0].Y})
		}
		if e[0] == 0 {
			from = append(from, end{p[0].Y, p[len(p)-1].Y})
		}
	}
	for name, ends := range map[string][]end{"arrivals into 5": into, "departures from 0": from} {
		slices.SortFunc(ends, func(a, b end) int { return int(math.Copysign(1, a.port-b.port)) })
		for j := 1; j < len(ends); j++ {
			if ends[j].port-ends[j-1].port < portPitch-1e-9 {
				t.Errorf("%s: ports %g and %g closer than %d", name, ends[j-1].port, ends[j].port, portPitch)
			}
			if ends[j].other < ends[j-1].other {
				t.Errorf("%s: ports out of the order of their other ends: %v", name, ends)
			}
		}
	}
	if l.Crossings != 0 {
		t.Errorf("%d crossings in a drawing that needs none", l.Crossings)
	}
}

func TestLayoutRejectsBadInput(t *testing.T) {
	cases := []struct {
		name         string
		tier         []int
		edges, links [][2]int
	}{
		{"negative tier", []int{0, -1}, nil, nil},
		{"tier far beyond the node count", []int{0, 5000}, nil, nil},
		{"edge within a tier", []int{0, 0}, [][2]int{{0, 1}}, nil},
		{"edge backwards", []int{0, 1}, [][2]int{{1, 0}}, nil},
		{"edge to no node", []int{0, 1}, [][2]int{{0, 2}}, nil},
		{"link across tiers", []int{0, 1}, nil, [][2]int{{0, 1}}},
		{"link to itself", []int{0, 1}, nil, [][2]int{{0, 0}}},
	}
	for _, c := range cases {
		if _, err := LayoutGraph(c.tier, c.edges, c.links); err == nil {
			t.Errorf("%s: no error", c.name)
		}
	}
	if l, err := LayoutGraph(nil, nil, nil); err != nil || l.Width <= 0 || l.Height <= 0 {
		t.Errorf("empty graph: %v, %+v", err, l)
	}
}

// TestSpread checks the pool-adjacent-violators placement on cases worked
// by hand: three slots that all want 0 with unit gaps settle at −1, 0, 1
// (the mean stays at 0); slots already far enough apart stay put; a heavy
// slot moves less than a light one.
func TestSpread(t *testing.T) {
	cases := []struct {
		want, w, gap, out []float64
	}{
		{[]float64{0, 0, 0}, []float64{1, 1, 1}, []float64{1, 1}, []float64{-1, 0, 1}},
		{[]float64{0, 5, 9}, []float64{1, 1, 1}, []float64{2, 2}, []float64{0, 5, 9}},
		// 3·(y−0)² + (y+2−0)²: minimum at y = −0.5.
		{[]float64{0, 0}, []float64{3, 1}, []float64{2}, []float64{-0.5, 1.5}},
		{[]float64{4, 0, 10}, []float64{1, 1, 1}, []float64{1, 1}, []float64{1.5, 2.5, 10}},
	}
	for _, c := range cases {
		got := spread(nil, c.want, c.w, c.gap)
		for i := range got {
			if math.Abs(got[i]-c.out[i]) > 1e-12 {
				t.Errorf("spread(%v, %v, %v) = %v, want %v", c.want, c.w, c.gap, got, c.out)
				break
			}
		}
	}
}

// TestFocusSets checks what focusing a node lights, on a graph worked by
// hand: d→a, d→b, a→c, b→c, c→e. Focusing a lights d→a (parent), a→c
// (child) and b→c (co-parent b into the shared child), but not d→b, although
// d and b are both in a's Markov blanket, nor c→e.
func TestFocusSets(t *testing.T) {
	const a, b, c, d, e = 0, 1, 2, 3, 4
	edges := [][2]int{{d, a}, {d, b}, {a, c}, {b, c}, {c, e}}
	links := [][2]int{{a, b}}
	f := focusSets(5, edges, links)["0"]
	if want := []int{0, 2, 3}; !slices.Equal(f.E, want) {
		t.Errorf("focusing a lights edges %v, want %v", f.E, want)
	}
	if want := []int{b, c, d}; !slices.Equal(f.N, want) {
		t.Errorf("focusing a lights nodes %v, want %v", f.N, want)
	}
	if want := []int{0}; !slices.Equal(f.L, want) {
		t.Errorf("focusing a lights links %v, want %v", f.L, want)
	}
	// e has one parent and no children: only c→e.
	if f := focusSets(5, edges, links)["4"]; !slices.Equal(f.E, []int{4}) || !slices.Equal(f.N, []int{c}) {
		t.Errorf("focusing e lights edges %v and nodes %v, want [4] and [2]", f.E, f.N)
	}
}

func TestTickLabels(t *testing.T) {
	cases := []struct {
		lo, hi float64
		want   []string
	}{
		{20.1, 21.1, []string{"20.25", "20.50", "20.75", "21.00"}},
		{0, 10, []string{"0", "2.5", "5.0", "7.5", "10.0"}},
	}
	for _, c := range cases {
		tv := ticks(c.lo, c.hi, 4)
		var got []string
		for _, v := range tv {
			got = append(got, label(v, step(tv)))
		}
		if !slices.Equal(got, c.want) {
			t.Errorf("ticks(%g, %g) = %v, want %v", c.lo, c.hi, got, c.want)
		}
	}
}

// TestPenaltyTicks checks the penalty axis on ranges worked by hand.
func TestPenaltyTicks(t *testing.T) {
	cases := []struct {
		lo, hi float64
		want   []string
	}{
		{0.04, 0.6, []string{"0.05", "0.1", "0.2", "0.5"}},
		{0.003, 0.6, []string{"0.003", "0.01", "0.03", "0.1", "0.3"}},
		{1e-4, 2, []string{"0.0001", "0.001", "0.01", "0.1", "1"}},
		{3e-9, 5, []string{"1e-8", "1e-6", "0.0001", "0.01", "1"}},
		{0.5, 0.5, []string{"0.5"}},
	}
	for _, c := range cases {
		var got []string
		for _, v := range logTicks(c.lo, c.hi) {
			got = append(got, penaltyLabel(v))
		}
		if !slices.Equal(got, c.want) {
			t.Errorf("logTicks(%g, %g) = %v, want %v", c.lo, c.hi, got, c.want)
		}
	}
}
