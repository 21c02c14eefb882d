package proportions

import (
	"math"
	"strconv"
)

// Decimal formatting for the conclusion and the text summaries: the same
// text as strconv.AppendFloat with formats 'f' (1 decimal) and 'g' (4
// significant digits), but without its general digit generation when the
// value is plainly not a rounding tie. Every analysis writes a dozen such
// numbers, and strconv's exact conversion cost about as much as several
// interval methods.

// decimalTieGuard is how close to a rounding tie (in units of the last
// digit kept) a scaled value may come before the exact conversion decides:
// scaling by a power of ten errs by at most an ulp, far below this.
const decimalTieGuard = 1e-6

// appendFixed1 appends t with one decimal, as strconv.AppendFloat(dst, t,
// 'f', 1, 64).
func appendFixed1(dst []byte, t float64) []byte {
	r := 10 * t
	k := math.Round(r)
	if !(math.Abs(r) < 1e9) || math.Abs(math.Abs(r-k)-0.5) < decimalTieGuard {
		return strconv.AppendFloat(dst, t, 'f', 1, 64)
	}
	if math.Signbit(t) {
		dst = append(dst, '-')
	}
	return appendScaled(dst, uint64(math.Abs(k)), 1, false)
}

// appendSignificant4 appends t with at most 4 significant digits, as
// strconv.AppendFloat(dst, t, 'g', 4, 64), taking the quick route for
// 10⁻⁴ ≤ |t| < 1000 (levels and α as percentages, p-values).
func appendSignificant4(dst []byte, t float64) []byte {
	a := math.Abs(t)
	if !(a >= 1e-4 && a < 1000) {
		return strconv.AppendFloat(dst, t, 'g', 4, 64)
	}
	// decimals = 3 − ⌊log10 a⌋ keeps four significant digits.
	decimals := 1
	for _, bound := range [...]float64{100, 10, 1, 0.1, 0.01, 0.001} {
		if a >= bound {
			break
		}
		decimals++
	}
	r := a * decimalPowers[decimals]
	k := math.Round(r)
	if k >= 10000 || math.Abs(math.Abs(r-k)-0.5) < decimalTieGuard {
		return strconv.AppendFloat(dst, t, 'g', 4, 64)
	}
	if t < 0 {
		dst = append(dst, '-')
	}
	return appendScaled(dst, uint64(k), decimals, true)
}

// decimalPowers[i] is 10^i, exactly.
var decimalPowers = [...]float64{1, 10, 100, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8}

// appendScaled appends k/10^decimals in plain decimal notation, dropping
// trailing zeros of the fraction (and its point) when trim is set.
func appendScaled(dst []byte, k uint64, decimals int, trim bool) []byte {
	var buf [24]byte
	digits := strconv.AppendUint(buf[:0], k, 10)
	if pad := decimals + 1 - len(digits); pad > 0 { // one digit before the point at least
		digits = append(buf[:0], "00000000"[:pad]...)
		digits = strconv.AppendUint(digits, k, 10)
	}
	whole, frac := digits[:len(digits)-decimals], digits[len(digits)-decimals:]
	dst = append(dst, whole...)
	if trim {
		for len(frac) > 0 && frac[len(frac)-1] == '0' {
			frac = frac[:len(frac)-1]
		}
	}
	if len(frac) > 0 {
		dst = append(dst, '.')
		dst = append(dst, frac...)
	}
	return dst
}
