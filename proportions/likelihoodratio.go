package proportions

import "math"

// LikelihoodRatioTest is the likelihood-ratio (G²) test of H0: π1 = π2 on the
// 2×2 table, with one degree of freedom:
//
//	G² = 2 Σ O·log(O/E),  E = row total × column total / N,
//
// over the four cells, with 0·log 0 = 0 for empty cells. Wilks SS (1938),
// "The large-sample distribution of the likelihood ratio for testing
// composite hypotheses", Annals of Mathematical Statistics 9:60–62. It is
// computed as 2 Σ E·(r·log r − r + 1), r = O/E, which is the same sum
// (Σ(O − E) = 0) in non-negative terms, so no precision is lost when O is
// close to E. One-sided alternatives and the degenerate table follow the
// conventions of PearsonChiSquare (signed root sign(p1 − p2)·√G²).
var LikelihoodRatioTest = TestMethod{
	Key:        "likelihood-ratio-chi-square-test",
	Name:       "Likelihood-ratio G² test",
	Citation:   "Wilks SS (1938). The large-sample distribution of the likelihood ratio for testing composite hypotheses. Annals of Mathematical Statistics 9:60–62.",
	Definition: "G² = 2 Σ O·log(O/E) over the four cells (0·log 0 = 0), E = row total × column total / N; χ² with 1 df (signed root for one-sided alternatives)",
	Scale:      Difference,
	Run:        likelihoodRatioRun,
}

func likelihoodRatioRun(c Counts, h Hypothesis) TestResult {
	d, _ := tableDeviation(c)
	return chiSquareResult(gSquared(c), d, h, "likelihood-ratio-chi-square-test", "Likelihood-ratio G² test", "G²")
}

// gSquared returns G² for the table (0 for the degenerate table).
func gSquared(c Counts) float64 {
	n1, n2 := float64(c.N1), float64(c.N2)
	nn := n1 + n2
	events := float64(c.X1) + float64(c.X2)
	nonEvents := nn - events
	if events == 0 || nonEvents == 0 {
		return 0
	}
	cell := func(o, row, col float64) float64 {
		e := row * col / nn
		return e * relativeEntropyTerm(o/e)
	}
	g := cell(float64(c.X1), n1, events) + cell(float64(c.N1-c.X1), n1, nonEvents) +
		cell(float64(c.X2), n2, events) + cell(float64(c.N2-c.X2), n2, nonEvents)
	return 2 * g
}

// relativeEntropyTerm returns r·log r − r + 1 ≥ 0 (1 at r = 0). Near r = 1
// it uses the series Σ_{k≥2} (−t)^k/(k(k−1)), t = r − 1, since the closed
// form loses all digits to cancellation there.
func relativeEntropyTerm(r float64) float64 {
	if r == 0 {
		return 1
	}
	t := r - 1
	if math.Abs(t) > 0.01 {
		return r*math.Log(r) - t
	}
	sum, pow := 0.0, -t
	for k := 2.0; k <= 10; k++ {
		pow *= -t
		sum += pow / (k * (k - 1))
	}
	return sum
}
