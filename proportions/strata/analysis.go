// Package strata is the stratified analysis of a breakdown: several 2×2
// tables (one per block, tray or site) and one question, whether the
// first group's rate differs from the second's once the strata are
// allowed their own base rates. It gives the Cochran–Mantel–Haenszel and
// exact conditional tests of no association, the Mantel–Haenszel common
// estimates of the difference, ratio and odds ratio with their intervals,
// Miettinen and Nurminen's stratified score interval for the difference,
// the exact conditional interval for the common odds ratio, tests of
// homogeneity (Breslow–Day with Tarone's correction, Cochran's Q), and the
// crude analysis of the pooled counts beside them, with warnings when the
// two disagree. [Analyze] runs everything and returns an [Analysis].
package strata

import (
	"context"
	"encoding/json"
	"fmt"
	"math"

	"github.com/propscope/propscope/internal/jsonlist"
	"github.com/propscope/propscope/proportions"
)

// Warning codes of a stratified analysis, beside proportions'
// WarnSmallExpected and WarnSkipped.
const (
	// WarnReversal: the pooled (crude) difference and the stratified one
	// point in opposite directions; the strata confound the comparison.
	WarnReversal = "reversal"
	// WarnCrudeDiffers: the crude difference lies outside the stratified
	// interval (without a reversal): the strata confound the comparison.
	WarnCrudeDiffers = "crude-differs"
	// WarnNotHomogeneous: a homogeneity test rejects at the analysis's
	// level, so one common effect hides differences between strata.
	WarnNotHomogeneous = "not-homogeneous"
	// WarnEmptyRows: some rows have a group with no trials; they are kept
	// in the strata list, counted in the crude analysis and left out of
	// every stratified method.
	WarnEmptyRows = "empty-rows"
)

// Stratum is one row of the breakdown as the stratified analysis sees it:
// its counts, whether the stratified methods used it, its own difference
// p1 − p2 with the single-table headline interval (proportions.Mee), its
// sample odds ratio and its share of the Mantel–Haenszel weight n1·n2/n.
// For an unused row (a group with no trials) the figures are NaN (null in
// JSON) and the weight 0.
type Stratum struct {
	Value      string             `json:"value"`      // the breakdown column's value
	Counts     proportions.Counts `json:"counts"`     // the stratum's 2×2 counts
	Used       bool               `json:"used"`       // both groups have units, so the methods used it
	Difference float64            `json:"difference"` // p1 − p2
	Lower      float64            `json:"lower"`      // Mee's lower limit for this stratum alone
	Upper      float64            `json:"upper"`      // Mee's upper limit for this stratum alone
	OddsRatio  float64            `json:"odds_ratio"` // the sample odds ratio ad/(bc)
	Weight     float64            `json:"weight"`     // share of Σ n1·n2/n over the used strata
}

// MarshalJSON writes NaN as null and ±Inf as strings.
func (s Stratum) MarshalJSON() ([]byte, error) {
	type plain Stratum
	f := func(v float64) proportions.JSONFloat { return proportions.JSONFloat(v) }
	return json.Marshal(struct {
		plain
		Difference proportions.JSONFloat `json:"difference"`
		Lower      proportions.JSONFloat `json:"lower"`
		Upper      proportions.JSONFloat `json:"upper"`
		OddsRatio  proportions.JSONFloat `json:"odds_ratio"`
	}{plain(s), f(s.Difference), f(s.Lower), f(s.Upper), f(s.OddsRatio)})
}

// Analysis is the stratified analysis of a breakdown, what [Analyze]
// returns and the stratified card renders. Its JSON field names are
// stable.
type Analysis struct {
	Breakdown   proportions.Breakdown   `json:"breakdown"`   // the data analysed
	Level       float64                 `json:"level"`       // the confidence level; tests use α = 1 − Level
	Alternative proportions.Alternative `json:"alternative"` // of the tests of no association
	// Strata are the rows of the breakdown in their order, each with its
	// own estimate.
	Strata []Stratum `json:"strata"`
	// Interval is the headline common difference: the Mantel–Haenszel
	// difference with the stratified Miettinen–Nurminen score interval,
	// which excludes 0 exactly when the uncorrected
	// Cochran–Mantel–Haenszel test (Test) rejects two-sided.
	Interval Estimate `json:"interval"`
	Test     Test     `json:"test"` // the headline test, paired with Interval
	// Tests are the tests of no association: Cochran–Mantel–Haenszel
	// without and with continuity correction, and the exact conditional
	// test when its cost allows.
	Tests []Test `json:"tests"`
	// Estimates are every common estimate: the difference (score interval,
	// Sato and Greenland–Robins variances), the ratio and the odds ratio
	// (Mantel–Haenszel, and exact conditional when its cost allows).
	Estimates []Estimate `json:"estimates"`
	// Homogeneity holds the tests of the same effect in every stratum that
	// could be computed (see Notes for those that could not).
	Homogeneity []Test `json:"homogeneity"`
	// Crude is the analysis of the counts pooled over every row, ignoring
	// the breakdown.
	Crude proportions.Analysis `json:"crude"`
	// Conclusion reads the headline result and the crude one in plain words.
	Conclusion string                `json:"conclusion"`
	Notes      []string              `json:"notes"`    // what was left out and why
	Warnings   []proportions.Warning `json:"warnings"` // codes: the Warn... constants, WarnSmallExpected, WarnSkipped
	// Caution is proportions.Caution.
	Caution string `json:"caution"`
}

