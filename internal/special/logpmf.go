package special

import "math"

// Log probabilities of the binomial and hypergeometric distributions,
// accurate to nearly full relative precision for any counts up to MaxTrials.
//
// Evaluating log C(n, k) + k log p + (n−k) log(1−p) with lgamma loses
// absolute accuracy as n grows (lgamma(10⁶) ≈ 1.3·10⁷, so its rounding error
// is about 10⁻⁹ in the log), which would blur the tie tolerance of Fisher's
// test. The saddle-point form of Loader C (2000), "Fast and accurate
// computation of binomial probabilities" (technical note, Bell Labs), keeps
// the large terms apart:
//
//	log b(k; n, p) = stirlerr(n) − stirlerr(k) − stirlerr(n−k)
//	                 − bd0(k, np) − bd0(n−k, n(1−p))
//	                 − ½ log(2π k (n−k)/n),
//
// where stirlerr(n) = log n! − (n+½) log n + n − ½ log 2π is the Stirling
// remainder and bd0(x, m) = x log(x/m) + m − x is evaluated by a series when
// x ≈ m, so no cancellation of large numbers happens.

// stirlerr returns log n! − (n+½)·log n + n − ½·log 2π for n ≥ 1.
func stirlerr(n float64) float64 {
	if n <= 15 {
		// Small n: direct evaluation; every term is below 30, so the
		// rounding error stays near 10⁻¹⁴ absolute.
		lg, _ := math.Lgamma(n + 1)
		return lg - (n+0.5)*math.Log(n) + n - 0.5*math.Log(2*math.Pi)
	}
	// Asymptotic Stirling series (the next term is below 10⁻¹⁷ here).
	return stirlerrSeries(n)
}

// bd0 returns x·log(x/m) + m − x ≥ 0, the deviance term of the saddle-point
// expansion, without cancellation when x is close to m.
func bd0(x, m float64) float64 {
	if math.Abs(x-m) < 0.1*(x+m) {
		v := (x - m) / (x + m)
		s := (x - m) * v
		ej := 2 * x * v
		v *= v
		for j := 3.0; j < 1000; j += 2 {
			ej *= v
			s1 := s + ej/j
			if s1 == s {
				return s1
			}
			s = s1
		}
		return s
	}
	return x*math.Log(x/m) + m - x
}

// LogBinomPMF returns log P(X = k) for X ~ Binomial(n, p), with q = 1 − p
// passed separately so callers holding 1 − p exactly lose nothing. It is
// −Inf where the probability is zero (k outside 0..n, or p ∈ {0, 1} with
// k not at the matching end).
func LogBinomPMF(k, n, p, q float64) float64 {
	switch {
	case k < 0 || k > n:
		return math.Inf(-1)
	case p == 0:
		if k == 0 {
			return 0
		}
		return math.Inf(-1)
	case q == 0:
		if k == n {
			return 0
		}
		return math.Inf(-1)
	case k == 0:
		if p < 0.5 {
			return n * math.Log1p(-p)
		}
		return n * math.Log(q)
	case k == n:
		if q < 0.5 {
			return n * math.Log1p(-q)
		}
		return n * math.Log(p)
	}
	lc := stirlerr(n) - stirlerr(k) - stirlerr(n-k) - bd0(k, n*p) - bd0(n-k, n*q)
	lf := math.Log(2*math.Pi) + math.Log(k) + math.Log1p(-k/n)
	return lc - 0.5*lf
}
