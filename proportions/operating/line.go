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
// (−1 < δ < 1, 0 < ρ, ψ < ∞), ErrUnsupported for another scale,
// ErrEmptyInput for k below 2 and ErrTooLarge for k above 1000001 (the
// most points WithSteps allows).
func EffectLine(f proportions.Scale, theta float64, k int) ([][2]float64, error) {
	if f != proportions.Difference && f != proportions.Ratio && f != proportions.OddsRatio {
		return nil, fmt.Errorf("effect line for the %s: %w; use the difference, ratio or odds ratio", f, proportions.ErrUnsupported)
	}
	if err := proportions.ValidateNull(f, theta); err != nil {
		return nil, err
	}
	if k < 2 {
		return nil, fmt.Errorf("%d points: %w; a line needs at least 2", k, proportions.ErrEmptyInput)
	}
	if k > maxSteps {
		// k is a length to allocate: 2^40 points asked for 16 TB and
		// ended the program with an out-of-memory crash.
		return nil, fmt.Errorf("%d points: %w; a line holds at most %d", k, proportions.ErrTooLarge, maxSteps)
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
