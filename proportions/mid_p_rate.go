package proportions

import (
	"math"

	"github.com/propscope/propscope/internal/special"
)

// MidPRate is the mid-p exact interval for one proportion: the lower limit
// is the π with
//
//	P(X > x | π) + ½·P(X = x | π) = α/2
//
// and the upper limit the π with P(X < x | π) + ½·P(X = x | π) = α/2, for
// X ~ Binomial(n, π); lower = 0 at x = 0 and upper = 1 at x = n. Method 6
// of Newcombe RG (1998), "Two-sided confidence intervals for the single
// proportion: comparison of seven methods", Statistics in Medicine
// 17:857–872 (after Lancaster's mid-p). It is narrower than Clopper–
// Pearson's, and lies between the Clopper–Pearson limits for x and x ± 1.
//
// Computation, for the lower limit at 0 < x < n: with Q(q) the π at which
// P(X > x | π) = q (the beta quantile B⁻¹(q; x + 1, n − x), from
// special.BetaLowerQuantile, exact to about 1e−15), the equation becomes
// h(q) = q + ½·b(x; n, Q(q)) − α/2 = 0, with b the binomial pmf (saddle-
// point log-pmf) and h′(q) = ½ + ½·x(1 − Q)/(Q(n − x)) in closed form;
// Newton steps in q from q = α/2, kept in the bracket (0, α/2], take 3 to
// 5 beta quantiles. At x = n the equation is ½πⁿ = α/2, π = α^(1/n).
// The upper limit is 1 minus the lower limit of n − x events (computed
// with its own complement, so limits near 1 keep their precision). Limits
// lie in [0, 1], contain x/n and are never NaN.
var MidPRate = RateMethod{
	Key:        "mid-p-rate",
	Name:       "Mid-p exact",
	Citation:   "Newcombe RG (1998). Two-sided confidence intervals for the single proportion: comparison of seven methods. Statistics in Medicine 17:857–872 (method 6, mid-p).",
	Definition: "lower: the π with P(X > x) + ½P(X = x) = α/2, upper: the π with P(X < x) + ½P(X = x) = α/2, X ~ Binomial(n, π); 0 at x = 0 and 1 at x = n",
	Limits:     midPRateLimits,
	TrialLimit: anyTrials, // tens of microseconds: not in the quick scope
}

func midPRateLimits(x, n int64, conf Confidence) (lower, upper float64) {
	lower, _ = midPLower(x, n, conf)
	_, upper = midPLower(n-x, n, conf)
	return lower, upper
}

// midPLower returns the mid-p lower limit π of x events in n trials and
// its complement 1 − π.
func midPLower(x, n int64, conf Confidence) (p, q float64) {
	half := conf.Alpha() / 2
	switch {
	case x == 0:
		return 0, 1
	case x == n: // ½πⁿ = α/2
		l := math.Log(2*half) / float64(n)
		return math.Exp(l), -math.Expm1(l)
	}
	a, b := float64(x+1), float64(n-x)
	fx, fn := float64(x), float64(n)
	h := func(tail float64) (hv, dh, p, q float64) {
		t := special.NewBetaTail(tail, conf.Z)
		p, q = special.BetaLowerQuantile(a, b, &t)
		pmf := math.Exp(special.LogBinomPMF(fx, fn, p, q))
		return tail + pmf/2 - half, 0.5 + 0.5*fx*q/(p*b), p, q
	}
	lo, hi := 0.0, half
	tail := half
	for range 60 {
		hv, dh, pp, qq := h(tail)
		p, q = pp, qq
		if hv == 0 {
			return p, q
		}
		if hv > 0 {
			hi = tail
		} else {
			lo = tail
		}
		next := tail - hv/dh
		if !(next > lo && next < hi) {
			next = lo + (hi-lo)/2
		}
		if math.Abs(next-tail) <= 1e-15*tail || next == tail {
			if next != tail {
				t := special.NewBetaTail(next, conf.Z)
				p, q = special.BetaLowerQuantile(a, b, &t)
			}
			return p, q
		}
		tail = next
	}
	return p, q
}
