package bayes

import (
	"math"

	"github.com/propscope/propscope/internal/special"

	"github.com/propscope/propscope/proportions"
)

// HighestDensity returns the highest-density interval holding the given
// posterior probability: the shortest interval [L, U] with P(L ≤ E ≤ U) =
// level, where, for a density with one peak, f(L) = f(U) (Box GEP, Tiao
// GC (1973), Bayesian Inference in Statistical Analysis, Addison-Wesley,
// §2.8). It is not invariant under a change of scale: the interval for the
// ratio is not the exponential of one for the log ratio.
//
// It solves f(U) = f(L) and P(E < L) + P(E > U) = 1 − level by Newton's
// method in two unknowns from the equal-tailed interval; when that does not
// settle (a peak at the end of the range, as for the ratio when group 1
// had no events) it minimises U − L over the lower tail probability u by
// golden-section search, with L, U the quantiles at u and u + level. The
// error estimate is the larger error estimate of the ends' quantiles or
// of the distribution function over the density.
func (e *Effect) HighestDensity(level float64) (lower, upper, err float64, fail error) {
	lo, hi, eerr, fail := e.EqualTailed(level)
	if fail != nil {
		return 0, 0, 0, fail
	}
	return e.highestDensityFrom(level, lo, hi, eerr)
}

// highestDensityFrom is HighestDensity started from the equal-tailed
// interval [lo, hi] (with its error estimate), when the caller has it.
func (e *Effect) highestDensityFrom(level, lo, hi, eerr float64) (lower, upper, err float64, fail error) {
	_, sd := e.approx()
	if e.Scale != proportions.Difference {
		sd = (hi - lo) / 4
	}
	logf := func(v float64) float64 {
		f, _ := e.Density(v)
		return math.Log(f)
	}
	dlogf := func(v float64) float64 {
		h := 1e-4 * sd
		if e.Scale != proportions.Difference {
			h = math.Min(h, v/4)
		}
		return (logf(v+h) - logf(v-h)) / (2 * h)
	}
	L, U := lo, hi
	if e.Scale != proportions.Difference {
		L, U = e.logNormalShift(level, lo, hi)
	}
	ok := false
	// the slopes of log f enter only the Jacobian: from the same pass as
	// the tails and densities when the inner distribution function is
	// tabulated (Newton's method); otherwise taken by differences at the
	// start and every fourth step (a chord method), as they cost four
	// densities where the rest of a step costs two passes
	var dL0, dU0, prevStep float64
	prevExact := false
	for i := 0; i < 30; i++ {
		below, e1, fL, sL := e.tailDensity(L, false)
		above, e2, fU, sU := e.tailDensity(U, true)
		g1 := below + above - (1 - level)
		g2 := math.Log(fU) - math.Log(fL)
		exact := !math.IsNaN(sL+sU) && fL > 0 && fU > 0
		switch {
		case exact: // the slopes from the same pass: Newton's method
			dL0, dU0 = sL/fL, sU/fU
		case i%4 == 0:
			dL0, dU0 = dlogf(L), dlogf(U)
		}
		// Jacobian of (g1, g2) in (L, U)
		j11, j12 := fL, -fU
		j21, j22 := -dL0, dU0
		det := j11*j22 - j12*j21
		if !(det != 0) || math.IsNaN(g1+g2) || math.IsInf(g2, 0) {
			break
		}
		dL := (g1*j22 - j12*g2) / det
		dU := (j11*g2 - j21*g1) / det
		nL, nU := L-dL, U-dU
		for k := 0; k < 30 && !(nL < nU && e.inSupport(nL) && e.inSupport(nU)); k++ {
			dL, dU = dL/2, dU/2
			nL, nU = L-dL, U-dU
			exact = false
		}
		if !(nL < nU && e.inSupport(nL) && e.inSupport(nU)) {
			break
		}
		L, U = nL, nU
		eerr = math.Max(eerr, math.Max(e1/math.Max(fL, 1e-300), e2/math.Max(fU, 1e-300)))
		// Newton's method with the exact Jacobian converges
		// quadratically: the next step is about K·d² for this step d,
		// with K measured from this step and the last (d/d₋₁²). When ten
		// times that prediction is within the tolerance 10⁻¹¹·sd, this
		// step's end is the answer and another pass would only confirm
		// it.
		step := math.Abs(dL) + math.Abs(dU)
		predicted := math.Inf(1)
		if exact && prevExact && prevStep > 0 {
			predicted = step / (prevStep * prevStep) * step * step
		}
		prevStep, prevExact = step, exact
		if step <= 1e-11*sd || 10*predicted <= 1e-11*sd {
			ok = true
			break
		}
	}
	// the shortest interval is not longer than the equal-tailed one, within
	// the error estimates of their ends (for a near-symmetric posterior
	// the two agree to rounding)
	if ok && U-L <= hi-lo+2*eerr+1e-12*sd {
		below, _ := e.tail1(L, false)
		above, _ := e.tail1(U, true)
		if math.Abs(below+above-(1-level)) < 1e-8 {
			return L, U, eerr, nil
		}
	}
	return e.shortestBySearch(level)
}

