package strata

import (
	"math"

	"github.com/propscope/propscope/proportions"
)

// ScoreKey is the key of the stratified score interval for the difference.
const ScoreKey = "stratified-miettinen-nurminen"

// scoreStatistic is Miettinen and Nurminen's stratified score statistic
// for a common difference δ:
//
//	Z(δ) = Σ w·(p1 − p2 − δ) / √(Σ w²·Ṽ(δ)),
//	Ṽ(δ) = n/(n−1)·(π̃1(1−π̃1)/n1 + π̃2(1−π̃2)/n2),
//
// with (π̃1, π̃2) each stratum's maximum-likelihood estimate under
// π1 − π2 = δ (proportions.RestrictedMLE) and the Cochran–Mantel–Haenszel
// weights w = n1·n2/n. With these weights Z(0)² is the uncorrected
// Cochran–Mantel–Haenszel statistic, so the interval that inverts Z
// excludes 0 exactly when that test rejects. A zero denominator (every
// restricted fit at 0 or 1) gives ±Inf by the sign of the numerator, or 0.
func scoreStatistic(ts []table, delta float64) float64 {
	var num, v float64
	for _, t := range ts {
		w := t.weight()
		num += w * (t.difference() - delta)
		p1, p2 := proportions.RestrictedMLE(t.counts, delta)
		v += w * w * t.n / (t.n - 1) * (p1*(1-p1)/t.n1 + p2*(1-p2)/t.n2)
	}
	switch {
	case v > 0:
		return num / math.Sqrt(v)
	case num == 0:
		return 0
	}
	return math.Copysign(math.Inf(1), num)
}

// stratifiedScore is Miettinen and Nurminen's stratified score interval
// for the common difference: the δ with |Z(δ)| ≤ z (see scoreStatistic),
// centred on the Mantel–Haenszel difference (where Z = 0), which it reports
// as its estimate. Miettinen O, Nurminen M (1985), "Comparative analysis of
// two rates", Statistics in Medicine 4:213–226 (the stratified form, with
// the weights w = n1·n2/n of the Cochran–Mantel–Haenszel test rather than
// the paper's own variance-based weights, so that the interval and the
// test agree). Each limit is found by bisection on [−1, RD] and [RD, 1] to
// 1e−12; with one stratum the interval is the single-table
// Miettinen–Nurminen interval (proportions.MiettinenNurminen).
func stratifiedScore(ts []table, conf proportions.Confidence) Estimate {
	rd, _ := mhDifference(ts)
	e := Estimate{Key: ScoreKey, Name: "Stratified Miettinen–Nurminen score", Scale: proportions.Difference, Level: conf.Level,
		Estimate: rd,
		Citation: "Miettinen O, Nurminen M (1985). Comparative analysis of two rates. Statistics in Medicine 4:213–226 (stratified form; weights n1·n2/n).",
		Definition: "the δ with |Σw(p1 − p2 − δ)| ≤ z·√(Σw²·n/(n−1)·(π̃1(1−π̃1)/n1 + π̃2(1−π̃2)/n2)), w = n1·n2/n, " +
			"(π̃1, π̃2) each stratum's MLE under π1 − π2 = δ"}
	z := conf.Z
	e.Lower = crossing(func(d float64) float64 { return scoreStatistic(ts, d) - z }, -1, rd)
	e.Upper = crossing(func(d float64) float64 { return scoreStatistic(ts, d) + z }, rd, 1)
	return e
}

// crossing returns where the nonincreasing g falls through 0 on [lo, hi]:
// lo when g(lo) ≤ 0, hi when g(hi) ≥ 0, else by bisection to 1e−12.
func crossing(g func(float64) float64, lo, hi float64) float64 {
	if g(lo) <= 0 {
		return lo
	}
	if g(hi) >= 0 {
		return hi
	}
	for hi-lo > 1e-12 {
		mid := lo + (hi-lo)/2
		if g(mid) > 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	return lo + (hi-lo)/2
}
