package report

import (
	"fmt"
	"math"
	"slices"
	"strconv"
)

// Point is a position in the drawing, in SVG user units.
type Point struct{ X, Y float64 }

// Layout places the nodes of a tiered graph and routes its edges: one
// column per tier, earliest on the left, nodes ordered within their column
// to reduce edge crossings, and every edge drawn through the gaps between
// boxes, never behind one.
type Layout struct {
	// Column and Rank give each node's tier and position within it.
	Column, Rank []int
	// Pos is the centre of each node's box and Heights its height; every
	// box is BoxWidth wide.
	Pos     []Point
	Heights []float64
	// BoxWidth is the width of every node box.
	BoxWidth float64
	// Width and Height of the whole drawing. The top labelRoom units are
	// left free for column labels.
	Width, Height float64
	// Edges holds the route of each edge, in the order given.
	Edges []Route
	// Links holds the route of each same-tier link, in the order given.
	Links []Route
	// Crossings counts crossing pairs of drawn edge routes.
	Crossings int
}

// Route is the drawn path of an edge or link.
//
// An edge's Points are its start on the parent box's right side, the entry
// and exit of the lane it follows through each column it crosses, and its
// end at the child box's left side. Between columns the path is a cubic
// curve leaving and arriving horizontally, so it stays inside the gap;
// inside a column it is a straight horizontal lane between boxes.
//
// A link's Points are its two ends on the right sides of its boxes, and
// Reach is how far its loop extends to the right of them.
type Route struct {
	Points []Point
	Reach  float64
}

// Sizes of the drawing, in SVG user units.
const (
	boxWidth  = 168
	boxHeight = 46 // smallest box; boxes with many ports are taller
	colGap    = 88 // between columns, where edges change height
	rowGap    = 22 // between boxes in a column
	laneClear = 15 // from a lane's centre line to the nearest box
	lanePitch = 9  // between neighbouring lanes
	portPitch = 9  // smallest distance between ports on one side
	portWide  = 12 // largest distance between ports on one side
	portInset = 10 // from a box's top or bottom to its outermost port
	arrowGap  = 1  // from an edge's end to the child's box
	margin    = 24
	labelRoom = 22 // above the boxes, for the column labels
	maxTier   = 1000
)

// item is a slot in a column: a node's box or, for an edge that crosses
// the column, the lane it passes through.
type item struct {
	node   int // node index, or -1 for a lane
	edge   int // for a lane, the edge it carries
	half   float64
	weight float64
}

