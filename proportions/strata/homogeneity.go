package strata

import (
	"math"

	"github.com/propscope/propscope/internal/special"
	"github.com/propscope/propscope/proportions"
)

// Keys of the homogeneity tests.
const (
	BreslowDayTaroneKey = "breslow-day-tarone-test"
	CochranQKey         = "cochran-q-difference-test"
)

// fittedEvents returns A, the first group's events in a stratum that has
// odds ratio psi with the stratum's margins: the A in [lo, hi] with
// A·(n2 − m1 + A) = ψ·(n1 − A)·(m1 − A), found by bisection (the left side
// minus the right grows with A).
func fittedEvents(t table, psi float64) float64 {
	lo, hi := math.Max(0, t.m1-t.n2), math.Min(t.n1, t.m1)
	f := func(a float64) float64 { return a*(t.n2-t.m1+a) - psi*(t.n1-a)*(t.m1-a) }
	for range 200 {
		mid := lo + (hi-lo)/2
		if mid == lo || mid == hi {
			break
		}
		if f(mid) < 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	return lo + (hi-lo)/2
}

// informative reports whether a stratum's margins allow more than one table
// (events and non-events both present), so that it carries information
// about its odds ratio.
func (t table) informative() bool { return t.m1 > 0 && t.m0 > 0 }

// breslowDayTarone is the Breslow–Day test of a common odds ratio across
// strata with Tarone's correction. With ψ the Mantel–Haenszel odds ratio,
// each informative stratum's fitted events A solve
// A·(n2 − m1 + A) = ψ·(n1 − A)·(m1 − A) within the margins, and
// V = 1/(1/A + 1/(n1 − A) + 1/(m1 − A) + 1/(n2 − m1 + A)); then
//
//	X² = Σ (a − A)²/V − (Σa − ΣA)²/ΣV,
//
// referred to χ² with K − 1 df (K informative strata). Breslow NE, Day NE
// (1980), Statistical Methods in Cancer Research, Vol. I: The Analysis of
// Case-Control Studies, IARC Scientific Publications 32, Lyon; the
// correction: Tarone RE (1985), "On heterogeneity tests based on efficient
// scores", Biometrika 72:91–95. ok is false when it cannot be computed:
// fewer than two informative strata, or ψ is 0, ∞ or not estimable.
func breslowDayTarone(ts []table, psi float64, level float64) (Test, bool) {
	t := Test{Key: BreslowDayTaroneKey, Name: "Breslow–Day with Tarone's correction", StatisticName: "X²",
		Alternative: proportions.TwoSided,
		Citation: "Breslow NE, Day NE (1980). Statistical Methods in Cancer Research, Vol. I. IARC Scientific Publications 32. " +
			"Correction: Tarone RE (1985). On heterogeneity tests based on efficient scores. Biometrika 72:91–95.",
		Definition: "X² = Σ(a − A)²/V − (Σa − ΣA)²/ΣV, A the first group's events fitted at the Mantel–Haenszel odds ratio within each stratum's margins, " +
			"V = 1/(1/A + 1/(n1−A) + 1/(m1−A) + 1/(n2−m1+A)); χ² with K − 1 df"}
	if !(psi > 0) || math.IsInf(psi, 1) {
		return t, false
	}
	var bd, dev, vsum float64
	k := 0
	for _, s := range ts {
		if !s.informative() {
			continue
		}
		a := fittedEvents(s, psi)
		v := 1 / (1/a + 1/(s.n1-a) + 1/(s.m1-a) + 1/(s.n2-s.m1+a))
		if !(v > 0) {
			continue
		}
		k++
		bd += (s.a - a) * (s.a - a) / v
		dev += s.a - a
		vsum += v
	}
	if k < 2 {
		return t, false
	}
	t.Statistic = math.Max(0, bd-dev*dev/vsum)
	t.DF = k - 1
	t.PValue, t.LogPValue = special.ChiSquareUpperTail(t.Statistic, t.DF)
	t.decide(level)
	return t, true
}

// cochranQ is Cochran's test of homogeneity of the differences: with each
// stratum's difference d = p1 − p2, its variance v = p1(1−p1)/n1 +
// p2(1−p2)/n2, weights w = 1/v and the weighted mean d̄ = Σw·d/Σw,
//
//	Q = Σ w·(d − d̄)²,
//
// referred to χ² with K − 1 df. Cochran WG (1954), "The combination of
// estimates from different experiments", Biometrics 10:101–129. A stratum
// with v = 0 (both rates 0 or 1) has no finite weight and is left out
// (skipped reports how many); ok is false with fewer than two strata left.
func cochranQ(ts []table, level float64) (t Test, skipped int, ok bool) {
	t = Test{Key: CochranQKey, Name: "Cochran's Q for the difference", StatisticName: "Q", Alternative: proportions.TwoSided,
		Citation:   "Cochran WG (1954). The combination of estimates from different experiments. Biometrics 10:101–129.",
		Definition: "Q = Σw(d − d̄)², d = p1 − p2, w = 1/(p1(1−p1)/n1 + p2(1−p2)/n2), d̄ = Σwd/Σw; χ² with K − 1 df"}
	var sw, swd float64
	var ws, ds []float64
	for _, s := range ts {
		p1, p2 := s.a/s.n1, s.c/s.n2
		v := p1*(1-p1)/s.n1 + p2*(1-p2)/s.n2
		if !(v > 0) {
			skipped++
			continue
		}
		ws, ds = append(ws, 1/v), append(ds, p1-p2)
		sw += 1 / v
		swd += (p1 - p2) / v
	}
	k := len(ws)
	if k < 2 {
		return t, skipped, false
	}
	mean, q := swd/sw, 0.0
	for i, w := range ws {
		q += w * (ds[i] - mean) * (ds[i] - mean)
	}
	t.Statistic = q
	t.DF = k - 1
	t.PValue, t.LogPValue = special.ChiSquareUpperTail(t.Statistic, t.DF)
	t.decide(level)
	return t, skipped, true
}
