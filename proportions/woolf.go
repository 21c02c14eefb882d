package proportions

import "math"

// Woolf is the logit (Wald on the log scale) interval for the odds ratio
// ψ = π1(1−π2) / (π2(1−π1)), with cells a = x1, b = n1 − x1, c = x2,
// d = n2 − x2:
//
//	exp(log(ad/(bc)) ± z·√(1/a + 1/b + 1/c + 1/d)).
//
// Woolf B (1955), "On estimating the relation between blood group and
// disease", Annals of Human Genetics 19:251–253.
//
// Zero cells: when any cell is zero the log odds ratio or its variance is
// infinite and the formula carries no information, so the interval is
// reported as the whole range [0, ∞]; use the Gart-adjusted, score or exact
// intervals there.
var Woolf = IntervalMethod{
	Key:        "woolf-odds-ratio",
	Name:       "Woolf logit",
	Scale:      OddsRatio,
	Symmetric:  true,
	Citation:   "Woolf B (1955). On estimating the relation between blood group and disease. Annals of Human Genetics 19:251–253.",
	Definition: "exp(log(ad/(bc)) ± z·√(1/a + 1/b + 1/c + 1/d)) with a = x1, b = n1 − x1, c = x2, d = n2 − x2; [0, ∞] when a cell is zero",
	Limits:     woolfLimits,
}

func woolfLimits(c Counts, conf Confidence) (lower, upper float64) {
	a, b := float64(c.X1), float64(c.N1-c.X1)
	cc, d := float64(c.X2), float64(c.N2-c.X2)
	if a == 0 || b == 0 || cc == 0 || d == 0 {
		return 0, math.Inf(1)
	}
	return logOddsRatioLimits(a, b, cc, d, conf.Z)
}

// logOddsRatioLimits returns exp(log(ad/(bc)) ± z·√(1/a + 1/b + 1/c + 1/d))
// for positive (possibly fractional) cells.
func logOddsRatioLimits(a, b, c, d, z float64) (lower, upper float64) {
	l := math.Log(a) + math.Log(d) - math.Log(b) - math.Log(c)
	se := math.Sqrt(1/a + 1/b + 1/c + 1/d)
	return math.Exp(l - z*se), math.Exp(l + z*se)
}
