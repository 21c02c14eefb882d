package proportions

import "math"

// YatesTest is Pearson's chi-square test with Yates' continuity correction:
// each cell's deviation is shrunk by ½ towards 0, never past it,
//
//	X²_Y = Σ max(0, |O − E| − ½)² / E,
//
// with one degree of freedom. Yates F (1934), "Contingency tables involving
// small numbers and the χ² test", Supplement to the Journal of the Royal
// Statistical Society 1:217–235. Capping the ½ shift at |O − E| (so a
// table with |O − E| < ½ gets X²_Y = 0, p = 1) follows SciPy's convention.
//
// It is opt-in (ContinuityCorrected; Analyze runs it only with
// WithYatesTest(true)): the correction makes the test
// conservative, its actual size well below α for usual designs, so it
// loses power against the uncorrected test, which keeps close to α. It is
// offered for users whose protocols prescribe it. The one-sided and
// degenerate conventions are those of PearsonChiSquare.
var YatesTest = TestMethod{
	Key:                 "yates-test",
	Name:                "Chi-square with Yates' correction",
	Citation:            "Yates F (1934). Contingency tables involving small numbers and the χ² test. Supplement to the Journal of the Royal Statistical Society 1:217–235.",
	Definition:          "X²_Y = Σ max(0, |O − E| − ½)²/E over the four cells; χ² with 1 df (signed root for one-sided alternatives)",
	Scale:               Difference,
	ContinuityCorrected: true,
	Run:                 yatesRun,
}

func yatesRun(c Counts, h Hypothesis) TestResult {
	d, recip := tableDeviation(c)
	shrunk := math.Max(0, math.Abs(d)-0.5)
	return chiSquareResult(shrunk*shrunk*recip, d, h, "yates-test", "Chi-square with Yates' correction", "X²")
}