// LayoutGraph places nodes with the given tiers (tier[i] ≥ 0 for node i)
// and routes directed edges and undirected same-tier links (pairs of node
// indices).
//
// It follows the layered drawing of Sugiyama, Tagawa & Toda (1981): an
// edge that skips tiers gets one virtual point, a lane, in each column it
// crosses; lanes are ordered together with the boxes by the barycentre
// heuristic (alternately left-to-right and right-to-left sweeps, each slot
// moving to the mean position of its neighbours in the column just
// placed), and the ordering with the fewest crossings seen is kept, the
// starting one included. The start is index order: boxes in index order,
// each lane where the straight line between its edge's ends would pass.
// Heights are then set by quadratic placement: each column in turn is
// pulled towards its neighbours' heights, edges through lanes weighted
// more so long edges run straight, under the constraint that slots keep
// their order and spacing (pool-adjacent-violators). Arrivals and
// departures are spread along the boxes' sides in the order of their other
// ends, so edges sharing a box never cross there.
//
// It returns an error, and no layout, for a negative tier or one above
// both the number of nodes and 1000, an edge whose ends are out of range
// or not in increasing tiers, or a link whose ends are out of range or in
// different tiers.
func LayoutGraph(tier []int, edges, links [][2]int) (*Layout, error) {
	n := len(tier)
	cols := 0
	for i, t := range tier {
		if t < 0 || t > max(n, maxTier) {
			return nil, fmt.Errorf("report: node %d has tier %d, outside [0, %d]", i, t, max(n, maxTier))
		}
		cols = max(cols, t+1)
	}
	for _, e := range edges {
		if e[0] < 0 || e[0] >= n || e[1] < 0 || e[1] >= n || tier[e[0]] >= tier[e[1]] {
			return nil, fmt.Errorf("report: edge %d -> %d does not go from an earlier tier to a later one", e[0], e[1])
		}
	}
	for _, e := range links {
		if e[0] < 0 || e[0] >= n || e[1] < 0 || e[1] >= n || e[0] == e[1] || tier[e[0]] != tier[e[1]] {
			return nil, fmt.Errorf("report: link %d — %d does not join two nodes of one tier", e[0], e[1])
		}
	}

	// Box heights from the number of ports on each side.
	in := make([]int, n)
	out := make([]int, n)
	for _, e := range edges {
		out[e[0]]++
		in[e[1]]++
	}
	for _, e := range links {
		out[e[0]]++
		out[e[1]]++
	}
	heights := make([]float64, n)
	for i := range heights {
		k := max(in[i], out[i])
		heights[i] = math.Max(boxHeight, float64(k-1)*portPitch+2*portInset)
	}

	g := newLayered(tier, cols, edges, heights)
	items, col, chains, pred, succ := g.items, g.col, g.chains, g.pred, g.succ
	layers := reduceCrossings(g.layers, pred, succ)
	pos := make([]int, len(items))
	for _, m := range layers {
		for r, i := range m {
			pos[i] = r
		}
	}

	y := placeHeights(layers, items, pred, succ)

	l := &Layout{Column: slices.Clone(tier), Rank: make([]int, n), Pos: make([]Point, n), Heights: heights, BoxWidth: boxWidth}
	for _, m := range layers {
		r := 0
		for _, i := range m {
			if items[i].node >= 0 {
				l.Rank[i] = r
				r++
			}
		}
	}
	for i := range n {
		l.Pos[i] = Point{colLeft(tier[i]) + boxWidth/2, y[i]}
	}

	// Ports: each side's ends sorted by the height of their other end.
	type end struct {
		route, point int     // where to write the port
		other        float64 // height of the other end
		link         bool
	}
	left := make([][]end, n)
	right := make([][]end, n)
	l.Edges = make([]Route, len(edges))
	for k, chain := range chains {
		pts := make([]Point, 0, 2*len(chain)-2)
		pts = append(pts, Point{})
		for _, it := range chain[1 : len(chain)-1] {
			c := col[it]
			pts = append(pts, Point{colLeft(c) - arrowGap, y[it]}, Point{colLeft(c) + boxWidth, y[it]})
		}
		pts = append(pts, Point{})
		l.Edges[k] = Route{Points: pts}
		a, b := chain[0], chain[len(chain)-1]
		right[a] = append(right[a], end{route: k, point: 0, other: y[chain[1]]})
		left[b] = append(left[b], end{route: k, point: len(pts) - 1, other: y[chain[len(chain)-2]]})
	}
	l.Links = make([]Route, len(links))
	for k, e := range links {
		l.Links[k] = Route{Points: make([]Point, 2), Reach: linkReach(y[e[0]], y[e[1]])}
		right[e[0]] = append(right[e[0]], end{route: k, point: 0, other: y[e[1]], link: true})
		right[e[1]] = append(right[e[1]], end{route: k, point: 1, other: y[e[0]], link: true})
	}
	for i := range n {
		for side, ends := range [][]end{left[i], right[i]} {
			slices.SortStableFunc(ends, func(a, b end) int {
				switch {
				case a.other < b.other:
					return -1
				case a.other > b.other:
					return 1
				}
				return 0
			})
			x := colLeft(tier[i]) - arrowGap
			if side == 1 {
				x = colLeft(tier[i]) + boxWidth
			}
			ys := ports(y[i], heights[i], len(ends))
			for j, e := range ends {
				if e.link {
					l.Links[e.route].Points[e.point] = Point{x, ys[j]}
				} else {
					l.Edges[e.route].Points[e.point] = Point{x, ys[j]}
				}
			}
		}
	}

	l.Crossings = countCrossings(layers, pos, succ)
	l.Width = 2*margin + float64(cols)*boxWidth + float64(max(cols-1, 0))*colGap
	var reach float64
	for k, e := range links {
		if tier[e[0]] == cols-1 {
			reach = math.Max(reach, 0.75*l.Links[k].Reach)
		}
	}
	l.Width += reach
	l.Height = labelRoom + 2*margin
	for i, it := range items {
		half := math.Max(it.half, lanePitch/2)
		l.Height = math.Max(l.Height, y[i]+half+margin)
	}
	return l, nil
}

