package lasso

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
)

// Moments holds weighted sums of q variables taken about a fixed shift:
//
//	Weight   = Σ_i w_i
//	Sum[j]   = Σ_i w_i (x_ij − Shift[j])
//	Cross[j*q+k] = Σ_i w_i (x_ij − Shift[j]) (x_ik − Shift[k])
//
// They are the sufficient statistics of every Gaussian regression among the
// q variables, so one pass over the data serves every response, predictor
// subset and penalty. Moments over disjoint row sets with the same shift add
// and subtract exactly, which gives cross-validation training sets as a
// total minus a held-out fold. A shift near the mean keeps the centring
// numerically stable.
type Moments struct {
	Vars   int
	Weight float64
	Shift  []float64
	Sum    []float64
	Cross  []float64
}

// NewMoments returns zero moments of len(shift) variables about shift. The
// shift slice is copied.
func NewMoments(shift []float64) *Moments {
	q := len(shift)
	return &Moments{
		Vars:  q,
		Shift: append([]float64(nil), shift...),
		Sum:   make([]float64, q),
		Cross: make([]float64, q*q),
	}
}

// ColumnMeans returns the weighted mean of each column over rows (nil rows
// means every row; nil weights means ones). It is a good shift for
// NewMoments.
func ColumnMeans(cols [][]float64, weights []float64, rows []int) []float64 {
	means := make([]float64, len(cols))
	for j, c := range cols {
		var s, w float64
		forRows(len(c), rows, func(i int) {
			wi := 1.0
			if weights != nil {
				wi = weights[i]
			}
			s += wi * c[i]
			w += wi
		})
		if w > 0 {
			means[j] = s / w
		}
	}
	return means
}

func forRows(n int, rows []int, f func(i int)) {
	if rows == nil {
		for i := 0; i < n; i++ {
			f(i)
		}
		return
	}
	for _, i := range rows {
		f(i)
	}
}

// momentBlock is the number of rows gathered at a time by Accumulate, so
// that a block of every column stays in cache while the cross-products
// are formed.
const momentBlock = 512

// Accumulate adds the rows (nil means all) of cols, with weights (nil
// means ones), to m. cols must have m.Vars columns of equal length. The
// inputs are not modified. Its cost is about len(rows)·q²/2 multiply-adds.
func (m *Moments) Accumulate(cols [][]float64, weights []float64, rows []int) error {
	q := m.Vars
	if len(cols) != q {
		return fmt.Errorf("%w: %d columns for moments of %d variables", ErrLength, len(cols), q)
	}
	if q == 0 {
		return nil
	}
	n := len(cols[0])
	for j, c := range cols {
		if len(c) != n {
			return fmt.Errorf("%w: column %d has %d rows, column 0 has %d", ErrLength, j, len(c), n)
		}
	}
	if weights != nil && len(weights) != n {
		return fmt.Errorf("%w: %d weights for %d rows", ErrLength, len(weights), n)
	}
	total := n
	if rows != nil {
		total = len(rows)
		for _, i := range rows {
			if i < 0 || i >= n {
				return fmt.Errorf("%w: row %d of %d", ErrIndex, i, n)
			}
		}
	}
	// blk holds a block of shifted values, column-major; wblk the same
	// values times the weights.
	blk := make([]float64, q*momentBlock)
	rootW := make([]float64, momentBlock)
	wts := make([]float64, momentBlock)
	for start := 0; start < total; start += momentBlock {
		b := min(momentBlock, total-start)
		for t := 0; t < b; t++ {
			i := start + t
			if rows != nil {
				i = rows[i]
			}
			w := 1.0
			if weights != nil {
				w = weights[i]
			}
			wts[t] = w
			rootW[t] = math.Sqrt(w)
			m.Weight += w
		}
		for j, c := range cols {
			x := blk[j*momentBlock : j*momentBlock+b]
			sh := m.Shift[j]
			var s float64
			for t := range x {
				i := start + t
				if rows != nil {
					i = rows[i]
				}
				v := c[i] - sh
				s += v * wts[t]
				x[t] = v * rootW[t]
			}
			m.Sum[j] += s
		}
		// Cross += (√w∘X_blk)ᵀ(√w∘X_blk) for this block of rows: the block
		// is stored one column after another, which is the q × b
		// row-major matrix Xᵀ, so one symmetric rank-b update (gonum's
		// Dsyrk) forms the upper triangle.
		a := blas64.General{Rows: q, Cols: b, Stride: momentBlock, Data: blk}
		c := blas64.Symmetric{Uplo: blas.Upper, N: q, Stride: q, Data: m.Cross}
		blas64.Syrk(blas.NoTrans, 1, a, 1, c)
	}
	// Mirror the upper triangle.
	for j := 0; j < q; j++ {
		for k := 0; k < j; k++ {
			m.Cross[j*q+k] = m.Cross[k*q+j]
		}
	}
	return nil
}

