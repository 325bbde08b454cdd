package table

import (
	"math"
	"strconv"
	"unsafe"
)

// pow10 holds the powers of ten that are exact in a float64.
var pow10 = [...]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10,
	1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// scanNumber parses the longest prefix of b of the form
// [+-]digits[point digits][(e|E)[+-]digits] and returns its value and
// length. ok is false when the prefix has no digit or its value cannot be
// formed exactly here (more than 19 digits, or a mantissa of 2⁵³ or more,
// or a decimal exponent outside ±22); the caller then falls back to
// strconv.ParseFloat.
//
// When ok is true the value is the one strconv.ParseFloat returns: the
// mantissa is an integer below 2⁵³ and the power of ten is exact, so the
// single multiplication or division is correctly rounded (Clinger's fast
// path, as in strconv's own atof64exact).
func scanNumber(b []byte, point byte) (x float64, n int, ok bool) {
	i := 0
	neg := false
	if len(b) > 0 && (b[0] == '-' || b[0] == '+') {
		neg = b[0] == '-'
		i = 1
	}
	var mant uint64
	start := i
	for i < len(b) {
		d := b[i] - '0'
		if d > 9 {
			break
		}
		mant = mant*10 + uint64(d)
		i++
	}
	digits := i - start
	exp := 0
	if i < len(b) && b[i] == point {
		i++
		from := i
		for i < len(b) {
			d := b[i] - '0'
			if d > 9 {
				break
			}
			mant = mant*10 + uint64(d)
			i++
		}
		digits += i - from
		exp = from - i
	}
	if digits == 0 {
		return 0, i, false
	}
	if i < len(b) && b[i]|0x20 == 'e' {
		j := i + 1
		eneg := false
		if j < len(b) && (b[j] == '+' || b[j] == '-') {
			eneg = b[j] == '-'
			j++
		}
		e, from := 0, j
		for ; j < len(b) && b[j]-'0' <= 9; j++ {
			if e < 10000 {
				e = e*10 + int(b[j]-'0')
			}
		}
		if j == from {
			return 0, j, false
		}
		if eneg {
			e = -e
		}
		exp += e
		i = j
	}
	if digits > 19 {
		return 0, i, false
	}
	if mant == 0 {
		if neg {
			return math.Copysign(0, -1), i, true
		}
		return 0, i, true
	}
	if mant >= 1<<53 || exp < -22 || exp > 22 {
		return 0, i, false
	}
	x = float64(mant)
	if exp < 0 {
		x /= pow10[-exp]
	} else {
		x *= pow10[exp]
	}
	if neg {
		x = -x
	}
	return x, i, true
}

// parseNumber returns the value of the whole of b as strconv.ParseFloat
// reads it (with point as the decimal separator), and whether b is a
// number. Infinite results, from "Inf" or an overflow, are returned as
// such; the caller refuses them.
func parseNumber(b []byte, point byte, scratch *[]byte) (float64, bool) {
	x, n, ok := scanNumber(b, point)
	if ok && n == len(b) {
		return x, true
	}
	if len(b) == 0 {
		return 0, false
	}
	switch c := b[0]; {
	case c-'0' <= 9, c == '+', c == '-', c == '.', c == ',', c|0x20 == 'i', c|0x20 == 'n':
	default:
		return 0, false
	}
	if point != '.' {
		s := (*scratch)[:0]
		for _, c := range b {
			switch c {
			case '.':
				return 0, false
			case point:
				c = '.'
			}
			s = append(s, c)
		}
		*scratch = s
		b = s
	}
	// The string shares b's memory only for the call; ParseFloat's error,
	// which keeps it, is dropped.
	y, err := strconv.ParseFloat(unsafe.String(unsafe.SliceData(b), len(b)), 64)
	if err != nil {
		if ne, ok := err.(*strconv.NumError); ok && ne.Err == strconv.ErrRange && math.IsInf(y, 0) {
			return y, true
		}
		return 0, false
	}
	return y, true
}
