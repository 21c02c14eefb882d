package proportions

import (
	"context"
	"errors"
	"fmt"
	"math"
	"slices"
)

// The headline pair of the default analysis. Mee's score interval is the
// set of differences δ that the Farrington–Manning score test does not
// reject, so the interval excludes the null exactly when the test rejects;
// at δ = 0 that test is the pooled z test, whose square is Pearson's
// chi-square.
const (
	HeadlineIntervalKey = "mee"
	HeadlineTestKey     = "farrington-manning-test"
)

// Caution is the standing reminder attached to every analysis.
const Caution = "Statistical significance is not practical importance: judge the size of the difference and " +
	"its interval against what matters in your setting. Where health or safety decisions follow, they rest " +
	"on the applicable regulations and the advice of a qualified statistician, not on this output alone."

// smallExpected is the expected-count threshold below which asymptotic
// methods are flagged (the common rule of thumb of 5; common practice).
const smallExpected = 5

// Analyze runs the default analysis of a comparison: each group's
// proportion with its intervals, every registered interval for the
// difference, the ratio and the odds ratio, every registered test of
// H0: π1 − π2 = δ that applies, the headline score test with the score
// interval that inverts it, a plain-language conclusion, warnings and the
// standing caution.
//
// It reads the settings Level (default 0.95), Null (δ, default 0),
// Alternative (default two-sided), ContinuityCorrection (adds Yates' test)
// and Methods (default ScopeQuick: every method that costs microseconds,
// Fisher's exact test included; WithScope(ScopeAll) adds Barnard's and
// Boschloo's tests, the exact unconditional intervals and the conditional
// odds-ratio intervals). Tests use α = 1 − Level. For a one-sided
// alternative the headline interval is the two-sided interval at level
// 1 − 2α, whose limit on the alternative's side is the one-sided 1 − α
// confidence bound; so with a one-sided test at 2.5% (Level 0.975) the
// familiar 95% interval is reported, and it excludes δ on the
// alternative's side exactly when the test rejects. A costly method whose
// TrialLimit the data exceed is skipped with a warning. Analyze is
// AnalyzeContext with context.Background().
func Analyze(c Comparison, opts ...Option) (Analysis, error) {
	return AnalyzeContext(context.Background(), c, opts...)
}

// AnalyzeContext is Analyze with cancellation: with ScopeAll it can take
// seconds, so it stops with ctx's error within a few milliseconds of ctx
// ending (the costly methods look at ctx inside their work). A costly
// method whose Cost for this table exceeds AnalysisCost, or whose work
// sized on the way would (the log-space search of the unconditional tests
// for a tail probability below 1e−280), is skipped with a warning like a
// method above its TrialLimit.
func AnalyzeContext(ctx context.Context, c Comparison, opts ...Option) (Analysis, error) {
	counts := c.Counts()
	if err := counts.Validate(); err != nil {
		return Analysis{}, err
	}
	s, err := NewSettings(opts...)
	if err != nil {
		return Analysis{}, err
	}
	null := s.NullFor(Difference)
	if err := ValidateNull(Difference, null); err != nil {
		return Analysis{}, err
	}
	conf, ivConf, err := analysisConfidences(s)
	if err != nil {
		return Analysis{}, err
	}
	a := Analysis{
		Comparison: c, Level: s.Level, Null: null, Alternative: s.Alternative, Scope: s.Scope,
		Difference: Difference.Estimate(counts), Caution: Caution,
	}
	store := newIntervalStore()
	run := methodFilter{scope: s.Scope, total: counts.N1 + counts.N2}
	rates := a.rateMethodsOf(run)
	a.Groups[0] = groupEstimate(c.First, ivConf, store.take(len(proportionMethods)), rates)
	a.Groups[1] = groupEstimate(c.Second, ivConf, store.take(len(proportionMethods)), rates)
	if a.DifferenceIntervals, err = a.intervalsOf(ctx, run, counts, ivConf, store.take(len(differenceMethods)+len(slowDifferenceMethods)), differenceMethods, slowDifferenceMethods); err != nil {
		return Analysis{}, err
	}
	if a.RatioIntervals, err = a.intervalsOf(ctx, run, counts, ivConf, store.take(len(ratioMethods)), ratioMethods); err != nil {
		return Analysis{}, err
	}
	if a.OddsRatioIntervals, err = a.intervalsOf(ctx, run, counts, ivConf, store.take(len(oddsRatioMethods)), oddsRatioMethods); err != nil {
		return Analysis{}, err
	}
	h := Hypothesis{Null: null, Alternative: s.Alternative, Conf: conf, shared: &sharedWork{}}
	if a.Tests, err = a.testsOf(ctx, run, counts, h, s); err != nil {
		return Analysis{}, err
	}
	if err := a.setHeadline(counts, ivConf, h); err != nil {
		return Analysis{}, err
	}
	a.Warnings = append(a.Warnings, dataWarnings(c, s.Scope)...)
	a.Conclusion = conclusion(a)
	return a, nil
}

