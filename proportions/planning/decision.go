package planning

import (
	"fmt"

	"github.com/propscope/propscope/proportions"
)

// This file turns a Plan into the decision rule of the test the user
// will run, for exact power: the hypotheses to run the test with.

// Validate checks every field of the plan and both rates; the target
// power and whether it can be reached are checked by the sample-size
// questions (SampleSize, DetectableDifference). Errors wrap ErrPlan,
// ErrMargin, ErrAlternative or ErrUnsupported.
func (d Plan) Validate() error {
	_, err := checkedModel(d, reads{})
	return err
}

// SecondGroupSize returns the size of group 2 for n1 units in group 1,
// ⌈r·n1⌉ with r = Allocation (equal groups when Allocation is 0).
func (d Plan) SecondGroupSize(n1 int64) int64 { return groupTwoSize(n1, d.allocation()) }

// Enrolled returns the units to enrol for n with an outcome,
// ⌈n/(1 − Dropout)⌉, never less than n. When that is above MaxTrials (a
// drop-out share near 1) it returns math.MaxInt64; EnrolledUnits returns
// an error wrapping ErrTooLarge instead, and the planning functions use it.
func (d Plan) Enrolled(n int64) int64 { return enrolled(n, d.Dropout) }

// TestHypotheses returns the hypotheses with which the test m carries out
// the plan's decision, each at level α (Conf.Level = 1 − α): one
// two-sided hypothesis of no effect for Equality; one one-sided hypothesis
// against the margin for Superiority and NonInferiority; for Equivalence
// the two one-sided hypotheses θ ≤ lower limit (alternative Greater) and
// θ ≥ upper limit (alternative Less). The plan rejects when m rejects
// every one of them (exact.Decision carries this rule for exact power).
//
// A test of no effect may come from any scale (π1 = π2 on every scale); a
// margin needs a test on the plan's scale that accepts margins. Errors
// wrap ErrUnsupported for a test that cannot carry out the plan, and the
// errors of Plan validation.
func (d Plan) TestHypotheses(m proportions.TestMethod) ([]proportions.Hypothesis, error) {
	if err := d.validate(reads{}); err != nil {
		return nil, err
	}
	if m.Run == nil {
		return nil, fmt.Errorf("test %q: %w; it has no Run function", m.Key, proportions.ErrUnsupported)
	}
	type spec struct {
		null float64
		alt  proportions.Alternative
	}
	var specs []spec
	switch d.Goal {
	case Equality:
		specs = []spec{{m.Scale.NoEffect(), proportions.TwoSided}}
	case Superiority, NonInferiority:
		specs = []spec{{d.Margin, d.alternative()}}
	case Equivalence:
		lo, hi := d.equivalenceBounds()
		specs = []spec{{lo, proportions.Greater}, {hi, proportions.Less}}
	}
	hs := make([]proportions.Hypothesis, 0, len(specs))
	for _, s := range specs {
		null := s.null
		if d.Goal != Equality && m.Scale != d.Scale {
			if null != d.Scale.NoEffect() {
				return nil, fmt.Errorf("%s on the %s scale with %s: %w; a margin on the %s scale needs a test on that scale",
					d.Goal, d.Scale, m.Name, proportions.ErrUnsupported, d.Scale)
			}
			null = m.Scale.NoEffect()
		}
		settings, err := proportions.NewSettings(proportions.WithLevel(1-d.Alpha), proportions.WithNull(null), proportions.WithAlternative(s.alt))
		if err != nil {
			return nil, err
		}
		h, err := m.Hypothesis(settings)
		if err != nil {
			return nil, err
		}
		hs = append(hs, h)
	}
	return hs, nil
}
