package strata

import (
	"math"

	"github.com/propscope/propscope/internal/special"
	"github.com/propscope/propscope/proportions"
)

// Keys of the tests of no association.
const (
	CMHKey          = "cochran-mantel-haenszel-test"
	CMHCorrectedKey = "cochran-mantel-haenszel-corrected-test"
)

const cmhCitation = "Cochran WG (1954). Some methods for strengthening the common χ² tests. Biometrics 10:417–451; " +
	"Mantel N, Haenszel W (1959). Statistical aspects of the analysis of data from retrospective studies of disease. " +
	"Journal of the National Cancer Institute 22:719–748."

// cmhSums are the three sums of the Cochran–Mantel–Haenszel test over the
// usable strata: the events in the first group, their expectation and
// their variance given every stratum's margins.
type cmhSums struct{ observed, expected, variance float64 }

func newCMHSums(ts []table) cmhSums {
	var s cmhSums
	for _, t := range ts {
		s.observed += t.a
		s.expected += t.n1 * t.m1 / t.n
		if t.n > 1 {
			s.variance += t.n1 * t.n2 * t.m1 * t.m0 / (t.n * t.n * (t.n - 1))
		}
	}
	return s
}

// cochranMantelHaenszel is the Cochran–Mantel–Haenszel test of no
// association in any stratum (π1 = π2 in every stratum), against a common
// direction of effect. Given each stratum's margins, its x1 is
// hypergeometric with mean E = n1·m1/n and variance
// V = n1·n2·m1·m0/(n²(n−1)) (m1 events, m0 non-events, n = n1 + n2); with
// S = Σx1, E = ΣE and V = ΣV over the strata,
//
//	two-sided: X² = (S − E)²/V, or (|S − E| − ½)²/V with the continuity
//	correction (0 when |S − E| < ½), referred to χ² with 1 df;
//	greater: p = P(Z ≥ (S − E − c)/√V); less: p = P(Z ≤ (S − E + c)/√V),
//	with c = ½ when corrected and 0 otherwise.
//
// Cochran WG (1954), "Some methods for strengthening the common χ²
// tests", Biometrics 10:417–451; Mantel N, Haenszel W (1959), "Statistical
// aspects of the analysis of data from retrospective studies of disease",
// Journal of the National Cancer Institute 22:719–748 (the form with n − 1
// and the correction). With one stratum the uncorrected X² is Pearson's
// chi-square times (n − 1)/n. Strata of one unit carry no variance and add
// nothing. When V = 0 (no stratum has both events and non-events) the
// test has no information: X² = 0 and p = 1.
func cochranMantelHaenszel(ts []table, alt proportions.Alternative, corrected bool) Test {
	s := newCMHSums(ts)
	t := Test{Key: CMHKey, Name: "Cochran–Mantel–Haenszel", StatisticName: "X²", DF: 1, Alternative: alt,
		Citation:   cmhCitation,
		Definition: "X² = (Σx1 − ΣE)²/ΣV, E = n1·m1/n and V = n1·n2·m1·m0/(n²(n−1)) per stratum, χ² with 1 df; one-sided: z = (Σx1 − ΣE)/√ΣV"}
	c := 0.0
	if corrected {
		t.Key, t.Name, c = CMHCorrectedKey, "Cochran–Mantel–Haenszel with continuity correction", 0.5
		t.Definition = "X² = (|Σx1 − ΣE| − ½)²/ΣV, E = n1·m1/n and V = n1·n2·m1·m0/(n²(n−1)) per stratum, χ² with 1 df; one-sided: z = (Σx1 − ΣE ∓ ½)/√ΣV"
	}
	if s.variance <= 0 {
		t.PValue, t.LogPValue = 1, 0
		return t
	}
	dev := s.observed - s.expected
	sd := math.Sqrt(s.variance)
	switch alt {
	case proportions.Greater:
		t.StatisticName, t.DF = "z", 0
		t.Statistic = (dev - c) / sd
		t.PValue, t.LogPValue = special.NormalUpperTail(t.Statistic)
	case proportions.Less:
		t.StatisticName, t.DF = "z", 0
		t.Statistic = (dev + c) / sd
		t.PValue, t.LogPValue = special.NormalUpperTail(-t.Statistic)
	default:
		e := math.Max(0, math.Abs(dev)-c)
		t.Statistic = e * e / s.variance
		t.PValue, t.LogPValue = special.ChiSquare1UpperTail(t.Statistic)
	}
	return t
}
