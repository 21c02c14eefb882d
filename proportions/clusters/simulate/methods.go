package simulate

import (
	"fmt"
	"slices"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/clusters"
)

// IntervalMethod is an interval method for π1 − π2 as a simulation runs it:
// a unit-level (naive) method of the registry run on the pooled counts, or an
// adjusted one that accounts for the clusters.
type IntervalMethod struct {
	// Key is the method's key in its registry.
	Key string
	// Name is its published name.
	Name string
	// Adjusted is true for a method that accounts for the clusters.
	Adjusted bool
	// Limits returns the reported limits for one simulated study, given the
	// sums over its clusters (whose Counts are the pooled counts); ok is
	// false when the method gives no interval for these data (the study is
	// then counted as undefined for this method, never dropped silently).
	Limits func(s *clusters.Summary, conf proportions.Confidence) (lower, upper float64, ok bool)
}

// TestMethod is a test of equal rates as a simulation runs it, naive or
// adjusted like IntervalMethod.
type TestMethod struct {
	// Key is the test's key in its registry.
	Key string
	// Name is its published name.
	Name string
	// Adjusted is true for a test that accounts for the clusters.
	Adjusted bool
	// Rejects tells whether the two-sided test of equal rates rejects at
	// α = 1 − conf.Level for one simulated study; ok is false when the
	// test gives no answer for these data.
	Rejects func(s *clusters.Summary, conf proportions.Confidence) (reject, ok bool)
}

// NaiveInterval wraps a registered interval method on the difference scale
// so that it runs on the pooled counts, ignoring the clusters.
func NaiveInterval(m proportions.IntervalMethod) IntervalMethod {
	return IntervalMethod{Key: m.Key, Name: m.Name,
		Limits: func(s *clusters.Summary, conf proportions.Confidence) (float64, float64, bool) {
			iv := m.IntervalAt(s.Counts(), conf)
			return iv.Lower, iv.Upper, true
		}}
}

// NaiveTest wraps a registered test so that it tests equal rates (its
// scale's no-effect null, two-sided) on the pooled counts.
func NaiveTest(m proportions.TestMethod) TestMethod {
	return TestMethod{Key: m.Key, Name: m.Name,
		Rejects: func(s *clusters.Summary, conf proportions.Confidence) (bool, bool) {
			h := proportions.Hypothesis{Null: m.Scale.NoEffect(), Alternative: proportions.TwoSided, Conf: conf}
			return m.Run(s.Counts(), h).Reject, true
		}}
}

// Intervals returns every interval method a simulation runs by default: the
// registered difference intervals of the quick scope on the pooled counts,
// then the adjusted ones.
func Intervals() []IntervalMethod {
	var out []IntervalMethod
	for _, m := range proportions.IntervalMethods(proportions.Difference, proportions.ScopeQuick) {
		out = append(out, NaiveInterval(m))
	}
	return append(out, adjustedIntervals()...)
}

// Tests returns every test a simulation runs by default: the registered
// tests of the quick scope on the pooled counts (Yates' variant, run only
// on request elsewhere, left out), then the adjusted ones.
func Tests() []TestMethod {
	var out []TestMethod
	for _, m := range proportions.Tests() {
		if proportions.ScopeQuick.Runs(m.Exact, m.TrialLimit) && !m.ContinuityCorrected {
			out = append(out, NaiveTest(m))
		}
	}
	return append(out, adjustedTests()...)
}

// AdjustedInterval wraps a clustered interval method of package clusters.
func AdjustedInterval(m clusters.IntervalMethod) IntervalMethod {
	return IntervalMethod{Key: m.Key, Name: m.Name, Adjusted: true,
		Limits: func(s *clusters.Summary, conf proportions.Confidence) (float64, float64, bool) {
			iv := m.IntervalAt(*s, conf)
			return iv.Lower, iv.Upper, true
		}}
}

// AdjustedTest wraps a clustered test of package clusters, two-sided at
// no difference.
func AdjustedTest(m clusters.TestMethod) TestMethod {
	return TestMethod{Key: m.Key, Name: m.Name, Adjusted: true,
		Rejects: func(s *clusters.Summary, conf proportions.Confidence) (bool, bool) {
			h := proportions.Hypothesis{Null: 0, Alternative: proportions.TwoSided, Conf: conf}
			return m.Run(*s, h).Reject, true
		}}
}

// adjustedIntervals lists the methods that account for the clusters.
func adjustedIntervals() []IntervalMethod {
	var out []IntervalMethod
	for _, m := range clusters.IntervalMethods() {
		out = append(out, AdjustedInterval(m))
	}
	return out
}

// adjustedTests lists the tests that account for the clusters.
func adjustedTests() []TestMethod {
	var out []TestMethod
	for _, m := range clusters.Tests() {
		out = append(out, AdjustedTest(m))
	}
	return out
}

// pick keeps the methods whose keys are listed (all when keys is empty),
// in registry order; an unknown key is an error wrapping
// proportions.ErrUnknownMethod that lists the known ones.
func pick(keys []string) ([]IntervalMethod, []TestMethod, error) {
	ivs, tests := Intervals(), Tests()
	if len(keys) == 0 {
		return ivs, tests, nil
	}
	var known []string
	for _, m := range ivs {
		known = append(known, m.Key)
	}
	for _, m := range tests {
		known = append(known, m.Key)
	}
	for _, k := range keys {
		if !slices.Contains(known, k) {
			return nil, nil, fmt.Errorf("method %q: %w; a simulation knows %v", k, proportions.ErrUnknownMethod, known)
		}
	}
	ivs = slices.DeleteFunc(ivs, func(m IntervalMethod) bool { return !slices.Contains(keys, m.Key) })
	tests = slices.DeleteFunc(tests, func(m TestMethod) bool { return !slices.Contains(keys, m.Key) })
	return ivs, tests, nil
}
