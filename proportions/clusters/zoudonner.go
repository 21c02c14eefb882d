package clusters

import "github.com/propscope/propscope/proportions"

// ZouDonner is the interval for π1 − π2 that joins each group's Wilson
// score limits, computed from its effective size N_i/D_i, by Newcombe's
// square-and-add rule (the method of variance estimates recovery, MOVER):
//
//	(l_i, u_i) = Wilson limits for p_i with n = N_i/D_i,
//	lower = p1 − p2 − √((p1 − l1)² + (u2 − p2)²),
//	upper = p1 − p2 + √((u1 − p1)² + (p2 − l2)²),
//
// D_i the design effect from the pooled ANOVA estimate of ρ (as in
// DesignEffectWald). Zou GY, Donner A (2004), "A simple alternative
// confidence interval for the difference between two proportions",
// Controlled Clinical Trials 25:3–12. With ρ = 0, or every cluster of one
// unit, it is Newcombe's hybrid score interval.
var ZouDonner = IntervalMethod{
	Key:        "zou-donner",
	Name:       "Zou–Donner",
	Citation:   "Zou GY, Donner A (2004). A simple alternative confidence interval for the difference between two proportions. Controlled Clinical Trials 25:3–12.",
	Definition: "Wilson limits for each p_i at the effective size N_i/D_i, joined by Newcombe's square-and-add rule: p1 − p2 − √((p1−l1)² + (u2−p2)²) to p1 − p2 + √((u1−p1)² + (p2−l2)²)",
	Limits:     zouDonnerLimits,
}

func zouDonnerLimits(s Summary, conf proportions.Confidence) (lower, upper float64) {
	d1, d2 := designEffects(s)
	return effectiveNewcombe(s, float64(s.Group1.Trials)/d1, float64(s.Group2.Trials)/d2, conf.Z)
}

// effectiveNewcombe is Newcombe's hybrid interval with Wilson limits at
// effective sizes e1, e2 and the groups' unit-level rates.
func effectiveNewcombe(s Summary, e1, e2, z float64) (lower, upper float64) {
	p1, p2 := s.Group1.Rate(), s.Group2.Rate()
	l1, u1 := wilsonLimits(p1, e1, z)
	l2, u2 := wilsonLimits(p2, e2, z)
	return newcombeCombine(p1, p2, l1, u1, l2, u2)
}
