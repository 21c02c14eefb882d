package planning

import (
	"encoding/json"
	"fmt"
	"math"

	"github.com/propscope/propscope/proportions"
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
	return 0, fmt.Errorf("%s %q: %w; use one of %q", what, s, proportions.ErrPlan, names)
}

// Plan describes a planned two-group study: what it sets out to show, the
// rates anticipated in each group, the error rates and the shape of the
// groups. The study-planning functions (SampleSize, Power,
// DetectableDifference, the curves and the exact searches) all take one.
//
// Planning takes a plain struct rather than the Options of the analysis
// functions because a plan is a record: it is written down before the data
// exist, shared, stored as JSON and echoed in every result. NewPlan fills
// the usual defaults.
//
// Conventions: group 1 is the new or experimental arm, group 2 the
// reference; θ is π1 − π2 on the difference scale and π1/π2 on the ratio
// scale.
type Plan struct {
	Goal Goal `json:"goal"`
	// Scale is Difference (default) or Ratio; it is the scale of Margin.
	// A test of equality is the same on both scales.
	Scale proportions.Scale `json:"scale"`
	// Better says which way the rates are good (HigherIsBetter, the zero
	// value, or LowerIsBetter); a Superiority or NonInferiority plan tests
	// the one-sided alternative that the first group is better. Equality
	// and Equivalence plans are two-sided and do not read it.
	Better proportions.Better `json:"better"`
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
	// that does not use it (Power, the power curves) still echoes it, so
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

// Default planning error rates used by NewPlan.
const (
	// DefaultPower is the target power used by NewPlan.
	DefaultPower = 0.8
	// DefaultTwoSidedAlpha is NewPlan's α for Equality.
	DefaultTwoSidedAlpha = 0.05
	// DefaultOneSidedAlpha is NewPlan's α for the one-sided goals and for
	// each test of Equivalence: 2.5%, so that the decision matches the
	// two-sided 95% confidence interval compared with the margin.
	DefaultOneSidedAlpha = 0.025
)

// NewPlan returns a plan on the difference scale with the defaults:
// power 0.8, α 0.05 two-sided for Equality and 0.025 one-sided otherwise,
// equal groups, no drop-out, pooled variance, no continuity correction, and
// higher rates better. Set Margin (and any other
// field) on the result.
func NewPlan(goal Goal, rate1, rate2 float64) Plan {
	d := Plan{Goal: goal, Scale: proportions.Difference, Rate1: rate1, Rate2: rate2,
		Alpha: DefaultOneSidedAlpha, Power: DefaultPower, Allocation: 1}
	switch goal {
	case Equality:
		d.Alpha = DefaultTwoSidedAlpha
	}
	return d
}

// allocation returns r = n2/n1 with 0 read as 1.
func (d Plan) allocation() float64 {
	if d.Allocation == 0 {
		return 1
	}
	return d.Allocation
}

// String prints the plan in one line, for example
// "non-inferiority on the difference, π1 = 0.85 vs π2 = 0.85, margin -0.1, one-sided α = 0.025, power 0.8, n2/n1 = 1".
func (d Plan) String() string {
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
		s += fmt.Sprintf(" (%s is better)", d.Better)
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

// validate checks every field the planning function reads: the shared
// ones, the second rate, and the first rate and the power when r says the
// function reads them; the others only when they are set (validateEchoed).
func (d Plan) validate(r reads) error {
	if d.Goal < Equality || d.Goal > Equivalence {
		return fmt.Errorf("goal %d: %w; use Equality, Superiority, NonInferiority or Equivalence", int(d.Goal), proportions.ErrPlan)
	}
	if d.Scale != proportions.Difference && d.Scale != proportions.Ratio {
		return fmt.Errorf("scale %s: %w; planning works on the difference or the ratio scale", d.Scale, proportions.ErrUnsupported)
	}
	if !(d.Alpha >= MinPlanningAlpha && d.Alpha <= 0.5) {
		return fmt.Errorf("alpha %v: %w; the significance level must lie in (0, 0.5], at least %g, such as 0.05 (two-sided) or 0.025 (one-sided)", d.Alpha, proportions.ErrPlan, MinPlanningAlpha)
	}
	if r := d.allocation(); !(r >= minAllocation && r <= maxAllocation) {
		return fmt.Errorf("allocation n2/n1 = %v: %w; it must lie in [%v, %v] (0 means equal groups)", d.Allocation, proportions.ErrPlan, minAllocation, maxAllocation)
	}
	if !(d.Dropout >= 0 && d.Dropout < 1) {
		return fmt.Errorf("drop-out share %v: %w; it must lie in [0, 1), such as 0.1 for 10%%", d.Dropout, proportions.ErrPlan)
	}
	if d.Variance != Pooled && d.Variance != Unpooled {
		return fmt.Errorf("variance rule %d: %w; use Pooled or Unpooled", int(d.Variance), proportions.ErrPlan)
	}
	if err := d.Better.Validate(); err != nil {
		return err
	}
	if err := d.validateMargin(); err != nil {
		return err
	}
	if d.ContinuityCorrection && d.nullValue() != d.Scale.NoEffect() {
		return fmt.Errorf("continuity correction with margin %v: %w; the Casagrande–Pike–Smith correction is published for a test of no difference only", d.Margin, proportions.ErrUnsupported)
	}
	if err := validateRate("second group's", d.Rate2); err != nil {
		return err
	}
	if r.rate1 {
		if err := validateRate("first group's", d.Rate1); err != nil {
			return err
		}
	}
	if r.power {
		if err := d.validatePower(); err != nil {
			return err
		}
	}
	return d.validateEchoed(r)
}

func validateRate(which string, p float64) error {
	if !(p >= MinPlanningRate && p <= MaxPlanningRate) {
		return fmt.Errorf("%s anticipated rate %v: %w; a rate must lie strictly between 0 and 1, from %g to %v (1 − 1e-12)",
			which, p, proportions.ErrPlan, MinPlanningRate, MaxPlanningRate)
	}
	return nil
}

func (d Plan) validatePower() error {
	if !(d.Power > d.Alpha && d.Power <= MaxPlanningPower) {
		return fmt.Errorf("power %v: %w; the target power must lie strictly between α = %v and 1, at most %v (1 − 1e-12), such as 0.8 or 0.9",
			d.Power, proportions.ErrPlan, d.Alpha, MaxPlanningPower)
	}
	return nil
}

// alternative is the alternative hypothesis of the plan's test: one-sided
// towards the better group for Superiority and NonInferiority, two-sided
// otherwise (Equivalence's two one-sided tests are built in decision.go).
func (d Plan) alternative() proportions.Alternative {
	if d.Goal == Superiority || d.Goal == NonInferiority {
		return d.Better.Alternative()
	}
	return proportions.TwoSided
}

// validateMargin checks the margin's range and its sign for the goal.
func (d Plan) validateMargin() error {
	m := d.Margin
	if d.Goal == Equality {
		if m != 0 {
			return fmt.Errorf("equality plan with margin %v: %w; a test of equality has no margin: leave it 0, or plan Superiority, NonInferiority or Equivalence", m, proportions.ErrMargin)
		}
		return nil
	}
	if d.Scale == proportions.Ratio && d.Goal == Equivalence && m > 0 && m < 1 {
		m = 1 / m // read as the upper bound
	}
	if err := proportions.ValidateNull(d.Scale, m); err != nil {
		return fmt.Errorf("%s margin %v on the %s scale: %w (%v)", d.Goal, d.Margin, d.Scale, proportions.ErrMargin, err)
	}
	if d.Scale == proportions.Ratio {
		if err := validateRatioMargin(d.Goal, m); err != nil {
			return err
		}
	}
	one := d.Scale.NoEffect()
	var ok bool
	var want string
	up := d.Better == proportions.HigherIsBetter
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
			hint = fmt.Sprintf(" when %s rates are better", d.Better)
		}
		return fmt.Errorf("%s margin %v on the %s scale: %w; it must be %s %v%s",
			d.Goal, d.Margin, d.Scale, proportions.ErrMargin, want, one, hint)
	}
	return nil
}

// nullValue is the value of θ under the null hypothesis (the no-effect
// value for Equality).
func (d Plan) nullValue() float64 {
	if d.Goal == Equality {
		return d.Scale.NoEffect()
	}
	return d.Margin
}

// equivalenceBounds returns the lower and upper equivalence limits of θ.
func (d Plan) equivalenceBounds() (lo, hi float64) {
	m := math.Abs(d.Margin)
	if d.Scale == proportions.Ratio {
		if m < 1 {
			m = 1 / m
		}
		return 1 / m, m
	}
	return -m, m
}
