package proportions

import (
	"encoding/json"
	"fmt"
	"math"
)

// Goal is what a planned study sets out to show about the first group's
// rate π1 against the second group's rate π2.
type Goal int

const (
	// Equality: a two-sided test of no difference, H0: π1 = π2.
	Equality Goal = iota
	// Superiority: a one-sided test that the first group is better by more
	// than the margin (margin 0 is the ordinary one-sided test of no
	// difference). With Alternative Greater, H0: θ ≤ margin with margin ≥ 0
	// (difference) or ≥ 1 (ratio); with Less, H0: θ ≥ margin with margin ≤ 0
	// or ≤ 1.
	Superiority
	// NonInferiority: a one-sided test that the first group is not worse
	// than the second by the margin or more. With Alternative Greater
	// (higher rates are better), H0: θ ≤ margin with margin < 0 (difference)
	// or < 1 (ratio); with Less (lower rates are better, such as defect
	// rates), H0: θ ≥ margin with margin > 0 or > 1.
	NonInferiority
	// Equivalence: two one-sided tests, each at level α, that θ lies within
	// ±margin (difference, margin > 0) or between 1/margin and margin
	// (ratio; a margin below 1 is read as its reciprocal).
	Equivalence
)

var goalNames = [...]string{"equality", "superiority", "non-inferiority", "equivalence"}

// String returns the goal's plain name.
func (g Goal) String() string {
	if g < 0 || int(g) >= len(goalNames) {
		return fmt.Sprintf("goal(%d)", int(g))
	}
	return goalNames[g]
}

// MarshalJSON writes the plain name.
func (g Goal) MarshalJSON() ([]byte, error) { return json.Marshal(g.String()) }

// UnmarshalJSON reads the plain name.
func (g *Goal) UnmarshalJSON(b []byte) error {
	i, err := unmarshalName(b, goalNames[:], "goal")
	*g = Goal(i)
	return err
}

// VarianceRule chooses the variance of the test statistic under the null
// hypothesis in the asymptotic formulas.
type VarianceRule int

const (
	// Pooled uses the rates that are most likely under the null hypothesis:
	// the pooled rate (π1 + rπ2)/(1 + r) for a test of no difference (Fleiss,
	// Levin & Paik 2003, ch. 4), and the restricted maximum-likelihood rates
	// of Farrington & Manning (1990) for a margin. It matches the score test.
	Pooled VarianceRule = iota
	// Unpooled uses the anticipated rates themselves (the variance of the
	// Wald statistic).
	Unpooled
)

var varianceNames = [...]string{"pooled", "unpooled"}

// String returns "pooled" or "unpooled".
func (v VarianceRule) String() string {
	if v < 0 || int(v) >= len(varianceNames) {
		return fmt.Sprintf("variance(%d)", int(v))
	}
	return varianceNames[v]
}

// MarshalJSON writes the plain name.
func (v VarianceRule) MarshalJSON() ([]byte, error) { return json.Marshal(v.String()) }

// UnmarshalJSON reads the plain name.
func (v *VarianceRule) UnmarshalJSON(b []byte) error {
	i, err := unmarshalName(b, varianceNames[:], "variance rule")
	*v = VarianceRule(i)
	return err
}

func unmarshalName(b []byte, names []string, what string) (int, error) {
	var s string
	if err := json.Unmarshal(b, &s); err != nil {
		return 0, err
	}
	for i, n := range names {
		if n == s {
			return i, nil
		}
	}
	return 0, fmt.Errorf("%s %q: %w; use one of %q", what, s, ErrDesign, names)
}

// Design describes a planned two-group study: what it sets out to show, the
// rates anticipated in each group, the error rates and the shape of the
// groups. The study-planning functions (SampleSize, PowerAt,
// DetectableDifference, the curves and the exact searches) all take one.
//
// Planning takes a plain struct rather than the Options of the analysis
// functions because a plan is a record: it is written down before the data
// exist, shared, stored as JSON and echoed in every result. NewDesign fills
// the usual defaults.
//
// Conventions: group 1 is the new or experimental arm, group 2 the
// reference; θ is π1 − π2 on the difference scale and π1/π2 on the ratio
// scale.
type Design struct {
	Goal Goal `json:"goal"`
	// Scale is Difference (default) or Ratio; it is the scale of Margin.
	// A test of equality is the same on both scales.
	Scale Family `json:"scale"`
	// Alternative is the direction of a Superiority or NonInferiority
	// design: Greater when higher rates are better, Less when lower rates
	// are better. It must be TwoSided (the zero value) for Equality and
	// Equivalence.
	Alternative Alternative `json:"alternative"`
	// Rate1 and Rate2 are the anticipated true rates π1 and π2, in (0, 1)
	// (from MinPlanningRate to MaxPlanningRate).
	Rate1 float64 `json:"rate1"`
	Rate2 float64 `json:"rate2"`
	// Margin is δ on the difference scale or ρ on the ratio scale; it must
	// be 0 for Equality. See Goal for the allowed signs.
	Margin float64 `json:"margin"`
	// Alpha is the significance level in [MinPlanningAlpha, 0.5]: the two-sided level for
	// Equality, the one-sided level for Superiority and NonInferiority, and
	// the level of each one-sided test for Equivalence.
	Alpha float64 `json:"alpha"`
	// Power is the target power, in (Alpha, MaxPlanningPower]. A function
	// that does not use it (PowerAt, the power curves) still echoes it, so
	// it must then be 0 or valid; the same holds for Rate1.
	Power float64 `json:"power"`
	// Allocation is the ratio r = n2/n1 of the group sizes; 0 means 1.
	// Group 2 gets ⌈r·n1⌉ units.
	Allocation float64 `json:"allocation"`
	// Dropout is the expected share of enrolled units lost before the
	// outcome is known, in [0, 1); enrolment is inflated to n/(1 − Dropout),
	// and an enrolment above MaxTrials is an error wrapping ErrTooLarge.
	Dropout float64 `json:"dropout"`
	// Variance is the null-variance rule of the asymptotic formulas.
	Variance VarianceRule `json:"variance"`
	// ContinuityCorrection applies the Casagrande–Pike–Smith correction in
	// the closed form of Fleiss, Tytun & Ury (1980) to the asymptotic sample
	// size and power; available only for a zero margin (Equality, or
	// Superiority at no difference).
	ContinuityCorrection bool `json:"continuity_correction"`
}

