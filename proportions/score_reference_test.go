package proportions

import "math"

// An internal reference copy of the score limits' search as it was before
// the search moved along the curve of restricted fits (see scoreLower): a
// safeguarded Newton search on G(δ) = (p1 − p2 − δ)² − z²k·V(δ) with a
// restricted fit (restrictedmle.go) at each trial δ. The comparison tests
// and the old-versus-new benchmarks use it; nothing else does.

func scoreLimitsOld(c Counts, z, k float64) (lower, upper float64) {
	return scoreLowerOld(c, z*z*k, z*math.Sqrt(k)), -scoreLowerOld(c.Swapped(), z*z*k, z*math.Sqrt(k))
}

const (
	oldScoreTolerance = 1e-8
	oldMaxScoreSteps  = 100
)

func scoreLowerOld(c Counts, z2k, zk float64) float64 {
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
	tol := math.Max(oldScoreTolerance*(d-x), 4e-16*math.Abs(x))
	// Each fit starts from the previous one extrapolated along its slope.
	prevX, prev := math.NaN(), restrictedFit{}
	for range oldMaxScoreSteps {
		start := math.NaN()
		if !math.IsNaN(prevX) {
			start = prev.p1 + prev.slope*(x-prevX)
		}
		f := fitRestrictedFrom(c, x, start)
		g, dg := scoreEquationOld(c, f, d, x, z2k)
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
func scoreEquationOld(c Counts, f restrictedFit, d, delta, z2k float64) (g, dg float64) {
	v := f.variance(c)
	// d/dδ of π(1−π) is (1 − 2π)·dπ/dδ; dπ̃2/dδ = dπ̃1/dδ − 1.
	dv := (f.q1-f.p1)*f.slope/float64(c.N1) + (f.q2-f.p2)*(f.slope-1)/float64(c.N2)
	r := d - delta
	return r*r - z2k*v, -2*r - z2k*dv
}
