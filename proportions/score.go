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
//
// A null within about 10⁻²⁷¹ of 0 with every trial alike gives a variance
// of order |δ|/n, which underflows (to 0 at δ = 5e−324), while the
// numerator −δ does not: the statistic was ±Inf and the test rejected a
// null its own interval contained. There both are scaled by 2⁵⁰⁰, which
// gives the true z, of order √(|δ|·n), near 0.
func scoreZ(c Counts, delta, k float64) float64 {
	f := fitRestricted(c, delta)
	num, v := c.P1()-c.P2()-delta, k*f.variance(c)
	if v < 0x1p-900 && num != 0 && math.Abs(num) < 0x1p-900 {
		const s = 0x1p500
		scaled := (f.p1*s)*(f.q1*s)/float64(c.N1) + (f.p2*s)*(f.q2*s)/float64(c.N2)
		return signedScore(num*s, k*scaled)
	}
	return signedScore(num, v)
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
	z2k, zk := z*z*k, z*math.Sqrt(k)
	return scoreLower(c, z2k, zk), -scoreLower(c.Swapped(), z2k, zk)
}

// scoreLower solves z(δ) = z for δ below p1 − p2 = d without a restricted
// fit at trial values of δ: it moves along the curve of restricted fits
// instead. Under π1 − π2 = δ the fit satisfies
//
//	ℓ1′(π̃1) = −ℓ2′(π̃2) = λ,  ℓi′(p) = (xi − ni·p)/(p(1 − p)),
//
// and δ < d corresponds to λ > 0. For each λ the fitted rates are roots of
// quadratics, λp² − (λ + n1)p + x1 = 0 and λp² + (n2 − λ)p − x2 = 0:
//
//	π̃1 = 2x1/(λ + n1 + s1),  s1 = √((λ + y1 − x1)² + 4x1y1),
//	π̃2 = 1 − 2y2/(λ + n2 + s2),  s2 = √((λ + x2 − y2)² + 4x2y2),
//
// each with its complement also formed without cancellation (see
// scoreCurveTerm), so rare events keep full relative precision. The
// likelihood equations give p1 − π̃1 = λπ̃1(1−π̃1)/n1 and π̃2 − p2 =
// λπ̃2(1−π̃2)/n2, so d − δ(λ) = λ·V(λ) and z(δ) = λ·√V(λ): the limit is
// where
//
//	H(λ) = λ²·V(λ) = z²k,
//
// and then δ = d − z²k/λ, whose distance from d has the relative
// precision of λ. H rises from 0 at λ = 0 to ∞ (δ falls from d to −1) and
// is smooth on the scale of λ, so Halley steps (see root.BracketedHalley) on
// F(λ) = H(λ) − z²k, kept in a bracket (bisecting when a step would leave
// it), converge fast from λ = z²k/(d − h), h Newcombe's hybrid lower limit
// with z√k, usually within 10⁻² of the root. The bracket starts as (0, ∞),
// F(0) = −z²k; until a point with F > 0 is found, a step grows λ at most
// 16-fold.
//
// A group with all events (x1 = n1) or none (x2 = 0) stays on its
// boundary (π̃1 = 1, π̃2 = 0) until λ reaches its ni, where H has a kink; a
// step across the kink is replaced by an evaluation at the kink, so each
// piece is solved where H is smooth. When both groups are all-or-none, H
// is piecewise linear, [x1 = n1]·(λ − n1)⁺ + [x2 = 0]·(λ − n2)⁺, and the
// limit is in closed form (for x1 = x2 = 0 it is −z²k/(n2 + z²k)). At
// levels from 0.8 to 0.999 the search needs 1.4 evaluations of F per limit
// on average over random tables from 1 to 2^45 trials per group, 2.6 over
// all tables up to 30 trials per group, and at most 8 per interval.
func scoreLower(c Counts, z2k, zk float64) float64 {
	d := c.P1() - c.P2()
	switch {
	case d <= -1:
		return -1 // x1 = 0 and x2 = n2: no smaller difference is possible.
	case !(z2k > 0):
		return d // z = 0 (or z² below the smallest float)
	case math.IsInf(z2k, 1):
		return -1 // z = ∞: every δ is inside
	}
	x1, n1, x2, n2 := float64(c.X1), float64(c.N1), float64(c.X2), float64(c.N2)
	y1, y2 := n1-x1, n2-x2
	inn := 1 / (n1 * n2)
	in1, in2 := n2*inn, n1*inn
	top1, bottom2 := c.X1 == c.N1, c.X2 == 0
	if (c.X1 == 0 || top1) && (bottom2 || c.X2 == c.N2) {
		return d - z2k/degenerateRoot(top1, bottom2, n1, n2, z2k)
	}
	kink := math.Inf(1) // at most one: x1 = n1 and x2 = 0 is handled above
	switch {
	case top1:
		kink = n1
	case bottom2:
		kink = n2
	}
	a, b := 0.0, math.Inf(1) // F(0) = −z²k
	lam := z2k / (d - hybridLower(c, zk))
	if !(lam > a && lam < b) {
		// The hybrid limit is at d (tiny z) or rounded outside: the Wald
		// value λ = z√k/√V(d), exact when V does not change along the curve.
		lam = zk / math.Sqrt(x1*y1/(n1*n1*n1)+x2*y2/(n2*n2*n2))
		if !(lam > a && lam < b) {
			lam = 2 * a
		}
	}
	for range maxScoreSteps {
		f, d1, d2 := scoreCurve(x1, y1, n1, in1, x2, y2, n2, in2, lam, z2k, false)
		if lam == kink && f < 0 {
			// The root is on the piece above the kink: its derivatives.
			f, d1, d2 = scoreCurve(x1, y1, n1, in1, x2, y2, n2, in2, lam, z2k, true)
		}
		switch {
		case f < 0:
			a = lam
		case f > 0:
			b = lam
		default:
			return scoreLimitAt(d, z2k, lam)
		}
		id1 := 1 / d1
		s := f * id1
		if cr := 0.5 * s * d2 * id1; math.Abs(cr) < 0.5 {
			s /= 1 - cr
		}
		next := lam - s
		if math.Abs(s) <= scoreTolerance*lam {
			// Converged; the error left is of the order of s³.
			return scoreLimitAt(d, z2k, clampTo(next, a, b))
		}
		switch {
		case !(next > a && next < b): // also for NaN
			if math.IsInf(b, 1) {
				next = 4 * lam
			} else {
				next = a + (b-a)/2
			}
		case math.IsInf(b, 1) && next > 16*lam:
			next = 16 * lam
		}
		if kink > a && kink < b && (lam < kink) != (next < kink) {
			next = kink
		}
		if next == a || next == b {
			return scoreLimitAt(d, z2k, next) // the bracket is down to adjacent floats
		}
		lam = next
	}
	return scoreLimitAt(d, z2k, lam)
}