// colLeft returns the x of the left side of column c's boxes.
func colLeft(c int) float64 { return margin + float64(c)*(boxWidth+colGap) }

// ports returns k heights spread evenly about the centre cy of a box of
// height h, no closer than portPitch and no wider apart than portWide.
func ports(cy, h float64, k int) []float64 {
	if k == 0 {
		return nil
	}
	step := 0.0
	if k > 1 {
		step = math.Min(portWide, (h-2*portInset)/float64(k-1))
	}
	ys := make([]float64, k)
	for j := range ys {
		ys[j] = cy + (float64(j)-float64(k-1)/2)*step
	}
	return ys
}

// linkReach returns how far a same-tier link between heights y1 and y2
// reaches to the right: further for distant ends, so the loop clears the
// boxes between them.
func linkReach(y1, y2 float64) float64 {
	return math.Min(0.9*colGap, 32+math.Abs(y2-y1)/5)
}

// layered is the proper layered graph of a drawing: one item per node and
// one per lane, segments joining items in neighbouring columns, and each
// column's items in order.
type layered struct {
	items      []item
	col        []int   // column of each item
	chains     [][]int // items along each edge
	pred, succ [][]int // items joined in the previous and next columns
	layers     [][]int // items of each column, top to bottom
}

// newLayered returns the layered graph of a drawing in its starting order:
// boxes in index order stacked and centred as in a plain drawing, and each
// lane where the straight segment between its edge's ends crosses the
// column.
func newLayered(tier []int, cols int, edges [][2]int, heights []float64) *layered {
	n := len(tier)
	g := &layered{items: make([]item, 0, n), chains: make([][]int, len(edges))}
	for i := range n {
		g.items = append(g.items, item{node: i, edge: -1, half: heights[i] / 2})
		g.col = append(g.col, tier[i])
	}
	for k, e := range edges {
		chain := []int{e[0]}
		for c := tier[e[0]] + 1; c < tier[e[1]]; c++ {
			chain = append(chain, len(g.items))
			g.items = append(g.items, item{node: -1, edge: k})
			g.col = append(g.col, c)
		}
		g.chains[k] = append(chain, e[1])
	}
	g.pred = make([][]int, len(g.items))
	g.succ = make([][]int, len(g.items))
	for _, chain := range g.chains {
		for j := 1; j < len(chain); j++ {
			g.succ[chain[j-1]] = append(g.succ[chain[j-1]], chain[j])
			g.pred[chain[j]] = append(g.pred[chain[j]], chain[j-1])
		}
	}

	stack := make([]float64, cols)
	y := make([]float64, len(g.items))
	for i := range n {
		y[i] = stack[tier[i]] + heights[i]/2
		stack[tier[i]] += heights[i] + rowGap
	}
	tallest := slices.Max(append(stack, 0))
	for i := range n {
		y[i] += (tallest - stack[tier[i]]) / 2
	}
	for _, chain := range g.chains {
		a, b := chain[0], chain[len(chain)-1]
		span := float64(tier[b] - tier[a])
		for j, it := range chain[1 : len(chain)-1] {
			f := float64(j+1) / span
			y[it] = (1-f)*y[a] + f*y[b]
		}
	}
	g.layers = make([][]int, cols)
	for i := range g.items {
		g.layers[g.col[i]] = append(g.layers[g.col[i]], i)
	}
	for _, m := range g.layers {
		slices.SortStableFunc(m, func(a, b int) int {
			switch {
			case y[a] < y[b]:
				return -1
			case y[a] > y[b]:
				return 1
			}
			return a - b
		})
	}
	return g
}

// crossings returns the number of crossings of g in its current order.
func (g *layered) crossings() int {
	pos := make([]int, len(g.items))
	for _, m := range g.layers {
		for r, i := range m {
			pos[i] = r
		}
	}
	return countCrossings(g.layers, pos, g.succ)
}

