package bayes

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mathext"

	"github.com/propscope/propscope/internal/quad"
	"github.com/propscope/propscope/internal/special"
	"github.com/propscope/propscope/proportions"
)

// Tolerances of the quadrature behind every distribution function and
// density: absolute and relative error estimates.
const (
	absTol = 1e-12
	relTol = 1e-9
)

// Effect is the posterior of one effect of the two rates: the difference
// π1 − π2, the ratio π1/π2 or the odds ratio π1(1−π2)/(π2(1−π1)), with π1
// and π2 independent beta posteriors. Its methods return a value and an
// error estimate (see the package doc for what it covers).
type Effect struct {
	Scale         proportions.Scale
	First, Second Posterior
	// outerFirst: integrate over π1 (the narrower posterior) instead of π2.
	outerFirst   bool
	lo, hi, tail float64 // the outer posterior's log-odds window and its truncation bound
	innerMax     float64 // the inner density's maximum (+Inf for a shape below 1)
	rule         fixedRule
	inner        cdfTable // the inner posterior's distribution function, when tabulated
}

// NewEffect returns the posterior of the effect on the scale (Difference,
// Ratio or OddsRatio; an error wrapping proportions.ErrUnsupported for
// another scale). Posteriors the integrals cannot handle are refused as by
// Analyze (proportions.ErrTooLarge above 10⁸ units, ErrPrior for a shape
// below 0.05 or one that is not a number).
func NewEffect(scale proportions.Scale, first, second Posterior) (*Effect, error) {
	switch scale {
	case proportions.Difference, proportions.Ratio, proportions.OddsRatio:
	default:
		return nil, fmt.Errorf("posterior of the %v scale: %w; use the difference, the ratio or the odds ratio", scale, proportions.ErrUnsupported)
	}
	for i, p := range [2]Posterior{first, second} {
		if err := checkPosterior([2]string{"first", "second"}[i], p); err != nil {
			return nil, err
		}
	}
	return newEffect(scale, first, second), nil
}

// newEffect is NewEffect for a scale it accepts and posteriors that Analyze
// checked, or that differ from checked ones by a shape of 1 (the expected
// loss, the sensitivity rows): those never fail, so their callers need no
// error to ignore.
func newEffect(scale proportions.Scale, first, second Posterior) *Effect {
	e := &Effect{Scale: scale, First: first, Second: second, outerFirst: first.Variance() < second.Variance()}
	out, in := e.outer()
	e.lo, e.hi, e.tail = out.window()
	e.innerMax = in.maxDensity()
	e.rule = newFixedRule(out, e.lo, e.hi)
	e.inner = newCDFTable(in)
	return e
}

// onScale returns the posterior of another effect of the same two rates,
// reusing the outer rule and the inner table (they depend only on the
// posteriors).
func (e *Effect) onScale(scale proportions.Scale) (*Effect, error) {
	switch scale {
	case proportions.Difference, proportions.Ratio, proportions.OddsRatio:
	default:
		return NewEffect(scale, e.First, e.Second)
	}
	o := *e
	o.Scale = scale
	return &o, nil
}

func (e *Effect) outer() (out, in Posterior) {
	if e.outerFirst {
		return e.First, e.Second
	}
	return e.Second, e.First
}

// threshold maps the outer rate o (with 1 − o) and an effect value v to the
// inner rate z (with 1 − z) at which the effect equals v, and |∂z/∂v|.
// With the second group outer, E ≤ v ⇔ π1 ≤ z; with the first outer,
// E ≤ v ⇔ π2 ≥ z.
func (e *Effect) threshold(o, oc, v float64) (z, zc, dz float64) {
	switch {
	case e.Scale == proportions.Difference && !e.outerFirst: // π1 ≤ π2 + v
		return o + v, oc - v, 1
	case e.Scale == proportions.Difference: // π2 ≥ π1 − v
		return o - v, oc + v, 1
	case e.Scale == proportions.Ratio && !e.outerFirst: // π1 ≤ v·π2
		return v * o, 1 - v*o, o
	case e.Scale == proportions.Ratio: // π2 ≥ π1/v
		return o / v, 1 - o/v, o / (v * v)
	case !e.outerFirst: // odds1 ≤ v·odds2: π1 ≤ v·o/(1 − o + v·o)
		d := oc + v*o
		return v * o / d, oc / d, o * oc / (d * d)
	default: // odds2 ≥ odds1/v: π2 ≥ o/(o + v(1 − o))
		d := o + v*oc
		return o / d, v * oc / d, o * oc / (d * d)
	}
}