// logNormalShift moves the equal-tailed interval [lo, hi] of a ratio by
// the difference between the highest-density and the equal-tailed
// interval of a log-normal law with the same mean and variance of the log
// (see Effect.cumulants), to start the highest-density search nearer its
// answer. For the log-normal law with log-scale mean m and sd s, the
// density of E is ∝ exp(−(y − m)²/(2s²) − y) at y = log v, so equal
// densities at the ends mean a + b = −2s for their standard scores a, b,
// and Φ(b) − Φ(a) = level fixes b (Newton's method on the normal law).
// Without usable moments it returns [lo, hi].
func (e *Effect) logNormalShift(level, lo, hi float64) (float64, float64) {
	_, k2, _ := e.cumulants()
	s := math.Sqrt(k2)
	z := normalQuantile((1 + level) / 2)
	if !(s > 0) || math.IsInf(s, 0) {
		return lo, hi
	}
	b := z
	for range 50 {
		a := -2*s - b
		pa, _ := special.NormalUpperTail(a)
		pb, _ := special.NormalUpperTail(b)
		g := pa - pb - level
		d := g / (normalDensity(b) + normalDensity(a))
		b -= d
		if math.Abs(d) < 1e-12 {
			break
		}
	}
	a := -2*s - b
	L, U := lo*math.Exp(s*(a+z)), hi*math.Exp(s*(b-z))
	if !(L > 0 && L < U) || math.IsInf(U, 0) || math.IsNaN(L+U) {
		return lo, hi
	}
	return L, U
}

func normalDensity(x float64) float64 { return math.Exp(-x*x/2) / math.Sqrt(2*math.Pi) }

// shortestBySearch minimises Q(u + level) − Q(u) over u in [0, 1 − level]
// by golden-section search (the width is convex in u for a density with
// one peak); an end of the range stands for u = 0 or u = 1 − level.
func (e *Effect) shortestBySearch(level float64) (lower, upper, err float64, fail error) {
	rangeLo := -1.0
	if e.Scale != proportions.Difference {
		rangeLo = 0
	}
	q := func(u float64) (float64, float64) {
		if u <= 0 {
			return rangeLo, 0
		}
		v, er, _ := e.Quantile(u)
		return v, er
	}
	width := func(u float64) (w, l, h, er float64) {
		l, e1 := q(u)
		h, e2, _ := e.Quantile(u + level)
		return h - l, l, h, math.Max(e1, e2)
	}
	a, b := 0.0, 1-level
	const phi = 0.6180339887498949
	c, d := b-phi*(b-a), a+phi*(b-a)
	wc, _, _, _ := width(c)
	wd, _, _, _ := width(d)
	for i := 0; i < 60 && b-a > 1e-10; i++ {
		if wc < wd {
			b, d, wd = d, c, wc
			c = b - phi*(b-a)
			wc, _, _, _ = width(c)
		} else {
			a, c, wc = c, d, wd
			d = a + phi*(b-a)
			wd, _, _, _ = width(d)
		}
	}
	u := (a + b) / 2
	w0, l0, h0, e0 := width(0)
	w, l, h, er := width(u)
	if w0 <= w {
		return l0, h0, e0, nil
	}
	return l, h, er, nil
}
