package special

import "math"

// Quantiles of the beta distribution for the Clopper–Pearson and Jeffreys
// intervals: the x in (0, 1) with I_x(a, b) = q, where I_x is the
// regularized incomplete beta function and 0 < q ≤ ½ is a tail probability
// (α/2 for a two-sided interval). Upper-tail quantiles are lower-tail ones of
// the reflected distribution, since 1 − I_x(a, b) = I_{1−x}(b, a); the
// solver returns x and 1 − x, each to about 1e-15 relative precision (a few
// times that in far tails of shapes near 1, where x^a carries the rounding
// of a logarithm near 20), so a limit near 1 and its distance from 1 are
// both accurate. The shapes 1 have closed forms. Otherwise one of two
// branches is used, by the smaller shape m = min(a, b) and the normal
// deviate z = Φ⁻¹(1 − q):
//
// Series branch (betaSeriesApplies: m ≥ 40 and (z+1)/√(4πm) ≤ 0.045, so
// for m of about 110 at 50%, 340 at 95%, 1400 at 99.9999%). With N = a + b,
// p = a/N and the variable ζ of Temme NM (1987), "Incomplete Laplace
// integrals: uniform asymptotic expansion with application to the
// incomplete beta function", SIAM J. Math. Anal. 18:1638–1663,
//
//	½ζ² = p log(p/t) + (1−p) log((1−p)/(1−t)),   sign ζ = sign(t − p),
//
// the beta integral becomes a Gaussian one. In w = ζ√N,
//
//	I_x(a, b) = e^Δ ∫_{−∞}^{w(x)} φ(s) ψ(s) ds,   ψ(w) = Σ ψ_k w^k,
//
// where φ is the standard normal density, Δ = stirlerr(N) − stirlerr(a) −
// stirlerr(b) collects the Stirling remainders, and ψ = σw/(x(w) − p) with
// σ = √(p(1−p)/N), ψ(0) = 1. The Taylor coefficients of u = t(ζ) − p follow
// from the differential equation u·u' = ζ(p(1−p) + (1−2p)u − u²), which
// setup solves term by term, and ψ from a power-series division.
// Integrating term by term, I = e^Δ Σ ψ_k m_k(w) with the truncated
// Gaussian moments m_0 = Φ(w), m_1 = −φ(w), m_k = (k−1) m_{k−2} −
// w^{k−1} φ(w). This is the expansion that DiDonato AR, Morris AH (1992),
// "Algorithm 708: Significant digit computation of the incomplete beta
// function ratios", ACM TOMS 18:360–373, use for large a and b (their
// BASYM). The coefficients decay like (4πm)^{−k/2}, the moments like
// (|w|+1)^k; setup stops when two successive terms are below the double
// precision of the quantile (at most about 14 terms within the branch's
// bounds, 6 to 8 for shapes of 10⁵). The equation I = q is solved for w by
// Halley steps from w0 = −z, where Φ(−z) and φ(z) are computed once per
// interval (z comes from the confidence level and need not be exact); later
// steps expand φ around w0 by its Hermite recurrence, so no transcendental
// function is evaluated per quantile, and x follows from the series of x(w).
//
// Continued-fraction branch (everything else). A starting value is
// evaluated once exactly: the prefactor x^a (1−x)^b / B(a, b) comes from
// Loader's saddle-point pieces (stirlerr, bd0; see logpmf.go) without
// cancellation, the lower tail below the mean from the continued fraction
// of Abramowitz M, Stegun IA (1964), Handbook of Mathematical Functions,
// 26.5.8, and the upper tail above the mean from Gauss's continued fraction
// of 2F1(1−a, 1; b+1; −(1−x)/x) (Pfaff's transformation, A&S 15.3.5, of
// the hypergeometric form of 1 − I_x; Cuyt A et al. (2008), Handbook of
// Continued Fractions for Special Functions, Springer, §15.3), which
// converges quickly even when b is huge and a small (A&S 26.5.8 on the
// reflected side would need thousands of steps there). From that one point
// the quantile is found on the exact Taylor expansion of the density, whose
// coefficients obey the three-term recurrence of its differential equation
// x(1−x) f' = ((a−1) − (a+b−2)x) f, so no further evaluation is needed when
// the starting value (see betaFractionGuess) is within the expansion's
// reach; otherwise the step is taken and the point evaluated again, inside
// a bracket that guarantees convergence from any start.

