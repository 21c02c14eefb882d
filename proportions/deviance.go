package proportions

import "math"

// binomialDeviance is the likelihood-ratio statistic of x events in n
// trials against the rate π (given with q = 1 − π):
//
//	2·[x·log(x/(nπ)) + (n−x)·log((n−x)/(nq))],
//
// a term with a zero count being 0. It is computed as
// 2·[t(x, nπ) + t(n−x, nq)] with t(k, m) = k·log(k/m) + m − k (the m − k
// parts cancel), and t(k, m) = k·(r − log1p(r)) with r = (m − k)/k, which
// keeps its relative precision when m is close to k at any n. It is +Inf
// when π or q is 0 against a nonzero count, never NaN for 0 ≤ x ≤ n.
func binomialDeviance(x, n int64, p, q float64) float64 {
	fn := float64(n)
	return 2 * (devianceTerm(float64(x), fn*p) + devianceTerm(float64(n-x), fn*q))
}

func devianceTerm(k, m float64) float64 {
	if k == 0 {
		return m
	}
	if m == 0 {
		return math.Inf(1)
	}
	r := (m - k) / k
	return k * (r - math.Log1p(r))
}
