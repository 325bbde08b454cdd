package report

import (
	"math/rand/v2"
	"testing"
)

func randomTiered(seed uint64, n, tiers int, p float64) ([]int, [][2]int) {
	rng := rand.New(rand.NewPCG(seed, 9))
	tier := make([]int, n)
	for i := range tier {
		tier[i] = i * tiers / n
	}
	// Shuffle tiers' members so index order is a poor order.
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

func TestLayoutInvariants(t *testing.T) {
	for seed := range uint64(30) {
		tier, edges := randomTiered(seed, 6+int(seed)%25, 2+int(seed)%5, 0.15)
		l := LayoutGraph(tier, edges)
		// No two boxes overlap.
		for i := range l.Pos {
			for j := i + 1; j < len(l.Pos); j++ {
				dx := l.Pos[i].X - l.Pos[j].X
				dy := l.Pos[i].Y - l.Pos[j].Y
				if (dx < boxWidth && dx > -boxWidth) && (dy < boxHeight && dy > -boxHeight) {
					t.Fatalf("seed %d: nodes %d and %d overlap at %v and %v", seed, i, j, l.Pos[i], l.Pos[j])
				}
			}
		}
		// Cross-tier edges go left to right; columns follow tiers.
		for _, e := range edges {
			if !(l.Pos[e[0]].X+boxWidth/2 < l.Pos[e[1]].X-boxWidth/2) {
				t.Fatalf("seed %d: edge %v does not go left to right", seed, e)
			}
		}
		// Never more crossings than the plain index order.
		naive := naivePositions(tier)
		if c := crossings(naive, edges); l.Crossings > c {
			t.Errorf("seed %d: %d crossings, index order has %d", seed, l.Crossings, c)
		}
		if got := crossings(l.Pos, edges); got != l.Crossings {
			t.Errorf("seed %d: reported %d crossings, counted %d", seed, l.Crossings, got)
		}
		if l.Width <= 0 || l.Height <= 0 {
			t.Errorf("seed %d: size %g × %g", seed, l.Width, l.Height)
		}
	}
}

// naivePositions places nodes in index order within each column, as
// LayoutGraph does before reordering.
func naivePositions(tier []int) []Point {
	l := LayoutGraph(tier, nil) // no edges: nothing to reorder
	return l.Pos
}

// TestLayoutReducesCrossings checks a case worked by hand: two columns,
// edges 0→3 and 1→2 cross in index order; swapping one column removes the
// crossing (barycentre heuristic, Sugiyama, Tagawa & Toda 1981).
func TestLayoutReducesCrossings(t *testing.T) {
	tier := []int{0, 0, 1, 1}
	edges := [][2]int{{0, 3}, {1, 2}}
	if c := crossings(naivePositions(tier), edges); c != 1 {
		t.Fatalf("index order has %d crossings, want 1", c)
	}
	if l := LayoutGraph(tier, edges); l.Crossings != 0 {
		t.Errorf("layout keeps %d crossings", l.Crossings)
	}
}

func TestIntersect(t *testing.T) {
	cases := []struct {
		p1, p2, q1, q2 Point
		want           bool
	}{
		{Point{0, 0}, Point{2, 2}, Point{0, 2}, Point{2, 0}, true},
		{Point{0, 0}, Point{2, 0}, Point{0, 1}, Point{2, 1}, false},
		{Point{0, 0}, Point{1, 1}, Point{1, 1}, Point{2, 0}, false}, // touching at an end
	}
	for _, c := range cases {
		if got := intersect(c.p1, c.p2, c.q1, c.q2); got != c.want {
			t.Errorf("intersect(%v %v %v %v) = %v", c.p1, c.p2, c.q1, c.q2, got)
		}
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
		if len(got) != len(c.want) {
			t.Errorf("ticks(%g, %g) = %v, want %v", c.lo, c.hi, got, c.want)
			continue
		}
		for i := range got {
			if got[i] != c.want[i] {
				t.Errorf("ticks(%g, %g) = %v, want %v", c.lo, c.hi, got, c.want)
				break
			}
		}
	}
}
