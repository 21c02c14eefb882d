package proportions

import "math"

// The score statistic for H0: π1 − π2 = δ shared by the score tests and the
// score intervals (Mee, Miettinen–Nurminen):
//
//	z(δ) = (p1 − p2 − δ) / √(k·V(δ)),  V(δ) = π̃1(1−π̃1)/n1 + π̃2(1−π̃2)/n2,
//
// with (π̃1, π̃2) the restricted MLE (RestrictedMLE) and k = 1 for
// Farrington–Manning / Mee, k = N/(N − 1) for Miettinen–Nurminen, N = n1 + n2.

// restrictedVariance returns V(δ).
func restrictedVariance(c Counts, delta float64) float64 {
	return fitRestricted(c, delta).variance(c)
}

// scoreZ returns z(δ) for the variance factor k. Degenerate case: V(δ) = 0
// happens inside −1 < δ < 1 only when δ = 0 and every trial had the same
// outcome (all events or none), and then p1 − p2 = δ too; the statistic is
// 0/0 there and is defined as 0 (no evidence either way, p = 1).
func scoreZ(c Counts, delta, k float64) float64 {
	return signedScore(c.P1()-c.P2()-delta, k*restrictedVariance(c, delta))
}

// FarringtonManningZ returns the score statistic for H0: π1 − π2 = delta
// with the restricted-MLE variance (k = 1); at delta = 0 it is the pooled
// two-proportion z. See FarringtonManning for the definition and the
// degenerate case. It does not validate its arguments and does not
// allocate (for coverage, size and power computations).
func FarringtonManningZ(c Counts, delta float64) float64 { return scoreZ(c, delta, 1) }

// MiettinenNurminenZ returns the score statistic for H0: π1 − π2 = delta
// with the restricted-MLE variance times N/(N − 1). See
// MiettinenNurminenTest. It does not validate its arguments.
func MiettinenNurminenZ(c Counts, delta float64) float64 {
	return scoreZ(c, delta, mnVarianceFactor(c))
}

// scoreLimits returns the interval {δ : |z(δ)| ≤ z} for the variance factor
// k. The upper limit is minus the lower limit of the swapped groups, which
// makes swapping the groups negate the interval exactly.
func scoreLimits(c Counts, z, k float64) (lower, upper float64) {
	return scoreLower(c, z*z*k, z*math.Sqrt(k)), -scoreLower(c.Swapped(), z*z*k, z*math.Sqrt(k))
}

// scoreLower solves z(δ) = z for δ below p1 − p2, written as the root of
//
//	G(δ) = (p1 − p2 − δ)² − z²k·V(δ),
//
// which is positive below the limit and ≤ 0 between it and p1 − p2 (z(δ)
// decreases in δ). G is smooth where √V is not (V → 0 as δ → −1 or, when
// both groups are all-or-none, as δ → p1 − p2), so Newton steps work well
// on it. The search starts from Newcombe's hybrid limit with z√k, which is
// usually within 10⁻² of the root, keeps a bracket [a, b] with G(a) > 0 ≥
// G(b), and bisects whenever a Newton step would leave the bracket. Over
// tables from 1 to 2^40 trials per group it needs 2.3 evaluations of G per
// limit on average and at most 5.
func scoreLower(c Counts, z2k, zk float64) float64 {
	d := c.P1() - c.P2()
	if d <= -1 {
		return -1 // x1 = 0 and x2 = n2: no smaller difference is possible.
	}
	a, b := -1.0, d // G(−1) = (d + 1)² > 0, G(d) = −z²k·V(d) ≤ 0.
	x := hybridLower(c, zk)
	if !(x > a && x < b) {
		x = (a + b) / 2
	}
	// The limit's distance from p1 − p2 can be as small as 1e−13 (one
	// event in 2^45 trials), so the tolerance is relative to it, but no
	// finer than a few units in the last place of x (coarser near ±1).
	tol := math.Max(scoreTolerance*(d-x), 4e-16*math.Abs(x))
	// Each fit starts from the previous one extrapolated along its slope.
	prevX, prev := math.NaN(), restrictedFit{}
	for range maxScoreSteps {
		start := math.NaN()
		if !math.IsNaN(prevX) {
			start = prev.p1 + prev.slope*(x-prevX)
		}
		f := fitRestrictedFrom(c, x, start)
		g, dg := scoreEquation(c, f, d, x, z2k)
		prevX, prev = x, f
		switch {
		case g > 0:
			a = x
		case g < 0:
			b = x
		default:
			return x
		}
		step := g / dg
		if math.Abs(step) <= tol {
			// Converged. Checked before the bracket test, which a step
			// below an ulp of x fails.
			return x - step
		}
		next := x - step
		if !(next > a && next < b) { // also for NaN and ±Inf
			next = a + (b-a)/2
		}
		if b-a <= tol || next == a || next == b {
			return next
		}
		x = next
	}
	return x
}

const (
	// scoreTolerance stops the search once a Newton step is this small
	// relative to the limit's distance from p1 − p2; convergence being
	// quadratic, the relative error left is of order its square.
	scoreTolerance = 1e-8
	// maxScoreSteps bounds the search; bisection alone halves [−1, 1] to
	// below scoreTolerance in 41 steps.
	maxScoreSteps = 100
)

// hybridLower is Newcombe's hybrid lower limit for the quantile z, the
// starting point of the score search.
func hybridLower(c Counts, z float64) float64 {
	l1, _ := wilsonAt(c.X1, c.N1, z)
	_, u2 := wilsonAt(c.X2, c.N2, z)
	p1, p2 := c.P1(), c.P2()
	return p1 - p2 - math.Sqrt(sq(p1-l1)+sq(u2-p2))
}

// scoreEquation returns G(δ) and G′(δ) = −2(d − δ) − z²k·V′(δ) from the
// restricted MLE f at δ, with V′ from its slope.
func scoreEquation(c Counts, f restrictedFit, d, delta, z2k float64) (g, dg float64) {
	v := f.variance(c)
	// d/dδ of π(1−π) is (1 − 2π)·dπ/dδ; dπ̃2/dδ = dπ̃1/dδ − 1.
	dv := (f.q1-f.p1)*f.slope/float64(c.N1) + (f.q2-f.p2)*(f.slope-1)/float64(c.N2)
	r := d - delta
	return r*r - z2k*v, -2*r - z2k*dv
}