// scoreLimitAt is the limit d − z²k/λ for the root λ, kept from rounding
// below −1.
func scoreLimitAt(d, z2k, lam float64) float64 {
	if l := d - z2k/lam; l > -1 {
		return l
	}
	return -1
}

// clampTo returns x moved into [a, b] (math.Max and math.Min are calls).
func clampTo(x, a, b float64) float64 {
	if x < a {
		return a
	}
	if x > b {
		return b
	}
	return x
}

const (
	// scoreTolerance stops the search once a Halley step in λ is this
	// small relative to λ (and so to the limit's distance from p1 − p2);
	// convergence being cubic, the relative error left is of order its
	// cube.
	scoreTolerance = 1e-6
	// maxScoreSteps bounds the search.
	maxScoreSteps = 200
)

// scoreCurve returns F(λ) = λ²V(λ) − z²k and its first two derivatives in
// λ (see scoreLower), for the counts xi, yi = ni − xi (ini = 1/ni); at a
// kink, above says which side's derivatives.
func scoreCurve(x1, y1, n1, in1, x2, y2, n2, in2, lam, z2k float64, above bool) (f, d1, d2 float64) {
	a1, a1d, a1dd := scoreCurveTerm(x1, y1, n1, lam, above)
	// Group 2 is group 1 with events and non-events exchanged: its
	// complement solves the first quadratic with y2 events.
	a2, a2d, a2dd := scoreCurveTerm(y2, x2, n2, lam, above)
	v, vd, vdd := a1*in1+a2*in2, a1d*in1+a2d*in2, a1dd*in1+a2dd*in2
	return lam*lam*v - z2k, lam * (2*v + lam*vd), 2*v + lam*(4*vd+lam*vdd)
}

