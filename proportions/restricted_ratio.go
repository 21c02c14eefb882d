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
	return restrictedRatioRates(float64(c.X1), float64(c.N1), float64(c.X2), float64(c.N2), theta)
}

// restrictedRatioRates is restrictedUnderRatio for real-valued counts (study
// planning calls it with the anticipated rates, x = n·π).
func restrictedRatioRates(x1, n1, x2, n2, theta float64) (p1, p2 float64) {
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
//	A = n2(ψ − 1),  B = n1ψ + n2 − m(ψ − 1)
//
// (Miettinen O, Nurminen M 1985, Statistics in Medicine 4:213–226). The
// root in [0, 1] is 2m / (B + √D), D = B² + 4Am, when B ≥ 0 and
// (√D − B) / (2A) otherwise (then ψ > 1 and A > 0), so neither form
// cancels; the equation is divided by max(ψ, 1) against overflow.
func restrictedUnderOddsRatio(c Counts, psi float64) (p1, p2 float64) {
	n1, n2 := float64(c.N1), float64(c.N2)
	m := float64(c.X1 + c.X2)
	s := math.Max(psi, 1)
	a := n2 * (psi - 1) / s
	b := (n1*psi + n2 - m*(psi-1)) / s
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
