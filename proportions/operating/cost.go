package operating

import (
	"fmt"

	"github.com/propscope/propscope/proportions"
)

// EngineCost is the cost guard of an engine run with a costly method (one
// with a Cost function: the exact unconditional tests and intervals): about
// ten minutes on one core and 1 GB. The engine calls the method at every
// outcome of the design, so a method that takes a millisecond per table
// needs minutes at a few hundred per group; a run estimated above the
// guard is refused before it starts with an error wrapping
// proportions.ErrTooLarge that gives the estimate, the limit and the ways
// out (a smaller design, a cheaper method, or WithCostGuard). Methods
// without a Cost function cost microseconds per outcome and are bounded by
// MaxDesignTrials alone.
var EngineCost = proportions.Cost{Steps: 6e11, Bytes: 1 << 30}

// WithCostGuard sets the cost guard of a run (default EngineCost), for a
// caller who accepts a longer computation with a costly method; see
// IntervalCost and DecisionCost for the estimate.
func WithCostGuard(c proportions.Cost) RunOption { return func(cfg *config) { cfg.guard = &c } }

// guardOr returns the guard set by WithCostGuard, or EngineCost.
func (c config) guardOr() proportions.Cost {
	if c.guard != nil {
		return *c.guard
	}
	return EngineCost
}

// costSamples are the shares of each group's trials at which a method's
// per-table cost is sampled (3 × 3 outcomes): the cost of exact methods
// varies across the outcomes, most in the middle of the table.
var costSamples = [3]float64{0.1, 0.5, 0.9}

// meanTableCost returns the mean of a per-table cost over the 3 × 3
// sampled outcomes of an n1 × n2 design.
func meanTableCost(n1, n2 int, per func(c proportions.Counts) proportions.Cost) proportions.Cost {
	var sum proportions.Cost
	for _, s1 := range costSamples {
		for _, s2 := range costSamples {
			c := proportions.Counts{X1: int64(s1 * float64(n1)), N1: int64(n1), X2: int64(s2 * float64(n2)), N2: int64(n2)}
			k := per(c)
			sum.Steps += k.Steps
			sum.Bytes = max(sum.Bytes, k.Bytes)
		}
	}
	sum.Steps /= float64(len(costSamples) * len(costSamples))
	return sum
}

// IntervalCost estimates NewOutcomeLimits for an interval method with a
// Cost function: its per-table cost, averaged over sampled outcomes,
// times the outcomes computed (half or a quarter of them for a Symmetric
// method), plus the table's memory; ok is false for a method without a
// Cost function (microseconds per outcome, not guarded). The design must
// be valid.
func IntervalCost(m proportions.IntervalMethod, d Design) (c proportions.Cost, ok bool) {
	if m.Cost == nil {
		return proportions.Cost{}, false
	}
	conf, err := proportions.NewConfidence(d.Level)
	if err != nil {
		return proportions.Cost{}, false
	}
	per := meanTableCost(d.N1, d.N2, func(c proportions.Counts) proportions.Cost { return m.Cost(c, conf) })
	outcomes := float64((d.N1 + 1) * (d.N2 + 1))
	if m.Symmetric {
		outcomes /= 2
	}
	c = per.Scale(outcomes)
	c.Bytes += 24 * float64((d.N1+1)*(d.N2+1))
	return c, true
}

// DecisionCost estimates a rejection region (NewRejectionRegion, and so
// TypeIError and Size) for a test with a Cost function: the cost of every
// hypothesis of the decision at a table, averaged over sampled outcomes,
// times the (n1+1)(n2+1) outcomes, plus the region's memory; ok is false
// for a test without a Cost function.
func DecisionCost(d Decision, n1, n2 int) (c proportions.Cost, ok bool) {
	if d.Test.Cost == nil {
		return proportions.Cost{}, false
	}
	per := meanTableCost(n1, n2, func(c proportions.Counts) proportions.Cost {
		var k proportions.Cost
		for _, h := range d.Hypotheses {
			k = k.Add(d.Test.Cost(c, h))
		}
		return k
	})
	c = per.Scale(float64((n1 + 1) * (n2 + 1)))
	c.Bytes += 8 * float64((n1+1)*(n2+1))
	return c, true
}

// guardRun refuses a run whose cost exceeds the guard, saying what it
// would need, the limit and the ways out.
func guardRun(what string, c proportions.Cost, guard proportions.Cost) error {
	if c.Within(guard) {
		return nil
	}
	return fmt.Errorf("%s would need %v: %w; the limit is %v; use a smaller design, a method without an exact search "+
		"(an asymptotic or Fisher's method), or raise the limit with operating.WithCostGuard",
		what, c, proportions.ErrTooLarge, guard)
}
