package proportions

import (
	"context"
	"fmt"
	"math"

	"github.com/propscope/propscope/internal/special"
)

// Finding the supremum over the nuisance parameter.
//
// Under the null hypothesis π1 − π2 = δ0 the tail probability of a region,
// T(π2) = P(region | π1 = π2 + δ0, π2), is a polynomial of degree n1 + n2
// with several local maxima. It is searched on the angle scale
// π2 = a + (b − a)·sin²θ, θ ∈ [0, π/2], on which binomial features have
// about the same width everywhere (the arcsine transform stabilises the
// binomial variance): a grid of supGridPoints(n1, n2) equally spaced angles,
// about 16 points per standard deviation of the pooled proportion's angle
// 1/(2√(n1+n2)), then every grid peak that reaches a fifth of the largest
// grid value is refined by Brent's method on the two grid cells around it.
// TestSupremumDense checks on many designs that a search 50 times denser
// never finds a higher value.

// supGridPoints returns the number of grid angles for a design.
func supGridPoints(n1, n2 int) int {
	return 40 + int(math.Ceil(16*math.Sqrt(float64(n1+n2))))
}

// supCandidateShare is the share of the largest grid value a grid peak
// needs to be refined. Near a peak the tail varies by a few percent over a
// grid cell, so a peak below a fifth of the largest grid value cannot hold
// the supremum; the generous margin costs only a few evaluations.
const supCandidateShare = 0.2

// supTolerance is the precision of the refined peak location on the angle
// scale (radians); the peak's height is then exact to far better than 1e−12
// relative, because the tail is flat at a maximum.
const supTolerance = 1e-9

// linearFloor is the smallest supremum the linear-scale search reports;
// below it the search is repeated in log space.
const linearFloor = 1e-280

// nuisanceSearch evaluates a region's tail probability along the null line
// π1 = π2 + delta for π2 in [a, b].
type nuisanceSearch struct {
	work  *tailWork
	reg   *region
	delta float64
	a, b  float64
	// best is the largest value seen, used to skip negligible binomial terms.
	best float64
	// logScale makes at return log T (the slow path for T below ~1e−280).
	logScale bool
	// thetaMax is the end of the angle range searched: π/2, or π/4 when the
	// tail is symmetric about π2 = ½ (see region.mirrored).
	thetaMax float64
	// low, when set, is a second region whose probability is added, taken
	// on the line π1 = π2 + lowDelta: the bound of exactScoreBound, which
	// takes each half of a two-sided region at the end of a stretch of δ
	// where that half is most probable.
	low      *region
	lowDelta float64
	// ctx, when set, is looked at before every evaluation; guard, when set,
	// bounds the cost of the log-space search. The first error (ctx's, or
	// the guard's wrapping ErrTooLarge) is kept in err, after which every
	// evaluation returns 0 at once and the search winds down.
	ctx   context.Context
	guard Cost
	err   error
	// prove, when set (tests only, not the interval searches; low must be
	// nil), makes every evaluation carry its rounding allowance and keeps
	// the grid and the best point for proveSupremum (unconditional_bound.go).
	prove     bool
	lastErr   float64
	grid      []boundPoint
	bestPoint boundPoint
	hasBest   bool
	// rowMin and rowMax are the smallest and largest x2 of each row of the
	// region, for the monotone-cell check of proveSupremum.
	rowMin, rowMax []int32
	// outMin and outMax: the same for the tables outside the region.
	outMin, outMax []int32
}

func (s *nuisanceSearch) pi2(theta float64) float64 {
	sn := math.Sin(theta)
	return min(max(s.a+(s.b-s.a)*sn*sn, s.a), s.b)
}

func (s *nuisanceSearch) at(theta float64) float64 {
	if s.err != nil {
		return 0
	}
	if s.ctx != nil {
		if s.err = s.ctx.Err(); s.err != nil {
			return 0
		}
	}
	p2 := s.pi2(theta)
	p1 := min(max(p2+s.delta, 0), 1)
	if s.logScale {
		v := s.work.logProb(s.reg, p1, p2)
		if s.low != nil {
			v = special.LogAddExp(v, s.work.logProb(s.low, min(max(p2+s.lowDelta, 0), 1), p2))
		}
		s.keep(theta, p2, v)
		return v
	}
	// The cutoff is relative to the largest value seen, but never below
	// what a result of linearFloor needs: smaller values are redone in log
	// space anyway, and a cutoff of 0 would let the binomial windows run on
	// through subnormal numbers (whose products round back to themselves),
	// a third of the range at slow subnormal speed. The proof's allowance
	// counts the terms skipped below whatever cutoff is used.
	cutoff := 1e-13 * max(s.best, linearFloor) / float64(s.reg.n1+s.reg.n2+2)
	if s.prove {
		v, e := s.work.probErr(s.reg, p1, p2, cutoff)
		s.lastErr = e + lineAllowance(v, s.reg.n1, p1, s.delta)
		s.best = max(s.best, v)
		s.keep(theta, p2, v)
		return v
	}
	v := s.work.prob(s.reg, p1, p2, cutoff)
	if s.low != nil {
		v += s.work.prob(s.low, min(max(p2+s.lowDelta, 0), 1), p2, cutoff)
	}
	s.best = max(s.best, v)
	return v
}

// keep records the best evaluated point when proving.
func (s *nuisanceSearch) keep(theta, p2, v float64) {
	if s.prove && (!s.hasBest || v > s.bestPoint.val) {
		s.bestPoint, s.hasBest = boundPoint{theta: theta, pi2: p2, val: v, up: s.upper(v)}, true
	}
}

