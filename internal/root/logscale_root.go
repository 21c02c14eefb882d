package root

import "math"

// Root finding for the limits of ratio and odds-ratio intervals. Those
// limits are where a statistic that falls steadily as the parameter grows
// crosses a critical value; the search runs on t = log(parameter), where the
// statistics are smooth and both tails of (0, ∞) are reached in a few steps.
// The score intervals instead solve a smooth equation on a bounded interval
// (see ratio_score.go and mn_oddsratio.go) with BracketedHalley.

// MaxLogScale bounds the search on the log scale: parameters beyond
// e^±300 ≈ 10^±130 are treated as 0 or ∞. Counts are at most 2^50 per group,
// so no finite limit of a method here comes near that bound, and θ² stays
// finite inside the statistics.
const MaxLogScale = 300

// rootTolerance is the absolute tolerance on t = log(parameter): a relative
// error of about 1e−11 in the reported limit.
const rootTolerance = 1e-11

// DecreasingCrossing returns the t at which the nonincreasing function g
// changes sign, searching outward from t0 in steps that start at step (a
// guess of the distance to the root) and double. It returns
// −Inf when g is already negative at −MaxLogScale (the limit is 0 on the
// parameter scale) and +Inf when g is still positive at +MaxLogScale (the
// limit is ∞).
func DecreasingCrossing(g func(t float64) float64, t0, step float64) float64 {
	return DecreasingCrossingFrom(g, t0, g(t0), step)
}

// DecreasingCrossingFrom is DecreasingCrossing when g(t0) = g0 is already
// known (a score statistic is 0 at the estimate), saving one evaluation.
func DecreasingCrossingFrom(g func(t float64) float64, t0, g0, step float64) float64 {
	if g0 == 0 {
		return t0
	}
	dir := 1.0
	if g0 < 0 {
		dir = -1
	}
	prev, gprev := t0, g0
	if !(step > 1e-3) || math.IsInf(step, 1) {
		step = 1
	}
	for ; ; step *= 2 {
		next := t0 + dir*step
		last := math.Abs(next) >= MaxLogScale
		if last {
			next = dir * MaxLogScale
		}
		gnext := g(next)
		if gnext == 0 {
			return next
		}
		if (gnext < 0) == (g0 > 0) {
			return Brent(g, prev, next, gprev, gnext)
		}
		if last {
			return math.Inf(int(dir))
		}
		prev, gprev = next, gnext
	}
}

// Brent returns a zero of f between a and b, where fa = f(a) and
// fb = f(b) have opposite signs, by Brent's method (Brent RP 1973,
// Algorithms for Minimization without Derivatives, Prentice-Hall, ch. 4):
// inverse quadratic or secant steps, falling back to bisection whenever an
// interpolation step would not shrink the bracket fast enough. Infinite
// function values (a statistic at a boundary) also force bisection.
func Brent(f func(float64) float64, a, b, fa, fb float64) float64 {
	if math.Abs(fa) < math.Abs(fb) {
		a, b, fa, fb = b, a, fb, fa
	}
	c, fc := a, fa
	d := b - a
	e := d
	for range 200 {
		if fb == 0 {
			return b
		}
		if (fb > 0) == (fc > 0) {
			c, fc = a, fa
			d = b - a
			e = d
		}
		if math.Abs(fc) < math.Abs(fb) {
			a, b, c = b, c, b
			fa, fb, fc = fb, fc, fb
		}
		tol := 2*2.220446049250313e-16*math.Abs(b) + rootTolerance/2
		m := (c - b) / 2
		if math.Abs(m) <= tol {
			return b
		}
		if math.Abs(e) >= tol && math.Abs(fa) > math.Abs(fb) && !math.IsInf(fa, 0) && !math.IsInf(fc, 0) {
			var p, q float64
			s := fb / fa
			if a == c {
				p, q = 2*m*s, 1-s
			} else {
				qq, r := fa/fc, fb/fc
				p = s * (2*m*qq*(qq-r) - (b-a)*(r-1))
				q = (qq - 1) * (r - 1) * (s - 1)
			}
			if p > 0 {
				q = -q
			} else {
				p = -p
			}
			if 2*p < math.Min(3*m*q-math.Abs(tol*q), math.Abs(e*q)) {
				e, d = d, p/q
			} else {
				d, e = m, m
			}
		} else {
			d, e = m, m
		}
		a, fa = b, fb
		if math.Abs(d) > tol {
			b += d
		} else {
			b += math.Copysign(tol, m)
		}
		fb = f(b)
	}
	return b
}

// BracketedHalley returns the root of F in (a, b), where F(a) < 0 < F(b)
// and F has no other root there, searching from x0 in (a, b). F returns
// F(x), F′(x) and F″(x). Each step is Halley's,
//
//	x ← x − s/(1 − s·F″/(2F′)),  s = F/F′
//
// (Halley E 1694, Philosophical Transactions 18:136–148; cubic
// convergence), or Newton's when the correction s·F″/(2F′) exceeds ½ in
// size; the bracket shrinks to each new point by the sign of F, and a step
// that would leave it is replaced by bisection. The search stops when a
// step is below halleyTolerance·|x| and returns that last step's result:
// with cubic convergence the error left is of the order of the step cubed.
func BracketedHalley(F func(x float64) (f, d1, d2 float64), x0, a, b float64) float64 {
	x := x0
	if !(x > a && x < b) {
		x = a + (b-a)/2
	}
	for range maxHalleySteps {
		f, d1, d2 := F(x)
		switch {
		case f < 0:
			a = x
		case f > 0:
			b = x
		default:
			return x
		}
		s := f / d1
		if c := s * d2 / (2 * d1); math.Abs(c) < 0.5 {
			s /= 1 - c
		}
		next := x - s
		if math.Abs(s) <= halleyTolerance*math.Abs(x) {
			// Converged, unless the step left the bracket by more than
			// rounding: then it converged on a root outside the bracket
			// (one just beyond an end), and bisection must go on inside.
			in := math.Min(math.Max(next, a), b)
			if math.Abs(next-in) <= 4*ulp(x) {
				return in
			}
		}
		if !(next > a && next < b) { // also for NaN and ±Inf
			next = a + (b-a)/2
			if next == a || next == b {
				return next
			}
		}
		x = next
	}
	return x
}

const (
	// halleyTolerance stops BracketedHalley once a step is this small
	// relative to the point; the relative error left is of order its cube.
	halleyTolerance = 1e-6
	// maxHalleySteps bounds the search; bisection alone would narrow the
	// callers' brackets (at most 2^50 wide) by 2^−200.
	maxHalleySteps = 200
)

// ulp is the spacing of float64 values at x.
func ulp(x float64) float64 {
	x = math.Abs(x)
	return math.Nextafter(x, math.Inf(1)) - x
}
