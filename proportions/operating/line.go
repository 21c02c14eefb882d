package operating

import (
	"fmt"

	"github.com/propscope/propscope/proportions"
)

// EffectLine returns k evenly spaced points (π1, π2) on which the scale's
// parameter equals θ, with π2 running over its whole feasible range:
//
//   - difference δ: π1 = π2 + δ, π2 from max(0, −δ) to min(1, 1 − δ);
//   - ratio ρ: π1 = ρ·π2, π2 from 0 to min(1, 1/ρ);
//   - odds ratio ψ: π1 = ψπ2 / (1 − π2 + ψπ2), π2 from 0 to 1.
//
// At θ = no effect this is the line π1 = π2. Errors wrap
// proportions.ErrNull for θ outside the scale's open parameter space
// (−1 < δ < 1, 0 < ρ, ψ < ∞).
func EffectLine(f proportions.Scale, theta float64, k int) ([][2]float64, error) {
	if f == proportions.SingleRate {
		return nil, fmt.Errorf("effect line for one proportion: %w; use the difference, ratio or odds ratio", proportions.ErrUnsupported)
	}
	if err := proportions.ValidateNull(f, theta); err != nil {
		return nil, err
	}
	if k < 2 {
		return nil, fmt.Errorf("%d points: %w; a line needs at least 2", k, proportions.ErrEmptyInput)
	}
	lo, hi := 0.0, 1.0
	switch f {
	case proportions.Difference:
		lo, hi = max(0, -theta), min(1, 1-theta)
	case proportions.Ratio:
		hi = min(1, 1/theta)
	}
	pts := make([][2]float64, k)
	for i, pi2 := range evenly(lo, hi, k) {
		var pi1 float64
		switch f {
		case proportions.Difference:
			pi1 = pi2 + theta
		case proportions.Ratio:
			pi1 = theta * pi2
		case proportions.OddsRatio:
			pi1 = theta * pi2 / (1 - pi2 + theta*pi2)
		}
		pts[i] = [2]float64{min(1, max(0, pi1)), pi2}
	}
	return pts, nil
}
