package proportions

import (
	"math"
	"strconv"
)

// Numbers as readers see them: the conclusion here and every card, chart
// and table of notebookui print through these primitives, so one style
// holds everywhere (notebookui/format.go states the whole policy).
//   - The minus is the typographic minus U+2212, never the hyphen.
//   - A difference always carries its sign ("+16.0", "−1.2"); zero is
//     "0.0".
//   - A p-value has four decimals with trailing zeros kept ("0.0680",
//     "1.0000"), and "< 0.0001" where four decimals would print zero: a
//     column of p-values lines up at the point and never switches to an
//     exponent. FormatP keeps the full precision for programs.

// ReaderMinus is the typographic minus sign (U+2212).
const ReaderMinus = "−"

// pFloor is the smallest p-value printed as a number; smaller ones read
// "< 0.0001".
const pFloor = 0.00005

// FormatPValue prints a p-value for readers: four decimals with trailing
// zeros kept, "< 0.0001" below 0.00005 (including underflow to 0).
func FormatPValue(p float64) string {
	var buf [24]byte
	return string(appendPValue(buf[:0], p))
}

// PValueClause prints "p = 0.0680", or "p < 0.0001" below the floor.
func PValueClause(p float64) string {
	var buf [32]byte
	return string(appendPClause(buf[:0], p))
}

func appendPClause(dst []byte, p float64) []byte {
	if p < pFloor {
		return append(dst, "p < 0.0001"...)
	}
	dst = append(dst, "p = "...)
	return appendPValue(dst, p)
}

func appendPValue(dst []byte, p float64) []byte {
	switch {
	case math.IsNaN(p):
		return append(dst, "not computed"...)
	case p < pFloor:
		return append(dst, "< 0.0001"...)
	}
	return strconv.AppendFloat(dst, min(p, 1), 'f', 4, 64)
}

// FormatPoints prints a difference of proportions d in percentage points
// with the given decimals and always a sign: "+16.0", "−1.2", and "0.0"
// for a value that rounds to zero; "∞", "−∞" and "not estimable" for the
// special values.
func FormatPoints(d float64, decimals int) string {
	return FormatSigned(100*d, decimals)
}

// FormatSigned prints v with the given decimals, always signed, with the
// typographic minus ("+3.25", "−0.91", "0.00").
func FormatSigned(v float64, decimals int) string {
	var buf [40]byte
	return string(appendSigned(buf[:0], v, decimals))
}

// appendSigned appends v signed with the given decimals; one decimal
// takes appendFixed1's quick route, as the conclusion is written for
// every analysis.
func appendSigned(dst []byte, v float64, decimals int) []byte {
	switch {
	case math.IsNaN(v):
		return append(dst, "not estimable"...)
	case math.IsInf(v, 1):
		return append(dst, "∞"...)
	case math.IsInf(v, -1):
		return append(dst, ReaderMinus+"∞"...)
	}
	var num [32]byte
	var digits []byte
	if decimals == 1 {
		digits = appendFixed1(num[:0], math.Abs(v))
	} else {
		digits = strconv.AppendFloat(num[:0], math.Abs(v), 'f', decimals, 64)
	}
	if isZeroDigits(digits) {
		return append(dst, digits...)
	}
	if v < 0 {
		dst = append(dst, ReaderMinus...)
	} else {
		dst = append(dst, '+')
	}
	return append(dst, digits...)
}

// isZeroDigits reports whether a formatted magnitude is all zeros.
func isZeroDigits(b []byte) bool {
	for _, c := range b {
		if c != '0' && c != '.' {
			return false
		}
	}
	return true
}
