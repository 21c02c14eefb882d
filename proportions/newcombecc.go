package proportions

// NewcombeCC is Newcombe's hybrid score interval for π1 − π2 built from the
// continuity-corrected Wilson limits of each group (see WilsonCC), combined
// by the same rule as Newcombe:
//
//	lower = p1 − p2 − √((p1 − l1)² + (u2 − p2)²),
//	upper = p1 − p2 + √((u1 − p1)² + (p2 − l2)²).
//
// Method 11 of Newcombe RG (1998), "Interval estimation for the difference
// between independent proportions: comparison of eleven methods",
// Statistics in Medicine 17:873–890. It is wider and more conservative than
// method 10, for users whose rule is that coverage must not fall below the
// nominal level.
var NewcombeCC = IntervalMethod{
	Key:        "newcombe-cc",
	Name:       "Newcombe hybrid score with continuity correction",
	Scale:      Difference,
	Citation:   "Newcombe RG (1998). Interval estimation for the difference between independent proportions: comparison of eleven methods. Statistics in Medicine 17:873–890 (method 11).",
	Definition: "Newcombe's hybrid rule applied to continuity-corrected Wilson limits (li, ui): p1 − p2 − √((p1−l1)² + (u2−p2)²) to p1 − p2 + √((u1−p1)² + (p2−l2)²)",
	Symmetric:  true,
	Limits:     newcombeCCLimits,
}

func newcombeCCLimits(c Counts, conf Confidence) (lower, upper float64) {
	l1, u1 := wilsonCCAt(c.X1, c.N1, conf.Z)
	l2, u2 := wilsonCCAt(c.X2, c.N2, conf.Z)
	return hybridLimits(c, l1, u1, l2, u2)
}