// stirlerrHalves[k] is stirlerr(k/2) for k = 1..30, computed to 20 digits
// with 40-digit arithmetic (lgamma(n+1) − (n+½) log n + n − ½ log 2π); the
// shapes of both intervals are integers or half-integers, so the small
// arguments never need lgamma.
var stirlerrHalves = [31]float64{
	0,
	0.15342640972002734529, // 0.5
	0.08106146679532725822, // 1.0
	0.054814121051917653896,
	0.041340695955409294094, // 2.0
	0.033162873519936287485,
	0.027677925684998339149, // 3.0
	0.023746163656297495971,
	0.020790672103765093112, // 4.0
	0.018488450532673185231,
	0.016644691189821192163, // 5.0
	0.015134973221917378874,
	0.013876128823070747999, // 6.0
	0.012810465242920226924,
	0.011896709945891770095, // 7.0
	0.011104559758206917327,
	0.010411265261972096497, // 8.0
	0.0097994161261588032984,
	0.0092554621827127329177, // 9.0
	0.008768700134139385463,
	0.0083305634333628712565, // 10.0
	0.0079341145643140205472,
	0.007573675487951840795, // 11.0
	0.0072445543013203831795,
	0.0069428401072095298657, // 12.0
	0.0066652470327076824424,
	0.0064089941880042070684, // 13.0
	0.0061717122630394576475,
	0.0059513701127588477356, // 14.0
	0.005746216513010115682,
	0.005554733551962801371, // 15.0
}

// stirlerrFast is stirlerr (logpmf.go) with a table for half-integers up
// to 15 and the Stirling series with a single division above.
func stirlerrFast(v float64) float64 {
	if v > 15 {
		r := 1 / v
		r2 := r * r
		return r * (1.0/12 - r2*(1.0/360-r2*(1.0/1260-r2*(1.0/1680-r2*(1.0/1188)))))
	}
	if k := 2 * v; k >= 1 && k == math.Trunc(k) {
		return stirlerrHalves[int(k)]
	}
	return stirlerr(v)
}

// bd0Fast is bd0 (logpmf.go), x·log(x/m) + m − x, with the series near
// x = m summed by Horner's rule to a length fixed by |x − m|/(x + m).
func bd0Fast(x, m float64) float64 {
	d, s := x-m, x+m
	if math.Abs(d) >= 0.1*s {
		return x*math.Log(x/m) - d
	}
	// x log(x/m) = 2x(v + v³/3 + v⁵/5 + …) with v = d/s, and 2xv − d = d·v.
	v := d / s
	v2 := v * v
	var p float64
	switch {
	case v2 < 1e-6: // terms up to v^{2·4}: error below 1e-24·v²
		p = 1.0/3 + v2*(1.0/5+v2*(1.0/7+v2*(1.0/9)))
	case v2 < 1e-4:
		p = 1.0/3 + v2*(1.0/5+v2*(1.0/7+v2*(1.0/9+v2*(1.0/11+v2*(1.0/13)))))
	default: // v² < 0.01: nine terms, the next is below 1e-18 of the first
		p = 1.0/3 + v2*(1.0/5+v2*(1.0/7+v2*(1.0/9+v2*(1.0/11+v2*(1.0/13+v2*(1.0/15+v2*(1.0/17+v2*(1.0/19+v2*(1.0/21)))))))))
	}
	return d*v + 2*x*v*v2*p
}

// BetaTail is the tail probability q of one interval with its normal
// deviate z = Φ⁻¹(1 − q), taken from the confidence level. The series
// branch starts at w = −z and needs Φ(−z) and φ(z) for that z, computed
// once per interval and only if that branch is tried (so z need not be
// exact); logq is likewise computed when a starting value first needs it.
type BetaTail struct {
	q, z     float64
	cdf, pdf float64 // Φ(−z), φ(z), valid when gauss is set
	gauss    bool
	logq     float64 // log q, valid when not 0
}

// NewBetaTail prepares the tail q, taking the hint z unless it cannot be
// the deviate of q (a Confidence built without NewConfidence has Z = 0).
func NewBetaTail(q, z float64) BetaTail {
	if !(z > 0 && z < 40) && q < 0.5 {
		z = -NormalQuantile(q)
	}
	return BetaTail{q: q, z: max(z, 0)}
}

