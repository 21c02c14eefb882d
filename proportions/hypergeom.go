package proportions

import "math"

// The conditional distribution of a 2×2 table given its margins.
//
// With n1 and n2 trials in the groups and m events in all, the number of
// events X1 in the first group follows the hypergeometric distribution
//
//	P(X1 = k) = C(n1, k)·C(n2, m−k) / C(n1+n2, m),   max(0, m−n2) ≤ k ≤ min(n1, m),
//
// the null distribution of Fisher's exact test. Under an odds ratio ψ the
// weights become C(n1, k)·C(n2, m−k)·ψᵏ (Fisher's noncentral
// hypergeometric distribution); callers needing that add k·log ψ to
// logHypergeomPMF and renormalise over hypergeomSupport.

// hypergeomSupport returns the smallest and largest possible X1 given the
// margins: n1, n2 trials and m events in all (0 ≤ m ≤ n1 + n2).
func hypergeomSupport(n1, n2, m int64) (lo, hi int64) {
	return max(0, m-n2), min(n1, m)
}

// hypergeomMode returns a most probable X1 given the margins,
// ⌊(m+1)(n1+1)/(n1+n2+2)⌋ clamped to the support.
func hypergeomMode(n1, n2, m int64) int64 {
	lo, hi := hypergeomSupport(n1, n2, m)
	mode := int64(math.Floor((float64(m) + 1) * (float64(n1) + 1) / (float64(n1+n2) + 2)))
	return min(max(mode, lo), hi)
}

// logHypergeomPMF returns log P(X1 = k) under the central hypergeometric
// distribution with n1, n2 trials and m events in all; −Inf outside the
// support. It uses the binomial identity
//
//	P(X1 = k) = b(k; n1, p)·b(m−k; n2, p) / b(m; n1+n2, p),   p = m/(n1+n2),
//
// with the saddle-point binomial of logpmf.go, so it keeps nearly full
// relative precision for margins up to MaxTrials (where lgamma-based
// formulas lose absolute accuracy in the log).
func logHypergeomPMF(k, n1, n2, m int64) float64 {
	lo, hi := hypergeomSupport(n1, n2, m)
	if k < lo || k > hi {
		return math.Inf(-1)
	}
	if lo == hi {
		return 0
	}
	n := float64(n1 + n2)
	p := float64(m) / n
	q := float64(n1+n2-m) / n
	return logBinomPMF(float64(k), float64(n1), p, q) +
		logBinomPMF(float64(m-k), float64(n2), p, q) -
		logBinomPMF(float64(m), n, p, q)
}

// hypergeomRatio returns P(X1 = k+1)/P(X1 = k) for lo ≤ k < hi:
// (n1−k)(m−k) / ((k+1)(n2−m+k+1)).
func hypergeomRatio(k, n1, n2, m int64) float64 {
	return (float64(n1-k) * float64(m-k)) / (float64(k+1) * float64(n2-m+k+1))
}

// hypergeomLogTail returns the log of P(X1 ≥ k) (upper = true) or
// P(X1 ≤ k) (upper = false), accurate in relative terms however small the
// tail: a tail that lies beyond the mode is summed outward from k by the
// ratio recurrence (terms shrink geometrically, so the sum stops once they
// no longer change it); a tail containing the mode is one minus the
// opposite tail.
func hypergeomLogTail(k, n1, n2, m int64, upper bool) float64 {
	lo, hi := hypergeomSupport(n1, n2, m)
	mode := hypergeomMode(n1, n2, m)
	if upper {
		switch {
		case k <= lo:
			return 0
		case k > hi:
			return math.Inf(-1)
		case k <= mode:
			return log1mexp(hypergeomLogOuter(k-1, n1, n2, m, false))
		}
		return hypergeomLogOuter(k, n1, n2, m, true)
	}
	switch {
	case k >= hi:
		return 0
	case k < lo:
		return math.Inf(-1)
	case k >= mode:
		return log1mexp(hypergeomLogOuter(k+1, n1, n2, m, true))
	}
	return hypergeomLogOuter(k, n1, n2, m, false)
}

// hypergeomLogOuter sums P(X1 = j) from j = k away from the mode (upward
// when up is true) and returns the log of the sum. k must lie in the
// support on the far side of the mode (or at it), where every step away
// shrinks the terms.
func hypergeomLogOuter(k, n1, n2, m int64, up bool) float64 {
	lo, hi := hypergeomSupport(n1, n2, m)
	sum, term := 1.0, 1.0
	if up {
		for j := k; j < hi; j++ {
			term *= hypergeomRatio(j, n1, n2, m)
			sum += term
			if term < sum*1e-17 {
				break
			}
		}
	} else {
		for j := k; j > lo; j-- {
			term /= hypergeomRatio(j-1, n1, n2, m)
			sum += term
			if term < sum*1e-17 {
				break
			}
		}
	}
	return logHypergeomPMF(k, n1, n2, m) + math.Log(sum)
}

// log1mexp returns log(1 − eˣ) for x ≤ 0 without cancellation, switching
// between expm1 and log1p at −log 2 (Mächler M (2012), "Accurately computing
// log(1 − exp(−|a|))").
func log1mexp(x float64) float64 {
	if x > -math.Ln2 {
		return math.Log(-math.Expm1(x))
	}
	return math.Log1p(-math.Exp(x))
}

// logAddExp returns log(eᵃ + eᵇ) without overflow.
func logAddExp(a, b float64) float64 {
	if math.IsInf(a, -1) {
		return b
	}
	if math.IsInf(b, -1) {
		return a
	}
	if a < b {
		a, b = b, a
	}
	return a + math.Log1p(math.Exp(b-a))
}