// MarshalJSON writes every list as a list, never null.
func (a Analysis) MarshalJSON() ([]byte, error) {
	type plain Analysis
	p := plain(a)
	p.Strata = jsonlist.NonNil(p.Strata)
	p.Tests = jsonlist.NonNil(p.Tests)
	p.Estimates = jsonlist.NonNil(p.Estimates)
	p.Homogeneity = jsonlist.NonNil(p.Homogeneity)
	p.Notes = jsonlist.NonNil(p.Notes)
	p.Warnings = jsonlist.NonNil(p.Warnings)
	p.Breakdown.Rows = jsonlist.NonNil(p.Breakdown.Rows)
	return json.Marshal(p)
}

// Used returns the number of strata the stratified methods used.
func (a Analysis) Used() int {
	n := 0
	for _, s := range a.Strata {
		if s.Used {
			n++
		}
	}
	return n
}

// Analyze runs the stratified analysis of a breakdown. It reads the
// settings Level (default 0.95), Alternative (default two-sided; the tests
// of no association follow it, the homogeneity tests are two-sided) and
// Scope (ScopeLargeSample leaves out the exact conditional methods); a
// one-sided alternative reports the intervals at level 1 − 2α, as
// proportions.Analyze does. The null is no association: a WithNull other
// than 0 is refused with an error wrapping ErrUnsupported. The crude
// analysis is proportions.Analyze of Breakdown.Crude with the same
// options. Rows with a group without trials are kept, flagged and left
// out of the stratified methods; a breakdown with no row that has both
// groups is refused with an error wrapping ErrNoTrials, and one filled in
// by hand is checked as NewBreakdown checks it (its errors). Analyze is
// AnalyzeContext with context.Background().
func Analyze(b proportions.Breakdown, opts ...proportions.Option) (Analysis, error) {
	return AnalyzeContext(context.Background(), b, opts...)
}

// AnalyzeContext is Analyze with cancellation: the exact conditional
// methods convolve one distribution per stratum, which can take seconds
// for large strata; they look at ctx inside the convolution. Their cost
// (see ExactCost) is estimated first; above proportions.AnalysisCost (above
// proportions.MaxCost with WithScope(ScopeAll)) they are left out with a
// warning (code proportions.WarnSkipped).
func AnalyzeContext(ctx context.Context, b proportions.Breakdown, opts ...proportions.Option) (Analysis, error) {
	s, conf, ivConf, err := settings(opts)
	if err != nil {
		return Analysis{}, err
	}
	if len(b.Rows) == 0 {
		return Analysis{}, fmt.Errorf("stratified analysis: %w; the breakdown has no rows (build it with proportions.NewBreakdown)", proportions.ErrEmptyInput)
	}
	// a breakdown filled in by hand skipped NewBreakdown's checks, and
	// negative counts or more events than trials gave wrong answers silently
	if _, err := proportions.NewBreakdown(b.By, b.Labels(), b.Rows); err != nil {
		return Analysis{}, fmt.Errorf("stratified analysis: %w", err)
	}
	ts := usable(b)
	if len(ts) == 0 {
		return Analysis{}, fmt.Errorf("stratified analysis by %s: %w in both groups in any row; at least one %s needs units of both %s and %s",
			b.By, proportions.ErrNoTrials, b.By, b.First, b.Second)
	}
	crude, err := b.Crude()
	if err != nil {
		return Analysis{}, err
	}
	a := Analysis{Breakdown: b, Level: s.Level, Alternative: s.Alternative, Caution: proportions.Caution}
	if a.Crude, err = proportions.AnalyzeContext(ctx, crude, opts...); err != nil {
		return Analysis{}, err
	}
	if a.Strata, err = strataRows(ctx, b, ts, ivConf); err != nil {
		return Analysis{}, err
	}
	a.Test = cochranMantelHaenszel(ts, s.Alternative, false)
	a.Test.decide(s.Level)
	corrected := cochranMantelHaenszel(ts, s.Alternative, true)
	corrected.decide(s.Level)
	a.Tests = []Test{a.Test, corrected}
	if a.Interval, err = stratifiedScore(ctx, ts, ivConf); err != nil {
		return Analysis{}, err
	}
	if err := ctx.Err(); err != nil {
		return Analysis{}, err
	}
	or := mhOddsRatio(ts, ivConf)
	a.Estimates = []Estimate{a.Interval, satoDifference(ts, ivConf), greenlandRobinsDifference(ts, ivConf), mhRatio(ts, ivConf), or}
	if err := a.addExact(ctx, ts, s, conf, ivConf, or.Estimate); err != nil {
		return Analysis{}, err
	}
	// each step below passes over every stratum once (tens of
	// milliseconds at 10⁵ strata): a cancel is seen between them
	if err := ctx.Err(); err != nil {
		return Analysis{}, err
	}
	a.addHomogeneity(ts, or.Estimate)
	if err := ctx.Err(); err != nil {
		return Analysis{}, err
	}
	a.addWarnings(ts)
	a.Conclusion = conclusion(a)
	return a, nil
}

