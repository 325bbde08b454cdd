package lasso

import (
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"
)

// Coordinate descent converges linearly, and slowly when predictors are
// collinear: the rate is set by the smallest curvature of the objective.
// Once the signs of the active coefficients have settled, the objective
// restricted to those signs is smooth, and for the weighted least-squares
// problems the solver works on it is quadratic: one Newton step on the
// active set,
//
//	(H_AA + diag(l2)) Δ = r_A,   r_j = g_j − l2·β_j − l1·sign(β_j),
//
// lands on its minimum. When a coefficient would cross zero on the way,
// the step stops where the first one reaches zero and leaves it there, as
// in the active-set method of Osborne, Presnell & Turlach (2000, IMA
// Journal of Numerical Analysis 20:389–403), whose sign-fixed system this
// is. After a full step the exact KKT residual decides whether descend is
// done; coordinate descent carries on otherwise.
//
// Forming H_AA can cost more than a sweep, so descend tries a step only
// once the sweeps since the signs last changed, or since the last try,
// have cost as much as the step (see newtonCost): a problem that
// coordinate descent solves quickly never pays for one, and one that it
// solves slowly pays at most twice what the step alone would have cost.
// A step that costs no more than two sweeps is also tried from the warm
// start, where along a path the signs are usually already right.

// newtoner is an engine that can take a Newton step on the active set.
type newtoner interface {
	// newtonCost returns the cost of a newton call on active, in
	// sweeps over active.
	newtonCost(active []int) float64
	// newton takes a Newton step on the coefficients of active, all
	// non-zero (and, for engines that sweep it, the intercept), at
	// penalty lam. It reports whether it moved and whether it took the
	// full step rather than stopping where a coefficient reached zero.
	newton(lam float64, active []int) (moved, full bool)
	// residual returns the largest KKT residual over set (and the
	// intercept, for engines that sweep it), each scaled by 1/√h_j.
	residual(lam float64, set []int) float64
}

// activeStep holds a Newton system on the active set and its buffers.
type activeStep struct {
	k  int
	h  []float64 // k×k curvature with l2 on the diagonal, both triangles
	r  []float64 // right-hand side r_A
	dx []float64 // the step
	lu []float64 // factor
}

// reset sizes the system for k coordinates and zeroes it.
func (s *activeStep) reset(k int) {
	s.k = k
	s.h = grow(s.h, k*k)
	s.r = grow(s.r, k)
	s.dx = grow(s.dx, k)
	s.lu = grow(s.lu, k*k)
	clear(s.h)
	clear(s.r)
}

// solve solves the system into s.dx and reports whether the matrix is
// positive definite and the step decreases the quadratic model
// −r·Δ + ½·Δ·H·Δ.
func (s *activeStep) solve() bool {
	k := s.k
	copy(s.lu, s.h)
	t, ok := lapack64.Potrf(blas64.Symmetric{N: k, Stride: k, Data: s.lu, Uplo: blas.Upper})
	if !ok {
		return false
	}
	copy(s.dx, s.r)
	lapack64.Potrs(t, blas64.General{Rows: k, Cols: 1, Stride: 1, Data: s.dx})
	var change float64
	for a, d := range s.dx {
		change += d * (dot(s.h[a*k:a*k+k], s.dx)/2 - s.r[a])
	}
	return change <= 0
}

// fraction returns the largest t ≤ 1 for which beta + t·dx keeps the sign
// of beta over active, and the position in active of the coefficient that
// reaches zero at t (−1 when none does). Along the segment the objective
// restricted to those signs is the quadratic the step minimises, so it
// decreases all the way to t.
func (s *activeStep) fraction(beta []float64, active []int) (float64, int) {
	t, hit := 1.0, -1
	for a, j := range active {
		b, d := beta[j], s.dx[a]
		if nb := b + d; nb == 0 || (nb > 0) != (b > 0) {
			if f := -b / d; hit < 0 || f < t {
				t, hit = f, a
			}
		}
	}
	return t, hit
}

// newtonRHS returns r_j = g − l2·b − l1·sign(b) of a non-zero coefficient.
func newtonRHS(g, b, l1, l2 float64) float64 {
	return g - l2*b - math.Copysign(l1, b)
}

func grow(s []float64, n int) []float64 {
	if cap(s) < n {
		return make([]float64, n)
	}
	return s[:n]
}
