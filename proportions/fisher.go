package proportions

import "math"

// FisherTieTolerance is the relative tolerance under which two tables count
// as equally probable in the two-sided Fisher test: a table belongs to the
// two-sided tail when P(table) ≤ P(observed)·(1 + 10⁻⁷). Tables that are
// mathematically equally probable (mirror tables when n1 = n2, for example)
// come out of floating-point arithmetic a few ulps apart; the tolerance
// keeps them together without merging tables whose probabilities really
// differ (common practice; the log probabilities here are accurate to about
// 10⁻¹³ relative, far inside the tolerance).
const FisherTieTolerance = 1e-7

// Fisher is Fisher's exact test of π1 = π2, conditional on both margins of
// the 2×2 table: given m = x1 + x2 events in all, X1 is hypergeometric,
// P(X1 = k) = C(n1, k)·C(n2, m−k)/C(n1+n2, m).
//
//   - Greater (π1 > π2): p = P(X1 ≥ x1).
//   - Less (π1 < π2): p = P(X1 ≤ x1).
//   - Two-sided: p = the total probability of the tables no more probable
//     than the observed one, P(X1 = k) ≤ P(X1 = x1)·(1 + FisherTieTolerance).
//
// Fisher RA (1935), "The logic of inductive inference", Journal of the Royal
// Statistical Society 98:39–82; the two-sided rule by probability ordering
// is the one used by Agresti A (1992), "A survey of exact inference for
// contingency tables", Statistical Science 7:131–153.
//
// Tails are summed in log space from the table furthest from the mode
// inward (see hypergeomLogTail), so p-values far below 10⁻³⁰⁸ keep their
// LogPValue and the test runs in O(√(n1+n2)) steps up to MaxTrials per
// group. A zero margin (no events, or only events) leaves a single
// possible table: p = 1. The statistic reported is the hypergeometric
// probability of the observed table (it may underflow to 0; its log is
// not kept since LogPValue carries the evidence).
var Fisher = TestMethod{
	Key:        "fisher",
	Name:       "Fisher exact",
	Citation:   "Fisher RA (1935). The logic of inductive inference. Journal of the Royal Statistical Society 98:39–82. Two-sided by probability ordering: Agresti A (1992). A survey of exact inference for contingency tables. Statistical Science 7:131–153.",
	Definition: "Conditional on the margins X1 is hypergeometric; one-sided p = P(X1 ≥ x1) or P(X1 ≤ x1); two-sided p = total probability of the tables with P(table) ≤ P(observed)·(1+1e−7).",
	Family:     Difference,
	Exact:      true,
	Run:        func(c Counts, h Hypothesis) TestResult { return fisherRun(c, h, "fisher", "Fisher exact", false) },
}

// FisherMidP is the mid-p version of Fisher's test: the probability of the
// tables more extreme than the observed one plus half the probability of
// the tables exactly as extreme (the observed table, and in the two-sided
// case any table tied with it within FisherTieTolerance):
//
//	one-sided: p = P(X1 > x1) + ½·P(X1 = x1)   (Greater; mirrored for Less),
//	two-sided: p = P(tables less probable) + ½·P(tables tied with the observed).
//
// Lancaster HO (1961), "Significance tests in discrete distributions",
// Journal of the American Statistical Association 56:223–234. It is not
// exact: its size can exceed α, though it usually stays close to it and is
// far less conservative than Fisher's test, so Exact is false.
var FisherMidP = TestMethod{
	Key:        "fisher-midp",
	Name:       "Fisher mid-p",
	Citation:   "Lancaster HO (1961). Significance tests in discrete distributions. Journal of the American Statistical Association 56:223–234.",
	Definition: "Fisher's conditional test with half the probability of the tables as extreme as the observed one: p = P(more extreme) + ½·P(as extreme).",
	Family:     Difference,
	Exact:      false,
	Run:        func(c Counts, h Hypothesis) TestResult { return fisherRun(c, h, "fisher-midp", "Fisher mid-p", true) },
}

func fisherRun(c Counts, h Hypothesis, key, name string, mid bool) TestResult {
	logp := fisherLogP(c, h.Alternative, mid)
	r := TestResult{
		Method: key, Name: name, Family: Difference,
		StatisticName: "P(observed table)",
		Statistic:     math.Exp(logHypergeomPMF(c.X1, c.N1, c.N2, c.X1+c.X2)),
		PValue:        math.Exp(logp), LogPValue: logp,
	}
	r.decide(h)
	return r
}

// fisherLogP returns the log of Fisher's p-value (or mid-p) for the counts.
func fisherLogP(c Counts, a Alternative, mid bool) float64 {
	n1, n2, m, x := c.N1, c.N2, c.X1+c.X2, c.X1
	if lo, hi := hypergeomSupport(n1, n2, m); lo == hi {
		return 0 // a single possible table: no evidence either way
	}
	var incl, excl float64 // tail with and without the tables as extreme as x
	switch a {
	case Greater:
		incl = hypergeomLogTail(x, n1, n2, m, true)
		excl = hypergeomLogTail(x+1, n1, n2, m, true)
	case Less:
		incl = hypergeomLogTail(x, n1, n2, m, false)
		excl = hypergeomLogTail(x-1, n1, n2, m, false)
	default:
		lp := logHypergeomPMF(x, n1, n2, m)
		incl = fisherLogTwoSided(n1, n2, m, lp+math.Log1p(FisherTieTolerance))
		excl = fisherLogTwoSided(n1, n2, m, lp+math.Log1p(-FisherTieTolerance))
	}
	if !mid {
		return min(incl, 0)
	}
	return min(logAddExp(incl, excl)-math.Ln2, 0)
}

// fisherLogTwoSided returns the log of the total probability of the tables
// whose log probability is at most thr. The hypergeometric distribution is
// unimodal, so those tables form the two outer tails; their inner ends are
// found by bisection on the log pmf, and each tail is summed outward.
func fisherLogTwoSided(n1, n2, m int64, thr float64) float64 {
	lo, hi := hypergeomSupport(n1, n2, m)
	mode := hypergeomMode(n1, n2, m)
	if logHypergeomPMF(mode, n1, n2, m) <= thr {
		return 0 // even the most probable table qualifies: every table does
	}
	total := math.Inf(-1)
	// Lower side: log pmf increases on [lo, mode]; find the largest k there
	// with log pmf ≤ thr.
	if logHypergeomPMF(lo, n1, n2, m) <= thr {
		a, b := lo, mode // invariant: pmf(a) ≤ thr < pmf(b)
		for b-a > 1 {
			mid := a + (b-a)/2
			if logHypergeomPMF(mid, n1, n2, m) <= thr {
				a = mid
			} else {
				b = mid
			}
		}
		total = hypergeomLogOuter(a, n1, n2, m, false)
	}
	// Upper side: log pmf decreases on [mode, hi]; find the smallest k there
	// with log pmf ≤ thr.
	if logHypergeomPMF(hi, n1, n2, m) <= thr {
		a, b := mode, hi // invariant: pmf(a) > thr ≥ pmf(b)
		for b-a > 1 {
			mid := a + (b-a)/2
			if logHypergeomPMF(mid, n1, n2, m) <= thr {
				b = mid
			} else {
				a = mid
			}
		}
		total = logAddExp(total, hypergeomLogOuter(b, n1, n2, m, true))
	}
	return total
}
