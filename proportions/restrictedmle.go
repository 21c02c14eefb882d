package proportions

import "math"

// RestrictedMLE returns the maximum-likelihood estimates (π̃1, π̃2) of the
// two proportions under the constraint π1 − π2 = delta, for −1 ≤ delta ≤ 1.
//
// π̃1 maximises x1·log π + y1·log(1−π) + x2·log(π−δ) + y2·log(1−π+δ)
// (yi = ni − xi) over max(0, δ) ≤ π ≤ min(1, 1+δ); the log-likelihood is
// concave, so the maximum is unique. Inside the range it is the root of the
// likelihood equation, which multiplied out is a cubic a·π³ + b·π² + c·π + d
// with, for θ = n2/n1,
//
//	a = 1 + θ
//	b = −(1 + θ + p1 + θ·p2 + δ(θ + 2))
//	c = δ² + δ(2p1 + θ + 1) + p1 + θ·p2
//	d = −p1·δ(1 + δ)
//
// and the root is given in closed form by
//
//	v = b³/(27a³) − bc/(6a²) + d/(2a),  u = sign(v)·√(b²/(9a²) − c/(3a)),
//	w = (π + arccos(v/u³))/3,  π̃1 = 2u·cos(w) − b/(3a),  π̃2 = π̃1 − δ.
//
// Miettinen O, Nurminen M (1985), "Comparative analysis of two rates",
// Statistics in Medicine 4:213–226 (appendix); Farrington CP, Manning G
// (1990), "Test statistics and sample size formulae for comparative binomial
// trials with null hypothesis of non-zero risk difference or non-unity
// relative risk", Statistics in Medicine 9:1447–1454.
//
// The closed form loses relative precision when π̃1 or π̃2 is tiny (rare
// events: its terms are near 1/3, and near δ = 0 a spurious root at 0 sits
// next to the true one). So the closed form is used as the starting point
// of a bracketed Newton solve of the likelihood equation itself, the
// counts are complemented (events ↔ non-events, δ ↔ −δ) when events are the
// majority so that the solve happens on the small side, and a maximum on
// the edge of the range is recognised from the sign of the likelihood
// equation there. The estimates are then accurate to a few units in the
// last place even for one event in 2^45 trials. At delta = ±1 they are the
// only feasible point. The score intervals (Mee, MiettinenNurminen), the
// score tests and sample-size planning share this function. It does not
// validate c.
func RestrictedMLE(c Counts, delta float64) (p1, p2 float64) {
	f := fitRestricted(c, delta)
	return f.p1, f.p2
}

// restrictedFit is the restricted MLE with the complements qi = 1 − π̃i
// (each to full relative precision, for the variance π̃(1−π̃)) and the
// slope dπ̃1/dδ used by the score intervals' Newton steps.
type restrictedFit struct {
	p1, q1, p2, q2 float64
	slope          float64
}

// variance returns π̃1(1−π̃1)/n1 + π̃2(1−π̃2)/n2.
func (f restrictedFit) variance(c Counts) float64 {
	return f.p1*f.q1/float64(c.N1) + f.p2*f.q2/float64(c.N2)
}

// fitRestricted computes the restricted MLE on the side where events are
// the minority (see RestrictedMLE).
func fitRestricted(c Counts, delta float64) restrictedFit {
	return fitRestrictedFrom(c, delta, math.NaN())
}

// fitRestrictedFrom is fitRestricted with a starting value for π̃1 (NaN for
// none: the closed form is used), which the score intervals take from the
// previous fit of their search extrapolated along its slope; it saves the
// closed form's arccos and cos.
func fitRestrictedFrom(c Counts, delta, start float64) restrictedFit {
	if 2*(c.X1+c.X2) <= c.N1+c.N2 {
		return fitMinority(c, delta, start)
	}
	f := fitMinority(Counts{X1: c.N1 - c.X1, N1: c.N1, X2: c.N2 - c.X2, N2: c.N2}, -delta, 1-start)
	// π1 = 1 − π1′ with δ′ = −δ, so dπ1/dδ = dπ1′/dδ′.
	return restrictedFit{p1: f.q1, q1: f.p1, p2: f.q2, q2: f.p2, slope: f.slope}
}

