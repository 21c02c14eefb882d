package proportions

import "fmt"

// MethodScope says which of the registered methods an analysis runs, by
// what they cost. The registry marks the costly ones: a method with a
// TrialLimit takes milliseconds to seconds per table (a search over a
// nuisance parameter or over the tables of an exact distribution), every
// other method takes microseconds or less.
type MethodScope int

const (
	// ScopeQuick, the default, runs every registered method that costs
	// microseconds: the large-sample intervals and tests of every scale,
	// the single-group intervals (Clopper–Pearson included) and Fisher's
	// exact test with its mid-p. A whole analysis then takes about ten
	// microseconds at any sample size, so it suits loops over many tables
	// and live redraws.
	ScopeQuick MethodScope = iota
	// ScopeAll adds the costly exact methods, each up to its TrialLimit:
	// Barnard's and Boschloo's unconditional tests, the exact unconditional
	// intervals for the difference and the conditional intervals for the
	// odds ratio. Small or sparse tables, where the large-sample methods
	// are least trustworthy, are where they earn their cost; a single
	// analysis takes milliseconds to a second.
	ScopeAll
	// ScopeLargeSample leaves out every exact and conditional method
	// (Fisher's test too): only methods justified by large-sample theory.
	ScopeLargeSample
)

var scopeNames = [...]string{"quick", "all", "large-sample"}

// String returns the scope's name: "quick", "all" or "large-sample".
func (s MethodScope) String() string {
	if s >= 0 && int(s) < len(scopeNames) {
		return scopeNames[s]
	}
	return fmt.Sprintf("MethodScope(%d)", int(s))
}

// Validate returns an error wrapping ErrScope unless s is one of the
// declared scopes.
func (s MethodScope) Validate() error {
	if s < 0 || int(s) >= len(scopeNames) {
		return fmt.Errorf("method scope %d: %w; use ScopeQuick, AllMethods or ScopeLargeSample", int(s), ErrScope)
	}
	return nil
}

// MarshalText writes the scope's name, so JSON shows "quick", "all" or
// "large-sample".
func (s MethodScope) MarshalText() ([]byte, error) {
	if err := s.Validate(); err != nil {
		return nil, err
	}
	return []byte(s.String()), nil
}

// UnmarshalText reads a scope's name.
func (s *MethodScope) UnmarshalText(b []byte) error {
	for i, n := range scopeNames {
		if string(b) == n {
			*s = MethodScope(i)
			return nil
		}
	}
	return fmt.Errorf("method scope %q: %w; use \"quick\", \"all\" or \"large-sample\"", b, ErrScope)
}

// Runs reports whether the scope includes a method with the given marks
// (its Exact flag and TrialLimit). Whether the data are small enough for a
// method's TrialLimit is a separate question (see Analyze).
func (s MethodScope) Runs(exact bool, sizeLimit int64) bool {
	costly := sizeLimit > 0
	switch s {
	case ScopeAll:
		return true
	case ScopeLargeSample:
		return !exact && !costly
	}
	return !costly
}

// WithScope sets which registered methods an analysis runs (see
// MethodScope; the default is ScopeQuick).
func WithScope(scope MethodScope) Option {
	return func(s *Settings) { s.Scope = scope }
}

// anyTrials is the TrialLimit of a method that runs at any size the library
// accepts but costs tens of microseconds per table, more than the quick
// scope's budget of a few: the positive limit marks it as costly, so
// ScopeQuick leaves it out and ScopeAll runs it.
const anyTrials = 2 * MaxTrials
