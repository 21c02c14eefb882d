package planning

import (
	"fmt"
	"math"

	"github.com/propscope/propscope/proportions"
)

// The ranges of the planning inputs beyond those of Plan's field
// comments. Inside them every planning function gives finite results that
// marshal (FuzzPlanDesign checks it); outside, floating point decides:
// a rate of 5e−324 passed the old check 0 < rate < 1 and made the ratio
// π1/π2 +Inf, and α or 1 − power below the spacing of doubles under 1
// makes a normal quantile infinite.
const (
	// MinPlanningRate and MaxPlanningRate bound the anticipated rates (and
	// the rates of a power curve): 10⁻¹² to 1 − 10⁻¹². Even MaxTrials
	// (about 1.1·10¹⁵) units expect only about a thousand events at the
	// lower end, and ratios of rates stay below 10¹².
	MinPlanningRate = 1e-12
	MaxPlanningRate = 1 - 1e-12
	// MinPlanningAlpha is the smallest significance level, 10⁻¹², and
	// MaxPlanningPower the largest target power, 1 − 10⁻¹²: the same edge
	// as MaxLevel for confidence levels.
	MinPlanningAlpha = 1e-12
	MaxPlanningPower = proportions.MaxLevel
)

// reads names the optional fields of Plan that a planning function reads
// beyond those every function reads; the others it only echoes in its
// result. It decides how validate words an error: a field the function
// reads must be valid, a field it only echoes may also be left at 0.
type reads struct{ rate1, power bool }

// validateEchoed checks the fields a planning function does not read but
// still echoes in its result (Rate1 for the power curve against π1 and the
// detectable difference, Power for the power at given sizes): each must be
// left at 0 or be valid, so that every result marshals and means what it
// says. The fields in r are checked by validate without that note.
func (d Plan) validateEchoed(r reads) error {
	if d.Rate1 != 0 && !r.rate1 {
		if err := validateRate("first group's", d.Rate1); err != nil {
			return fmt.Errorf("%w (the field is not used here: leave it 0 or give a valid rate)", err)
		}
	}
	if d.Power != 0 && !r.power {
		if err := d.validatePower(); err != nil {
			return fmt.Errorf("%w (the field is not used here: leave it 0 or give a valid power)", err)
		}
	}
	return nil
}

// EnrolledUnits returns the units to enrol for n with an outcome,
// ⌈n/(1 − Dropout)⌉ and never less than n, or an error wrapping
// ErrTooLarge when that is above MaxTrials (a drop-out share near 1).
// The result is computed in floating point before it becomes an integer,
// so it cannot overflow.
func (d Plan) EnrolledUnits(n int64) (int64, error) { return enrolledUnits(n, d.Dropout) }

func enrolledUnits(n int64, share float64) (int64, error) {
	if share == 0 {
		return n, nil
	}
	x := float64(n) / (1 - share)
	if !(x <= float64(proportions.MaxTrials)) {
		return 0, fmt.Errorf("enrolling %d units with an outcome at a drop-out share of %v needs %.3g units: %w; at most %d units per group can be enrolled",
			n, share, x, proportions.ErrTooLarge, proportions.MaxTrials)
	}
	// ceilSize forgives rounding noise (up to 1e−6 of a unit), which must not
	// take the enrolment below the analysed size.
	return max(n, ceilSize(x)), nil
}

// checkGroupTwo returns an error wrapping ErrTooLarge when group 2,
// ⌈r·n1⌉, would hold more than MaxTrials units.
func checkGroupTwo(n1 int64, r float64) error {
	if n2 := r * float64(n1); !(n2 <= float64(proportions.MaxTrials)) {
		return fmt.Errorf("group 2 with n2/n1 = %v and n1 = %d needs %.3g units: %w; at most %d units per group",
			r, n1, math.Ceil(n2), proportions.ErrTooLarge, proportions.MaxTrials)
	}
	return nil
}

// MaxPlanningRatio bounds a margin on the ratio scale to [1/MaxPlanningRatio,
// MaxPlanningRatio] = [10⁻¹², 10¹²]: the ratios that rates in
// [MinPlanningRate, MaxPlanningRate] can take. Beyond it the variance terms
// (ρ²·p2q2) lose all precision; at 10³⁰⁰ the power was NaN.
const MaxPlanningRatio = 1 / MinPlanningRate

// validateRatioMargin checks a margin on the ratio scale against
// MaxPlanningRatio (ValidateNull has checked that it is finite and above 0).
func validateRatioMargin(goal Goal, m float64) error {
	if !(m >= 1/MaxPlanningRatio && m <= MaxPlanningRatio) {
		return fmt.Errorf("%s margin %v on the ratio scale: %w; it must lie from %g to %g, the ratios anticipated rates can take",
			goal, m, proportions.ErrMargin, 1/MaxPlanningRatio, MaxPlanningRatio)
	}
	return nil
}