// normal sets Φ(−z) and φ(z), first replacing z by Φ⁻¹(1 − q) if the hint
// is off by more than 0.1% in Φ(−z).
func (t *BetaTail) normal() {
	if t.gauss {
		return
	}
	t.gauss = true
	t.cdf = 0.5 * math.Erfc(t.z/math.Sqrt2)
	if !(math.Abs(t.cdf-t.q) <= 1e-3*t.q) {
		t.z = -NormalQuantile(t.q)
		t.cdf = 0.5 * math.Erfc(t.z/math.Sqrt2)
	}
	// exp(−z²/2) with the rounding error of z² put back
	zz := t.z * t.z
	e := math.FMA(t.z, t.z, -zz)
	t.pdf = math.Exp(-0.5*zz) * (1 - 0.5*e) / math.Sqrt(2*math.Pi)
}

// BetaLowerQuantile returns x with I_x(a, b) = t.q and y = 1 − x, for
// shapes a, b > 0 (up to 2^50 and beyond) and 0 < t.q ≤ ½.
func BetaLowerQuantile(a, b float64, t *BetaTail) (x, y float64) {
	q := t.q
	switch {
	case a == 1 && b == 1: // uniform
		return q, 1 - q
	case a == 1: // I_x(1, b) = 1 − (1−x)^b
		l := math.Log1p(-q) / b
		return -math.Expm1(l), math.Exp(l)
	case b == 1: // I_x(a, 1) = x^a
		l := math.Log(q) / a
		return math.Exp(l), -math.Expm1(l)
	}
	if betaSeriesApplies(a, b, t.z) {
		t.normal()
		var s betaSeries
		if s.setup(a, b, t) {
			if x, y, ok := s.solve(t); ok {
				return x, y
			}
		}
	}
	return betaQuantileByFraction(a, b, t)
}

// ---------- series branch ----------

// Bounds of the series branch (see betaSeriesApplies) and the lengths of
// its coefficient arrays; setup gives up, and the continued fractions take
// over, rather than exceed them.
const (
	betaSeriesMinShape  = 40
	betaSeriesMaxRatio2 = 0.002 // (|w|+1)²/(4πm) at most 0.045²
	betaSeriesMaxTerms  = 24
	betaHermiteTerms    = 24
)

// betaRecip[i] = 1/i, so the recurrences multiply instead of dividing.
var betaRecip = func() (r [64]float64) {
	for i := 1; i < len(r); i++ {
		r[i] = 1 / float64(i)
	}
	return r
}()

// betaSeriesApplies reports whether the series branch is tried: the smaller
// shape m is at least betaSeriesMinShape and the deviate z is well inside
// the radius √(4πm) of the expansion in w, ρ = (z+1)/√(4πm) ≤ 0.045. The
// series then needs at most about 14 terms (K ≈ 37/log(1/ρ)); beyond that
// the continued fractions, at about 20–40 steps there, are faster.
func betaSeriesApplies(a, b, z float64) bool {
	m := math.Min(a, b)
	return m >= betaSeriesMinShape && (z+1)*(z+1) <= betaSeriesMaxRatio2*4*math.Pi*m
}

// betaSeries holds the coefficients of the series branch for one (a, b).
type betaSeries struct {
	p, q  float64
	k     int
	u     [betaSeriesMaxTerms + 2]float64 // x(w) − p = Σ_{k≥1} u[k] w^k
	psi   [betaSeriesMaxTerms + 1]float64 // ψ(w) = Σ psi[k] w^k
	delta float64
	// at w0 = −z: Σ psi_k m_k(w0), ψ(w0), ψ'(w0)
	s0, p0, d0 float64
}