func fitMinority(c Counts, delta, start float64) restrictedFit {
	switch {
	case delta >= 1:
		return restrictedFit{p1: 1, q1: 0, p2: 0, q2: 1}
	case delta <= -1:
		return restrictedFit{p1: 0, q1: 1, p2: 1, q2: 0}
	}
	// The edges of the feasible range and π2 on them, set exactly.
	lo, uLo := 0.0, math.Abs(delta) // +0 at δ = 0: the sign of zero matters to x2/u
	if delta > 0 {
		lo, uLo = delta, 0
	}
	hi, uHi := 1.0, 1-delta
	if delta < 0 {
		hi, uHi = 1+delta, 1
	}
	// Far from the edges the closed form is accurate to about √ε at worst,
	// so its root inside the range is the maximum; near an edge, or from a
	// given start, the sign of the likelihood equation at the edges decides.
	given := !math.IsNaN(start)
	if !given {
		start = cubicRoot(c, delta)
	}
	if given || !(start-lo >= edgeMargin && hi-start >= edgeMargin) { // also when NaN
		if likelihoodSlope(c, lo, uLo) <= 0 {
			return edgeFit(lo, uLo, delta > 0)
		}
		if likelihoodSlope(c, hi, uHi) >= 0 {
			return edgeFit(hi, uHi, delta < 0)
		}
	}
	t := solveLikelihood(c, delta, lo, hi, start)
	u := t - delta
	a1 := curvature(c.X1, t) + curvature(c.N1-c.X1, 1-t)
	a2 := curvature(c.X2, u) + curvature(c.N2-c.X2, 1-u)
	return restrictedFit{p1: t, q1: 1 - t, p2: u, q2: (1 + delta) - t, slope: a2 / (a1 + a2)}
}

// edgeMargin is the distance from an edge of the feasible range within which
// the edge is checked as a possible maximum.
const edgeMargin = 1e-6

// edgeFit is a maximum on an edge of the feasible range. Its slope dπ̃1/dδ
// is the edge's own: 1 on the edges that move with δ (π1 = δ, π1 = 1 + δ),
// 0 on π1 = 0 and π1 = 1.
func edgeFit(t, u float64, moves bool) restrictedFit {
	f := restrictedFit{p1: t, q1: 1 - t, p2: u, q2: 1 - u}
	if moves {
		f.slope = 1
	}
	return f
}

// likelihoodSlope is the derivative of the log-likelihood in π1 at π1 = t,
// π2 = u: x1/t − y1/(1−t) + x2/u − y2/(1−u), a term with a zero count
// being 0 and one with a zero denominator ±Inf. It decreases in t.
func likelihoodSlope(c Counts, t, u float64) float64 {
	return ratio(c.X1, t) - ratio(c.N1-c.X1, 1-t) + ratio(c.X2, u) - ratio(c.N2-c.X2, 1-u)
}

func ratio(k int64, den float64) float64 {
	if k == 0 {
		return 0
	}
	return float64(k) / den
}

// curvature is k/den², a term of minus the second derivative.
func curvature(k int64, den float64) float64 {
	if k == 0 {
		return 0
	}
	return float64(k) / (den * den)
}