// reduceCrossings reorders the columns by barycentre sweeps and returns
// the ordering with the fewest crossings seen, layers itself included.
func reduceCrossings(layers [][]int, pred, succ [][]int) [][]int {
	pos := make([]int, len(pred))
	setPos := func() {
		for _, m := range layers {
			for r, i := range m {
				pos[i] = r
			}
		}
	}
	setPos()
	best := countCrossings(layers, pos, succ)
	bestOrder := cloneLayers(layers)
	// relative is a slot's height in its column, in [0, 1].
	relative := func(i int, m []int) float64 {
		if len(m) == 1 {
			return 0.5
		}
		return float64(pos[i]) / float64(len(m)-1)
	}
	key := make([]float64, len(pred))
	cols := len(layers)
	for sweep := 0; sweep < 24 && best > 0; sweep++ {
		forward := sweep%2 == 0
		for k := 1; k < cols; k++ {
			c, nb, from := k, pred, k-1
			if !forward {
				c, nb, from = cols-1-k, succ, cols-k
			}
			m := layers[c]
			for _, i := range m {
				if len(nb[i]) == 0 {
					key[i] = relative(i, m)
					continue
				}
				var s float64
				for _, j := range nb[i] {
					s += relative(j, layers[from])
				}
				key[i] = s / float64(len(nb[i]))
			}
			slices.SortStableFunc(m, func(a, b int) int {
				switch {
				case key[a] < key[b]:
					return -1
				case key[a] > key[b]:
					return 1
				}
				return 0
			})
			for r, i := range m {
				pos[i] = r
			}
		}
		if x := countCrossings(layers, pos, succ); x < best {
			best = x
			bestOrder = cloneLayers(layers)
		}
	}
	return bestOrder
}

// countCrossings counts pairs of segments between neighbouring columns
// whose ends are in opposite orders. Segments sharing an end never cross:
// their ports are sorted by their other ends. Because every segment in a
// gap is drawn as the same curve shape between the same two verticals,
// two of them cross exactly when their ends are in opposite orders, so
// this is the number of crossings in the drawing. It counts inversions
// with a Fenwick tree, in O(s log s) for s segments in a gap.
func countCrossings(layers [][]int, pos []int, succ [][]int) int {
	total := 0
	type seg struct{ a, b int }
	var segs []seg
	var tree []int
	for c, m := range layers {
		segs = segs[:0]
		for _, i := range m {
			for _, j := range succ[i] {
				segs = append(segs, seg{pos[i], pos[j]})
			}
		}
		if len(segs) < 2 {
			continue
		}
		slices.SortFunc(segs, func(s, t seg) int {
			if s.a != t.a {
				return s.a - t.a
			}
			return s.b - t.b
		})
		// Count earlier segments (smaller a, or equal a and so smaller or
		// equal b) whose b is strictly greater.
		size := len(layers[c+1])
		tree = slices.Grow(tree[:0], size+1)[:size+1]
		clear(tree)
		for k, s := range segs {
			atMost := 0
			for i := s.b + 1; i > 0; i -= i & -i {
				atMost += tree[i]
			}
			total += k - atMost
			for i := s.b + 1; i <= size; i += i & -i {
				tree[i]++
			}
		}
	}
	return total
}

func cloneLayers(m [][]int) [][]int {
	out := make([][]int, len(m))
	for i, x := range m {
		out[i] = slices.Clone(x)
	}
	return out
}

