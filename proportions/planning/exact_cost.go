package planning

import (
	"fmt"
	"math"

	"github.com/propscope/propscope/proportions"
)

// ExactSearchCost is the cost guard of the exact planning functions
// (ExactPower, ExactSampleSize, ExactPowerByTrials): about a minute on
// one core. A call estimated above it is refused before it starts, with an
// error wrapping proportions.ErrTooLarge that gives the estimate.
var ExactSearchCost = proportions.Cost{Steps: 6e10, Bytes: 1 << 30}

// cheapOutcomeSteps is the cost of one run of a test without a Cost
// function (the asymptotic tests and Fisher's): about half a microsecond,
// plus a term growing like the hypergeometric window of Fisher's test.
func cheapOutcomeSteps(n1, n2 int64) float64 { return 500 + 10*math.Sqrt(float64(n1+n2)) }

// exactPowerCost estimates one exact power: the engine runs the test at
// every outcome inside the binomial windows of the anticipated rates
// (tails below 1e−16 left out: about 8.3 standard deviations either side),
// each at the test's own cost at a typical outcome (the expected counts).
func exactPowerCost(d Plan, m proportions.TestMethod, h []proportions.Hypothesis, n1, n2 int64) proportions.Cost {
	window := func(n int64, p float64) float64 {
		return min(float64(n+1), 2*8.3*math.Sqrt(float64(n)*p*(1-p))+1)
	}
	outcomes := window(n1, d.Rate1) * window(n2, d.Rate2)
	if m.Window != nil {
		return windowDeciderCost(m, h, n1, n2, window(n1, d.Rate1), window(n2, d.Rate2))
	}
	per := proportions.Cost{Steps: cheapOutcomeSteps(n1, n2)}
	if m.Cost != nil {
		c := proportions.Counts{X1: int64(d.Rate1 * float64(n1)), N1: n1, X2: int64(d.Rate2 * float64(n2)), N2: n2}
		per = proportions.Cost{}
		for _, hh := range h {
			per = per.Add(m.Cost(c, hh))
		}
	}
	cost := per.Scale(outcomes)
	cost.Bytes += 8 * float64(n1+n2+2+int64(outcomes/max(window(n2, d.Rate2), 1)))
	return cost
}

// scanCost estimates the exact power at every n1 from `from` to `to`
// (n2 = ⌈r·n1⌉): the cost per size grows smoothly with n1, so it is
// integrated by the trapezoid rule over 33 sizes spread geometrically.
func scanCost(d Plan, m proportions.TestMethod, h []proportions.Hypothesis, from, to int64) proportions.Cost {
	if to < from {
		return proportions.Cost{}
	}
	const k = 33
	var total proportions.Cost
	prevN := float64(from)
	prev := exactPowerCost(d, m, h, from, d.SecondGroupSize(from))
	total.Bytes = prev.Bytes
	for i := 1; i < k; i++ {
		n := float64(from) * math.Pow(float64(to)/float64(from), float64(i)/float64(k-1))
		n1 := int64(math.Round(n))
		c := exactPowerCost(d, m, h, n1, d.SecondGroupSize(n1))
		total.Steps += (c.Steps + prev.Steps) / 2 * (n - prevN)
		total.Bytes = max(total.Bytes, c.Bytes)
		prev, prevN = c, n
	}
	total.Steps += prev.Steps // the last size itself
	if to == from {
		total.Steps = prev.Steps
	}
	return total
}

// guardSearch refuses a scan estimated above ExactSearchCost, saying what
// it would need and how to narrow it.
func guardSearch(what string, c proportions.Cost, hint string) error {
	if c.Within(ExactSearchCost) {
		return nil
	}
	return fmt.Errorf("%s would need %v: %w; the limit is %v; %s", what, c, proportions.ErrTooLarge, ExactSearchCost, hint)
}

// windowDeciderCost estimates one exact power of a test with a window
// decider: its own estimate for a window of w1 by w2 outcomes, per
// hypothesis.
func windowDeciderCost(m proportions.TestMethod, h []proportions.Hypothesis, n1, n2 int64, w1, w2 float64) proportions.Cost {
	win := proportions.OutcomeWindow{N1: int(n1), N2: int(n2), X1To: int(w1) - 1, X2To: int(w2) - 1}
	var cost proportions.Cost
	for _, hh := range h {
		c := m.Window.Cost(win, hh)
		cost = proportions.Cost{Steps: cost.Steps + c.Steps, Bytes: max(cost.Bytes, c.Bytes)}
	}
	return cost
}