// breaks returns the outer log-odds where the inner threshold reaches 0 or
// 1 (kinks of the integrand).
func (e *Effect) breaks(v float64, buf []float64) []float64 {
	add := func(o float64) {
		if o > 0 && o < 1 {
			buf = append(buf, logOdds(o))
		}
	}
	switch e.Scale {
	case proportions.Difference:
		if e.outerFirst {
			add(v)
			add(1 + v)
		} else {
			add(-v)
			add(1 - v)
		}
	case proportions.Ratio:
		if e.outerFirst {
			add(v)
		} else {
			add(1 / v)
		}
	}
	return buf
}

// identity reports whether v is the scale's no-effect value, where the
// inner threshold equals the outer rate.
func (e *Effect) identity(v float64) bool {
	if e.Scale == proportions.Difference {
		return v == 0
	}
	return v == 1
}

// inSupport reports whether v lies strictly inside the effect's range.
func (e *Effect) inSupport(v float64) bool {
	if e.Scale == proportions.Difference {
		return v > -1 && v < 1
	}
	return v > 0 && !math.IsInf(v, 1)
}

// Tails returns P(E ≤ v) and P(E > v), each computed directly (neither as
// one minus the other, so both keep their precision far in the tails), and
// the larger of their error estimates.
func (e *Effect) Tails(v float64) (below, above, err float64) {
	if math.IsNaN(v) {
		return math.NaN(), math.NaN(), math.Inf(1)
	}
	if !e.inSupport(v) {
		if (e.Scale == proportions.Difference && v <= -1) || (e.Scale != proportions.Difference && v <= 0) {
			return 0, 1, 0
		}
		return 1, 0, 0
	}
	pb, eb := e.tailIntegral(v, false)
	pa, ea := e.tailIntegral(v, true)
	return pb, pa, math.Max(eb, ea)
}

// tail returns P(E > v) when upper, P(E ≤ v) otherwise, with its error
// estimate: one of the two integrals of Tails.
func (e *Effect) tail1(v float64, upper bool) (p, err float64) {
	if !e.inSupport(v) {
		b, a, _ := e.Tails(v)
		if upper {
			return a, 0
		}
		return b, 0
	}
	return e.tailIntegral(v, upper)
}

// tailIntegral returns P(E > v) when upper, P(E ≤ v) otherwise, for v
// inside the support: on the fixed rule when its error estimate is within
// the tolerances, by adaptive quadrature otherwise.
func (e *Effect) tailIntegral(v float64, upper bool) (p, err float64) {
	out, in := e.outer()
	// with the second group outer, "below" is π1 ≤ z; with the first outer
	// it is π2 ≥ z
	useAbove := upper != e.outerFirst
	g := func(o, oc float64) float64 {
		z, zc, _ := e.threshold(o, oc, v)
		if useAbove {
			return in.above(zc)
		}
		return in.Below(z)
	}
	tableErr := 0.0
	if e.inner.ok() {
		tableErr = e.inner.err // the integrand's error, over an outer mass of at most 1
		g = func(o, oc float64) float64 {
			z, zc, _ := e.threshold(o, oc, v)
			below, above := e.inner.tails(z, zc)
			if useAbove {
				return above
			}
			return below
		}
	}
	integrate := func() (float64, float64) { return e.rule.integrate(g, 1) }
	if e.inner.ok() && e.identity(v) {
		// the threshold is the outer rate itself (no effect at v): the
		// inner table at the node's own log-odds
		integrate = func() (float64, float64) {
			return e.rule.integrateLogOdds(func(t float64) float64 {
				below, above := e.inner.tailsAt(t)
				if useAbove {
					return above
				}
				return below
			}, 1)
		}
	}
	if val, er := integrate(); er <= math.Max(absTol, relTol*math.Abs(val)) {
		return clamp01(val), er + e.tail + tableErr
	}
	var bb [4]float64
	r := quad.Integrate(func(t float64) float64 {
		o, oc := logistic(t)
		l, _ := out.ell(t)
		return math.Exp(l) * g(o, oc)
	}, e.lo, e.hi, e.breaks(v, bb[:0]), absTol, relTol)
	return clamp01(r.Value), r.Err + e.tail + tableErr
}