// setup computes the coefficients; it returns false when more than
// betaSeriesMaxTerms terms would be needed at w0 = −z.
func (s *betaSeries) setup(a, b float64, t *BetaTail) bool {
	n := a + b
	s.p, s.q = a/n, b/n
	w0 := -t.z
	u := &s.u
	u1 := math.Sqrt(s.p * s.q / n)
	u[1] = u1
	inv2u1 := 0.5 / u1
	invn := 1 / n
	d := s.q - s.p
	psi := &s.psi
	psi[0] = 1
	inv1 := 1 / u1
	// The stopping rule is on the quantile: a term changes w by about
	// term/φ(w0), hence x by u1 times that; both x and 1 − x must keep
	// their relative precision.
	xs0 := u1 * w0
	x0 := math.Min(s.p+xs0, s.q-xs0)
	if !(x0 > 0) {
		return false
	}
	tolU := 2e-17 * x0
	tolS := tolU * t.pdf * inv1
	m2, m1 := t.cdf, -t.pdf // m_{k-2}, m_{k-1}
	S, P, D := m2, 1.0, 0.0
	wk := 1.0 // w0^(k-1)
	// sp2[j] = Σ_{i+l=j, i,l≥2} u_i u_l, so the full sum over i+l=j is
	// sp2[j] + 2u1u_{j-1}.
	var sp2 [betaSeriesMaxTerms + 3]float64
	prevSmall := false
	for k := 1; ; k++ {
		nn := k + 1
		var full float64 // Σ_{i+l=nn−1} u_i u_l
		switch {
		case nn == 3:
			full = u1 * u1
		case nn > 3:
			full = sp2[nn-1] + 2*u1*u[nn-2]
		}
		// Σ_{i+l=nn+1, i,l≥2} u_i u_l by symmetry; the pair (2, nn−1) holds
		// the newest coefficient and is added last to keep the dependency
		// chain short.
		var s2 float64
		for i, j := 3, nn-2; i < j; i, j = i+1, j-1 {
			s2 += u[i] * u[j]
		}
		if nn&1 == 1 && nn >= 5 {
			s2 += 0.5 * u[(nn+1)/2] * u[(nn+1)/2]
		}
		if nn >= 3 {
			if nn == 3 {
				s2 += 0.5 * u[2] * u[2]
			} else {
				s2 += u[2] * u[nn-1]
			}
		}
		s2 *= 2
		sp2[nn+1] = s2
		c1 := 2 * betaRecip[nn+1] * invn * inv2u1
		un := c1*(d*u[nn-1]) - (c1*full + s2*inv2u1)
		u[nn] = un
		// ψ_k = −(Σ_{j=1}^{k} u_{j+1} ψ_{k−j})/u1; the terms with the newest
		// values (j = 1 and j = k, where ψ_0 = 1) come last.
		var sp float64
		for j := 2; j < k; j++ {
			sp += u[j+1] * psi[k-j]
		}
		if k > 1 {
			sp += u[2] * psi[k-1]
		}
		pk := -(sp + un) * inv1
		psi[k] = pk
		mk := m1
		if k > 1 {
			mk = float64(k-1)*m2 - wk*t.pdf
			m2, m1 = m1, mk
		}
		term := pk * mk
		S += term
		D += float64(k) * pk * wk
		wk *= w0
		P += pk * wk
		small := math.Abs(term) <= tolS && math.Abs(un*wk*w0) <= tolU
		if small && prevSmall {
			s.k = k
			break
		}
		prevSmall = small
		if k == betaSeriesMaxTerms {
			return false
		}
	}
	s.s0, s.p0, s.d0 = S, P, D
	s.delta = stirlerrFast(n) - stirlerrFast(a) - stirlerrFast(b)
	return true
}

// solve finds w with e^Δ Σ ψ_k m_k(w) = q near w0 = −z and returns x(w)
// and 1 − x(w); ok is false if the iteration leaves the expansion's reach.
func (s *betaSeries) solve(t *BetaTail) (x, y float64, ok bool) {
	K := s.k
	psi := &s.psi
	wr := -t.z
	dl := s.delta // |Δ| < 1/(12m): five terms of e^{−Δ} are exact
	target := t.q * (1 - dl*(1-dl*(0.5-dl*(1.0/6-dl*(1.0/24-dl/120)))))
	// Halley step from w0, where setup has everything.
	F := s.s0 - target
	Fp := t.pdf * s.p0
	Fpp := t.pdf * (s.d0 - wr*s.p0)
	h := -F / Fp / (1 - F*Fpp/(2*Fp*Fp))
	// Halley's error is about (w²+2)/12 times the cube of the step.
	if (wr*wr+2)*h*h*math.Abs(h) > 1e-17 {
		// Further steps need Φ and φ near w0: φ(w0+h) = φ(w0) Σ c_n h^n
		// with (n+1)c_{n+1} = −w0 c_n − c_{n−1}, and Φ its integral.
		var c [betaHermiteTerms + 1]float64
		c[0], c[1] = 1, -wr
		J := 1
		hb := 1.5*math.Abs(h) + 1e-6
		pw := hb
		for n := 1; n < betaHermiteTerms; n++ {
			c[n+1] = (-wr*c[n] - c[n-1]) * betaRecip[n+1]
			pw *= hb
			J = n + 1
			if math.Abs(c[n+1])*pw < 1e-18 && math.Abs(c[n])*pw < 1e-18*hb {
				break
			}
		}
		if J == betaHermiteTerms {
			return 0, 0, false
		}
		for it := 0; ; it++ {
			if it == 6 {
				return 0, 0, false
			}
			w := wr + h
			E, G := 0.0, 0.0
			for n := J; n >= 0; n-- {
				E = E*h + c[n]
				G = G*h + c[n]*betaRecip[n+1]
			}
			phi := t.pdf * E
			Phi := t.cdf + t.pdf*G*h
			m2, m1 := Phi, -phi
			S := Phi + psi[1]*m1
			wp := 1.0
			ps, dps := psi[K], 0.0
			for k := 2; k <= K; k++ {
				wp *= w
				mk := float64(k-1)*m2 - wp*phi
				S += psi[k] * mk
				m2, m1 = m1, mk
				dps = dps*w + ps
				ps = ps*w + psi[K-k+1]
			}
			dps = dps*w + ps
			ps = ps*w + psi[0]
			F := S - target
			Fp := phi * ps
			Fpp := phi * (dps - w*ps)
			step := F / Fp / (1 - F*Fpp/(2*Fp*Fp))
			h -= step
			if !(math.Abs(h) <= hb) {
				return 0, 0, false
			}
			if (wr*wr+2)*step*step*math.Abs(step) < 1e-17 {
				break
			}
		}
	}
	w := wr + h
	xs := 0.0
	for k := K + 1; k >= 1; k-- {
		xs = (xs + s.u[k]) * w
	}
	return s.p + xs, s.q - xs, true
}

