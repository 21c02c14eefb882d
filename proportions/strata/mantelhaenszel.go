package strata

import (
	"math"

	"github.com/propscope/propscope/proportions"
)

// Keys of the Mantel–Haenszel common estimates.
const (
	SatoKey            = "mantel-haenszel-sato"
	GreenlandRobinsKey = "mantel-haenszel-greenland-robins"
	MHRatioKey         = "mantel-haenszel-ratio"
	MHOddsRatioKey     = "mantel-haenszel-odds-ratio"
)

const (
	greenlandRobins = "Greenland S, Robins JM (1985). Estimation of a common effect parameter from sparse follow-up data. Biometrics 41:55–68."
	sato            = "Sato T (1989). On the variance estimator for the Mantel-Haenszel risk difference. Biometrics 45:1323–1324."
	mantelHaenszel  = "Mantel N, Haenszel W (1959). Journal of the National Cancer Institute 22:719–748"
	rbg             = "Robins J, Breslow N, Greenland S (1986). Estimators of the Mantel-Haenszel variance consistent in both sparse data and large-strata limiting models. Biometrics 42:311–323."
)

// mhDifference returns the Mantel–Haenszel common difference
// Σ w·(p1 − p2)/Σ w with w = n1·n2/n (each stratum's difference weighted
// by the Cochran–Mantel–Haenszel weight), and W = Σ w.
func mhDifference(ts []table) (rd, w float64) {
	var num float64
	for _, t := range ts {
		num += (t.a*t.n2 - t.c*t.n1) / t.n
		w += t.weight()
	}
	return num / w, w
}

// satoDifference is the Mantel–Haenszel common difference with Sato's
// variance, which holds both with many small strata and with a few large
// ones:
//
//	RD = Σ (a·n2 − c·n1)/n / Σ n1·n2/n
//	Var = (RD·ΣP + ΣQ)/(Σ n1·n2/n)²,
//	P = (n1²·c − n2²·a + n1·n2·(n2 − n1)/2)/n²,  Q = (a·(n2 − c) + c·(n1 − a))/(2n),
//
// and the interval RD ± z·√Var, clipped to [−1, 1]. With one stratum RD is
// p1 − p2 and Var is p1(1−p1)/n1 + p2(1−p2)/n2. Estimate: Greenland S,
// Robins JM (1985), Biometrics 41:55–68; variance: Sato T (1989), "On the
// variance estimator for the Mantel-Haenszel risk difference", Biometrics
// 45:1323–1324.
func satoDifference(ts []table, conf proportions.Confidence) Estimate {
	rd, w := mhDifference(ts)
	var p, q float64
	for _, t := range ts {
		p += (t.n1*t.n1*t.c - t.n2*t.n2*t.a + t.n1*t.n2*(t.n2-t.n1)/2) / (t.n * t.n)
		q += (t.a*(t.n2-t.c) + t.c*(t.n1-t.a)) / (2 * t.n)
	}
	v := math.Max(0, (rd*p+q)/(w*w))
	e := Estimate{Key: SatoKey, Name: "Mantel–Haenszel difference, Sato variance", Scale: proportions.Difference,
		Citation:   greenlandRobins + " Variance: " + sato,
		Definition: "RD = Σ(a·n2 − c·n1)/n ÷ Σ n1·n2/n; Var = (RD·ΣP + ΣQ)/(Σ n1·n2/n)², P = (n1²c − n2²a + n1n2(n2 − n1)/2)/n², Q = (a(n2 − c) + c(n1 − a))/(2n); RD ± z√Var"}
	return differenceInterval(e, rd, v, conf)
}

// greenlandRobinsDifference is the Mantel–Haenszel common difference with
// Greenland and Robins' variance, which holds when the strata are few and
// large:
//
//	Var = Σ w²·(p1(1−p1)/n1 + p2(1−p2)/n2) / (Σ w)²,  w = n1·n2/n,
//
// that is Σ (a·b·n2³ + c·d·n1³)/(n1·n2·n²) / (Σ n1·n2/n)² in the paper's
// form, and the interval RD ± z·√Var clipped to [−1, 1]. Greenland S,
// Robins JM (1985), "Estimation of a common effect parameter from sparse
// follow-up data", Biometrics 41:55–68.
func greenlandRobinsDifference(ts []table, conf proportions.Confidence) Estimate {
	rd, w := mhDifference(ts)
	var v float64
	for _, t := range ts {
		v += (t.a*t.b*t.n2*t.n2*t.n2 + t.c*t.d*t.n1*t.n1*t.n1) / (t.n1 * t.n2 * t.n * t.n)
	}
	v /= w * w
	e := Estimate{Key: GreenlandRobinsKey, Name: "Mantel–Haenszel difference, Greenland–Robins variance", Scale: proportions.Difference,
		Citation:   greenlandRobins,
		Definition: "RD = Σ(a·n2 − c·n1)/n ÷ Σ n1·n2/n; Var = Σ(a·b·n2³ + c·d·n1³)/(n1·n2·n²) ÷ (Σ n1·n2/n)²; RD ± z√Var"}
	return differenceInterval(e, rd, v, conf)
}

