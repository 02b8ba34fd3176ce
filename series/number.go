package series

import (
	"math"
	"strconv"
	"unsafe"
)

// parseFloat parses a decimal number held in b without allocating. It returns ok=false when b
// is not a number (or is out of the float64 range); NaN and ±Inf spellings that
// strconv.ParseFloat accepts are returned as such.
//
// Plain decimals with at most 19 significant digits, a mantissa m ≤ 2^53 and a decimal
// exponent e with |e| ≤ 22 take the exact fast path of Clinger (1990, "How to read floating
// point numbers accurately", PLDI): m and 10^|e| are both exact in float64, so the single
// multiplication or division is correctly rounded and equals strconv.ParseFloat bit for bit.
// Everything else goes to strconv.ParseFloat over the same bytes (no copy).
func parseFloat(b []byte) (float64, bool) {
	if len(b) > 18 {
		// Full-precision output ('g' −1 writes up to 17 digits) rarely fits the fast path;
		// skip the second scan.
		return parseFloatSlow(b)
	}
	i := 0
	neg := false
	if i < len(b) && (b[i] == '+' || b[i] == '-') {
		neg = b[i] == '-'
		i++
	}
	var mant uint64
	nd, dp := 0, 0
	sawDigit, sawDot := false, false
	for ; i < len(b); i++ {
		c := b[i]
		if c >= '0' && c <= '9' {
			sawDigit = true
			if nd == 0 && c == '0' {
				if sawDot {
					dp--
				}
				continue
			}
			if nd >= 19 {
				return parseFloatSlow(b)
			}
			mant = mant*10 + uint64(c-'0')
			nd++
			if sawDot {
				dp--
			}
			continue
		}
		if c == '.' {
			if sawDot {
				return parseFloatSlow(b)
			}
			sawDot = true
			continue
		}
		break
	}
	if !sawDigit {
		return parseFloatSlow(b)
	}
	if i < len(b) {
		if b[i] != 'e' && b[i] != 'E' {
			return parseFloatSlow(b)
		}
		i++
		eneg := false
		if i < len(b) && (b[i] == '+' || b[i] == '-') {
			eneg = b[i] == '-'
			i++
		}
		if i == len(b) {
			return parseFloatSlow(b)
		}
		exp := 0
		for ; i < len(b); i++ {
			c := b[i]
			if c < '0' || c > '9' || exp > 10000 {
				return parseFloatSlow(b)
			}
			exp = exp*10 + int(c-'0')
		}
		if eneg {
			exp = -exp
		}
		dp += exp
	}
	if mant == 0 {
		if neg {
			return math.Copysign(0, -1), true
		}
		return 0, true
	}
	if mant > 1<<53 || dp > 22 || dp < -22 {
		return parseFloatSlow(b)
	}
	f := float64(mant)
	if dp > 0 {
		f *= math.Pow10(dp) // exact for 0 < dp ≤ 22 (table value)
	} else if dp < 0 {
		f /= math.Pow10(-dp)
	}
	if neg {
		f = -f
	}
	return f, true
}

// parseFloatSlow is strconv.ParseFloat over b without copying it. The error (which would
// refer to b) is never kept.
func parseFloatSlow(b []byte) (float64, bool) {
	if len(b) == 0 {
		return 0, false
	}
	f, err := strconv.ParseFloat(unsafe.String(&b[0], len(b)), 64)
	if err != nil {
		return 0, false
	}
	return f, true
}

// stampQuantum returns the precision a number is written with: 10^(exponent − decimals), e.g.
// 0.01 for "12.34", 1 for "1959", 1e-10 for "1959.0833333333" and 1e-5 for "1.5e-3" … "1.50e-3".
// It assumes b already parsed as a finite number.
func stampQuantum(b []byte) float64 {
	decimals, exp := 0, 0
	i := 0
	for i < len(b) && b[i] != '.' && b[i] != 'e' && b[i] != 'E' {
		i++
	}
	if i < len(b) && b[i] == '.' {
		i++
		for i < len(b) && b[i] >= '0' && b[i] <= '9' {
			decimals++
			i++
		}
	}
	if i < len(b) && (b[i] == 'e' || b[i] == 'E') {
		i++
		eneg := false
		if i < len(b) && (b[i] == '+' || b[i] == '-') {
			eneg = b[i] == '-'
			i++
		}
		for i < len(b) && b[i] >= '0' && b[i] <= '9' && exp < 10000 {
			exp = exp*10 + int(b[i]-'0')
			i++
		}
		if eneg {
			exp = -exp
		}
	}
	return math.Pow10(exp - decimals)
}