// tailDensity returns tail1(v, upper) with its error estimate and the
// density at v, from one pass over the fixed rule's nodes (the threshold
// and its logarithms serve both) when the inner distribution function is
// tabulated and both estimates are within the tolerances; otherwise from
// tail1 and Density. The quantile search and the highest-density interval
// need both at each step. The pass also gives the density's slope f′(v)
// (NaN when it took the other way): the highest-density search steers by
// it.
func (e *Effect) tailDensity(v float64, upper bool) (p, perr, f, slope float64) {
	if !e.inSupport(v) || !e.inner.ok() || math.IsInf(e.innerMax, 1) {
		p, perr = e.tail1(v, upper)
		f, _ = e.Density(v)
		return p, perr, f, math.NaN()
	}
	_, in := e.outer()
	useAbove := upper != e.outerFirst
	jac := 1.0
	if e.Scale != proportions.Difference {
		m := math.Min(1, v)
		jac = math.Max(1, 1/(4*m*m))
	}
	a1, b1 := in.EventShape-1, in.NonEventShape-1
	g := func(o, oc float64) (float64, float64, float64) {
		z, zc, dz := e.threshold(o, oc, v)
		if z <= 0 || zc <= 0 {
			if (z <= 0) == useAbove {
				return 1, 0, 0
			}
			return 0, 0, 0
		}
		lz, lzc := math.Log(z), math.Log(zc)
		below, above := e.inner.tailsAt(lz - lzc)
		dens := math.Exp(a1*lz+b1*lzc-in.lbeta) * dz
		// d/dv of p_in(z(v))·|z′(v)| = p_in·|z′|·(ℓ′(z)·z′ + z″/z′)
		zp, curv := e.bend(o, oc, v, dz)
		sl := dens * ((a1/z-b1/zc)*zp + curv)
		if useAbove {
			return above, dens, sl
		}
		return below, dens, sl
	}
	bound := e.innerMax * jac
	pv, pe, fv, fe, sv := e.rule.integrate2(g, 1, bound)
	if pe > math.Max(absTol, relTol*math.Abs(pv)) || fe > relTol*math.Abs(fv) {
		p, perr = e.tail1(v, upper)
		f, _ = e.Density(v)
		return p, perr, f, math.NaN()
	}
	return clamp01(pv), pe + e.tail + e.inner.err, fv, sv
}

// bend returns the signed slope z′(v) of the inner threshold of
// Effect.threshold (whose magnitude dz it is given) and z″(v)/z′(v), for
// the density's slope.
func (e *Effect) bend(o, oc, v, dz float64) (zp, curv float64) {
	switch {
	case e.Scale == proportions.Difference && !e.outerFirst: // z = o + v
		return 1, 0
	case e.Scale == proportions.Difference: // z = o − v
		return -1, 0
	case e.Scale == proportions.Ratio && !e.outerFirst: // z = v·o
		return dz, 0
	case e.Scale == proportions.Ratio: // z = o/v
		return -dz, -2 / v
	case !e.outerFirst: // z = v·o/(1 − o + v·o)
		return dz, -2 * o / (oc + v*o)
	default: // z = o/(o + v(1 − o))
		return -dz, -2 * oc / (o + v*oc)
	}
}

// CDF returns P(E ≤ v) and its error estimate.
func (e *Effect) CDF(v float64) (p, err float64) {
	b, _, err := e.Tails(v)
	return b, err
}

// Density returns the posterior density of E at v and its error estimate
// (+Inf when the inner posterior's density is unbounded, a shape below 1,
// and the window's truncation cannot be bounded).
func (e *Effect) Density(v float64) (f, err float64) {
	if !e.inSupport(v) {
		return 0, 0
	}
	out, in := e.outer()
	jac := 1.0
	if e.Scale != proportions.Difference {
		m := math.Min(1, v)
		jac = math.Max(1, 1/(4*m*m))
	}
	g := func(o, oc float64) float64 {
		z, zc, dz := e.threshold(o, oc, v)
		if z <= 0 || zc <= 0 {
			return 0
		}
		return math.Exp(in.logDensity(z, zc)) * dz
	}
	if bound := e.innerMax * jac; !math.IsInf(bound, 1) {
		if val, er := e.rule.integrate(g, bound); er <= relTol*math.Abs(val) {
			return val, er + e.tail*bound
		}
	}
	var bb [4]float64
	r := quad.Integrate(func(t float64) float64 {
		o, oc := logistic(t)
		l, _ := out.ell(t)
		z, zc, dz := e.threshold(o, oc, v)
		if z <= 0 || zc <= 0 {
			return 0
		}
		// the density of t is exp(ℓ); in is evaluated at z
		return math.Exp(l+in.logDensity(z, zc)) * dz
	}, e.lo, e.hi, e.breaks(v, bb[:0]), 1e-300, relTol)
	return r.Value, r.Err + e.tail*e.innerMax*jac
}

