package proportions

import "math"

// signedScore returns num / √v for a score statistic, defined where the
// variance vanishes: 0 when the numerator is 0 too (the data sit exactly on
// the null) and ±Inf otherwise, so the statistic is never NaN.
func signedScore(num, v float64) float64 {
	switch {
	case num == 0:
		return 0
	case v <= 0 || math.IsNaN(v):
		return math.Copysign(math.Inf(1), num)
	}
	return num / math.Sqrt(v)
}

// pearsonTerm returns d² / v for one group of a Pearson chi-square, d the
// observed minus the fitted count, with 0/0 read as 0 (observed equals a
// degenerate expectation) and (non-zero)/0 as +Inf.
func pearsonTerm(d, v float64) float64 {
	switch {
	case d == 0:
		return 0
	case v <= 0:
		return math.Inf(1)
	}
	return d * d / v
}

// mnVarianceFactor is Miettinen and Nurminen's variance inflation N/(N − 1),
// N = n1 + n2, which makes their score variance unbiased.
func mnVarianceFactor(c Counts) float64 {
	n := float64(c.N1 + c.N2)
	return n / (n - 1)
}

// adjustedLogRatio returns the log of ((x1+½)/(n1+½)) / ((x2+½)/(n2+½))
// and its Katz-type standard error: a finite starting point and step for the
// limit searches whatever the zero cells.
func adjustedLogRatio(c Counts) (t, se float64) {
	x1, n1 := float64(c.X1)+0.5, float64(c.N1)+0.5
	x2, n2 := float64(c.X2)+0.5, float64(c.N2)+0.5
	return math.Log(x1/n1) - math.Log(x2/n2), math.Sqrt(math.Max(1/x1-1/n1+1/x2-1/n2, 0))
}

// adjustedLogOddsRatio returns the log of the odds ratio with ½ added to
// every cell, finite for every table, and its Woolf-type standard error.
func adjustedLogOddsRatio(c Counts) (t, se float64) {
	a, b := float64(c.X1)+0.5, float64(c.N1-c.X1)+0.5
	cc, d := float64(c.X2)+0.5, float64(c.N2-c.X2)+0.5
	return math.Log(a) + math.Log(d) - math.Log(b) - math.Log(cc), math.Sqrt(1/a + 1/b + 1/cc + 1/d)
}