// ---------- continued-fraction branch ----------

// betaFraction returns the continued fraction of I_x(a, b) (A&S 26.5.8),
// I_x = x^a (1−x)^b/(a B(a,b)) · 1/(1+ d1/(1+ d2/(1+ …))), with
// d_{2m} = m(b−m)x/((a+2m−1)(a+2m)) and d_{2m+1} = −(a+m)(a+b+m)x/
// ((a+2m)(a+2m+1)), evaluated through its even part (one three-term
// recurrence per pair of terms), two pairs per loop sharing one division.
func betaFraction(a, b, x float64) float64 {
	n := a + b
	dOprev := -n * x / (a + 1) // d_1
	a0, b0 := 0.0, 1.0
	a1, b1 := 1.0, 1+dOprev
	for m := 1.0; m < 1e6; m += 2 {
		c0 := a + 2*m - 1
		c1, c2, c3, c4 := c0+1, c0+2, c0+3, c0+4
		c01, c34 := c0*c1, c3*c4
		inv := x / (c01 * c2 * c34)
		dE := m * (b - m) * c2 * c34 * inv        // d_{2m}
		dO := -(a + m) * (n + m) * c0 * c34 * inv // d_{2m+1}
		beta, alpha := 1+dE+dO, -dE*dOprev
		a2, b2 := beta*a1+alpha*a0, beta*b1+alpha*b0
		m1 := m + 1
		dE = m1 * (b - m1) * c01 * c4 * inv            // d_{2m+2}
		dOprev = -(a + m1) * (n + m1) * c01 * c2 * inv // d_{2m+3}
		beta, alpha = 1+dE+dOprev, -dE*dO
		a3, b3 := beta*a2+alpha*a1, beta*b2+alpha*b1
		// converged when A_k B_{k−1} and A_{k−1} B_k agree
		p := a3 * b2
		if math.Abs(math.FMA(a2, -b3, p)) <= 1e-16*math.Abs(p) {
			return a3 / b3
		}
		sc := 1 / b3
		a0, b0, a1, b1 = a2*sc, b2*sc, a3*sc, 1
	}
	return a1 / b1
}