// placeHeights returns the height of every slot's centre, the top box's
// top at labelRoom + margin.
func placeHeights(layers [][]int, items []item, pred, succ [][]int) []float64 {
	y := make([]float64, len(items))
	gapAfter := func(a, b int) float64 {
		ha, hb := items[a].half, items[b].half
		switch {
		case items[a].node >= 0 && items[b].node >= 0:
			return ha + rowGap + hb
		case items[a].node >= 0 || items[b].node >= 0:
			return ha + hb + laneClear
		}
		return lanePitch
	}
	// Start stacked and centred on the tallest column.
	var tallest float64
	for _, m := range layers {
		var s float64
		for r, i := range m {
			if r > 0 {
				s += gapAfter(m[r-1], i)
			}
			y[i] = s
		}
		if len(m) > 0 {
			tallest = math.Max(tallest, s)
		}
	}
	for _, m := range layers {
		if len(m) == 0 {
			continue
		}
		shift := (tallest - y[m[len(m)-1]]) / 2
		for _, i := range m {
			y[i] += shift
		}
	}
	// weight of a segment: 1 between boxes, 2 from a box to a lane, 8
	// between lanes, as in the priority of Gansner et al. (1993), so long
	// edges straighten first.
	weight := func(a, b int) float64 {
		w := 1.0
		if items[a].node < 0 {
			w *= 2
		}
		if items[b].node < 0 {
			w *= 2
		}
		if w == 4 {
			w = 8
		}
		return w
	}
	var want, w, gap, got []float64
	for sweep := range 40 {
		for k := range layers {
			c := k
			if sweep%2 == 1 {
				c = len(layers) - 1 - k
			}
			m := layers[c]
			if len(m) == 0 {
				continue
			}
			want, w, gap = want[:0], w[:0], gap[:0]
			for r, i := range m {
				var sw, sy float64
				for _, j := range pred[i] {
					sw += weight(j, i)
					sy += weight(j, i) * y[j]
				}
				for _, j := range succ[i] {
					sw += weight(i, j)
					sy += weight(i, j) * y[j]
				}
				if sw == 0 {
					want = append(want, y[i])
					w = append(w, 1e-3)
				} else {
					want = append(want, sy/sw)
					w = append(w, sw)
				}
				if r > 0 {
					gap = append(gap, gapAfter(m[r-1], i))
				}
			}
			got = spread(got[:0], want, w, gap)
			for r, i := range m {
				y[i] = got[r]
			}
		}
	}
	top := math.Inf(1)
	for i, it := range items {
		top = math.Min(top, y[i]-math.Max(it.half, lanePitch/2))
	}
	for i := range y {
		y[i] += labelRoom + margin - top
	}
	return y
}

// spread appends to dst the positions y minimising Σ w[i]·(y[i] − want[i])²
// subject to y[i+1] − y[i] ≥ gap[i], found by the pool-adjacent-violators
// algorithm (Ayer et al. 1955) on y[i] minus the sum of the gaps before i.
// Weights must be positive.
func spread(dst, want, w, gap []float64) []float64 {
	type block struct{ w, wz float64 }
	off := make([]float64, len(want))
	for i := 1; i < len(want); i++ {
		off[i] = off[i-1] + gap[i-1]
	}
	blocks := make([]block, 0, len(want))
	sizes := make([]int, 0, len(want))
	for i := range want {
		blocks = append(blocks, block{w[i], w[i] * (want[i] - off[i])})
		sizes = append(sizes, 1)
		for k := len(blocks) - 1; k > 0 && blocks[k-1].wz/blocks[k-1].w > blocks[k].wz/blocks[k].w; k-- {
			blocks[k-1].w += blocks[k].w
			blocks[k-1].wz += blocks[k].wz
			sizes[k-1] += sizes[k]
			blocks, sizes = blocks[:k], sizes[:k]
		}
	}
	i := 0
	for k, b := range blocks {
		z := b.wz / b.w
		for range sizes[k] {
			dst = append(dst, z+off[i])
			i++
		}
	}
	return dst
}

// Path returns the route as SVG path data.
func (r Route) Path() string {
	p := r.Points
	if len(p) < 2 {
		return ""
	}
	b := make([]byte, 0, 40*len(p))
	f := func(v float64) []byte { return strconv.AppendFloat(nil, math.Round(v*10)/10, 'f', -1, 64) }
	pt := func(cmd byte, q Point) {
		b = append(b, cmd)
		b = append(b, f(q.X)...)
		b = append(b, ',')
		b = append(b, f(q.Y)...)
	}
	pt('M', p[0])
	if r.Reach > 0 {
		pt('C', Point{p[0].X + r.Reach, p[0].Y})
		pt(' ', Point{p[1].X + r.Reach, p[1].Y})
		pt(' ', p[1])
		return string(b)
	}
	for k := 1; k < len(p); k++ {
		a, c := p[k-1], p[k]
		if k%2 == 0 {
			pt('L', c) // through a column, along a lane
			continue
		}
		dx := (c.X - a.X) / 2
		pt('C', Point{a.X + dx, a.Y})
		pt(' ', Point{c.X - dx, c.Y})
		pt(' ', c)
	}
	return string(b)
}
