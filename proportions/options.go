package proportions

import (
	"fmt"
)

// DefaultLevel is the confidence level used when none is given.
const DefaultLevel = 0.95

// Settings gathers every tunable of an analysis. Callers do not fill it
// directly: they pass Options (WithLevel, WithNull, ...) to the functions
// that accept them; each function documents which settings it reads.
type Settings struct {
	// Level is the two-sided confidence level; tests use α = 1 − Level.
	Level float64
	// Null is the value of π1 − π2 (or of the ratio / odds ratio for tests
	// on those scales) under the null hypothesis; 0 for the difference.
	Null float64
	// nullSet records whether WithNull was given, since the default null
	// depends on the scale (0 for a difference, 1 for a ratio).
	nullSet bool
	// Alternative is the direction of the alternative hypothesis.
	Alternative Alternative
	// Scope says which registered methods an analysis runs, by cost
	// (ScopeQuick by default; see MethodScope).
	Scope MethodScope
	// YatesTest turns on Yates' correction for the chi-square
	// test (off by default: it makes the test conservative, see chisquare.go).
	YatesTest bool
}

// Option changes one setting. Options are applied in order.
type Option func(*Settings)

// WithLevel sets the confidence level, which must lie in (0, 1).
func WithLevel(level float64) Option { return func(s *Settings) { s.Level = level } }

// WithNull sets the null value: a difference δ in (−1, 1), or a ratio or odds
// ratio in (0, ∞) for tests on those scales. A non-zero difference (or a
// ratio other than 1) turns a test into a non-inferiority, superiority or
// equivalence-margin test.
func WithNull(null float64) Option {
	return func(s *Settings) { s.Null = null; s.nullSet = true }
}

// WithAlternative sets the direction of the alternative hypothesis.
func WithAlternative(a Alternative) Option { return func(s *Settings) { s.Alternative = a } }

// WithYatesTest turns Yates' continuity correction on or off for
// the chi-square test.
func WithYatesTest(on bool) Option {
	return func(s *Settings) { s.YatesTest = on }
}

// NewSettings applies the options to the defaults (level 0.95, null 0 for a
// difference, two-sided, no continuity correction, quick methods) and validates the result
// for the difference scale.
func NewSettings(opts ...Option) (Settings, error) {
	s := Settings{Level: DefaultLevel, Alternative: TwoSided}
	for _, o := range opts {
		if o != nil {
			o(&s)
		}
	}
	if err := ValidateLevel(s.Level); err != nil {
		return s, err
	}
	if err := s.Alternative.Validate(); err != nil {
		return s, err
	}
	if err := s.Scope.Validate(); err != nil {
		return s, err
	}
	return s, nil
}

// NullFor returns the null value on the given scale: the value set with
// WithNull, or the scale's no-effect value (0 or 1) when none was set.
func (s Settings) NullFor(f Scale) float64 {
	if s.nullSet {
		return s.Null
	}
	return f.NoEffect()
}

// ValidateLevel returns an error wrapping ErrLevel unless MinLevel ≤ level
// ≤ MaxLevel (10⁻⁶ to 1 − 10⁻¹²; see MinLevel for why not all of (0, 1)).
func ValidateLevel(level float64) error {
	if !(level >= MinLevel && level <= MaxLevel) {
		return fmt.Errorf("level %v: %w; use a confidence level from %g to %v (1 − 1e-12), such as 0.95",
			level, ErrLevel, MinLevel, MaxLevel)
	}
	return nil
}

// MaxNullRatio bounds a null value on the ratio and odds-ratio scales to
// [1/MaxNullRatio, MaxNullRatio] = [10⁻¹², 10¹²]. Beyond, floating point
// decides: at a null of 1.7·10³⁰⁸ (and of 5·10⁻³²⁴ for the odds ratio)
// the restricted fit of the score tests overflowed and they rejected with
// z = +∞ a null their own intervals contained; a ratio of rates beyond
// 10¹² answers no question of the trade.
const MaxNullRatio = 1e12

// ValidateNull returns an error wrapping ErrNull unless the null value is
// inside the parameter space of the scale: (−1, 1) for the difference, and
// for the ratio and the odds ratio (0, ∞) as far as MaxNullRatio reaches:
// [10⁻¹², 10¹²].
func ValidateNull(f Scale, null float64) error {
	switch f {
	case Difference:
		if !(null > -1 && null < 1) {
			return fmt.Errorf("null difference %v: %w; a difference of proportions under the null must lie strictly between -1 and 1", null, ErrNull)
		}
	case Ratio, OddsRatio:
		if !(null >= 1/MaxNullRatio && null <= MaxNullRatio) {
			return fmt.Errorf("null %s %v: %w; it must be a number greater than 0, from %g to %g", f, null, ErrNull, 1/MaxNullRatio, float64(MaxNullRatio))
		}
	}
	return nil
}
