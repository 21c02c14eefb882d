package proportions

import "math"

// Wald is the simple asymptotic interval for π1 − π2:
//
//	p1 − p2 ± z·√(p1(1−p1)/n1 + p2(1−p2)/n2).
//
// Method 1 of Newcombe RG (1998), "Interval estimation for the difference
// between independent proportions: comparison of eleven methods",
// Statistics in Medicine 17:873–890. It is the textbook interval; it
// undercovers badly at small n and near 0 or 1, and collapses to a single
// point when both proportions are 0 or 1.
var Wald = IntervalMethod{
	Key:        "wald",
	Name:       "Wald",
	Scale:      Difference,
	Citation:   "Newcombe RG (1998). Interval estimation for the difference between independent proportions: comparison of eleven methods. Statistics in Medicine 17:873–890 (method 1).",
	Definition: "p1 − p2 ± z·√(p1(1−p1)/n1 + p2(1−p2)/n2)",
	Symmetric:  true,
	Limits:     waldLimits,
}

func waldLimits(c Counts, conf Confidence) (lower, upper float64) {
	p1, p2 := c.P1(), c.P2()
	se := math.Sqrt(p1*(1-p1)/float64(c.N1) + p2*(1-p2)/float64(c.N2))
	d := p1 - p2
	return d - conf.Z*se, d + conf.Z*se
}
