package planning

import (
	"fmt"
	"math"
	"strings"

	"github.com/propscope/propscope/internal/special"
	"github.com/propscope/propscope/proportions"
)

// DetectableSide is the first group's rate at one end of what a plan can
// detect (see DetectableResult).
type DetectableSide struct {
	// Found is false when no rate in (0, 1) on this side reaches the power.
	Found bool `json:"found"`
	// Rate1 is the first group's rate π1; Difference is π1 − π2 and Ratio
	// π1/π2 at that rate.
	Rate1      float64 `json:"rate1"`
	Difference float64 `json:"difference"`
	Ratio      float64 `json:"ratio"`
}

// DetectableResult answers "what can this study detect?" for given group
// sizes, target power and the second group's rate.
//
// For Equality, Above is the smallest π1 above π2 and Below the largest π1
// below π2 at which the power reaches the target. For Superiority and
// NonInferiority only the side of the alternative is filled (Above for
// Greater, Below for Less): the rate π1 must exceed (or stay under) it. For
// Equivalence, Below and Above are the ends of the range of π1 within which
// the power is at least the target.
type DetectableResult struct {
	Plan          Plan           `json:"plan"`
	Approximation string         `json:"approximation"`
	Citation      string         `json:"citation"`
	N1            int64          `json:"n1"`
	N2            int64          `json:"n2"`
	Below         DetectableSide `json:"below"`
	Above         DetectableSide `json:"above"`
	Caution       string         `json:"caution"`
}

// DetectableDifference returns the true rates of the first group that the
// plan detects with its target power given n1 and n2 units with an
// outcome, by the asymptotic model of SampleSize (solved for π1 by root
// finding, π2 = Plan.Rate2 held fixed). Plan.Rate1, Allocation and
// Dropout are not used. It returns an error wrapping ErrUnreachable when
// no rate on any side reaches the power, and the errors of Power for
// bad input.
func DetectableDifference(d Plan, n1, n2 int64) (DetectableResult, error) {
	if err := d.validate(reads{power: true}); err != nil {
		return DetectableResult{}, err
	}
	if err := validateSizes(n1, n2); err != nil {
		return DetectableResult{}, err
	}
	sr := rateSearch{d: d, r: float64(n2) / float64(n1), n1: float64(n1), z: d.critical(), zp: special.NormalQuantile(d.Power)}
	method, cite, _ := describeMethod(d)
	res := DetectableResult{Plan: d, Approximation: method, Citation: cite, N1: n1, N2: n2, Caution: Caution}
	// π1 is sought among the rates a plan accepts, which hold π2: an edge
	// further in (10⁻⁹ once) put a side on the wrong side of a π2 near 0
	// or 1.
	lo, hi := MinPlanningRate, MaxPlanningRate
	switch d.Goal {
	case Equivalence:
		centre := d.Rate2
		pc := sr.power(centre)
		if pc < d.Power {
			return res, fmt.Errorf("with %d and %d units even equal rates (%v) show equivalence with power %.4f < %v: %w; enlarge the groups or widen the margin",
				n1, n2, centre, pc, d.Power, proportions.ErrUnreachable)
		}
		lower, upper := d.equivalenceBounds()
		res.Below = d.side(sr.find(0, centre, math.Max(lo, d.rateAt(lower)), pc))
		res.Above = d.side(sr.find(1, centre, math.Min(hi, d.rateAt(upper)), pc))
		return res, nil
	case Equality:
		p2 := sr.power(d.Rate2)
		res.Below = d.side(sr.find(1, d.Rate2, lo, p2))
		res.Above = d.side(sr.find(0, d.Rate2, hi, p2))
	default:
		start := d.rateAt(d.Margin)
		if d.Better == proportions.HigherIsBetter {
			from := math.Max(lo, start)
			res.Above = d.side(sr.find(0, from, hi, sr.power(from)))
		} else {
			from := math.Min(hi, start)
			res.Below = d.side(sr.find(0, from, lo, sr.power(from)))
		}
	}
	if !res.Above.Found && !res.Below.Found {
		return res, fmt.Errorf("with %d and %d units no first-group rate reaches power %v against %v: %w; enlarge the groups",
			n1, n2, d.Power, d.Rate2, proportions.ErrUnreachable)
	}
	return res, nil
}

// rateSearch solves the plan's power for the first group's rate, π2 and
// the group sizes fixed.
type rateSearch struct {
	d     Plan
	r, n1 float64
	z, zp float64 // critical value and z_{power}
}