// settings reads and checks the options: the tests' confidence and the
// intervals' (1 − 2α for a one-sided alternative).
func settings(opts []proportions.Option) (s proportions.Settings, conf, ivConf proportions.Confidence, err error) {
	if s, err = proportions.NewSettings(opts...); err != nil {
		return s, conf, ivConf, err
	}
	if null := s.NullFor(proportions.Difference); null != 0 {
		return s, conf, ivConf, fmt.Errorf("stratified analysis with null %v: %w; the stratified tests are of no association (null 0)", null, proportions.ErrUnsupported)
	}
	if conf, err = proportions.NewConfidence(s.Level); err != nil {
		return s, conf, ivConf, err
	}
	ivConf = conf
	if s.Alternative != proportions.TwoSided {
		if ivConf, err = proportions.NewConfidence(2*s.Level - 1); err != nil {
			return s, conf, ivConf, fmt.Errorf("level %v with a one-sided alternative: %w; the intervals' level 1 − 2α must stay above %g",
				s.Level, proportions.ErrLevel, proportions.MinLevel)
		}
	}
	return s, conf, ivConf, nil
}

// strataRows returns one Stratum per row of b, used or not, or ctx's error
// (it looks every strataPerCheck rows: a score interval per row).
func strataRows(ctx context.Context, b proportions.Breakdown, ts []table, conf proportions.Confidence) ([]Stratum, error) {
	total := sum(ts, table.weight)
	out := make([]Stratum, len(b.Rows))
	for i, r := range b.Rows {
		if i%strataPerCheck == strataPerCheck-1 {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
		}
		s := Stratum{Value: r.Value, Counts: r.Counts, Difference: math.NaN(), Lower: math.NaN(), Upper: math.NaN(), OddsRatio: math.NaN()}
		if !r.Empty() {
			t := newTable(r.Value, r.Counts)
			iv := proportions.Mee.IntervalAt(r.Counts, conf)
			s.Used, s.Difference, s.Lower, s.Upper = true, t.difference(), iv.Lower, iv.Upper
			s.OddsRatio = proportions.OddsRatio.Estimate(r.Counts)
			s.Weight = t.weight() / total
		}
		out[i] = s
	}
	return out, nil
}

// addExact runs the exact conditional test and interval unless the scope
// leaves them out or their cost exceeds the analysis guard.
func (a *Analysis) addExact(ctx context.Context, ts []table, s proportions.Settings, conf, ivConf proportions.Confidence, start float64) error {
	if s.Scope == proportions.ScopeLargeSample {
		a.Notes = append(a.Notes, "The exact conditional test and interval were left out (large-sample scope).")
		return nil
	}
	guard := proportions.AnalysisCost
	if s.Scope == proportions.ScopeAll {
		guard = proportions.MaxCost // every method asked for: up to the guard of a direct call
	}
	t, e, err := exactMethods(ctx, ts, s.Alternative, ivConf, s.Level, math.Log(start), guard)
	switch {
	case err == nil:
		a.Tests = append(a.Tests, t)
		a.Estimates = append(a.Estimates, e)
		return nil
	case ctx.Err() != nil:
		return err
	}
	a.Warnings = append(a.Warnings, proportions.Warning{Code: proportions.WarnSkipped, Message: "The exact conditional methods were not run: " + err.Error() + "."})
	return nil
}

// addHomogeneity runs the homogeneity tests that can be computed and notes
// the others.
func (a *Analysis) addHomogeneity(ts []table, psi float64) {
	if len(ts) < 2 {
		a.Notes = append(a.Notes, fmt.Sprintf("Only one %s has both groups: homogeneity cannot be tested.", a.Breakdown.By))
		return
	}
	if t, ok := breslowDayTarone(ts, psi, a.Level); ok {
		a.Homogeneity = append(a.Homogeneity, t)
	} else {
		a.Notes = append(a.Notes, fmt.Sprintf("The Breslow–Day test was not computed: it needs a finite, non-zero common odds ratio and two %s values with both %s and no %s.",
			a.Breakdown.By, a.Breakdown.Event, a.Breakdown.Event))
	}
	t, skipped, ok := cochranQ(ts, a.Level)
	if ok {
		a.Homogeneity = append(a.Homogeneity, t)
	}
	if skipped > 0 {
		a.Notes = append(a.Notes, fmt.Sprintf("Cochran's Q leaves out %d %s value(s) whose rates are all 0 or all 1 (no variance to weigh them by).", skipped, a.Breakdown.By))
	}
	if !ok {
		a.Notes = append(a.Notes, "Cochran's Q was not computed: fewer than two rows have a difference with a variance.")
	}
}
