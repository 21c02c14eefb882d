package bayes

import (
	"math"

	"gonum.org/v1/gonum/mathext"
)

// Posterior is one group's beta posterior Beta(α, β) on its rate. Both
// shapes are above 0 (NewPosterior does not check; Prior.Update keeps
// them so).
type Posterior struct {
	EventShape    float64 `json:"event_shape"`
	NonEventShape float64 `json:"non_event_shape"`
	lbeta         float64 // log B(α, β)
}

// NewPosterior returns Beta(α, β). It takes any shapes above 0, including
// those of an improper prior updated by data (Altham's check uses them).
func NewPosterior(eventShape, nonEventShape float64) Posterior {
	return Posterior{EventShape: eventShape, NonEventShape: nonEventShape, lbeta: mathext.Lbeta(eventShape, nonEventShape)}
}

// Mean returns α/(α+β).
func (p Posterior) Mean() float64 { return p.EventShape / (p.EventShape + p.NonEventShape) }

// Variance returns αβ/((α+β)²(α+β+1)).
func (p Posterior) Variance() float64 {
	s := p.EventShape + p.NonEventShape
	return p.EventShape * p.NonEventShape / (s * s * (s + 1))
}

// Below returns P(π ≤ x) = I_x(α, β).
func (p Posterior) Below(x float64) float64 {
	switch {
	case x <= 0:
		return 0
	case x >= 1:
		return 1
	}
	return mathext.RegIncBeta(p.EventShape, p.NonEventShape, x)
}

// Above returns P(π > x) = I_{1−x}(β, α), given 1 − x as y (so that rates
// near 1 keep their precision).
func (p Posterior) above(y float64) float64 {
	switch {
	case y <= 0:
		return 0
	case y >= 1:
		return 1
	}
	return mathext.RegIncBeta(p.NonEventShape, p.EventShape, y)
}

// Above returns P(π > x).
func (p Posterior) Above(x float64) float64 { return p.above(1 - x) }

// logDensity returns log f(x) given x and 1 − x.
func (p Posterior) logDensity(x, y float64) float64 {
	if x <= 0 || y <= 0 {
		return math.Inf(-1)
	}
	return (p.EventShape-1)*math.Log(x) + (p.NonEventShape-1)*math.Log(y) - p.lbeta
}

// Density returns the posterior density at x (0 outside (0, 1)).
func (p Posterior) Density(x float64) float64 { return math.Exp(p.logDensity(x, 1-x)) }

// maxDensity returns the largest value of the density, +Inf when a shape
// is below 1.
func (p Posterior) maxDensity() float64 {
	a, b := p.EventShape, p.NonEventShape
	switch {
	case a < 1 || b < 1:
		return math.Inf(1)
	case a == 1 && b == 1:
		return 1
	}
	m := (a - 1) / (a + b - 2)
	return math.Exp(p.logDensity(m, (b-1)/(a+b-2)))
}

// The log-odds form. With t = log(x/(1−x)), x = 1/(1+e^−t), the density of
// t is exp(ℓ(t)), ℓ(t) = α·log x + β·log(1−x) − log B(α, β), concave with
// ℓ'(t) = α − (α+β)x and ℓ''(t) = −(α+β)x(1−x).

// logistic returns x and 1 − x at log-odds t, both to full relative
// precision.
func logistic(t float64) (x, y float64) {
	if t >= 0 {
		e := math.Exp(-t)
		return 1 / (1 + e), e / (1 + e)
	}
	e := math.Exp(t)
	return e / (1 + e), 1 / (1 + e)
}

// logOdds returns log(x/(1−x)).
func logOdds(x float64) float64 { return math.Log(x) - math.Log1p(-x) }

// ell returns ℓ(t) and ℓ'(t).
func (p Posterior) ell(t float64) (l, d float64) {
	x, y := logistic(t)
	lx, ly := -math.Log1p(math.Exp(-t)), -math.Log1p(math.Exp(t))
	if t < -30 {
		lx = t - math.Log1p(math.Exp(t))
	}
	if t > 30 {
		ly = -t - math.Log1p(math.Exp(-t))
	}
	return p.EventShape*lx + p.NonEventShape*ly - p.lbeta, p.EventShape*y - p.NonEventShape*x
}

// relEll returns ℓ(t) − ℓ(m) at the mode m = log(α/β). With δ = t − m,
// x_m = α/(α+β) and y_m = 1 − x_m it is
//
//	−α·log1p(y_m·expm1(−δ)) − β·log1p(x_m·expm1(δ)),
//
// two terms of one sign, each to its own relative precision, where ℓ
// itself (α·log x + β·log(1−x) − log B(α, β), terms of size α+β and a
// log-beta about 10⁻⁹ off at 10⁶ trials) cancels to a small number.
// Densities built on it are normalised by their total mass.
func (p Posterior) relEll(t float64) float64 { return p.relEllFunc()(t) }

// relEllFunc returns relEll with its constants worked out once.
func (p Posterior) relEllFunc() func(t float64) float64 {
	a, b := p.EventShape, p.NonEventShape
	xm, ym, m := a/(a+b), b/(a+b), math.Log(a/b)
	return func(t float64) float64 {
		d := t - m
		return -a*log1pScaledExpm1(ym, -d) - b*log1pScaledExpm1(xm, d)
	}
}

// log1pScaledExpm1 returns log(1 + c·(e^s − 1)) for c in (0, 1).
func log1pScaledExpm1(c, s float64) float64 {
	if s > 30 { // e^s would overflow far out: log(c) + s + log1p((1−c)/c·e^−s)
		return math.Log(c) + s + math.Log1p((1-c)/c*math.Exp(-s))
	}
	return math.Log1p(c * math.Expm1(s))
}

// windowDrop is how far ℓ falls from its peak at the window's ends: e^−36
// is about 2·10⁻¹⁶, and the mass beyond an end, at most exp(ℓ)/|ℓ'| there,
// comes to about 10⁻¹⁷ at any shapes, far below the integrals' absolute
// tolerance (10⁻¹²); the bound itself is part of every error estimate.
const windowDrop = 36

// window returns log-odds limits [lo, hi] outside which the posterior has
// mass at most tail (a bound: for a log-concave density exp(ℓ), the mass
// beyond a point t right of the mode is at most exp(ℓ(t))/|ℓ'(t)|).
func (p Posterior) window() (lo, hi, tail float64) {
	a, b := p.EventShape, p.NonEventShape
	mode := math.Log(a / b)
	peak, _ := p.ell(mode)
	xm, ym := logistic(mode)
	sd := 1 / math.Sqrt((a+b)*xm*ym) // curvature at the mode
	find := func(dir float64) (float64, float64) {
		in, out := mode, mode+dir*sd
		for i := 0; i < 200; i++ {
			if l, _ := p.ell(out); peak-l >= windowDrop {
				break
			}
			in, out = out, out+2*(out-in)
		}
		// tidy: bisect towards the drop (ten halvings leave the end within
		// a thousandth of the last doubling step of it; the bound below is
		// computed at the end itself)
		for i := 0; i < 10; i++ {
			mid := (in + out) / 2
			if l, _ := p.ell(mid); peak-l >= windowDrop {
				out = mid
			} else {
				in = mid
			}
		}
		l, d := p.ell(out)
		return out, math.Exp(l) / math.Abs(d)
	}
	lo, tlo := find(-1)
	hi, thi := find(1)
	return lo, hi, tlo + thi
}