// betaUpperFraction returns F = 2F1(1−a, 1; b+1; −y/x) by Gauss's continued
// fraction, so that 1 − I_x(a, b) = x^(a−1) y^b F / (b B(a,b)) with
// y = 1 − x: F = 1/(1+ e1/(1+ e2/(1+ …))) with e_{2m} = m(a+b+m−1)r/
// ((b+2m−1)(b+2m)) and e_{2m+1} = (m+1−a)(b+m)r/((b+2m)(b+2m+1)),
// r = y/x, evaluated like betaFraction. For integer a it terminates.
func betaUpperFraction(a, b, x, y float64) float64 {
	r := y / x
	n := a + b
	dOprev := (1 - a) / (b + 1) * r // e_1
	a0, b0 := 0.0, 1.0
	a1, b1 := 1.0, 1+dOprev
	for m := 1.0; m < 1e6; m += 2 {
		c0 := b + 2*m - 1
		c1, c2, c3, c4 := c0+1, c0+2, c0+3, c0+4
		c01, c34 := c0*c1, c3*c4
		inv := r / (c01 * c2 * c34)
		dE := m * (n + m - 1) * c2 * c34 * inv
		dO := (m + 1 - a) * (b + m) * c0 * c34 * inv
		beta, alpha := 1+dE+dO, -dE*dOprev
		a2, b2 := beta*a1+alpha*a0, beta*b1+alpha*b0
		m1 := m + 1
		dE = m1 * (n + m1 - 1) * c01 * c4 * inv
		dOprev = (m1 + 1 - a) * (b + m1) * c01 * c2 * inv
		beta, alpha = 1+dE+dOprev, -dE*dO
		a3, b3 := beta*a2+alpha*a1, beta*b2+alpha*b1
		p := a3 * b2
		if math.Abs(math.FMA(a2, -b3, p)) <= 1e-16*math.Abs(p) {
			return a3 / b3
		}
		sc := 1 / b3
		a0, b0, a1, b1 = a2*sc, b2*sc, a3*sc, 1
	}
	return a1 / b1
}

// betaFracConst holds √(ab/(2πN)) and Δ for the prefactor of one (a, b).
type betaFracConst struct{ sq, delta float64 }

// betaTailValue returns the lower (upper false) or upper tail of Beta(al, be)
// at t, with s = 1 − t, and the density there.
func betaTailValue(al, be, t, s float64, lk betaFracConst, upper bool) (tail, dens float64) {
	n := al + be
	// t^al s^be / B(al, be) = √(al be/(2πN)) exp(Δ − bd0(al, Nt) − bd0(be, Ns))
	g := lk.sq * math.Exp(lk.delta-bd0Fast(al, n*t)-bd0Fast(be, n*s))
	dens = g / (t * s)
	if t*(n+2) < al+1 {
		i := g / al * betaFraction(al, be, t)
		if upper {
			return 1 - i, dens
		}
		return i, dens
	}
	j := g / (be * t) * betaUpperFraction(al, be, t, s)
	if upper {
		return j, dens
	}
	return 1 - j, dens
}

const betaModelTerms = 40

// betaModelStep solves tail(t0 + h) = q on the Taylor expansion of the density
// at t0 (scaled by t0), whose coefficients follow from t(1−t) f' =
// ((al−1) − (al+be−2)t) f. ok is false when h is beyond the expansion's
// reach.
func betaModelStep(al, be, t0, s0, tail0, dens0, q float64, upper bool) (h float64, ok bool) {
	r := (q - tail0) / dens0
	if upper {
		r = -r
	}
	r /= t0
	n := al + be
	c0 := (al - 1) - (n-2)*t0
	d := s0 - t0
	is0 := 1 / s0
	var F [betaModelTerms + 2]float64
	F[0] = 1
	F[1] = c0 * is0
	// Within reach: |h| well inside the distance to the singularities at 0
	// and 1, and the density changing by at most a few times over h (its
	// expansion is like that of exp(F1·ρ)).
	if !(math.Abs(r) <= 0.3) || math.Abs(r*t0/s0) > 0.3 || math.Abs(r*F[1]) > 1.5 {
		return r * t0, false
	}
	rb := 1.25*math.Abs(r) + 1e-300
	pw := rb
	K := 1
	for k := 1; k < betaModelTerms; k++ {
		fk := float64(k)
		F[k+1] = ((c0-d*fk)*F[k] + (fk+1-n)*t0*F[k-1]) * is0 * betaRecip[k+1]
		pw *= rb
		K = k + 1
		if math.Abs(F[k+1])*pw*rb < 1e-17 && math.Abs(F[k])*pw < 1e-17 {
			break
		}
	}
	if K == betaModelTerms {
		return r * t0, false
	}
	for k := K + 1; k <= 4; k++ {
		F[k] = 0
	}
	// Newton's method on G(ρ) = ρ + g2ρ² + g3ρ³ + … = r, from the
	// fifth-order reversion of the series.
	g2, g3, g4, g5 := 0.5*F[1], F[2]*(1.0/3), 0.25*F[3], 0.2*F[4]
	g22 := g2 * g2
	A2 := -g2
	A3 := 2*g22 - g3
	A4 := -5*g22*g2 + 5*g2*g3 - g4
	A5 := 14*g22*g22 - 21*g22*g3 + 6*g2*g4 + 3*g3*g3 - g5
	rho := r * (1 + r*(A2+r*(A3+r*(A4+r*A5))))
	for it := 0; ; it++ {
		if it == 8 {
			return rho * t0, false
		}
		G, E := 0.0, 0.0
		for k := K; k >= 0; k-- {
			G = G*rho + F[k]*betaRecip[k+1]
			E = E*rho + F[k]
		}
		dd := (G*rho - r) / E
		rho -= dd
		if math.Abs(dd) <= 1e-9*math.Abs(rho) {
			break
		}
	}
	if !(math.Abs(rho) <= rb) {
		return rho * t0, false
	}
	return rho * t0, true
}

