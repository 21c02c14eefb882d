package clusters

import (
	"github.com/propscope/propscope/proportions"
)

// RaoScottCitation is the source of the Rao–Scott design effects.
const RaoScottCitation = "Rao JNK, Scott AJ (1992). A simple method for the analysis of clustered binary data. Biometrics 48:577–585."

// raoScottDesignEffect is group i's design effect as Rao & Scott (1992)
// estimate it, from the ratio-estimator variance of its rate:
//
//	v = m/(m − 1) · Σ_j (x_j − p·n_j)² / N²,  d = v·N / (p(1 − p)).
//
// Our conventions, where the formula breaks down: d = 1 when p is 0 or 1
// (no variance to compare), and d at least 1/N, so that a variance
// estimate of exactly 0 (every cluster at the group's rate) gives an
// effective size of N² units rather than an infinite one.
func raoScottDesignEffect(g GroupSummary) float64 {
	p := g.Rate()
	n, m := float64(g.Trials), float64(g.Clusters)
	if p <= 0 || p >= 1 {
		return 1
	}
	squares := nonNegative(g.SumSquaredEvents - 2*p*g.SumEventsTrials + p*p*g.SumSquaredTrials)
	v := m / (m - 1) * squares / (n * n)
	return max(v*n/(p*(1-p)), 1/n)
}

// RaoScottTest is the Rao–Scott adjusted chi-square test of π1 = π2:
// Pearson's chi-square on the table of effective counts x_i/d_i of
// N_i/d_i units, d_i each group's design effect estimated from the
// variation of its clusters' counts (v_i = m_i/(m_i − 1)·Σ_j (x_ij −
// p_i n_ij)²/N_i², d_i = v_i·N_i/(p_i(1 − p_i))). For two groups this is
//
//	X² = (p1 − p2)² / (p̃(1 − p̃)·(d1/N1 + d2/N2)),  p̃ = Σ (x_i/d_i) / Σ (N_i/d_i),
//
// on one degree of freedom (signed root for a one-sided alternative).
// Rao JNK, Scott AJ (1992), Biometrics 48:577–585. It needs no common ρ
// and no model; with every cluster of one unit d_i = N_i/(N_i − 1), so it
// is Pearson's test on counts scaled by (N_i − 1)/N_i.
var RaoScottTest = TestMethod{
	Key:        "rao-scott-test",
	Name:       "Rao–Scott adjusted chi-square",
	Citation:   RaoScottCitation,
	Definition: "Pearson's X² on the effective counts x_i/d_i of N_i/d_i units, d_i = v_i·N_i/(p_i(1−p_i)), v_i = m_i/(m_i−1)·Σ (x_ij − p_i·n_ij)²/N_i²; χ² with 1 df",
	Run:        raoScottRun,
}

func raoScottRun(s Summary, h proportions.Hypothesis) proportions.TestResult {
	d1, d2 := raoScottDesignEffect(s.Group1), raoScottDesignEffect(s.Group2)
	return chiSquareResult("rao-scott-test", "Rao–Scott adjusted chi-square", effectivePearson(s, d1, d2), s.Group1.Rate()-s.Group2.Rate(), h)
}

// effectivePearson is Pearson's X² on the effective counts x_i/d_i of
// N_i/d_i units: Σ_i (N_i/d_i)(p_i − p̃)² / (p̃(1 − p̃)), with p̃ the
// effective pooled rate; 0 when p̃ is 0 or 1 (no events, or no
// non-events: the degenerate table, p = 1, as in Pearson's test).
func effectivePearson(s Summary, d1, d2 float64) float64 {
	p1, p2 := s.Group1.Rate(), s.Group2.Rate()
	e1, e2 := float64(s.Group1.Trials)/d1, float64(s.Group2.Trials)/d2
	pooled := (e1*p1 + e2*p2) / (e1 + e2)
	if pooled <= 0 || pooled >= 1 {
		return 0
	}
	return (e1*sq(p1-pooled) + e2*sq(p2-pooled)) / (pooled * (1 - pooled))
}

func sq(v float64) float64 { return v * v }

// RaoScottNewcombe is Newcombe's hybrid score interval with each group's
// Wilson limits computed from its Rao–Scott effective size N_i/d_i:
//
//	(l_i, u_i) = Wilson limits for p_i with n = N_i/d_i,
//	lower = p1 − p2 − √((p1 − l1)² + (u2 − p2)²),
//	upper = p1 − p2 + √((u1 − p1)² + (p2 − l2)²),
//
// the effective sizes of Rao JNK, Scott AJ (1992), Biometrics 48:577–585,
// joined by method 10 of Newcombe RG (1998), Statistics in Medicine
// 17:873–890. Unlike ZouDonner it lets each group have its own design
// effect, estimated without a common ρ.
var RaoScottNewcombe = IntervalMethod{
	Key:        "rao-scott-newcombe",
	Name:       "Rao–Scott Newcombe",
	Citation:   RaoScottCitation + " Combined by: Newcombe RG (1998). Interval estimation for the difference between independent proportions: comparison of eleven methods. Statistics in Medicine 17:873–890 (method 10).",
	Definition: "Wilson limits for each p_i at the Rao–Scott effective size N_i/d_i, joined by Newcombe's square-and-add rule",
	Limits:     raoScottNewcombeLimits,
}

func raoScottNewcombeLimits(s Summary, conf proportions.Confidence) (lower, upper float64) {
	d1, d2 := raoScottDesignEffect(s.Group1), raoScottDesignEffect(s.Group2)
	return effectiveNewcombe(s, float64(s.Group1.Trials)/d1, float64(s.Group2.Trials)/d2, conf.Z)
}
