package lasso

import "math"

// The binomial working weights need one exponential per row per
// reweighting step and the recorded deviance one logarithm per row per
// penalty; together they dominated binary fits. expNonPositive and
// log1pUnit are table-driven versions for the arguments that occur
// there, accurate to a few units in the last place.

const (
	expBits  = 6
	expTable = 1 << expBits
	logBits  = 7
	logTable = 1 << logBits
)

var (
	// exp2Frac[i] = 2^(i/64).
	exp2Frac [expTable]float64
	// logInv[i] ≈ 1/c_i for the centre c_i of the i-th of 128 equal
	// subintervals of [1, 2) (c_0 = 1, so that small arguments suffer no
	// cancellation), and logOff[i] = −log(logInv[i]) of the rounded
	// value, so that log(u) = logOff[i] + log(u·logInv[i]) holds exactly.
	logInv [logTable]float64
	logOff [logTable]float64
)

func init() {
	for i := range exp2Frac {
		exp2Frac[i] = math.Exp2(float64(i) / expTable)
	}
	logInv[0], logOff[0] = 1, 0
	for i := 1; i < logTable; i++ {
		c := 1 + (float64(i)+0.5)/logTable
		logInv[i] = 1 / c
		logOff[i] = -math.Log(logInv[i])
	}
}

const (
	expShift = 0x1.8p52 // adding it rounds to an integer held in the low bits
	invLn2N  = expTable / math.Ln2
	// ln2/64 split so that k·ln2HiN is exact for |k| < 2^21 (the split
	// of the standard library's exp).
	ln2HiN = 6.93147180369123816490e-01 / expTable
	ln2LoN = 1.90821492927058770002e-10 / expTable
)

// expNonPositive returns e^x for x ≤ 0 (NaN for NaN).
func expNonPositive(x float64) float64 {
	var v [1]float64
	expNegAbs(v[:], []float64{-x})
	return v[0]
}

// expNegAbs sets dst[i] = e^−|x[i]|. The loop is written out here rather
// than calling a scalar function so that the processor overlaps the
// independent rows.
func expNegAbs(dst, x []float64) {
	dst = dst[:len(x)]
	for i, v := range x {
		a := -math.Abs(v)
		if !(a > -700) {
			dst[i] = math.Exp(a)
			continue
		}
		kd := a*invLn2N + expShift
		k := int64(math.Float64bits(kd) - math.Float64bits(expShift))
		kd -= expShift
		r := a - kd*ln2HiN - kd*ln2LoN
		// |r| ≤ ln2/128 ≈ 0.0054, so degree 6 leaves a relative error
		// below 1e-19.
		r2 := r * r
		p := r + r2*(0.5+r*(1.0/6+r*(1.0/24+r*(1.0/120+r*(1.0/720)))))
		// 2^(k/64) = 2^(k>>6)·2^((k&63)/64); the exponent is added to
		// the table entry's bits (k>>6 ≥ −1011 keeps the result normal).
		t := exp2Frac[k&(expTable-1)]
		s := math.Float64frombits(math.Float64bits(t) + uint64((k>>expBits)<<52))
		dst[i] = s + s*p
	}
}

// log1pUnit returns log(1+x) for 0 ≤ x ≤ 1.
func log1pUnit(x float64) float64 {
	u := 1 + x
	if u >= 2 {
		return math.Ln2
	}
	i := (math.Float64bits(u) >> (52 - logBits)) & (logTable - 1)
	inv := logInv[i]
	// c ≈ (x − (u − 1))/u corrects for the rounding of 1 + x; it is below
	// one unit in the last place, so inv serves as 1/u.
	c := (x - (u - 1)) * inv
	r := math.FMA(u, inv, -1)
	// |r| < 1/128, so degree 7 leaves a relative error below 3e-17.
	s := r * (1 - r*(1.0/2-r*(1.0/3-r*(1.0/4-r*(1.0/5-r*(1.0/6-r*(1.0/7)))))))
	return logOff[i] + s + c
}

// halfDevianceSum returns Σ w·(log1p(ex) + max(η, 0) − y·η), half the
// weighted binomial deviance when ex = e^−|η|, with log1pUnit written out
// so that the processor overlaps the rows.
func halfDevianceSum(ex, eta, y, w []float64) float64 {
	eta, y, w = eta[:len(ex)], y[:len(ex)], w[:len(ex)]
	var sum float64
	for t, x := range ex {
		u := 1 + x
		var l float64
		if u >= 2 {
			l = math.Ln2
		} else {
			i := (math.Float64bits(u) >> (52 - logBits)) & (logTable - 1)
			inv := logInv[i]
			c := (x - (u - 1)) * inv
			r := math.FMA(u, inv, -1)
			l = logOff[i] + r*(1-r*(1.0/2-r*(1.0/3-r*(1.0/4-r*(1.0/5-r*(1.0/6-r*(1.0/7))))))) + c
		}
		e := eta[t]
		pos := math.Float64frombits(math.Float64bits(e) &^ uint64(int64(math.Float64bits(e))>>63))
		sum += w[t] * (l + pos - y[t]*e)
	}
	return sum
}