// Add adds o to m. Both must have the same shift.
func (m *Moments) Add(o *Moments) error { return m.combine(o, 1) }

// Subtract subtracts o from m. Both must have the same shift.
func (m *Moments) Subtract(o *Moments) error { return m.combine(o, -1) }

func (m *Moments) combine(o *Moments, sign float64) error {
	if o.Vars != m.Vars {
		return fmt.Errorf("%w: moments of %d and %d variables", ErrLength, m.Vars, o.Vars)
	}
	for j, s := range o.Shift {
		if s != m.Shift[j] {
			return fmt.Errorf("%w: moments have different shifts at variable %d", ErrSettings, j)
		}
	}
	m.Weight += sign * o.Weight
	for j, v := range o.Sum {
		m.Sum[j] += sign * v
	}
	for j, v := range o.Cross {
		m.Cross[j] += sign * v
	}
	return nil
}

// Clone returns a deep copy of m.
func (m *Moments) Clone() *Moments {
	return &Moments{
		Vars:   m.Vars,
		Weight: m.Weight,
		Shift:  append([]float64(nil), m.Shift...),
		Sum:    append([]float64(nil), m.Sum...),
		Cross:  append([]float64(nil), m.Cross...),
	}
}

// Mean returns the weighted mean of variable j.
func (m *Moments) Mean(j int) float64 { return m.Shift[j] + m.Sum[j]/m.Weight }

// Covariance returns the weighted covariance of variables j and k with
// divisor Weight (the population form).
func (m *Moments) Covariance(j, k int) float64 {
	q := m.Vars
	return (m.Cross[j*q+k] - m.Sum[j]*m.Sum[k]/m.Weight) / m.Weight
}

// SecondMoment returns Σ w x_j x_k / Weight, the uncentred second moment.
func (m *Moments) SecondMoment(j, k int) float64 {
	q := m.Vars
	sj, sk := m.Shift[j], m.Shift[k]
	return (m.Cross[j*q+k] + sj*m.Sum[k] + sk*m.Sum[j] + m.Weight*sj*sk) / m.Weight
}

func dot(a, b []float64) float64 {
	b = b[:len(a)]
	var s0, s1, s2, s3 float64
	i := 0
	for ; i+4 <= len(a); i += 4 {
		s0 += a[i] * b[i]
		s1 += a[i+1] * b[i+1]
		s2 += a[i+2] * b[i+2]
		s3 += a[i+3] * b[i+3]
	}
	for ; i < len(a); i++ {
		s0 += a[i] * b[i]
	}
	return (s0 + s1) + (s2 + s3)
}

// isConstant reports whether a variance v of a variable with mean m is zero
// up to rounding.
func isConstant(v, m float64) bool {
	return v <= 0 || v <= 1e-26*m*m || math.IsNaN(v)
}