// betaQuantileByFraction solves I_x(a, b) = q with continued-fraction
// evaluations.
func betaQuantileByFraction(a, b float64, tl *BetaTail) (x, y float64) {
	t0, upper := betaFractionGuess(a, b, tl)
	return betaSolveByFraction(a, b, tl.q, t0, upper)
}

// betaSolveByFraction solves I_x(a, b) = q from the starting point t0 = x
// (upper false) or t0 = 1 − x (upper true), 0 < t0 < 1. It keeps a bracket,
// so any starting point converges, and works on whichever of x and 1 − x is
// below ½, so that both come out to full relative precision.
func betaSolveByFraction(a, b, q, t0 float64, upper bool) (x, y float64) {
	al, be := a, b
	if upper {
		al, be = b, a
	}
	n := al + be
	lk := betaFracConst{math.Sqrt(al * be / (2 * math.Pi * n)), stirlerrFast(n) - stirlerrFast(al) - stirlerrFast(be)}
	s0 := 1 - t0
	lo, hi := 0.0, 1.0
	for it := 0; it < 400; it++ {
		if t0 > 0.5 {
			// Reflect: the tail of Beta(al, be) at t is the other tail of
			// Beta(be, al) at 1 − t.
			al, be, upper = be, al, !upper
			t0, s0 = s0, t0
			lo, hi = 1-hi, 1-lo
		}
		tail0, dens0 := betaTailValue(al, be, t0, s0, lk, upper)
		if (tail0 < q) != upper {
			lo = t0
		} else {
			hi = t0
		}
		if hi-lo <= 2e-16*hi {
			break // the bracket is down to rounding
		}
		h, ok := betaModelStep(al, be, t0, s0, tail0, dens0, q, upper)
		tn := t0 + h
		// (inclusive: a step below the rounding of t0 leaves tn = t0)
		if ok && tn >= lo && tn <= hi {
			if tn <= 0.5 {
				t, s := tn, s0-h
				if upper {
					return s, t
				}
				return t, s
			}
			// The root is above ½: polish it from the other side.
			t0, s0 = tn, s0-h
			continue
		}
		// Safeguarded step: Newton in log t on log tail, kept inside the
		// bracket, else bisection.
		tn = 0
		if tail0 > 0 && dens0 > 0 {
			dl := math.Log(q/tail0) * tail0 / (t0 * dens0)
			if upper {
				dl = -dl
			}
			dl = math.Max(-2, math.Min(2, dl))
			tn = t0 * math.Exp(dl)
		}
		if !(tn > lo && tn < hi) {
			if lo > 0 {
				tn = math.Sqrt(lo * hi)
				if hi-lo > 0.5*hi {
					tn = 0.5 * (lo + hi)
				}
			} else {
				tn = hi / 16
			}
		}
		t0, s0 = tn, 1-tn
	}
	if upper {
		return s0, t0
	}
	return t0, s0
}

// lgammaHalvesPlus1[k] is log Γ(k/2 + 1) for k = 1..16 (40-digit
// arithmetic), the small shapes of the gamma-like starting values.
var lgammaHalvesPlus1 = [17]float64{
	0,
	-0.12078223763524522235, // 0.5
	0,                       // 1
	0.28468287047291915963,  // 1.5
	0.69314718055994530942,  // 2
	1.2009736023470742248,   // 2.5
	1.7917594692280550008,   // 3
	2.4537365708424422205,   // 3.5
	3.1780538303479456196,   // 4
	3.9578139676187162939,   // 4.5
	4.7874917427820459942,   // 5
	5.6625620598571415285,   // 5.5
	6.5792512120101009951,   // 6
	7.5343642367587329552,   // 6.5
	8.5251613610654143002,   // 7
	9.5492672573009977117,   // 7.5
	10.604602902745250228,   // 8
}

