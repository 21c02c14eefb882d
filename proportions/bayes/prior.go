package bayes

import (
	"fmt"
	"math"
	"strconv"
)

// Prior is a beta prior Beta(α, β) on one group's rate: EventShape is α and
// NonEventShape is β, which act as α events and β non-events seen before
// the data. Its mean is α/(α+β) and its strength α+β (in units, like
// trials). Build one with Uniform, Jeffreys, Neutral, PriorFromMean or
// PriorFromShapes.
type Prior struct {
	// Name is "uniform", "jeffreys", "neutral" or "informative".
	Name          string  `json:"name"`
	EventShape    float64 `json:"event_shape"`
	NonEventShape float64 `json:"non_event_shape"`
}

// Uniform is Beta(1, 1): every rate between 0 and 1 equally plausible
// before the data (Bayes T (1763), "An essay towards solving a problem in
// the doctrine of chances", Philosophical Transactions of the Royal
// Society 53:370–418).
func Uniform() Prior { return Prior{Name: "uniform", EventShape: 1, NonEventShape: 1} }

// Jeffreys is Beta(½, ½), the prior proportional to the square root of the
// binomial Fisher information, π^(−½)(1−π)^(−½) (Jeffreys H (1946), "An
// invariant form for the prior probability in estimation problems",
// Proceedings of the Royal Society of London A 186:453–461).
func Jeffreys() Prior { return Prior{Name: "jeffreys", EventShape: 0.5, NonEventShape: 0.5} }

// Neutral is Beta(⅓, ⅓), the prior whose posterior median is close to the
// observed share x/n for every x ≥ 1 (Kerman J (2011), "Neutral
// noninformative and informative conjugate beta and gamma prior
// distributions", Electronic Journal of Statistics 5:1450–1470; citation
// recalled from memory).
func Neutral() Prior { return Prior{Name: "neutral", EventShape: 1.0 / 3, NonEventShape: 1.0 / 3} }

// DefaultPrior is the prior used when none is given: Uniform, on each
// group. It is the easiest to state in plain words ("before the data,
// every rate was equally plausible"), and its whole-number shapes keep
// P(π1 > π2) an exact finite sum. The sensitivity table shows what
// Jeffreys' and the neutral prior would change.
func DefaultPrior() Prior { return Uniform() }

// PriorFromShapes is the informative prior Beta(α, β); both shapes must be
// finite and above 0 (an error wrapping ErrPrior otherwise).
func PriorFromShapes(eventShape, nonEventShape float64) (Prior, error) {
	p := Prior{Name: "informative", EventShape: eventShape, NonEventShape: nonEventShape}
	return p, p.Validate()
}

// PriorFromMean is the informative prior with the given mean rate (strictly
// between 0 and 1) worth strength units of earlier data (above 0):
// Beta(mean·strength, (1−mean)·strength). A strength of 20 weighs as much as
// 20 trials.
func PriorFromMean(mean, strength float64) (Prior, error) {
	if !(mean > 0 && mean < 1) {
		return Prior{}, fmt.Errorf("prior mean %v: %w; the mean must be strictly between 0 and 1", mean, ErrPrior)
	}
	if !(strength > 0) || math.IsInf(strength, 1) {
		return Prior{}, fmt.Errorf("prior strength %v: %w; the strength (prior units) must be finite and above 0", strength, ErrPrior)
	}
	return PriorFromShapes(mean*strength, (1-mean)*strength)
}

// Validate returns an error wrapping ErrPrior unless both shapes are finite
// and above 0.
func (p Prior) Validate() error {
	for _, s := range []float64{p.EventShape, p.NonEventShape} {
		if !(s > 0) || math.IsInf(s, 1) {
			return fmt.Errorf("prior Beta(%v, %v): %w; both shapes must be finite and above 0", p.EventShape, p.NonEventShape, ErrPrior)
		}
	}
	return nil
}

// Mean returns α/(α+β).
func (p Prior) Mean() float64 { return p.EventShape / (p.EventShape + p.NonEventShape) }

// Strength returns α+β, the prior's weight in units.
func (p Prior) Strength() float64 { return p.EventShape + p.NonEventShape }

// String names the prior with its shapes: "uniform Beta(1, 1)".
func (p Prior) String() string {
	return fmt.Sprintf("%s Beta(%s, %s)", p.Name, shape(p.EventShape), shape(p.NonEventShape))
}

func shape(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }

// Update returns the posterior after events of trials: Beta(α + events,
// β + trials − events).
func (p Prior) Update(events, trials int64) Posterior {
	return NewPosterior(p.EventShape+float64(events), p.NonEventShape+float64(trials-events))
}

// standardPriors are the priors of the sensitivity table, in its order.
func standardPriors() []Prior { return []Prior{Uniform(), Jeffreys(), Neutral()} }
