package planning

import (
	"math"

	"github.com/propscope/propscope/proportions"
)

// nullRates returns the rates (π̃1, π̃2) that are most likely under the null
// hypothesis θ = null when the groups show the anticipated rates p1 and p2
// exactly and n2/n1 = r: the population version of the restricted maximum
// likelihood estimates of Farrington CP, Manning G (1990), "Test statistics
// and sample size formulae for comparative binomial trials with null
// hypothesis of non-zero risk difference or non-unity relative risk",
// Statistics in Medicine 9:1447–1454. They maximise
//
//	p1·log π̃1 + (1−p1)·log(1−π̃1) + r·[p2·log π̃2 + (1−p2)·log(1−π̃2)]
//
// subject to π̃1 − π̃2 = null (difference) or π̃1 = null·π̃2 (ratio). At no
// effect they are both the pooled rate (p1 + r·p2)/(1 + r).
//
// The ratio case reuses the score tests' solver on real-valued counts; the
// difference case solves the Farrington–Manning cubic at real-valued rates.
func nullRates(scale proportions.Scale, p1, p2, r, null float64) (q1, q2 float64) {
	if null == scale.NoEffect() {
		pooled := (p1 + r*p2) / (1 + r)
		return pooled, pooled
	}
	if scale == proportions.Ratio {
		// The likelihood equation of the ratio-scale score tests with
		// x1 = p1, n1 = 1, x2 = r·p2, n2 = r.
		return proportions.RestrictedRatioRates(p1, 1, r*p2, r, null)
	}
	q1 = differenceNullRate1(p1, p2, r, null)
	return q1, q1 - null
}

// differenceNullRate1 solves the likelihood equation for π̃1 under
// π̃1 − π̃2 = δ, the cubic a·x³ + b·x² + c·x + d = 0 with (θ = r)
//
//	a = 1 + θ,  b = −(1 + θ + p1 + θ·p2 + δ(θ + 2)),
//	c = δ² + δ(2p1 + θ + 1) + p1 + θ·p2,  d = −p1·δ(1 + δ),
//
// by the trigonometric closed form given by Farrington & Manning (1990):
// v = b³/(27a³) − bc/(6a²) + d/(2a), u = sign(v)·√(b²/(9a²) − c/(3a)),
// w = (π + arccos(v/u³))/3, π̃1 = 2u·cos(w) − b/(3a).
func differenceNullRate1(p1, p2, r, delta float64) float64 {
	a := 1 + r
	b := -(1 + r + p1 + r*p2 + delta*(r+2))
	c := delta*delta + delta*(2*p1+r+1) + p1 + r*p2
	d := -p1 * delta * (1 + delta)
	v := b*b*b/(27*a*a*a) - b*c/(6*a*a) + d/(2*a)
	u := math.Sqrt(math.Max(0, b*b/(9*a*a)-c/(3*a)))
	if v < 0 {
		u = -u
	}
	cos := 0.0
	if u != 0 {
		cos = math.Max(-1, math.Min(1, v/(u*u*u)))
	}
	w := (math.Pi + math.Acos(cos)) / 3
	x := 2*u*math.Cos(w) - b/(3*a)
	// Keep the root inside the parameter space (guards rounding at the edges).
	lo, hi := math.Max(0, delta), math.Min(1, 1+delta)
	x = math.Max(lo, math.Min(hi, x))
	// The closed form loses relative precision for rare events (its terms
	// are near 1/3 while the root is tiny); two Newton steps on the
	// likelihood equation itself restore it there.
	if math.Min(math.Min(x, 1-x), math.Min(x-delta, 1-x+delta)) > 0.01 {
		return x
	}
	for range 2 {
		t, v := x, x-delta
		if !(t > lo && t < hi) {
			break
		}
		g := p1/t - (1-p1)/(1-t) + r*(p2/v-(1-p2)/(1-v))
		dg := -p1/(t*t) - (1-p1)/((1-t)*(1-t)) - r*(p2/(v*v)+(1-p2)/((1-v)*(1-v)))
		if next := t - g/dg; next > lo && next < hi {
			x = next
		}
	}
	return x
}