func clamp01(p float64) float64 { return math.Min(1, math.Max(0, p)) }

// approx returns a normal approximation (mean, sd) of E on the scale the
// quantile search works in: the value for the difference, its log for the
// ratio and the odds ratio.
func (e *Effect) approx() (m, sd float64) {
	a1, b1, a2, b2 := e.First.EventShape, e.First.NonEventShape, e.Second.EventShape, e.Second.NonEventShape
	switch e.Scale {
	case proportions.Difference:
		return e.First.Mean() - e.Second.Mean(), math.Sqrt(e.First.Variance() + e.Second.Variance())
	case proportions.Ratio: // log π ≈ ψ(α) − ψ(α+β), variance ≈ 1/α − 1/(α+β)
		return math.Log(a1/(a1+b1)) - math.Log(a2/(a2+b2)), math.Sqrt(1/a1 - 1/(a1+b1) + 1/a2 - 1/(a2+b2))
	}
	return math.Log(a1/b1) - math.Log(a2/b2), math.Sqrt(1/a1 + 1/b1 + 1/a2 + 1/b2)
}

// start returns the quantile search's first point for probability p, on
// the search scale: the Cornish–Fisher expansion to the skewness term,
// s = μ + σ·(z + (z² − 1)·γ/6) with z the normal quantile (Cornish EA,
// Fisher RA (1938), "Moments and cumulants in the specification of
// distributions", Revue de l'Institut International de Statistique 5:307–
// 320; the reference recalled from memory), from the exact cumulants of
// the two posteriors: of a beta rate for the difference; of log π,
// ψ⁽ᵏ⁾(α) − ψ⁽ᵏ⁾(α+β), for the ratio; of the log odds,
// ψ⁽ᵏ⁾(α) + (−1)ᵏ⁺¹·ψ⁽ᵏ⁾(β), for the odds ratio. The two groups'
// cumulants subtract (odd orders) or add (even). It only starts the
// search: with the skewness the start is off by the square of what a
// normal start is, which saves a step of Newton's method.
func (e *Effect) start(p float64) float64 {
	z := normalQuantile(p)
	m, k2, k3 := e.cumulants()
	sd := math.Sqrt(k2)
	s := m + sd*(z+(z*z-1)*k3/(k2*sd)/6)
	if math.IsNaN(s) || math.IsInf(s, 0) {
		m, sd := e.approx()
		return m + sd*z
	}
	return s
}

// cumulants returns the mean, variance and third cumulant of the effect
// on the search scale (see start).
func (e *Effect) cumulants() (m, k2, k3 float64) {
	for i, q := range []Posterior{e.First, e.Second} {
		a, b := q.EventShape, q.NonEventShape
		var mi, k2i, k3i float64
		switch e.Scale {
		case proportions.Difference:
			n := a + b
			mi = a / n
			k2i = a * b / (n * n * (n + 1))
			k3i = 2 * a * b * (b - a) / (n * n * n * (n + 1) * (n + 2))
		case proportions.Ratio:
			mi = mathext.Digamma(a) - mathext.Digamma(a+b)
			k2i = special.Trigamma(a) - special.Trigamma(a+b)
			k3i = special.Tetragamma(a) - special.Tetragamma(a+b)
		default:
			mi = mathext.Digamma(a) - mathext.Digamma(b)
			k2i = special.Trigamma(a) + special.Trigamma(b)
			k3i = special.Tetragamma(a) - special.Tetragamma(b)
		}
		if i == 1 {
			mi, k3i = -mi, -k3i
		}
		m, k2, k3 = m+mi, k2+k2i, k3+k3i
	}
	return m, k2, k3
}

// fromSearch maps the search variable to the effect's value and back.
func (e *Effect) fromSearch(s float64) float64 {
	if e.Scale == proportions.Difference {
		return s
	}
	return math.Exp(s)
}