// analysisConfidences returns the test's confidence (α = 1 − Level) and the
// confidence of the reported intervals (1 − 2α when one-sided).
func analysisConfidences(s Settings) (test, intervals Confidence, err error) {
	test, err = NewConfidence(s.Level)
	if err != nil {
		return test, test, err
	}
	if s.Alternative == TwoSided {
		return test, test, nil
	}
	intervals, err = NewConfidence(1 - 2*(1-s.Level))
	if err != nil {
		return test, test, fmt.Errorf("level %v with a one-sided alternative: %w; one-sided tests need a level of at least %v "+
			"(a one-sided α below 0.5), so that the intervals' level 1 − 2α is at least %g", s.Level, ErrLevel, (1+MinLevel)/2, MinLevel)
	}
	return test, intervals, nil
}

// intervalStore hands out the interval lists of one analysis from a single
// allocation: an analysis fills about two dozen intervals, and one block
// costs less than a list per scale. Each list is capped at its share, so
// appending to one later moves it instead of overwriting the next.
type intervalStore []Interval

func newIntervalStore() *intervalStore {
	s := make(intervalStore, 2*len(proportionMethods)+len(differenceMethods)+len(slowDifferenceMethods)+
		len(ratioMethods)+len(oddsRatioMethods))
	return &s
}

// take returns an empty list with room for n intervals.
func (s *intervalStore) take(n int) []Interval {
	list := (*s)[:0:n]
	*s = (*s)[n:]
	return list
}

// rateMethodsOf returns the single-rate methods the analysis runs (the same
// for both groups), recording the others once. Rate methods are left out for
// their cost only (see RateMethod.TrialLimit).
func (a *Analysis) rateMethodsOf(f methodFilter) []RateMethod {
	all := true
	for _, m := range proportionMethods {
		run, _ := f.decide(false, m.TrialLimit)
		all = all && run
	}
	if all { // the usual case: no list to build
		return proportionMethods
	}
	out := make([]RateMethod, 0, len(proportionMethods))
	for _, m := range proportionMethods {
		if a.admit(f, m.Key, m.Name, false, m.TrialLimit) {
			out = append(out, m)
		}
	}
	return out
}

func groupEstimate(g Group, conf Confidence, list []Interval, methods []RateMethod) GroupEstimate {
	ge := GroupEstimate{Group: g, Rate: g.Proportion(), Intervals: list}
	for _, m := range methods {
		ge.Intervals = append(ge.Intervals, m.IntervalAt(g.Events, g.Trials, conf))
	}
	return ge
}

// methodFilter decides which registered methods an analysis runs: those in
// its scope, and of the costly ones only those whose TrialLimit the data
// do not exceed.
type methodFilter struct {
	scope MethodScope
	total int64 // n1 + n2
}