// momentSource is what the Gram engine reads: moments held in full, or
// the difference of two (a training set as a total minus a held-out fold)
// computed entry by entry when asked for.
type momentSource interface {
	weight() float64
	mean(j int) float64
	covariance(j, k int) float64
	secondMoment(j, k int) float64
	// momentRow sets dst[i] to the covariance (centred) or second
	// moment of variables k and vars[i].
	momentRow(dst []float64, k int, vars []int, centred bool)
	finite(vars []int) error
}

func (m *Moments) weight() float64               { return m.Weight }
func (m *Moments) mean(j int) float64            { return m.Mean(j) }
func (m *Moments) covariance(j, k int) float64   { return m.Covariance(j, k) }
func (m *Moments) secondMoment(j, k int) float64 { return m.SecondMoment(j, k) }
func (m *Moments) finite(vars []int) error       { return finiteBlock(m.Cross, nil, m.Vars, vars) }

func (m *Moments) momentRow(dst []float64, k int, vars []int, centred bool) {
	momentRow(dst, m.Cross[k*m.Vars:(k+1)*m.Vars], nil, m.Sum, nil, m.Shift, m.Weight, k, vars, centred)
}

// momentRow is momentRow of Moments for row a − b of the cross-products
// (b nil: a alone), with sums sa − sb.
func momentRow(dst, a, b, sa, sb, shift []float64, w float64, k int, vars []int, centred bool) {
	sum := func(j int) float64 {
		if sb == nil {
			return sa[j]
		}
		return sa[j] - sb[j]
	}
	sk := sum(k)
	dst = dst[:len(vars)]
	switch {
	case centred && b == nil:
		for i, j := range vars {
			dst[i] = (a[j] - sk*sa[j]/w) / w
		}
	case centred:
		for i, j := range vars {
			dst[i] = (a[j] - b[j] - sk*(sa[j]-sb[j])/w) / w
		}
	default:
		hk := shift[k]
		for i, j := range vars {
			c := a[j]
			if b != nil {
				c -= b[j]
			}
			dst[i] = (c + hk*sum(j) + shift[j]*sk + w*hk*shift[j]) / w
		}
	}
}

// momentsDiff is a − b without forming it.
type momentsDiff struct{ a, b *Moments }

func (d momentsDiff) weight() float64   { return d.a.Weight - d.b.Weight }
func (d momentsDiff) sum(j int) float64 { return d.a.Sum[j] - d.b.Sum[j] }
func (d momentsDiff) cross(j, k int) float64 {
	q := d.a.Vars
	return d.a.Cross[j*q+k] - d.b.Cross[j*q+k]
}
func (d momentsDiff) mean(j int) float64 { return d.a.Shift[j] + d.sum(j)/d.weight() }
func (d momentsDiff) covariance(j, k int) float64 {
	w := d.weight()
	return (d.cross(j, k) - d.sum(j)*d.sum(k)/w) / w
}
func (d momentsDiff) secondMoment(j, k int) float64 {
	w := d.weight()
	sj, sk := d.a.Shift[j], d.a.Shift[k]
	return (d.cross(j, k) + sj*d.sum(k) + sk*d.sum(j) + w*sj*sk) / w
}
func (d momentsDiff) momentRow(dst []float64, k int, vars []int, centred bool) {
	q := d.a.Vars
	momentRow(dst, d.a.Cross[k*q:(k+1)*q], d.b.Cross[k*q:(k+1)*q], d.a.Sum, d.b.Sum, d.a.Shift, d.weight(), k, vars, centred)
}

func (d momentsDiff) finite(vars []int) error {
	return finiteBlock(d.a.Cross, d.b.Cross, d.a.Vars, vars)
}

// finiteBlock checks the cross-products among vars for NaN and ±Inf.
func finiteBlock(a, b []float64, q int, vars []int) error {
	for _, j := range vars {
		for _, k := range vars {
			x := a[j*q+k]
			if b != nil {
				x -= b[j*q+k]
			}
			if math.IsNaN(x) || math.IsInf(x, 0) {
				return fmt.Errorf("%w: cross-product of variables %d and %d", ErrNotFinite, j, k)
			}
		}
	}
	return nil
}
