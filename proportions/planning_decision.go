package proportions

import "fmt"

// This file turns a Design into the decision rule of the test the user
// will run, for exact power: the hypotheses to run the test with.

// Validate checks every field of the design and both rates; the target
// power and whether it can be reached are checked by the sample-size
// questions (SampleSize, DetectableDifference). Errors wrap ErrDesign,
// ErrMargin, ErrAlternative or ErrUnsupported.
func (d Design) Validate() error {
	_, err := checkedModel(d)
	return err
}

// SecondGroupSize returns the size of group 2 for n1 units in group 1,
// ⌈r·n1⌉ with r = Allocation (equal groups when Allocation is 0).
func (d Design) SecondGroupSize(n1 int64) int64 { return groupTwoSize(n1, d.allocation()) }

// Enrolled returns the units to enrol for n with an outcome,
// ⌈n/(1 − Dropout)⌉, never less than n. When that is above MaxTrials (a
// drop-out share near 1) it returns math.MaxInt64; EnrolledUnits returns
// an error wrapping ErrTooLarge instead, and the planning functions use it.
func (d Design) Enrolled(n int64) int64 { return enrolled(n, d.Dropout) }

// TestHypotheses returns the hypotheses with which the test m carries out
// the design's decision, each at level α (Conf.Level = 1 − α): one
// two-sided hypothesis of no effect for Equality; one one-sided hypothesis
// against the margin for Superiority and NonInferiority; for Equivalence
// the two one-sided hypotheses θ ≤ lower limit (alternative Greater) and
// θ ≥ upper limit (alternative Less). The design rejects when m rejects
// every one of them (exact.Decision carries this rule for exact power).
//
// A test of no effect may come from any scale (π1 = π2 on every scale); a
// margin needs a test on the design's scale that accepts margins. Errors
// wrap ErrUnsupported for a test that cannot carry out the design, and the
// errors of Design validation.
func (d Design) TestHypotheses(m TestMethod) ([]Hypothesis, error) {
	if err := d.validate(); err != nil {
		return nil, err
	}
	if m.Run == nil {
		return nil, fmt.Errorf("test %q: %w; it has no Run function", m.Key, ErrUnsupported)
	}
	type spec struct {
		null float64
		alt  Alternative
	}
	var specs []spec
	switch d.Goal {
	case Equality:
		specs = []spec{{m.Family.NoEffect(), TwoSided}}
	case Superiority, NonInferiority:
		specs = []spec{{d.Margin, d.Alternative}}
	case Equivalence:
		lo, hi := d.equivalenceBounds()
		specs = []spec{{lo, Greater}, {hi, Less}}
	}
	hs := make([]Hypothesis, 0, len(specs))
	for _, s := range specs {
		null := s.null
		if d.Goal != Equality && m.Family != d.Scale {
			if null != d.Scale.NoEffect() {
				return nil, fmt.Errorf("%s on the %s scale with %s: %w; a margin on the %s scale needs a test on that scale",
					d.Goal, d.Scale, m.Name, ErrUnsupported, d.Scale)
			}
			null = m.Family.NoEffect()
		}
		settings, err := NewSettings(WithLevel(1-d.Alpha), WithNull(null), WithAlternative(s.alt))
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
