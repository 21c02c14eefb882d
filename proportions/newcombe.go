package proportions

import "math"

// Newcombe is the hybrid score interval for π1 − π2 built from each group's
// Wilson interval (l1, u1) and (l2, u2):
//
//	lower = p1 − p2 − √((p1 − l1)² + (u2 − p2)²),
//	upper = p1 − p2 + √((u1 − p1)² + (p2 − l2)²).
//
// Method 10 of Newcombe RG (1998), "Interval estimation for the difference
// between independent proportions: comparison of eleven methods",
// Statistics in Medicine 17:873–890. It needs no iteration, stays inside
// [−1, 1], and its coverage is close to nominal.
var Newcombe = IntervalMethod{
	Key:        "newcombe",
	Name:       "Newcombe hybrid score",
	Scale:      Difference,
	Citation:   "Newcombe RG (1998). Interval estimation for the difference between independent proportions: comparison of eleven methods. Statistics in Medicine 17:873–890 (method 10).",
	Definition: "from Wilson limits (li, ui): p1 − p2 − √((p1−l1)² + (u2−p2)²) to p1 − p2 + √((u1−p1)² + (p2−l2)²)",
	Symmetric:  true,
	Limits:     newcombeLimits,
}

func newcombeLimits(c Counts, conf Confidence) (lower, upper float64) {
	l1, u1 := wilsonAt(c.X1, c.N1, conf.Z)
	l2, u2 := wilsonAt(c.X2, c.N2, conf.Z)
	return hybridLimits(c, l1, u1, l2, u2)
}

// hybridLimits combines the two groups' single-proportion limits by
// Newcombe's square-and-add rule. Which combinations are used follows from
// where each difference is largest: the lower limit pairs group 1's lower
// with group 2's upper distance, and vice versa.
func hybridLimits(c Counts, l1, u1, l2, u2 float64) (lower, upper float64) {
	p1, p2 := c.P1(), c.P2()
	d := p1 - p2
	lower = d - math.Sqrt(sq(p1-l1)+sq(u2-p2))
	upper = d + math.Sqrt(sq(u1-p1)+sq(p2-l2))
	return lower, upper
}

func sq(v float64) float64 { return v * v }
