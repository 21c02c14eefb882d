package proportions

import (
	"fmt"
	"math"
	"strings"
)

// DetectableSide is the first group's rate at one end of what a design can
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
	Design   Design         `json:"design"`
	Method   string         `json:"method"`
	Citation string         `json:"citation"`
	N1       int64          `json:"n1"`
	N2       int64          `json:"n2"`
	Below    DetectableSide `json:"below"`
	Above    DetectableSide `json:"above"`
	Caution  string         `json:"caution"`
}

// DetectableDifference returns the true rates of the first group that the
// design detects with its target power given n1 and n2 units with an
// outcome, by the asymptotic model of SampleSize (solved for π1 by
// bisection, π2 = Design.Rate2 held fixed). Design.Rate1, Allocation and
// Dropout are not used. It returns an error wrapping ErrUnreachable when
// no rate on any side reaches the power, and the errors of PowerAt for
// bad input.
func DetectableDifference(d Design, n1, n2 int64) (DetectableResult, error) {
	if err := d.validate(); err != nil {
		return DetectableResult{}, err
	}
	if err := d.validatePower(); err != nil {
		return DetectableResult{}, err
	}
	if err := validateSizes(n1, n2); err != nil {
		return DetectableResult{}, err
	}
	r := float64(n2) / float64(n1)
	z := d.critical()
	power := func(p1 float64) float64 {
		return newModelZ(d, p1, d.Rate2, r, z).power(float64(n1))
	}
	method, cite, _ := describeMethod(d)
	res := DetectableResult{Design: d, Method: method, Citation: cite, N1: n1, N2: n2, Caution: PlanningCaution}
	const edge = 1e-9 // keep π1 inside (0, 1)
	lo, hi := edge, 1-edge
	switch d.Goal {
	case Equivalence:
		centre := d.Rate2
		if power(centre) < d.Power {
			return res, fmt.Errorf("with %d and %d units even equal rates (%v) show equivalence with power %.4f < %v: %w; enlarge the groups or widen the margin",
				n1, n2, centre, power(centre), d.Power, ErrUnreachable)
		}
		lower, upper := d.equivalenceBounds()
		res.Below = d.side(bisectRate(power, centre, math.Max(lo, d.rateAt(lower)), d.Power))
		res.Above = d.side(bisectRate(power, centre, math.Min(hi, d.rateAt(upper)), d.Power))
		return res, nil
	case Equality:
		res.Below = d.side(bisectRate(power, d.Rate2, lo, d.Power))
		res.Above = d.side(bisectRate(power, d.Rate2, hi, d.Power))
	default:
		start := d.rateAt(d.Margin)
		if d.Alternative == Greater {
			res.Above = d.side(bisectRate(power, math.Max(lo, start), hi, d.Power))
		} else {
			res.Below = d.side(bisectRate(power, math.Min(hi, start), lo, d.Power))
		}
	}
	if !res.Above.Found && !res.Below.Found {
		return res, fmt.Errorf("with %d and %d units no first-group rate reaches power %v against %v: %w; enlarge the groups",
			n1, n2, d.Power, d.Rate2, ErrUnreachable)
	}
	return res, nil
}

// rateAt returns the first group's rate at which θ equals v, given π2.
func (d Design) rateAt(v float64) float64 {
	if d.Scale == Ratio {
		return v * d.Rate2
	}
	return d.Rate2 + v
}

// side wraps a rate found (ok) into a DetectableSide.
func (d Design) side(p1 float64, ok bool) DetectableSide {
	if !ok {
		return DetectableSide{}
	}
	return DetectableSide{Found: true, Rate1: p1, Difference: p1 - d.Rate2, Ratio: p1 / d.Rate2}
}

// bisectRate finds where power(p) crosses the target between from and to,
// assuming at most one crossing (power below the target at from, or above it
// for equivalence). It reports false when power does not cross on the way
// and returns to when the whole range reaches the target.
func bisectRate(power func(float64) float64, from, to, target float64) (float64, bool) {
	inside := power(from) >= target
	if (power(to) >= target) == inside {
		return to, inside
	}
	return findRoot(func(p float64) float64 { return power(p) - target }, from, to, 1e-10), true
}

// String prints what the design can detect.
func (r DetectableResult) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "Detectable with %d + %d units, power %v, π2 = %v (%s)\n", r.N1, r.N2, r.Design.Power, r.Design.Rate2, r.Design.Goal)
	for _, s := range []struct {
		name string
		side DetectableSide
	}{{"below", r.Below}, {"above", r.Above}} {
		if s.side.Found {
			fmt.Fprintf(&b, "  %s: π1 = %.4f (difference %+.4f, ratio %.4f)\n", s.name, s.side.Rate1, s.side.Difference, s.side.Ratio)
		}
	}
	fmt.Fprintf(&b, "  method: %s\n", r.Method)
	writeNotes(&b, nil, r.Caution)
	return b.String()
}
