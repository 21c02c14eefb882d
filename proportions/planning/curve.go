package planning

import (
	"fmt"
	"strings"

	"github.com/propscope/propscope/proportions"
)

// MaxCurvePoints is the most points a power curve holds; longer ranges of
// group sizes are walked in equal steps.
const MaxCurvePoints = 2000

// PowerPoint is one point of a power curve.
type PowerPoint struct {
	N1    int64   `json:"n1"`
	N2    int64   `json:"n2"`
	Rate1 float64 `json:"rate1"`
	// Difference is π1 − π2 and Ratio π1/π2 at this point.
	Difference float64 `json:"difference"`
	Ratio      float64 `json:"ratio"`
	Power      float64 `json:"power"`
}

// PowerCurve is power as data for a chart: against the group size
// (Axis "n1") or against the first group's true rate (Axis "rate1").
type PowerCurve struct {
	Plan Plan `json:"plan"`
	// Basis is the asymptotic method or the exact test behind the powers.
	Basis   string       `json:"basis"`
	Axis    string       `json:"axis"`
	Points  []PowerPoint `json:"points"`
	Caution string       `json:"caution"`
}

// PowerByTrials returns the asymptotic power of the plan for every n1 from
// n1From to n1To (in equal steps when that is more than MaxCurvePoints
// sizes, always ending at n1To), with n2 = ⌈r·n1⌉. Plan.Power is not used.
// Errors are those of Power, and ErrPlan for an empty range.
func PowerByTrials(d Plan, n1From, n1To int64) (PowerCurve, error) {
	if _, err := checkedModel(d, reads{}); err != nil {
		return PowerCurve{}, err
	}
	sizes, err := sizeGrid(n1From, n1To, d.allocation())
	if err != nil {
		return PowerCurve{}, err
	}
	method, _, _ := describeMethod(d)
	c := PowerCurve{Plan: d, Basis: method, Axis: "n1", Points: make([]PowerPoint, 0, len(sizes)), Caution: Caution}
	for _, s := range sizes {
		c.Points = append(c.Points, d.point(s[0], s[1], d.Rate1, powerAtSizes(d, s[0], s[1])))
	}
	return c, nil
}

// PowerByDifference returns the asymptotic power of the plan with n1 and
// n2 units against the first group's true rate, at points rates evenly
// spaced from rate1From to rate1To (both in (0, 1)), π2 = Plan.Rate2
// fixed. Plan.Rate1 and Power are not used.
func PowerByDifference(d Plan, n1, n2 int64, rate1From, rate1To float64, points int) (PowerCurve, error) {
	if err := d.validate(reads{}); err != nil { // Rate1 too, when given: it is echoed
		return PowerCurve{}, err
	}
	if err := validateSizes(n1, n2); err != nil {
		return PowerCurve{}, err
	}
	rates, err := rateGrid(rate1From, rate1To, points)
	if err != nil {
		return PowerCurve{}, err
	}
	method, _, _ := describeMethod(d)
	c := PowerCurve{Plan: d, Basis: method, Axis: "rate1", Points: make([]PowerPoint, 0, len(rates)), Caution: Caution}
	r, z := float64(n2)/float64(n1), d.critical()
	for _, p1 := range rates {
		c.Points = append(c.Points, d.point(n1, n2, p1, newModelZ(d, p1, d.Rate2, r, z).power(float64(n1))))
	}
	return c, nil
}

func (d Plan) point(n1, n2 int64, p1, power float64) PowerPoint {
	return PowerPoint{N1: n1, N2: n2, Rate1: p1, Difference: p1 - d.Rate2, Ratio: p1 / d.Rate2, Power: power}
}

// sizeGrid lists (n1, ⌈r·n1⌉) from n1From to n1To, at most MaxCurvePoints.
func sizeGrid(n1From, n1To int64, r float64) ([][2]int64, error) {
	if n1From < 1 || n1To < n1From || n1To > proportions.MaxTrials || groupTwoSize(n1From, r) < 1 {
		return nil, fmt.Errorf("group-1 sizes %d to %d: %w; give 1 ≤ from ≤ to ≤ %d", n1From, n1To, proportions.ErrPlan, proportions.MaxTrials)
	}
	if err := checkGroupTwo(n1To, r); err != nil {
		return nil, err
	}
	// A step of ⌈span/(MaxCurvePoints − 1)⌉ gives at most MaxCurvePoints − 1
	// steps, so the sizes, n1To appended when a step misses it, number at
	// most MaxCurvePoints.
	span := n1To - n1From
	step := max(1, (span+MaxCurvePoints-2)/(MaxCurvePoints-1))
	var out [][2]int64
	for n := n1From; n <= n1To; n += step {
		out = append(out, [2]int64{n, groupTwoSize(n, r)})
	}
	if out[len(out)-1][0] != n1To {
		out = append(out, [2]int64{n1To, groupTwoSize(n1To, r)})
	}
	return out, nil
}

// rateGrid lists points rates evenly spaced from a to b.
func rateGrid(a, b float64, points int) ([]float64, error) {
	if !(a >= MinPlanningRate && b <= MaxPlanningRate && a <= b) {
		return nil, fmt.Errorf("rates %v to %v: %w; give 0 < from ≤ to < 1, from %g to %v (1 − 1e-12)", a, b, proportions.ErrPlan, MinPlanningRate, MaxPlanningRate)
	}
	if points < 2 || points > MaxCurvePoints {
		return nil, fmt.Errorf("%d points: %w; ask for 2 to %d points", points, proportions.ErrPlan, MaxCurvePoints)
	}
	out := make([]float64, points)
	for i := range out {
		out[i] = a + (b-a)*float64(i)/float64(points-1)
	}
	return out, nil
}

// String prints the curve as a small table.
func (c PowerCurve) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "Power by %s for %s\n  approximation: %s\n", c.Axis, c.Plan, c.Basis)
	fmt.Fprintf(&b, "  %8s %8s %8s %10s %8s\n", "n1", "n2", "π1", "π1 − π2", "power")
	for _, p := range c.Points {
		fmt.Fprintf(&b, "  %8d %8d %8.4f %+10.4f %8.4f\n", p.N1, p.N2, p.Rate1, p.Difference, p.Power)
	}
	fmt.Fprintf(&b, "  %s\n", c.Caution)
	return b.String()
}
