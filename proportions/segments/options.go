package segments

import (
	"fmt"

	"github.com/propscope/propscope/proportions"
)

// DefaultMinTrials is the fewest trials a group of a segment may have
// before the segment is flagged sparse (our choice: below ten units a rate
// moves by ten points with one unit).
const DefaultMinTrials = 10

// Option changes one setting of a per-segment analysis.
type Option func(*settings)

type settings struct {
	analysis   []proportions.Option
	adjustment Adjustment
	minTrials  int64
}

// WithAdjustment sets the multiplicity adjustment of the p-values
// (default Holm).
func WithAdjustment(a Adjustment) Option { return func(s *settings) { s.adjustment = a } }

// WithMinTrials sets the fewest trials per group below which a segment is
// flagged sparse (default DefaultMinTrials); 0 flags only small expected
// counts.
func WithMinTrials(n int64) Option { return func(s *settings) { s.minTrials = n } }

// WithAnalysis passes settings of the headline analysis to every segment:
// proportions.WithLevel, WithNull and WithAlternative (the defaults are
// Analyze's: 95%, no difference, two-sided). Other settings do not change
// the headline and are ignored.
func WithAnalysis(opts ...proportions.Option) Option {
	return func(s *settings) { s.analysis = append(s.analysis, opts...) }
}

func newSettings(opts []Option) (settings, error) {
	s := settings{adjustment: DefaultAdjustment, minTrials: DefaultMinTrials}
	for _, o := range opts {
		if o != nil {
			o(&s)
		}
	}
	if err := s.adjustment.Validate(); err != nil {
		return s, err
	}
	if s.minTrials < 0 {
		return s, fmt.Errorf("minimum trials %d: %w; use 0 or more", s.minTrials, proportions.ErrNegativeCount)
	}
	return s, nil
}