// Quantile returns v with P(E ≤ v) = p, for p strictly between 0 and 1
// (an error wrapping proportions.ErrLevel otherwise), and an error
// estimate for v: the distribution function's error estimate over the
// density at v, plus the search tolerance.
func (e *Effect) Quantile(p float64) (v, err float64, fail error) {
	if !(p > 0 && p < 1) {
		return math.NaN(), 0, fmt.Errorf("quantile at %v: %w; the probability must be strictly between 0 and 1", p, proportions.ErrLevel)
	}
	upper := p > 0.5
	target := p
	if upper {
		target = 1 - p
	}
	// g(s) = tail(s) − target, increasing in s for the lower tail, with
	// its error estimate and the density at s
	g := func(s float64) (float64, float64, float64, float64) {
		p, er, f, slope := e.tailDensity(e.fromSearch(s), upper)
		if upper {
			return target - p, er, f, slope
		}
		return p - target, er, f, slope
	}
	_, sd := e.approx()
	s0 := e.start(p)
	lo, hi := math.Inf(-1), math.Inf(1)
	if e.Scale == proportions.Difference {
		lo, hi = -1, 1
		s0 = math.Max(-1+1e-12, math.Min(1-1e-12, s0))
	}
	s := s0
	var gv, ge float64
	var f, fv float64 // fv: the density at the last point evaluated
	for i := 0; i < 100; i++ {
		var slope float64
		gv, ge, f, slope = g(s)
		fv = f
		if math.Abs(gv) <= ge { // zero within the distribution function's error estimate
			break
		}
		if gv < 0 {
			lo = s
		} else {
			hi = s
		}
		// g′ and g″ on the search scale: f and f′ for the difference;
		// f·v and f′·v² + f·v in s = log v for the ratios
		curv := slope
		if e.Scale != proportions.Difference {
			v := e.fromSearch(s)
			curv = slope*v*v + f*v
			f *= v // density of log E
		}
		next := s - gv/f
		newton := true
		if !(f > 0) || !(next > lo && next < hi) {
			newton = false
			switch {
			case math.IsInf(lo, -1):
				next = s - 2*sd*(1+float64(i))
			case math.IsInf(hi, 1):
				next = s + 2*sd*(1+float64(i))
			default:
				next = (lo + hi) / 2
			}
		}
		// stop when the step is below the search tolerance or below what
		// the distribution function's own error estimate can resolve
		// (ge/f, which the reported error includes)
		tol := 1e-12*math.Max(sd, 1e-300) + 4e-16*math.Abs(s) + resolvable(ge, f)
		if math.Abs(next-s) <= tol || (hi-lo) <= 1e-12*sd {
			s = next
			break
		}
		// a Newton step d lands within |g″/(2g′)|·d² of the root (the
		// quadratic term of g's expansion): when ten times that is within
		// the tolerance, the step's end is the answer and one more
		// evaluation would only confirm it
		if d := next - s; newton && !math.IsNaN(curv) && 10*math.Abs(curv/(2*f))*d*d <= tol {
			s = next
			break
		}
		s = next
	}
	v = e.fromSearch(s)
	// the density at the last point evaluated: v itself, or a point within
	// the search tolerance of it
	err = 1e-12 * sd
	if e.Scale != proportions.Difference {
		err *= v
	}
	if fv > 0 {
		err += ge / fv
	}
	return v, err, nil
}

// resolvable is the step below which the distribution function's error
// estimate ge hides the change, at density f (0 when f is not above 0).
func resolvable(ge, f float64) float64 {
	if f > 0 && !math.IsInf(f, 1) {
		return ge / f
	}
	return 0
}

// EqualTailed returns the interval holding the given posterior
// probability with equal probability (1 − level)/2 beyond each end, and
// the larger error estimate of its ends. The level lies from
// proportions.MinLevel to proportions.MaxLevel, as in Analyze.
func (e *Effect) EqualTailed(level float64) (lower, upper, err float64, fail error) {
	if err := proportions.ValidateLevel(level); err != nil {
		return 0, 0, 0, fmt.Errorf("interval probability: %w", err)
	}
	lower, e1, _ := e.Quantile((1 - level) / 2)
	upper, e2, _ := e.Quantile((1 + level) / 2)
	return lower, upper, math.Max(e1, e2), nil
}
