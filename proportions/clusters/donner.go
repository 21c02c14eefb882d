package clusters

import "github.com/propscope/propscope/proportions"

// DonnerTest is Donner's adjusted chi-square test of π1 = π2:
//
//	X² = Σ_i N_i (p_i − p)² / (C_i·p(1 − p)),
//	C_i = Σ_j n_ij (1 + (n_ij − 1)·ρ) / N_i,
//
// p = X/N the pooled unit-level rate and ρ the pooled ANOVA estimate of the
// intracluster correlation (0 where negative or not defined), on one
// degree of freedom (signed root for a one-sided alternative). Donner A
// (1989), "Statistical methods in ophthalmology: an adjusted chi-square
// approach", Biometrics 45:605–611. With ρ = 0, or every cluster of one
// unit, it is Pearson's chi-square.
var DonnerTest = TestMethod{
	Key:        "donner-test",
	Name:       "Donner adjusted chi-square",
	Citation:   "Donner A (1989). Statistical methods in ophthalmology: an adjusted chi-square approach. Biometrics 45:605–611.",
	Definition: "X² = Σ N_i (p_i − p)²/(C_i·p(1−p)), C_i = Σ_j n_ij(1 + (n_ij − 1)ρ)/N_i with ρ the pooled ANOVA estimate; χ² with 1 df",
	Run:        donnerRun,
}

func donnerRun(s Summary, h proportions.Hypothesis) proportions.TestResult {
	c1, c2 := designEffects(s)
	g1, g2 := s.Group1, s.Group2
	p1, p2 := g1.Rate(), g2.Rate()
	n1, n2 := float64(g1.Trials), float64(g2.Trials)
	p := float64(g1.Events+g2.Events) / (n1 + n2)
	x2 := 0.0
	if p > 0 && p < 1 {
		x2 = (n1*sq(p1-p)/c1 + n2*sq(p2-p)/c2) / (p * (1 - p))
	}
	return chiSquareResult("donner-test", "Donner adjusted chi-square", x2, p1-p2, h)
}