// scoreCurveTerm returns a = p(1 − p) and its first two derivatives in λ
// for the root p in [0, 1] of λp² − (λ + n)p + x = 0 (y = n − x, λ > 0),
// the fit of a group whose log-likelihood has slope λ. With
// t = λ + y − x and s = √(t² + 4xy) = λ + n − 2λp,
//
//	p = 2x/(λ + n + s),  1 − p = 2y/(n − λ + s) (λ ≤ n) or (λ − n + s)/(2λ),
//
// dp/dλ = −a/s, so a′ = −(1 − 2p)·a/s and a″ = a·(1 − 6a + (1 − 2p)·t/s)/s².
// With no events p = 0; with no non-events p = 1 up to λ = n and n/λ after,
// where a = n(λ − n)/λ² has a′ = 1/n and a″ = −4/n² at λ = n (returned at
// λ = n when above is set).
func scoreCurveTerm(x, y, n, lam float64, above bool) (a, d1, d2 float64) {
	if x == 0 {
		return 0, 0, 0
	}
	t := lam + y - x
	s := math.Sqrt(t*t + 4*x*y)
	// p = 2x/pd and q = qn/qd, with one division for both.
	pd, qn, qd := lam+n+s, 2*y, n-lam+s
	switch {
	case lam > n:
		qn, qd = lam-n+s, 2*lam
	case y > 0:
	case above && lam == n:
		return 0, 1 / n, -4 / (n * n)
	default:
		return 0, 0, 0
	}
	inv := 1 / (pd * qd)
	p, q := 2*x*qd*inv, qn*pd*inv
	is := 1 / s
	a = p * q
	r := (q - p) * is
	return a, -r * a, a * (1 - 6*a + r*t) * is * is
}

// degenerateRoot returns the root of H(λ) = z²k when both groups are
// all-or-none (see scoreLower): H = [x1 = n1]·(λ − n1)⁺ + [x2 = 0]·(λ − n2)⁺.
func degenerateRoot(top1, bottom2 bool, n1, n2, z2k float64) float64 {
	switch {
	case top1 && bottom2:
		lo, hi := math.Min(n1, n2), math.Max(n1, n2)
		if z2k <= hi-lo {
			return lo + z2k
		}
		return (n1 + n2 + z2k) / 2
	case top1:
		return n1 + z2k
	default:
		return n2 + z2k
	}
}

// hybridLower is Newcombe's hybrid lower limit for the quantile z, the
// starting point of the score search.
func hybridLower(c Counts, z float64) float64 {
	x1, n1, x2, n2 := float64(c.X1), float64(c.N1), float64(c.X2), float64(c.N2)
	p1, p2 := c.P1(), c.P2()
	// Wilson's lower limit for the first group and upper for the second
	// (see wilsonAt), the only ones used.
	z2 := z * z
	l1, u2 := 0.0, 1.0
	if c.X1 > 0 {
		l1 = (x1 + z2/2 - z*math.Sqrt(x1*(n1-x1)/n1+z2/4)) / (n1 + z2)
	}
	if c.X2 < c.N2 {
		u2 = (x2 + z2/2 + z*math.Sqrt(x2*(n2-x2)/n2+z2/4)) / (n2 + z2)
	}
	return p1 - p2 - math.Sqrt(sq(p1-l1)+sq(u2-p2))
}