// decide reports whether to run a method, and whether it was left out
// only because the data exceed its TrialLimit (which deserves a warning).
func (f methodFilter) decide(exact bool, sizeLimit int64) (run, tooLarge bool) {
	if !f.scope.Runs(exact, sizeLimit) {
		return false, false
	}
	if sizeLimit > 0 && f.total > sizeLimit {
		return false, true
	}
	return true, false
}

// intervalsOf fills out (empty, with room for every method of lists) with
// the intervals the analysis runs; it stops with ctx's error when ctx ends.
func (a *Analysis) intervalsOf(ctx context.Context, f methodFilter, c Counts, conf Confidence, out []Interval, lists ...[]IntervalMethod) ([]Interval, error) {
	for _, l := range lists {
		for _, m := range l {
			if !a.admit(f, m.Key, m.Name, m.Exact, m.TrialLimit) {
				continue
			}
			if m.Cost == nil && m.LimitsContext == nil {
				out = append(out, m.IntervalAt(c, conf))
				continue
			}
			iv, err := m.intervalContext(ctx, c, conf, AnalysisCost)
			if out, err = keepCostly(a, out, iv, m.Name, err); err != nil {
				return out, err
			}
		}
	}
	return out, nil
}

// testsOf runs the tests the analysis includes; it stops with ctx's error
// when ctx ends.
func (a *Analysis) testsOf(ctx context.Context, f methodFilter, c Counts, h Hypothesis, s Settings) ([]TestResult, error) {
	out := make([]TestResult, 0, len(asymptoticTests)+len(exactTests))
	for _, l := range [...][]TestMethod{asymptoticTests, exactTests, ratioTests} {
		for _, m := range l {
			if m.Scale != Difference || (m.ContinuityCorrected && !s.YatesTest) {
				continue
			}
			if !m.Margins && h.Null != 0 {
				if m.ContinuityCorrected { // asked for by name (WithYatesTest): say why it is missing
					a.Warnings = append(a.Warnings, Warning{Code: WarnSkipped, Message: fmt.Sprintf(
						"%s was not computed: it tests equal rates only, and this analysis tests a difference of %s percentage points.", m.Name, FormatPoints(h.Null, 1))})
				}
				continue
			}
			if !a.admit(f, m.Key, m.Name, m.Exact, m.TrialLimit) {
				continue
			}
			if m.Cost == nil && m.RunContext == nil {
				out = append(out, m.Run(c, h))
				continue
			}
			r, err := m.runContext(ctx, c, h, AnalysisCost)
			if out, err = keepCostly(a, out, r, m.Name, err); err != nil {
				return out, err
			}
		}
	}
	return out, nil
}

// keepCostly appends a costly method's result v to out; a method refused
// for its cost (ErrTooLarge) is recorded as skipped instead, and any other
// error (the context's) is passed on.
func keepCostly[T any](a *Analysis, out []T, v T, name string, err error) ([]T, error) {
	switch {
	case errors.Is(err, ErrTooLarge):
		a.skipCostly(name, err)
	case err != nil:
		return out, err
	default:
		out = append(out, v)
	}
	return out, nil
}

// skipCostly records a costly method left out because its cost at this
// table exceeds AnalysisCost; err (wrapping ErrTooLarge) says what it
// would need.
func (a *Analysis) skipCostly(name string, err error) {
	a.Warnings = append(a.Warnings, Warning{Code: WarnSkipped, Message: fmt.Sprintf(
		"%s was not computed: it would be slow at this table (%v); it can be run on its own where the wait is acceptable.", name, err)})
}

// admit reports whether the analysis runs a method, and otherwise records
// why not: in a warning when the data exceed its TrialLimit, in Omitted
// when the scope leaves it out.
func (a *Analysis) admit(f methodFilter, key, name string, exact bool, sizeLimit int64) bool {
	run, tooLarge := f.decide(exact, sizeLimit)
	switch {
	case tooLarge:
		a.skip(name, sizeLimit, f.total)
	case !run:
		if a.Omitted == nil {
			a.Omitted = make([]string, 0, 16) // the costly methods, at most a dozen today
		}
		a.Omitted = append(a.Omitted, key)
	}
	return run
}

