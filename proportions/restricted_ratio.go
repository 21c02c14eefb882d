package proportions

import "math"

// Maximum-likelihood estimates of (π1, π2) restricted to a given ratio or
// odds ratio: the nuisance-parameter estimates every score statistic on those
// scales needs. Both are closed-form roots of a quadratic, taken in the form
// that avoids cancellation, and work for any θ or ψ in (0, ∞) (e.g. 1e300).

// restrictedUnderRatio returns the maximum-likelihood estimates (p̃1, p̃2)
// under the constraint π1 = θ·π2, θ > 0. Setting the derivative of the
// binomial log-likelihood in π2 to zero gives A·p̃2² + B·p̃2 + C = 0 with
//
//	A = Nθ,  B = −(n1θ + x1 + n2 + x2θ),  C = x1 + x2,  N = n1 + n2,
//
// whose smaller root is p̃2 (Miettinen O, Nurminen M 1985, Statistics in
// Medicine 4:213–226, appendix; Farrington CP, Manning G 1990, Statistics in
// Medicine 9:1447–1454); p̃1 = θ·p̃2. The root is computed as
// 2C / (−B + √(B² − 4AC)), free of cancellation since −B > 0, after dividing
// the equation by max(θ, 1) so that B² cannot overflow.
func restrictedUnderRatio(c Counts, theta float64) (p1, p2 float64) {
	return RestrictedRatioRates(float64(c.X1), float64(c.N1), float64(c.X2), float64(c.N2), theta)
}

// RestrictedRatioRates returns the maximum-likelihood estimates (p̃1, p̃2)
// under π1 = θ·π2 for real-valued counts: the root of the quadratic stated at
// restrictedUnderRatio (Miettinen & Nurminen 1985; Farrington & Manning 1990).
// Study planning calls it with the anticipated rates as counts, x = n·π.
func RestrictedRatioRates(x1, n1, x2, n2, theta float64) (p1, p2 float64) {
	s := math.Max(theta, 1)
	a := (n1 + n2) * theta / s
	b := -(n1*theta + x1 + n2 + x2*theta) / s
	cc := (x1 + x2) / s
	disc := math.Max(b*b-4*a*cc, 0)
	p2 = 2 * cc / (-b + math.Sqrt(disc))
	p2 = math.Min(math.Max(p2, 0), 1)
	p1 = math.Min(theta*p2, 1)
	return p1, p2
}

// restrictedUnderOddsRatio returns the maximum-likelihood estimates
// (p̃1, p̃2) under the constraint π1(1−π2) / (π2(1−π1)) = ψ, ψ > 0. The
// restricted fit keeps the observed number of events, n1p̃1 + n2p̃2 = m =
// x1 + x2, with p̃1 = ψp̃2 / (1 + p̃2(ψ − 1)); substituting gives
// A·p̃2² + B·p̃2 − m = 0 with
//
//	A = n2(ψ − 1),  B = n1ψ + n2 − m(ψ − 1) = (n1 − m)ψ + (n2 + m)
//
// (Miettinen O, Nurminen M 1985, Statistics in Medicine 4:213–226). The
// root in [0, 1] is 2m / (B + √D), D = B² + 4Am, when B ≥ 0 and
// (√D − B) / (2A) otherwise (then ψ > 1 and A > 0), so neither form
// cancels. B is formed from the exact counts n1 − m and n2 + m, so that it
// does not cancel either, and the equation is divided by max(ψ, 1) before
// any product is formed, against overflow. p̃2 keeps full relative
// precision; for p̃1 see fitUnderOddsRatio.
func restrictedUnderOddsRatio(c Counts, psi float64) (p1, p2 float64) {
	n2 := float64(c.N2)
	m := float64(c.X1 + c.X2)
	s := math.Max(psi, 1)
	a := n2 * ((psi - 1) / s)
	b := float64(c.N1-c.X1-c.X2)*(psi/s) + float64(c.N2+c.X1+c.X2)/s
	ms := m / s
	disc := math.Max(b*b+4*a*ms, 0)
	root := math.Sqrt(disc)
	if b >= 0 {
		if b+root == 0 {
			p2 = 0
		} else {
			p2 = 2 * ms / (b + root)
		}
	} else {
		p2 = (root - b) / (2 * a)
	}
	p2 = math.Min(math.Max(p2, 0), 1)
	p1 = oddsShift(p2, psi)
	return p1, p2
}

// oddsShift returns the proportion whose odds are ψ times the odds of p:
// ψp / (1 − p + ψp), written to stay finite for huge ψ.
func oddsShift(p, psi float64) float64 {
	if psi > 1 {
		return p / ((1-p)/psi + p)
	}
	return psi * p / (1 - p + psi*p)
}

