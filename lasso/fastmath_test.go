package lasso

import (
	"math"
	"math/rand/v2"
	"testing"
)

// The fast functions are checked against the standard library's (within
// one unit in the last place, per its documentation) on many points and
// at the ends of their ranges.
func TestFastMath(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	const tol = 6e-16 // relative; about three units in the last place
	var worstExp, worstLog float64
	check := func(x float64) {
		got, want := expNonPositive(x), math.Exp(x)
		if e := relErr(got, want); e > worstExp {
			worstExp = e
		}
	}
	for _, x := range []float64{0, -0.0, -1e-300, -1e-17, -math.Ln2, -1, -36, -699.9, -700, -701, -745, -746, -math.MaxFloat64, math.Inf(-1)} {
		check(x)
	}
	draws := 1_000_000
	if testing.Short() {
		draws = 100_000
	}
	for range draws {
		check(-rng.Float64() * 40)
		check(-rng.ExpFloat64() * 0.01)
		check(-rng.Float64() * 700)
	}
	checkLog := func(x float64) {
		got, want := log1pUnit(x), math.Log1p(x)
		if e := relErr(got, want); e > worstLog {
			worstLog = e
		}
	}
	for _, x := range []float64{0, 1e-300, 1e-17, 1.0 / 128, math.Nextafter(1.0/128, 0), 0.5, math.Nextafter(1, 0), 1} {
		checkLog(x)
	}
	for range draws {
		checkLog(rng.Float64())
		checkLog(rng.ExpFloat64() * 1e-3)
		checkLog(math.Exp(-rng.Float64() * 40))
	}
	if worstExp > tol || worstLog > tol {
		t.Errorf("largest relative errors: exp %.2g, log1p %.2g; want ≤ %.0g", worstExp, worstLog, tol)
	}
	if !math.IsNaN(expNonPositive(math.NaN())) {
		t.Error("exp(NaN) is not NaN")
	}
	t.Logf("largest relative errors: exp %.2g, log1p %.2g", worstExp, worstLog)
}

func relErr(got, want float64) float64 {
	if got == want {
		return 0
	}
	return math.Abs(got-want) / math.Abs(want)
}

var fastSink float64

func BenchmarkExpNonPositive(b *testing.B) {
	xs := benchArgs(-20, 0)
	var s float64
	for i := 0; b.Loop(); i++ {
		s += expNonPositive(xs[i&1023])
	}
	fastSink = s
}

func BenchmarkMathExp(b *testing.B) {
	xs := benchArgs(-20, 0)
	var s float64
	for i := 0; b.Loop(); i++ {
		s += math.Exp(xs[i&1023])
	}
	fastSink = s
}

func BenchmarkLog1pUnit(b *testing.B) {
	xs := benchArgs(0, 1)
	var s float64
	for i := 0; b.Loop(); i++ {
		s += log1pUnit(xs[i&1023])
	}
	fastSink = s
}

func BenchmarkMathLog1p(b *testing.B) {
	xs := benchArgs(0, 1)
	var s float64
	for i := 0; b.Loop(); i++ {
		s += math.Log1p(xs[i&1023])
	}
	fastSink = s
}

func benchArgs(lo, hi float64) []float64 {
	rng := rand.New(rand.NewPCG(3, 4))
	xs := make([]float64, 1024)
	for i := range xs {
		xs[i] = lo + (hi-lo)*rng.Float64()
	}
	return xs
}

// halfDevianceSum is checked against the deviance formed with the
// standard library's functions (common practice: log(1+e^η) − y·η).
func TestHalfDevianceSum(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	const n = 10_000
	ex, eta, y, w := make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)
	var want float64
	for i := range eta {
		eta[i] = rng.NormFloat64() * 5
		if i%97 == 0 {
			eta[i] = 0
		}
		if rng.Float64() < 0.4 {
			y[i] = 1
		}
		w[i] = rng.Float64()
		ex[i] = math.Exp(-math.Abs(eta[i]))
		want += w[i] * (math.Log1p(math.Exp(-math.Abs(eta[i]))) + math.Max(eta[i], 0) - y[i]*eta[i])
	}
	if got := halfDevianceSum(ex, eta, y, w); relErr(got, want) > 1e-13 {
		t.Errorf("halfDevianceSum = %.17g, want %.17g", got, want)
	}
}