func (a *Analysis) skip(name string, limit, total int64) {
	a.Warnings = append(a.Warnings, Warning{Code: WarnSkipped, Message: fmt.Sprintf(
		"%s was not computed: with %d units in all it would be slow (it is run up to %d); it can be run on its own where the wait is acceptable.",
		name, total, limit)})
}

// setHeadline picks the paired score test and score interval, reusing the
// results already in the lists (they are always in scope).
func (a *Analysis) setHeadline(c Counts, ivConf Confidence, h Hypothesis) error {
	if i := slices.IndexFunc(a.DifferenceIntervals, func(iv Interval) bool { return iv.Method == HeadlineIntervalKey }); i >= 0 {
		a.Interval = a.DifferenceIntervals[i]
	} else {
		im, err := LookupInterval(HeadlineIntervalKey)
		if err != nil {
			return fmt.Errorf("headline interval: %w", err)
		}
		a.Interval = im.IntervalAt(c, ivConf)
	}
	if i := slices.IndexFunc(a.Tests, func(t TestResult) bool { return t.Method == HeadlineTestKey }); i >= 0 {
		a.Test = a.Tests[i]
		return nil
	}
	tm, err := LookupTest(HeadlineTestKey)
	if err != nil {
		return fmt.Errorf("headline test: %w", err)
	}
	a.Test = tm.Run(c, h)
	return nil
}

// dataWarnings flags small expected counts and zero cells.
func dataWarnings(c Comparison, scope MethodScope) []Warning {
	var w []Warning
	n1, n2 := float64(c.First.Trials), float64(c.Second.Trials)
	pooled := float64(c.First.Events+c.Second.Events) / (n1 + n2)
	minExp := math.Min(math.Min(n1*pooled, n1*(1-pooled)), math.Min(n2*pooled, n2*(1-pooled)))
	if minExp < smallExpected {
		w = append(w, Warning{Code: WarnSmallExpected, Message: fmt.Sprintf(
			"The smallest expected count under equal rates is %.2g (below %d): the asymptotic tests and the Wald intervals "+
				"may be inaccurate here. Prefer the exact tests and check the coverage of the intervals for this design.%s",
			minExp, smallExpected, exactAdvice(scope))})
	}
	var zeros []string
	for _, g := range []Group{c.First, c.Second} {
		if g.Events == 0 {
			zeros = append(zeros, fmt.Sprintf("no %s in %s", c.Event, g.Label))
		}
		if g.Events == g.Trials {
			zeros = append(zeros, fmt.Sprintf("every unit %s in %s", c.Event, g.Label))
		}
	}
	if len(zeros) > 0 {
		w = append(w, Warning{Code: WarnZeroCell, Message: fmt.Sprintf(
			"The table has a zero cell (%s): Wald-type intervals collapse or misbehave there and a ratio or odds ratio "+
				"may be infinite; the score intervals remain usable.", joinPlain(zeros))})
	}
	return w
}

// exactAdvice tells a reader of a sparse table how to add the costly exact
// methods when the analysis's scope left them out.
func exactAdvice(scope MethodScope) string {
	if scope == ScopeAll {
		return ""
	}
	return " Barnard's and Boschloo's tests and the exact unconditional intervals were not run in this analysis;" +
		" an analysis with every method (scope \"all\") adds them."
}

func joinPlain(parts []string) string {
	switch len(parts) {
	case 0:
		return ""
	case 1:
		return parts[0]
	}
	out := parts[0]
	for _, p := range parts[1 : len(parts)-1] {
		out += ", " + p
	}
	return out + " and " + parts[len(parts)-1]
}
