package report

import (
	"slices"
	"sort"
)

// Point is a position in the drawing, in SVG user units.
type Point struct{ X, Y float64 }

// Layout places the nodes of a tiered graph: one column per tier, earliest
// on the left, nodes ordered within their column to reduce edge crossings.
type Layout struct {
	// Column and Rank give each node's tier and position within it.
	Column, Rank []int
	// Pos is the centre of each node's box.
	Pos []Point
	// Width and Height of the whole drawing.
	Width, Height float64
	// BoxWidth and BoxHeight of every node box.
	BoxWidth, BoxHeight float64
	// Crossings counts crossing pairs of edges drawn as straight segments.
	Crossings int
}

// Sizes of the drawing, in SVG user units.
const (
	boxWidth  = 170
	boxHeight = 44
	colGap    = 84
	rowGap    = 26
	margin    = 24
)

// LayoutGraph places nodes with the given tiers (tier[i] for node i) and
// directed edges (pairs of node indices). Within each column nodes start in
// index order and are reordered by the barycentre heuristic of layered
// drawing (Sugiyama, Tagawa & Toda 1981): alternately left-to-right and
// right-to-left, each node moves to the mean rank of its neighbours in the
// columns already placed. The ordering with the fewest crossings seen,
// the starting one included, is kept, so the result never has more
// crossings than the plain index order.
func LayoutGraph(tier []int, edges [][2]int) *Layout {
	n := len(tier)
	cols := 0
	for _, t := range tier {
		cols = max(cols, t+1)
	}
	members := make([][]int, cols)
	for i, t := range tier {
		members[t] = append(members[t], i)
	}
	nbr := make([][]int, n)
	for _, e := range edges {
		nbr[e[0]] = append(nbr[e[0]], e[1])
		nbr[e[1]] = append(nbr[e[1]], e[0])
	}
	rank := make([]int, n)
	setRanks := func() {
		for _, m := range members {
			for r, i := range m {
				rank[i] = r
			}
		}
	}
	setRanks()
	l := &Layout{Column: slices.Clone(tier), BoxWidth: boxWidth, BoxHeight: boxHeight}
	tallest := 0
	for _, m := range members {
		tallest = max(tallest, len(m))
	}
	place := func() {
		l.Pos = make([]Point, n)
		for c, m := range members {
			x := margin + float64(c)*(boxWidth+colGap) + boxWidth/2
			offset := float64(tallest-len(m)) * (boxHeight + rowGap) / 2
			for r, i := range m {
				l.Pos[i] = Point{x, margin + offset + float64(r)*(boxHeight+rowGap) + boxHeight/2}
			}
		}
	}
	place()
	best := crossings(l.Pos, edges)
	bestOrder := cloneMembers(members)
	// pos is a node's relative height in its column, in [0, 1].
	relative := func(i int) float64 {
		m := members[tier[i]]
		if len(m) == 1 {
			return 0.5
		}
		return float64(rank[i]) / float64(len(m)-1)
	}
	for sweep := 0; sweep < 24 && best > 0; sweep++ {
		forward := sweep%2 == 0
		for k := range cols {
			c := k
			if !forward {
				c = cols - 1 - k
			}
			m := members[c]
			key := make(map[int]float64, len(m))
			for _, i := range m {
				var s float64
				cnt := 0
				for _, j := range nbr[i] {
					if (forward && tier[j] < c) || (!forward && tier[j] > c) {
						s += relative(j)
						cnt++
					}
				}
				if cnt == 0 {
					key[i] = relative(i)
				} else {
					key[i] = s / float64(cnt)
				}
			}
			sort.SliceStable(m, func(a, b int) bool { return key[m[a]] < key[m[b]] })
			for r, i := range m {
				rank[i] = r
			}
		}
		place()
		if x := crossings(l.Pos, edges); x < best {
			best = x
			bestOrder = cloneMembers(members)
		}
	}
	members = bestOrder
	setRanks()
	place()
	l.Rank = slices.Clone(rank)
	l.Crossings = best
	l.Width = 2*margin + float64(cols)*boxWidth + float64(max(cols-1, 0))*colGap
	l.Height = 2*margin + float64(tallest)*boxHeight + float64(max(tallest-1, 0))*rowGap
	return l
}

func cloneMembers(m [][]int) [][]int {
	out := make([][]int, len(m))
	for i, x := range m {
		out[i] = slices.Clone(x)
	}
	return out
}

// crossings counts pairs of edges whose straight segments, from the right
// side of the parent's box to the left side of the child's, cross.
func crossings(pos []Point, edges [][2]int) int {
	seg := func(e [2]int) (Point, Point) {
		a, b := pos[e[0]], pos[e[1]]
		return Point{a.X + boxWidth/2, a.Y}, Point{b.X - boxWidth/2, b.Y}
	}
	n := 0
	for i := range edges {
		p1, p2 := seg(edges[i])
		for j := i + 1; j < len(edges); j++ {
			if edges[i][0] == edges[j][0] || edges[i][1] == edges[j][1] || edges[i][0] == edges[j][1] || edges[i][1] == edges[j][0] {
				continue
			}
			q1, q2 := seg(edges[j])
			if intersect(p1, p2, q1, q2) {
				n++
			}
		}
	}
	return n
}

func orient(a, b, c Point) float64 { return (b.X-a.X)*(c.Y-a.Y) - (b.Y-a.Y)*(c.X-a.X) }

// intersect reports whether segments p1p2 and q1q2 cross at a point
// interior to both.
func intersect(p1, p2, q1, q2 Point) bool {
	d1 := orient(q1, q2, p1)
	d2 := orient(q1, q2, p2)
	d3 := orient(p1, p2, q1)
	d4 := orient(p1, p2, q2)
	return ((d1 > 0 && d2 < 0) || (d1 < 0 && d2 > 0)) && ((d3 > 0 && d4 < 0) || (d3 < 0 && d4 > 0))
}