// solveLikelihood finds the root of likelihoodSlope inside (lo, hi), where
// it goes from positive to negative, by Newton steps from start kept inside
// a shrinking bracket (bisecting when a step would leave it). From the
// closed-form start one step usually suffices.
//
// The likelihood equation has poles at the edges (x1/t at t = 0, x2/u at
// u = 0, ...), and Newton steps overshoot across a pole when the root sits
// next to it (one event in 10¹¹ trials). So the steps are taken on the
// equation multiplied by the factors that vanish at the nearer edge (t or
// u at the lower edge, 1 − t or 1 − u at the upper), which has the same
// sign and root but no pole there: with w that product, the step
// −(w·S)/(w·S)′ is S/(−S′ − S·w′/w).
func solveLikelihood(c Counts, delta, lo, hi, start float64) float64 {
	// The root is on the side of the pooled guess (x1 + x2 + n2·δ)/N, the
	// estimate of π1 that matches the total count of events under π2 = π1 − δ.
	guess := (float64(c.X1) + float64(c.X2) + float64(c.N2)*delta) / (float64(c.N1) + float64(c.N2))
	nearLo := guess-lo <= hi-guess
	t := start
	if !(t > lo && t < hi) {
		// Rounding put the closed form outside the range: the root is near
		// an edge, where the weighted steps below are close to linear.
		t = math.Max(lo, math.Min(hi, guess))
		if !(t > lo && t < hi) {
			t = lo + (hi-lo)/2
		}
	}
	// Which pole factors vanish at the nearer edge (and have a count).
	poleT := nearLo && delta <= 0 && c.X1 > 0 || !nearLo && delta >= 0 && c.N1 > c.X1
	poleU := nearLo && delta >= 0 && c.X2 > 0 || !nearLo && delta <= 0 && c.N2 > c.X2
	a, b := lo, hi
	for range 200 {
		u := t - delta
		s := likelihoodSlope(c, t, u)
		switch {
		case s > 0:
			a = t
		case s < 0:
			b = t
		default:
			return t
		}
		// −S′ and w′/w.
		curv := curvature(c.X1, t) + curvature(c.N1-c.X1, 1-t) + curvature(c.X2, u) + curvature(c.N2-c.X2, 1-u)
		var dlogw float64
		switch {
		case nearLo && poleT:
			dlogw += 1 / t
		case !nearLo && poleT:
			dlogw -= 1 / (1 - t)
		}
		switch {
		case nearLo && poleU:
			dlogw += 1 / u
		case !nearLo && poleU:
			dlogw -= 1 / (1 - u)
		}
		step := s / (curv - s*dlogw)
		scale := math.Min(math.Min(t-lo, hi-t), math.Min(t, 1-t))
		if math.Abs(step) <= 1e-12*scale || math.Abs(step) <= 4e-16*t {
			// Converged, or the step is within a few units in the last
			// place of t, below the rounding noise in s; the bracket test
			// (which such a step can fail by an ulp) is skipped.
			return t + step
		}
		next := t + step
		if !(next > a && next < b) {
			next = a + (b-a)/2
		}
		if next == t || next == a || next == b {
			return t // the bracket is down to adjacent floats
		}
		t = next
	}
	return t
}

// cubicRoot is the closed-form root documented on RestrictedMLE, the
// starting point of solveLikelihood. The coefficients are those above
// multiplied by n1 and divided by a·n1 = N, which avoids forming θ.
func cubicRoot(c Counts, delta float64) float64 {
	n1, n2 := float64(c.N1), float64(c.N2)
	x1, x2 := float64(c.X1), float64(c.X2)
	nn := n1 + n2
	b := -(nn + x1 + x2 + delta*(n2+2*n1)) / nn
	cc := (delta*delta*n1 + delta*(2*x1+nn) + x1 + x2) / nn
	d := -x1 * delta * (1 + delta) / nn
	v := b*b*b/27 - b*cc/6 + d/2
	u2 := b*b/9 - cc/3
	if u2 <= 0 {
		return -b / 3 // a triple root
	}
	u := math.Sqrt(u2)
	if v < 0 {
		u = -u
	}
	// Rounding can push |v/u³| a hair above 1 where roots coincide.
	r := math.Max(-1, math.Min(1, v/(u*u*u)))
	return 2*u*math.Cos((math.Pi+math.Acos(r))/3) - b/3
}