// supremum returns the log of the largest tail probability over the
// nuisance range and the π2 where it is attained. It searches in linear
// scale and, when the supremum is below 1e−280 (where linear sums lose
// terms to underflow), repeats the search in log space.
func (s *nuisanceSearch) supremum() (logValue, pi2 float64) {
	if s.reg.full() {
		return 0, s.pi2(math.Pi / 4)
	}
	s.setAngleRange()
	v, p := s.search()
	if v >= linearFloor || s.err != nil {
		return math.Log(min(v, 1)), p
	}
	if s.guard != (Cost{}) {
		c := unconditionalLogCost(s.reg.n1, s.reg.n2, s.reg.tables)
		if s.err = c.guard(fmt.Sprintf("the log-space search for a tail probability below 1e-280 at %d and %d trials", s.reg.n1, s.reg.n2), s.guard); s.err != nil {
			return 0, p
		}
	}
	s.logScale = true
	s.grid, s.hasBest = s.grid[:0], false
	return s.search()
}

// setAngleRange sets the end of the angle range searched: π/2, or π/4
// when the tail is symmetric about π2 = ½.
func (s *nuisanceSearch) setAngleRange() {
	s.thetaMax = math.Pi / 2
	if s.delta == 0 && s.a == 0 && s.b == 1 && s.low == nil && s.reg.mirrored() {
		s.thetaMax = math.Pi / 4
	}
}

// gridSpec returns the number of grid angles and their spacing, once the
// angle range is set.
func (s *nuisanceSearch) gridSpec() (g int, step float64) {
	g = supGridPoints(s.reg.n1, s.reg.n2)
	if s.thetaMax < math.Pi/2 {
		g = g/2 + 1
	}
	if s.a == s.b {
		g = 1
	}
	return g, s.thetaMax / float64(max(g-1, 1))
}

// search runs the grid and the refinements on the current scale.
func (s *nuisanceSearch) search() (value, pi2 float64) {
	g, step := s.gridSpec()
	vals := make([]float64, g)
	for i := range vals {
		vals[i] = s.at(float64(i) * step)
		if s.prove {
			s.grid = append(s.grid, boundPoint{theta: float64(i) * step, pi2: s.pi2(float64(i) * step), val: vals[i], up: s.upper(vals[i])})
		}
	}
	top := 0
	for i, v := range vals {
		if v > vals[top] {
			top = i
		}
	}
	value, theta := vals[top], float64(top)*step
	if !s.logScale && value < linearFloor {
		// The largest grid value is below what linear scale resolves:
		// supremum repeats the search in log space, so refining here would
		// be wasted (and on a plateau of underflowed values every grid
		// point would pass the test below and cost a Brent search).
		return value, s.pi2(theta)
	}
	floor := supCandidateShare * vals[top]
	if s.logScale {
		floor = vals[top] + math.Log(supCandidateShare)
	}
	for i, v := range vals {
		if v < floor || (i > 0 && vals[i-1] > v) || (i+1 < g && vals[i+1] > v) {
			continue
		}
		lo, hi := max(float64(i-1)*step, 0), min(float64(i+1)*step, s.thetaMax)
		x, fx := maximizeBrent(s.at, lo, hi, float64(i)*step, v, supTolerance)
		if fx > value {
			value, theta = fx, x
		}
	}
	return value, s.pi2(theta)
}

// maximizeBrent maximises f on [a, b] by Brent's method (golden-section
// steps with parabolic interpolation), started from the known point x0
// with value f0: Brent RP (1973), Algorithms for Minimization without
// Derivatives, Prentice-Hall, ch. 5. It returns the best point seen.
func maximizeBrent(f func(float64) float64, a, b, x0, f0, tol float64) (float64, float64) {
	const cgold = 0.3819660112501051
	x, w, v := x0, x0, x0
	fx, fw, fv := -f0, -f0, -f0 // minimise −f
	d, e := 0.0, 0.0
	for iter := 0; iter < 100; iter++ {
		xm := 0.5 * (a + b)
		tol1 := tol + 1e-12*math.Abs(x)
		tol2 := 2 * tol1
		if math.Abs(x-xm) <= tol2-0.5*(b-a) {
			break
		}
		golden := true
		if math.Abs(e) > tol1 {
			r := (x - w) * (fx - fv)
			q := (x - v) * (fx - fw)
			p := (x-v)*q - (x-w)*r
			q = 2 * (q - r)
			if q > 0 {
				p = -p
			}
			q = math.Abs(q)
			if math.Abs(p) < math.Abs(0.5*q*e) && p > q*(a-x) && p < q*(b-x) {
				e, d = d, p/q
				golden = false
				if u := x + d; u-a < tol2 || b-u < tol2 {
					d = math.Copysign(tol1, xm-x)
				}
			}
		}
		if golden {
			if x >= xm {
				e = a - x
			} else {
				e = b - x
			}
			d = cgold * e
		}
		u := x + d
		if math.Abs(d) < tol1 {
			u = x + math.Copysign(tol1, d)
		}
		fu := -f(u)
		if fu <= fx {
			if u >= x {
				a = x
			} else {
				b = x
			}
			v, fv, w, fw, x, fx = w, fw, x, fx, u, fu
			continue
		}
		if u < x {
			a = u
		} else {
			b = u
		}
		if fu <= fw || w == x {
			v, fv, w, fw = w, fw, u, fu
		} else if fu <= fv || v == x || v == w {
			v, fv = u, fu
		}
	}
	return x, -fx
}