func differenceInterval(e Estimate, rd, v float64, conf proportions.Confidence) Estimate {
	h := conf.Z * math.Sqrt(v)
	e.Level, e.Estimate = conf.Level, rd
	e.Lower, e.Upper = math.Max(-1, rd-h), math.Min(1, rd+h)
	return e
}

// mhRatio is the Mantel–Haenszel common ratio of rates with Greenland and
// Robins' variance of its log:
//
//	RR = R/S,  R = Σ a·n2/n,  S = Σ c·n1/n,
//	Var(log RR) = Σ (n1·n2·m1 − a·c·n)/n² / (R·S),
//
// and the interval RR·exp(±z·√Var). Greenland S, Robins JM (1985),
// Biometrics 41:55–68. With no events in the first group (R = 0) the
// estimate is 0, in the second (S = 0) it is ∞, and the interval is
// [0, ∞]; with no events at all it is not estimable.
func mhRatio(ts []table, conf proportions.Confidence) Estimate {
	var r, s, v float64
	for _, t := range ts {
		r += t.a * t.n2 / t.n
		s += t.c * t.n1 / t.n
		v += (t.n1*t.n2*t.m1 - t.a*t.c*t.n) / (t.n * t.n)
	}
	e := Estimate{Key: MHRatioKey, Name: "Mantel–Haenszel ratio", Scale: proportions.Ratio,
		Citation:   greenlandRobins,
		Definition: "RR = Σ a·n2/n ÷ Σ c·n1/n; Var(log RR) = Σ(n1·n2·m1 − a·c·n)/n² ÷ (Σ a·n2/n · Σ c·n1/n); RR·exp(±z√Var)"}
	return logInterval(e, r, s, v/(r*s), conf)
}

// mhOddsRatio is the Mantel–Haenszel common odds ratio with the variance of
// its log by Robins, Breslow and Greenland:
//
//	OR = R/S,  R = Σ a·d/n,  S = Σ b·c/n,  P = (a + d)/n,  Q = (b + c)/n,
//	Var(log OR) = Σ P·R/(2R²) + Σ (P·S + Q·R)/(2R·S) + Σ Q·S/(2S²)
//
// (the sums over strata of the products of each stratum's P, Q, R, S), and
// the interval OR·exp(±z·√Var). With one stratum the variance is Woolf's
// 1/a + 1/b + 1/c + 1/d. Mantel N, Haenszel W (1959), Journal of the
// National Cancer Institute 22:719–748; variance: Robins J, Breslow N,
// Greenland S (1986), "Estimators of the Mantel-Haenszel variance
// consistent in both sparse data and large-strata limiting models",
// Biometrics 42:311–323. R = 0 gives 0 and S = 0 gives ∞, with [0, ∞];
// both 0, not estimable.
func mhOddsRatio(ts []table, conf proportions.Confidence) Estimate {
	var r, s, pr, ps, qr, qs float64
	for _, t := range ts {
		rk, sk := t.a*t.d/t.n, t.b*t.c/t.n
		pk, qk := (t.a+t.d)/t.n, (t.b+t.c)/t.n
		r, s = r+rk, s+sk
		pr, ps, qr, qs = pr+pk*rk, ps+pk*sk, qr+qk*rk, qs+qk*sk
	}
	v := pr/(2*r*r) + (ps+qr)/(2*r*s) + qs/(2*s*s)
	e := Estimate{Key: MHOddsRatioKey, Name: "Mantel–Haenszel odds ratio", Scale: proportions.OddsRatio,
		Citation:   mantelHaenszel + "; variance: " + rbg,
		Definition: "OR = Σ a·d/n ÷ Σ b·c/n; Var(log OR) = ΣPR/(2R²) + Σ(PS + QR)/(2RS) + ΣQS/(2S²), P = (a+d)/n, Q = (b+c)/n, R = ad/n, S = bc/n; OR·exp(±z√Var)"}
	return logInterval(e, r, s, v, conf)
}

// logInterval fills a ratio-scale estimate num/den with the interval
// exp(log(num/den) ± z·√v), handling a zero numerator or denominator.
func logInterval(e Estimate, num, den, v float64, conf proportions.Confidence) Estimate {
	e.Level = conf.Level
	switch {
	case num == 0 && den == 0:
		e.Estimate, e.Lower, e.Upper = math.NaN(), math.NaN(), math.NaN()
	case num == 0:
		e.Estimate, e.Lower, e.Upper = 0, 0, math.Inf(1)
	case den == 0:
		e.Estimate, e.Lower, e.Upper = math.Inf(1), 0, math.Inf(1)
	default:
		est := num / den
		h := conf.Z * math.Sqrt(math.Max(0, v))
		e.Estimate, e.Lower, e.Upper = est, est*math.Exp(-h), est*math.Exp(h)
	}
	return e
}
