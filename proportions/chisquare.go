package proportions

import (
	"math"

	"github.com/propscope/propscope/internal/special"
)

// PearsonChiSquareTest is Pearson's chi-square test of H0: π1 = π2 on the 2×2
// table, with one degree of freedom:
//
//	X² = Σ (O − E)² / E,  E = row total × column total / N,
//
// over the four cells. Pearson K (1900), "On the criterion that a given
// system of deviations from the probable in the case of a correlated system
// of variables is such that it can be reasonably supposed to have arisen
// from random sampling", Philosophical Magazine (5th series) 50:157–175.
// X² equals the square of the pooled z statistic (FarringtonManning at
// δ = 0), so the two-sided tests are the same test.
//
// Alternatives: two-sided uses X² against χ²₁ (critical value χ²₁,₁₋α). For
// Greater and Less the statistic reported is the signed root
// sign(p1 − p2)·√X² with its normal one-sided tail (DF is then 0), the
// usual one-sided version of the test.
//
// Yates' continuity-corrected variant is the separate, opt-in test Yates
// (off by default because the correction makes the test conservative).
//
// Degenerate case: when every unit has the same outcome (no events at all,
// or no non-events) an expected count is 0 and X² is 0/0; it is defined as
// X² = 0, p = 1. The test applies only to δ = 0.
var PearsonChiSquareTest = TestMethod{
	Key:        "pearson-chi-square-test",
	Name:       "Pearson chi-square",
	Citation:   "Pearson K (1900). On the criterion that a given system of deviations from the probable in the case of a correlated system of variables is such that it can be reasonably supposed to have arisen from random sampling. Philosophical Magazine (5th series) 50:157–175.",
	Definition: "X² = Σ (O − E)²/E over the four cells, E = row total × column total / N; χ² with 1 df (signed root and normal tail for one-sided alternatives)",
	Scale:      Difference,
	Run:        pearsonRun,
}

func pearsonRun(c Counts, h Hypothesis) TestResult {
	d, recip := tableDeviation(c)
	return chiSquareResult(d*d*recip, d, h, "pearson-chi-square-test", "Pearson chi-square", "X²")
}

// tableDeviation returns O − E for the first group's events (the other
// three cells deviate by the same amount with alternating signs) and
// Σ 1/E over the four cells. With a zero column total it returns (0, 0):
// the degenerate table documented on PearsonChiSquare.
func tableDeviation(c Counts) (d, recip float64) {
	n1, n2 := float64(c.N1), float64(c.N2)
	events := float64(c.X1) + float64(c.X2)
	nn := n1 + n2
	nonEvents := nn - events
	if events == 0 || nonEvents == 0 {
		return 0, 0
	}
	// O − E = x1 − n1·events/N = (x1·n2 − x2·n1)/N, exact for counts up
	// to 2^26 and free of the cancellation in x1 − E otherwise.
	d = (float64(c.X1)*n2 - float64(c.X2)*n1) / nn
	recip = nn * (1/(n1*events) + 1/(n1*nonEvents) + 1/(n2*events) + 1/(n2*nonEvents))
	return d, recip
}

// chiSquareResult fills a TestResult for a one-degree-of-freedom statistic
// x2 whose signed root has the sign of dev (see PearsonChiSquare for the
// one-sided convention).
func chiSquareResult(x2, dev float64, h Hypothesis, key, name, stat string) TestResult {
	r := TestResult{Method: key, MethodName: name, Scale: Difference}
	if h.Alternative == TwoSided {
		crit := sq(h.critical()) // χ²₁ quantile = z²
		r.StatisticName, r.Statistic, r.DF, r.CriticalValue = stat, x2, 1, &crit
		r.PValue, r.LogPValue = special.ChiSquare1UpperTail(x2)
	} else {
		z := math.Copysign(math.Sqrt(x2), dev)
		crit := h.critical()
		r.StatisticName, r.Statistic, r.CriticalValue = "signed √"+stat, z, &crit
		r.PValue, r.LogPValue = normalPValue(z, h.Alternative)
	}
	r.decide(h)
	return r
}