// Default planning error rates used by NewDesign.
const (
	// DefaultPlanningPower is the target power used by NewDesign.
	DefaultPlanningPower = 0.8
	// DefaultTwoSidedAlpha is NewDesign's α for Equality.
	DefaultTwoSidedAlpha = 0.05
	// DefaultOneSidedAlpha is NewDesign's α for the one-sided goals and for
	// each test of Equivalence: 2.5%, so that the decision matches the
	// two-sided 95% confidence interval compared with the margin.
	DefaultOneSidedAlpha = 0.025
)

// NewDesign returns a design on the difference scale with the defaults:
// power 0.8, α 0.05 two-sided for Equality and 0.025 one-sided otherwise,
// equal groups, no drop-out, pooled variance, no continuity correction, and
// Alternative Greater for the one-sided goals. Set Margin (and any other
// field) on the result.
func NewDesign(goal Goal, rate1, rate2 float64) Design {
	d := Design{Goal: goal, Scale: Difference, Rate1: rate1, Rate2: rate2,
		Alpha: DefaultOneSidedAlpha, Power: DefaultPlanningPower, Allocation: 1}
	switch goal {
	case Equality:
		d.Alpha = DefaultTwoSidedAlpha
	case Superiority, NonInferiority:
		d.Alternative = Greater
	}
	return d
}

// allocation returns r = n2/n1 with 0 read as 1.
func (d Design) allocation() float64 {
	if d.Allocation == 0 {
		return 1
	}
	return d.Allocation
}

// String prints the design in one line, for example
// "non-inferiority on the difference, π1 = 0.85 vs π2 = 0.85, margin -0.1, one-sided α = 0.025, power 0.8, n2/n1 = 1".
func (d Design) String() string {
	alpha := fmt.Sprintf("one-sided α = %v", d.Alpha)
	switch d.Goal {
	case Equality:
		alpha = fmt.Sprintf("two-sided α = %v", d.Alpha)
	case Equivalence:
		alpha = fmt.Sprintf("α = %v for each one-sided test", d.Alpha)
	}
	s := fmt.Sprintf("%s on the %s, π1 = %v vs π2 = %v", d.Goal, d.Scale, d.Rate1, d.Rate2)
	if d.Goal != Equality {
		s += fmt.Sprintf(", margin %v", d.Margin)
	}
	if d.Goal == Superiority || d.Goal == NonInferiority {
		s += fmt.Sprintf(" (alternative %s)", d.Alternative)
	}
	s += fmt.Sprintf(", %s, power %v, n2/n1 = %v", alpha, d.Power, d.allocation())
	if d.Dropout > 0 {
		s += fmt.Sprintf(", drop-out %v", d.Dropout)
	}
	return s
}

// Limits of the allocation ratio: beyond them one group is so small that
// the asymptotic formulas and the exact searches stop being useful.
const (
	minAllocation = 0.01
	maxAllocation = 100
)