// oneMinusExpNeg returns 1 − e^{−u} for 0 ≤ u, by its series when u is
// small (a starting value needs no more than five terms).
func oneMinusExpNeg(u float64) float64 {
	if u < 0.05 {
		return u * (1 - u*(0.5-u*(1.0/6-u*(1.0/24-u*(1.0/120)))))
	}
	return -math.Expm1(-u)
}

// betaFractionGuess returns a starting point for I_x(a, b) = q: t0 = x when
// reflect is false, t0 = 1 − x otherwise, with t0 ≤ ½.
//
// A small shape s against a large one L makes the beta close to a gamma:
// −c·log(1 − X) ≈ Gamma(s) with c = L + (s−1)/2, which matches the leading
// power of the lower tail, x^s/(s B(s, L)) ≈ (c x)^s/Γ(s+1). The gamma's
// lower tail is inverted by the series ω = r + r²/(s+1) + r³(3s+5)/
// (2(s+1)²(s+2)) + … in r = (q Γ(s+1))^(1/s) (DiDonato AR, Morris AH (1986),
// "Computation of the incomplete gamma function ratios and their inverse",
// ACM TOMS 12:377–393), its upper tail by Wilson EB, Hilferty MM (1931),
// "The distribution of chi-square", PNAS 17:684–688, and for s = ½, where
// Gamma(½) is half a squared normal, exactly. Otherwise Carter's normal
// approximation (AS 109) is used, and the power law of a tail for shapes
// at most 1.
func betaFractionGuess(a, b float64, tl *BetaTail) (t0 float64, reflect bool) {
	q, z := tl.q, tl.z
	if s, l := math.Min(a, b), math.Max(a, b); s <= 8 && l >= 4*s {
		c := l + 0.5*(s-1)
		if a == s {
			// lower tail of the small shape
			lg := 0.0
			if k := 2 * s; k == math.Trunc(k) {
				lg = lgammaHalvesPlus1[int(k)]
			} else {
				lg, _ = math.Lgamma(s + 1)
			}
			if tl.logq == 0 {
				tl.logq = math.Log(q)
			}
			r := math.Exp((tl.logq + lg) / s)
			if r <= 0.25*(s+1) {
				// one division: d = 1/(24 s1⁴ s2² s3 s4)
				s1, s2, s3, s4 := s+1, s+2, s+3, s+4
				s12, s34 := s1*s2, s3*s4
				d := 1 / (24 * s12 * s12 * s1 * s1 * s34)
				c2 := 24 * s12 * s12 * s1 * s34 * d // 1/s1
				c3 := (3*s + 5) * 12 * s12 * s1 * s34 * d
				c4 := ((8*s+33)*s + 31) * 8 * s12 * s4 * d
				c5 := ((((125*s+1179)*s+3971)*s+5661)*s + 2888) * d
				w := r * (1 + r*(c2+r*(c3+r*(c4+r*c5))))
				if x := oneMinusExpNeg(w / c); x <= 0.5 {
					return x, false
				}
			}
		} else {
			// upper tail of the small shape
			var g float64
			if s == 0.5 {
				u := NormalQuantile(q / 2)
				g = 0.5 * u * u
			} else {
				v := 1 - 1/(9*s) + z/(3*math.Sqrt(s))
				g = s * v * v * v
			}
			if y := oneMinusExpNeg(g / c); y <= 0.5 {
				return y, true
			}
		}
	}
	if a > 1 && b > 1 {
		// Carter's approximation, as in AS 109.
		r := (z*z - 3) * (1.0 / 6)
		ia, ib := 2*a-1, 2*b-1
		inv := 1 / (ia * ib)
		s, t := ib*inv, ia*inv // 1/(2a−1), 1/(2b−1)
		ih := 0.5 * (s + t)    // 1/h
		w := z*math.Sqrt(1/ih+r)*ih - (t-s)*(r+5.0/6-(2.0/3)*ih)
		e := b * math.Exp(2*w)
		if a <= e {
			return a / (a + e), false
		}
		return e / (a + e), true
	}
	// Shapes at most 1 on both sides, or comparable: the power law of the
	// lower tail, x^a ≈ q a B(a, b), or of the upper one.
	la, _ := math.Lgamma(a)
	lb, _ := math.Lgamma(b)
	ln, _ := math.Lgamma(a + b)
	lbeta := la + lb - ln
	if x := math.Exp((math.Log(q*a) + lbeta) / a); x <= 0.5 {
		return x, false
	}
	y := math.Exp((math.Log((1-q)*b) + lbeta) / b)
	return math.Min(y, 0.5), true
}