func (s rateSearch) model(p1 float64) model { return newModelZ(s.d, p1, s.d.Rate2, s.r, s.z) }

func (s rateSearch) power(p1 float64) float64 { return s.model(p1).power(s.n1) }

// deciding returns test k of the model at p1, building only that test
// where the goal allows (equivalence has one test per side).
func (s rateSearch) deciding(k int, p1 float64) zTest {
	if s.d.Goal != Equivalence {
		return s.model(p1).tests[k]
	}
	m := model{plan: s.d, r: s.r}
	lo, hi := s.d.equivalenceBounds()
	if k == 0 {
		return m.zTest(p1, s.d.Rate2, lo, true, s.z)
	}
	return m.zTest(p1, s.d.Rate2, hi, false, s.z)
}

// find returns the rate between from and to where the power crosses the
// target, assuming at most one crossing (power below the target at from,
// or above it for equivalence); it reports false when the power does not
// cross and returns to when the whole range reaches the target. Test k of
// the model is the one that decides on this side: the rate where it alone
// has the target power, E·√n1 = z·√V0 + z_{power}·√V1, found by a few
// fixed-point steps (the variances change slowly with π1), is the starting
// guess; regula falsi finishes on the full power. powerFrom is the power
// at from, which callers already have.
func (s rateSearch) find(k int, from, to, powerFrom float64) (float64, bool) {
	target := s.d.Power
	inside := powerFrom >= target
	powerTo := s.power(to)
	if (powerTo >= target) == inside {
		return to, inside
	}
	a, b := math.Min(from, to), math.Max(from, to)
	p, sd1 := from, 0.0
	for range 3 { // converges to about 1e-9 in three steps

		t := s.deciding(k, p)
		e := (t.z*t.sd0 + s.zp*t.sd1) / math.Sqrt(s.n1)
		if !t.upper {
			e = -e
		}
		p, sd1 = math.Max(a, math.Min(b, p-t.mean+e)), t.sd1
	}
	// Newton steps on the full power with the slope of the deciding test,
	// φ(z_power)·√n1/√V1 per unit of π1, until the crossing is bracketed;
	// then regula falsi on the small bracket.
	g := func(x float64) float64 { return s.power(x) - target }
	slope := math.Exp(-s.zp*s.zp/2) / math.Sqrt(2*math.Pi) * math.Sqrt(s.n1) / sd1
	if (to > from) == inside {
		slope = -slope // power falls as π1 moves toward to
	}
	gp := g(p)
	for range 8 {
		if gp == 0 {
			return p, true
		}
		next := math.Max(a, math.Min(b, p-1.5*gp/slope)) // overshoot a little to bracket
		gn := g(next)
		if (gn > 0) != (gp > 0) || gn == 0 {
			return findRootFrom(g, p, next, gp, gn, 1e-12), true
		}
		p, gp = next, gn
	}
	if (gp > 0) == inside {
		return findRootFrom(g, p, to, gp, powerTo-target, 1e-12), true
	}
	return findRootFrom(g, from, p, powerFrom-target, gp, 1e-12), true
}

// rateAt returns the first group's rate at which θ equals v, given π2.
func (d Plan) rateAt(v float64) float64 {
	if d.Scale == proportions.Ratio {
		return v * d.Rate2
	}
	return d.Rate2 + v
}

// side wraps a rate found (ok) into a DetectableSide.
func (d Plan) side(p1 float64, ok bool) DetectableSide {
	if !ok {
		return DetectableSide{}
	}
	return DetectableSide{Found: true, Rate1: p1, Difference: p1 - d.Rate2, Ratio: p1 / d.Rate2}
}

// String prints what the plan can detect.
func (r DetectableResult) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "Detectable with %d + %d units, power %v, π2 = %v (%s)\n", r.N1, r.N2, r.Plan.Power, r.Plan.Rate2, r.Plan.Goal)
	for _, s := range []struct {
		name string
		side DetectableSide
	}{{"below", r.Below}, {"above", r.Above}} {
		if s.side.Found {
			fmt.Fprintf(&b, "  %s: π1 = %.4f (difference %+.4f, ratio %.4f)\n", s.name, s.side.Rate1, s.side.Difference, s.side.Ratio)
		}
	}
	fmt.Fprintf(&b, "  approximation: %s\n", r.Approximation)
	writeNotes(&b, nil, r.Caution)
	return b.String()
}
