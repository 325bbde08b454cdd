package lasso

import (
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
)

// crossBlock is the number of rows gathered at a time when the residual
// engine forms cross-products for a Newton step.
const crossBlock = 256

// crossCache holds the curvature Σ h·x̃_a·x̃_b of the standardised
// predictors among a growing list of predictors, and Σ h·x̃_a, their
// curvature with the intercept, at the working weights of one version.
// Gaussian weights never change, so a Gaussian fit keeps one cache along
// the whole path and forms each entry once; other families start again at
// each reweighting.
type crossCache struct {
	version int
	idx     []int     // predictors held
	at      []int     // at[j] = position of predictor j in idx, or −1
	m       []float64 // len(idx)² curvatures, row-major
	b0      []float64 // curvature with the intercept
	hx      []float64 // Σ h·u of the working column u of each held predictor
	// Buffers.
	z, root, prod []float64
	cursor        []int
}

// missing returns how many of active the cache lacks at version v.
func (c *crossCache) missing(active []int, v int) int {
	if c.at == nil || c.version != v {
		return len(active)
	}
	miss := 0
	for _, j := range active {
		if c.at[j] < 0 {
			miss++
		}
	}
	return miss
}

// crossShare is the cost of one multiply-add of the blocked products that
// form cross-products, as a share of the per-row cost of a coordinate
// update (a pass for the gradient and one for the residuals): measured at
// about a quarter for the general product (less for the symmetric one) on
// the project's 2-core machine with gonum's pure-Go BLAS, n = 10,000,
// k = 80.
const crossShare = 0.25

// newtonCost is the cost of a Newton step in sweeps over active: the
// missing cross-products, n multiply-adds per entry (half as many when
// every entry is new, as the product is then symmetric), and a
// factorisation of k³/3, against k coordinate updates of n rows each,
// plus a sweep for the gradient and the step.
func (e *residualEngine) newtonCost(active []int) float64 {
	k := float64(len(active))
	miss := float64(e.cross.missing(active, e.version))
	held := float64(len(e.cross.idx))
	if e.cross.version != e.version {
		held = 0
	}
	entries := miss * (held + miss + 1)
	if held == 0 {
		entries = (miss + 1) * (miss + 2) / 2
	}
	n := float64(e.n)
	return 1 + crossShare*(n*entries+k*k*k/3)/(n*k)
}

// newton takes a Newton step on the coefficients of active and, for
// families other than Gaussian with an intercept, the intercept (see
// newtoner).
func (e *residualEngine) newton(lam float64, active []int) (moved, full bool) {
	k := len(active)
	if k == 0 {
		return false, false
	}
	withB0 := e.r.intercept && !e.r.gaussian
	c := &e.cross
	e.crossProducts(active)
	stride := len(c.idx)
	dim := k
	if withB0 {
		dim++
	}
	st := &e.step
	st.reset(dim)
	for a, j := range active {
		row := c.m[c.at[j]*stride:]
		for b, i := range active {
			st.h[a*dim+b] = row[c.at[i]]
		}
		l1, l2 := penaltyTerms(lam, e.r.a, e.v[j])
		st.h[a*dim+a] += l2
		_, g := e.squareGrad(j)
		st.r[a] = newtonRHS(g, e.beta[j], l1, l2)
		if withB0 {
			st.h[a*dim+k] = c.b0[c.at[j]]
			st.h[k*dim+a] = c.b0[c.at[j]]
		}
	}
	if withB0 {
		st.h[k*dim+k] = e.sumH
		st.r[k] = e.sumQ + e.alpha*e.sumH
	}
	if !st.solve() {
		return false, false
	}
	t, hit := st.fraction(e.beta, active)
	for a, j := range active {
		d := t * st.dx[a]
		if a == hit {
			d = -e.beta[j]
		}
		if d != 0 {
			e.beta[j] += d
			e.shift(j, d)
		}
	}
	if withB0 {
		d := t * st.dx[k]
		e.b0 += d
		e.alpha -= d
		e.stamp++
	}
	return true, hit < 0
}

