package lasso

// The loops over a 0/1 predictor's listed positions carry most of a
// binary fit's coordinate work. Sums keep four running totals, so that
// consecutive additions do not wait on each other; updates handle four
// positions at a time, loading before storing. Positions within a list
// are distinct.

// sumAt returns Σ v[t] over the positions t in at.
func sumAt(v []float64, at []int32) float64 {
	var s0, s1, s2, s3 float64
	k := 0
	for ; k+4 <= len(at); k += 4 {
		a := at[k : k+4 : k+4]
		s0 += v[a[0]]
		s1 += v[a[1]]
		s2 += v[a[2]]
		s3 += v[a[3]]
	}
	for ; k < len(at); k++ {
		s0 += v[at[k]]
	}
	return (s0 + s1) + (s2 + s3)
}

// sumAt2 returns Σ u[t] and Σ v[t] over the positions t in at.
func sumAt2(u, v []float64, at []int32) (float64, float64) {
	var u0, u1, u2, u3, v0, v1, v2, v3 float64
	k := 0
	for ; k+4 <= len(at); k += 4 {
		a := at[k : k+4 : k+4]
		u0 += u[a[0]]
		v0 += v[a[0]]
		u1 += u[a[1]]
		v1 += v[a[1]]
		u2 += u[a[2]]
		v2 += v[a[2]]
		u3 += u[a[3]]
		v3 += v[a[3]]
	}
	for ; k < len(at); k++ {
		u0 += u[at[k]]
		v0 += v[at[k]]
	}
	return (u0 + u1) + (u2 + u3), (v0 + v1) + (v2 + v3)
}

// subScaledAt sets dst[t] −= f·v[t] at the positions t in at.
func subScaledAt(dst, v []float64, at []int32, f float64) {
	k := 0
	for ; k+4 <= len(at); k += 4 {
		a := at[k : k+4 : k+4]
		t0, t1, t2, t3 := a[0], a[1], a[2], a[3]
		v0, v1, v2, v3 := v[t0], v[t1], v[t2], v[t3]
		dst[t0] -= f * v0
		dst[t1] -= f * v1
		dst[t2] -= f * v2
		dst[t3] -= f * v3
	}
	for ; k < len(at); k++ {
		dst[at[k]] -= f * v[at[k]]
	}
}

// addAt adds f to dst[t] at the positions t in at.
func addAt(dst []float64, at []int32, f float64) {
	k := 0
	for ; k+4 <= len(at); k += 4 {
		a := at[k : k+4 : k+4]
		dst[a[0]] += f
		dst[a[1]] += f
		dst[a[2]] += f
		dst[a[3]] += f
	}
	for ; k < len(at); k++ {
		dst[at[k]] += f
	}
}