// ratioScaleFit is a restricted maximum-likelihood fit of both groups'
// proportions with each complement 1 − p̃ computed in its own right, so that
// p̃ and 1 − p̃ both keep full relative precision near 0 and near 1. (When a
// fitted proportion is within about 1e−8 of 1 — a handful of non-events in
// 10⁹ trials — the roots of the quadratics for p̃ nearly coincide and
// 1 − p̃ taken from p̃ would keep only a few correct digits.)
type ratioScaleFit struct {
	p1, q1, p2, q2 float64
}

// residual1 returns x1 − n1p̃1, computed from whichever of p̃1 and 1 − p̃1 is
// the smaller, so that it is accurate when it is tiny.
func (f ratioScaleFit) residual1(c Counts) float64 {
	return residual(float64(c.X1), float64(c.N1), f.p1, f.q1)
}

// residual2 returns x2 − n2p̃2 (see residual1).
func (f ratioScaleFit) residual2(c Counts) float64 {
	return residual(float64(c.X2), float64(c.N2), f.p2, f.q2)
}

func residual(x, n, p, q float64) float64 {
	if p <= 0.5 {
		return x - n*p
	}
	return n*q - (n - x)
}

// fitUnderRatio returns the fit under π1 = θ·π2 (see restrictedUnderRatio).
// A group whose p̃ exceeds ½ takes its complement from the quadratic for
// q̃ = 1 − p̃, obtained by substituting p = 1 − q:
//
//	N·q̃1² − ((N − m) + (1 − θ)(n1 + x2))·q̃1 + (n1 − x1)(1 − θ) = 0,
//	N·q̃2² − ((N − m) + (1 − 1/θ)(n2 + x1))·q̃2 + (n2 − x2)(1 − 1/θ) = 0,
//
// m = x1 + x2, each taking its larger root. Their coefficients are built
// from the non-event counts, so they carry no large cancelling terms.
func fitUnderRatio(c Counts, theta float64) ratioScaleFit {
	p1, p2 := restrictedUnderRatio(c, theta)
	f := ratioScaleFit{p1: p1, q1: 1 - p1, p2: p2, q2: 1 - p2}
	n := float64(c.N1 + c.N2)
	nonEvents := float64(c.N1 + c.N2 - c.X1 - c.X2)
	// The factors 1 − θ and 1 − 1/θ = (θ − 1)/θ are formed from θ − 1,
	// which is exact near θ = 1, and the equations are divided by s ≥ 1
	// against overflow at extreme θ.
	if p1 > 0.5 {
		s := math.Max(theta, 1)
		k := (1 - theta) / s
		f.q1 = largerRoot(n/s, nonEvents/s+k*float64(c.N1+c.X2), float64(c.N1-c.X1)*k)
		f.p1 = 1 - f.q1
	}
	if p2 > 0.5 {
		s := math.Max(1/theta, 1)
		k := (theta - 1) / (theta * s)
		f.q2 = largerRoot(n/s, nonEvents/s+k*float64(c.N2+c.X1), float64(c.N2-c.X2)*k)
		f.p2 = 1 - f.q2
	}
	return f
}

// fitUnderOddsRatio returns the fit under odds ratio ψ (see
// restrictedUnderOddsRatio). The second group's p̃2 comes from the
// quadratic, or, when it exceeds ½, its complement comes from the same fit
// for the table with events and non-events exchanged (whose odds ratio is
// 1/ψ); the first group follows from odds(p̃1) = ψ·odds(p̃2) as
//
//	p̃1 = ψp̃2 / (q̃2 + ψp̃2),  q̃1 = q̃2 / (q̃2 + ψp̃2),  q̃2 = 1 − p̃2,
//
// sums of positive terms, with at most twice the relative error of p̃2 or
// q̃2 (whichever is at most ½), for every ψ in (0, ∞).
func fitUnderOddsRatio(c Counts, psi float64) ratioScaleFit {
	_, p2 := restrictedUnderOddsRatio(c, psi)
	q2 := 1 - p2
	if p2 > 0.5 {
		flip := Counts{X1: c.N1 - c.X1, N1: c.N1, X2: c.N2 - c.X2, N2: c.N2}
		_, q2 = restrictedUnderOddsRatio(flip, 1/psi)
		p2 = 1 - q2
	}
	t := psi * p2
	return ratioScaleFit{p1: t / (q2 + t), q1: q2 / (q2 + t), p2: p2, q2: q2}
}

// largerRoot returns the larger root of a·q² − b·q + c = 0 (a > 0), clamped
// to [0, 1], in the form that avoids cancellation.
func largerRoot(a, b, c float64) float64 {
	root := math.Sqrt(math.Max(b*b-4*a*c, 0))
	var q float64
	switch {
	case b >= 0:
		q = (b + root) / (2 * a)
	case b-root != 0:
		q = 2 * c / (b - root)
	}
	return math.Min(math.Max(q, 0), 1)
}