// crossProducts makes the cache hold every predictor of active at the
// current weights. New entries come from one pass over the rows in blocks:
// the working columns of the new predictors times those of all held ones
// and the ones column, weighted by h, as one matrix product per block.
func (e *residualEngine) crossProducts(active []int) {
	c := &e.cross
	p := len(e.beta)
	if c.at == nil {
		c.at = make([]int, p)
		for j := range c.at {
			c.at[j] = -1
		}
		c.version = e.version
	}
	if c.version != e.version {
		for _, j := range c.idx {
			c.at[j] = -1
		}
		c.idx, c.m, c.b0, c.hx = c.idx[:0], c.m[:0], c.b0[:0], c.hx[:0]
		c.version = e.version
	}
	old := len(c.idx)
	for _, j := range active {
		if c.at[j] < 0 {
			c.at[j] = len(c.idx)
			c.idx = append(c.idx, j)
		}
	}
	all := len(c.idx)
	nNew := all - old
	if nNew == 0 {
		return
	}
	// raw[a][b] = Σ h·u_a·u_b for new a and every b, the ones column last.
	cols := all + 1
	c.prod = grow(c.prod, cols*cols)
	clear(c.prod)
	c.z = grow(c.z, cols*crossBlock)
	c.root = grow(c.root, crossBlock)
	root := c.root
	c.cursor = append(c.cursor[:0], make([]int, all)...)
	// With nothing held, every entry is new and the product symmetric:
	// one rank-k update per block forms half of it.
	sym := old == 0
	for t0 := 0; t0 < e.n; t0 += crossBlock {
		nb := min(crossBlock, e.n-t0)
		for t := range nb {
			root[t] = math.Sqrt(e.h[t0+t])
		}
		for a, j := range c.idx {
			e.gatherRoot(c.z[a*crossBlock:a*crossBlock+nb], j, t0, root[:nb], &c.cursor[a])
		}
		copy(c.z[all*crossBlock:all*crossBlock+nb], root[:nb])
		zAll := blas64.General{Rows: cols, Cols: nb, Stride: crossBlock, Data: c.z}
		if sym {
			blas64.Syrk(blas.NoTrans, 1, zAll, 1, blas64.Symmetric{N: cols, Stride: cols, Data: c.prod, Uplo: blas.Upper})
			continue
		}
		zNew := blas64.General{Rows: nNew, Cols: nb, Stride: crossBlock, Data: c.z[old*crossBlock:]}
		blas64.Gemm(blas.NoTrans, blas.Trans, 1, zNew, zAll, 1, blas64.General{Rows: nNew, Cols: cols, Stride: cols, Data: c.prod})
	}
	if sym {
		// Complete the lower triangle, which the centring below reads.
		for a := range cols {
			for b := range a {
				c.prod[a*cols+b] = c.prod[b*cols+a]
			}
		}
	}
	// Centre and scale: Σ h x̃_a x̃_b = (Σ h u_a u_b − m_a·Σ h u_b − m_b·Σ h u_a + m_a m_b·Σ h)/(s_a s_b).
	for a := old; a < all; a++ {
		c.hx = append(c.hx, c.prod[(a-old)*cols+all])
	}
	m := make([]float64, all*all)
	for a := 0; a < old; a++ {
		copy(m[a*all:a*all+old], c.m[a*old:a*old+old])
	}
	for a := old; a < all; a++ {
		ja := c.idx[a]
		ma, sa := e.center[ja], e.scale[ja]
		raw := c.prod[(a-old)*cols:]
		for b := 0; b < all; b++ {
			jb := c.idx[b]
			mb, sb := e.center[jb], e.scale[jb]
			v := (raw[b] - ma*c.hx[b] - mb*c.hx[a] + ma*mb*e.sumH) / (sa * sb)
			m[a*all+b] = v
			m[b*all+a] = v
		}
		c.b0 = append(c.b0, (c.hx[a]-ma*e.sumH)/sa)
	}
	c.m = m
}

// gatherRoot writes √h_t·u_j(t) for the rows t0, t0+1, … of a block into
// dst, where u_j is the working column of predictor j: the column itself,
// or for a 0/1 predictor the indicator of its listed positions (from
// *cur on, which it advances).
func (e *residualEngine) gatherRoot(dst []float64, j, t0 int, root []float64, cur *int) {
	switch {
	case e.isBin[j]:
		clear(dst)
		ones := e.ones[j]
		end := int32(t0 + len(dst))
		k := *cur
		for ; k < len(ones) && ones[k] < end; k++ {
			t := int(ones[k]) - t0
			dst[t] = root[t]
		}
		*cur = k
	case e.rows == nil:
		for t, x := range e.cols[j][t0 : t0+len(dst)] {
			dst[t] = root[t] * x
		}
	default:
		c := e.cols[j]
		for t, i := range e.rows[t0 : t0+len(dst)] {
			dst[t] = root[t] * c[i]
		}
	}
}
