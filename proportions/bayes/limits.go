package bayes

import (
	"fmt"

	"github.com/propscope/propscope/proportions"
)

// The posteriors whose integrals run in about a second at most. The
// quadrature and the inner table are tuned for shapes from ½ to 10⁶ (see
// the package doc); beyond, the rules fall back to adaptive quadrature,
// which took over 4 s at 10⁹ units and minutes at 10¹⁰ (or at a prior of
// strength 2·10¹⁰), and a shape near 0 (a prior Beta(0.01, 0.01) with no
// events) took 5 s, while shapes below 10⁻³⁰ gave infinite densities in
// the result. Measured on the shared 2-core machine with the default
// analysis: 10⁸ units per group took 0.5 to 1.5 s, a shape of 0.05 at most
// 2.7 s.
const (
	// maxPosteriorStrength is the largest α + β of a posterior: the units
	// of the group plus the prior's strength.
	maxPosteriorStrength = 1e8
	// minPosteriorShape is the smallest shape of a posterior.
	minPosteriorShape = 0.05
)

// checkPosterior refuses a posterior outside the range the integrals
// handle, naming the group, what it holds and what to do instead.
func checkPosterior(group string, p Posterior) error {
	a, b := p.EventShape, p.NonEventShape
	if a+b > maxPosteriorStrength {
		return fmt.Errorf("group %q: posterior Beta(%.4g, %.4g) worth %.4g units (counts plus prior): %w; the Bayesian view handles up to %.0e units per group, prior included, and would take minutes beyond; at this size the posterior is close to normal, so use the frequentist analysis",
			group, a, b, a+b, proportions.ErrTooLarge, maxPosteriorStrength)
	}
	if !(min(a, b) >= minPosteriorShape) { // NaN too
		return fmt.Errorf("group %q: posterior Beta(%.4g, %.4g): %w; a posterior shape below %g (a prior shape that small with no events, or no non-events) is too close to a point mass for the integrals: use prior shapes of at least %g, such as Jeffreys' Beta(0.5, 0.5)",
			group, a, b, ErrPrior, minPosteriorShape, minPosteriorShape)
	}
	return nil
}