// validate checks every field except the rates and the power, which not
// every question uses (validateRate, validatePower).
func (d Design) validate() error {
	if d.Goal < Equality || d.Goal > Equivalence {
		return fmt.Errorf("goal %d: %w; use Equality, Superiority, NonInferiority or Equivalence", int(d.Goal), ErrDesign)
	}
	if d.Scale != Difference && d.Scale != Ratio {
		return fmt.Errorf("scale %s: %w; planning works on the difference or the ratio scale", d.Scale, ErrUnsupported)
	}
	if !(d.Alpha >= MinPlanningAlpha && d.Alpha <= 0.5) {
		return fmt.Errorf("alpha %v: %w; the significance level must lie in (0, 0.5], at least %g, such as 0.05 (two-sided) or 0.025 (one-sided)", d.Alpha, ErrDesign, MinPlanningAlpha)
	}
	if r := d.allocation(); !(r >= minAllocation && r <= maxAllocation) {
		return fmt.Errorf("allocation n2/n1 = %v: %w; it must lie in [%v, %v] (0 means equal groups)", d.Allocation, ErrDesign, minAllocation, maxAllocation)
	}
	if !(d.Dropout >= 0 && d.Dropout < 1) {
		return fmt.Errorf("drop-out share %v: %w; it must lie in [0, 1), such as 0.1 for 10%%", d.Dropout, ErrDesign)
	}
	if d.Variance != Pooled && d.Variance != Unpooled {
		return fmt.Errorf("variance rule %d: %w; use Pooled or Unpooled", int(d.Variance), ErrDesign)
	}
	if err := d.validateAlternative(); err != nil {
		return err
	}
	if err := d.validateMargin(); err != nil {
		return err
	}
	if d.ContinuityCorrection && d.nullValue() != d.Scale.NoEffect() {
		return fmt.Errorf("continuity correction with margin %v: %w; the Casagrande–Pike–Smith correction is published for a test of no difference only", d.Margin, ErrUnsupported)
	}
	if err := validateRate("second group's", d.Rate2); err != nil {
		return err
	}
	return d.validateEchoed()
}

func validateRate(which string, p float64) error {
	if !(p >= MinPlanningRate && p <= MaxPlanningRate) {
		return fmt.Errorf("%s anticipated rate %v: %w; a rate must lie strictly between 0 and 1, from %g to %v (1 − 1e-12)",
			which, p, ErrDesign, MinPlanningRate, MaxPlanningRate)
	}
	return nil
}

func (d Design) validatePower() error {
	if !(d.Power > d.Alpha && d.Power <= MaxPlanningPower) {
		return fmt.Errorf("power %v: %w; the target power must lie strictly between α = %v and 1, at most %v (1 − 1e-12), such as 0.8 or 0.9",
			d.Power, ErrDesign, d.Alpha, MaxPlanningPower)
	}
	return nil
}

func (d Design) validateAlternative() error {
	switch d.Goal {
	case Superiority, NonInferiority:
		if d.Alternative != Greater && d.Alternative != Less {
			return fmt.Errorf("%s with alternative %s: %w; a %s design is one-sided: use Greater when higher rates are better, Less when lower rates are better", d.Goal, d.Alternative, ErrAlternative, d.Goal)
		}
	default:
		if d.Alternative != TwoSided {
			return fmt.Errorf("%s with alternative %s: %w; leave Alternative at TwoSided (a one-sided test of no difference is Superiority with margin 0)", d.Goal, d.Alternative, ErrAlternative)
		}
	}
	return nil
}

// validateMargin checks the margin's range and its sign for the goal.
func (d Design) validateMargin() error {
	m := d.Margin
	if d.Goal == Equality {
		if m != 0 {
			return fmt.Errorf("equality design with margin %v: %w; a test of equality has no margin: leave it 0, or plan Superiority, NonInferiority or Equivalence", m, ErrMargin)
		}
		return nil
	}
	if d.Scale == Ratio && d.Goal == Equivalence && m > 0 && m < 1 {
		m = 1 / m // read as the upper bound
	}
	if err := ValidateNull(d.Scale, m); err != nil {
		return err
	}
	if d.Scale == Ratio {
		if err := validateRatioMargin(d.Goal, m); err != nil {
			return err
		}
	}
	one := d.Scale.NoEffect()
	var ok bool
	var want string
	up := d.Alternative == Greater
	switch d.Goal {
	case NonInferiority:
		ok = (up && m < one) || (!up && m > one)
		want = map[bool]string{true: "below", false: "above"}[up]
	case Superiority:
		ok = (up && m >= one) || (!up && m <= one)
		want = map[bool]string{true: "at or above", false: "at or below"}[up]
	case Equivalence:
		ok, want = m != one, "other than"
	}
	if !ok {
		hint := ""
		if d.Goal != Equivalence {
			hint = fmt.Sprintf(" when the alternative is %s", d.Alternative)
		}
		return fmt.Errorf("%s margin %v on the %s scale: %w; it must be %s %v%s",
			d.Goal, d.Margin, d.Scale, ErrMargin, want, one, hint)
	}
	return nil
}

// nullValue is the value of θ under the null hypothesis (the no-effect
// value for Equality).
func (d Design) nullValue() float64 {
	if d.Goal == Equality {
		return d.Scale.NoEffect()
	}
	return d.Margin
}

// equivalenceBounds returns the lower and upper equivalence limits of θ.
func (d Design) equivalenceBounds() (lo, hi float64) {
	m := math.Abs(d.Margin)
	if d.Scale == Ratio {
		if m < 1 {
			m = 1 / m
		}
		return 1 / m, m
	}
	return -m, m
}
