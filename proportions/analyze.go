package proportions

import (
	"fmt"
	"math"
)

// The headline pair of the default analysis. Mee's score interval is the
// set of differences δ that the Farrington–Manning score test does not
// reject, so the interval excludes the null exactly when the test rejects;
// at δ = 0 that test is the pooled z test, whose square is Pearson's
// chi-square.
const (
	HeadlineIntervalKey = "mee"
	HeadlineTestKey     = "score"
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
// difference (and for the ratio and odds ratio), every registered test of
// H0: π1 − π2 = δ that applies, the headline score test with the score
// interval that inverts it, a plain-language conclusion, warnings and the
// standing caution.
//
// It reads the settings Level (default 0.95), Null (δ, default 0),
// Alternative (default two-sided), ContinuityCorrection (adds Yates' test)
// and SkipExact (WithExactMethods(false) leaves out the exact methods). Tests use α = 1 − Level. For a one-sided alternative the headline
// interval is the two-sided interval at level 1 − 2α, whose limit on the
// alternative's side is the one-sided 1 − α confidence bound; so with a
// one-sided test at 2.5% (Level 0.975) the familiar 95% interval is
// reported, and it excludes δ on the alternative's side exactly when the
// test rejects. Methods slower than their SizeLimit at this sample size
// are skipped with a warning.
func Analyze(c Comparison, opts ...Option) (Analysis, error) {
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
		Comparison: c, Level: s.Level, Null: null, Alternative: s.Alternative,
		Difference: Difference.Estimate(counts), Caution: Caution,
	}
	a.Groups[0] = groupEstimate(c.First, ivConf)
	a.Groups[1] = groupEstimate(c.Second, ivConf)
	total := counts.N1 + counts.N2
	a.Intervals = a.intervalsOf(IntervalMethods(Difference), counts, ivConf, total, s.SkipExact)
	if !s.SkipExact {
		a.Intervals = append(a.Intervals, a.intervalsOf(SlowIntervalMethods(Difference), counts, ivConf, total, false)...)
	}
	a.Ratios = a.intervalsOf(IntervalMethods(Ratio), counts, ivConf, total, s.SkipExact)
	a.OddsRatios = a.intervalsOf(IntervalMethods(OddsRatio), counts, ivConf, total, s.SkipExact)
	h := Hypothesis{Null: null, Alternative: s.Alternative, Conf: conf}
	a.Tests = a.testsOf(counts, h, s, total)
	if err := a.setHeadline(counts, ivConf, h); err != nil {
		return Analysis{}, err
	}
	a.Warnings = append(a.Warnings, dataWarnings(c)...)
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
		return test, test, fmt.Errorf("level %v with a one-sided alternative: %w; one-sided tests need a level above 0.5 (a one-sided α below 0.5)", s.Level, ErrLevel)
	}
	return test, intervals, nil
}

func groupEstimate(g Group, conf Confidence) GroupEstimate {
	ge := GroupEstimate{Group: g, Proportion: g.Proportion()}
	for _, m := range proportionMethods {
		ge.Intervals = append(ge.Intervals, m.IntervalAt(g.Events, g.Trials, conf))
	}
	return ge
}

func (a *Analysis) intervalsOf(methods []IntervalMethod, c Counts, conf Confidence, total int64, skipExact bool) []Interval {
	var out []Interval
	for _, m := range methods {
		if skipExact && (m.Exact || m.SizeLimit > 0) {
			continue
		}
		if m.SizeLimit > 0 && total > m.SizeLimit {
			a.skip(m.Name, m.SizeLimit, total)
			continue
		}
		out = append(out, m.IntervalAt(c, conf))
	}
	return out
}

func (a *Analysis) testsOf(c Counts, h Hypothesis, s Settings, total int64) []TestResult {
	var out []TestResult
	for _, m := range Tests() {
		if m.Family != Difference || (!m.Margins && h.Null != 0) || (m.ContinuityCorrected && !s.ContinuityCorrection) || (s.SkipExact && (m.Exact || m.SizeLimit > 0)) {
			continue
		}
		if m.SizeLimit > 0 && total > m.SizeLimit {
			a.skip(m.Name, m.SizeLimit, total)
			continue
		}
		out = append(out, m.Run(c, h))
	}
	return out
}

func (a *Analysis) skip(name string, limit, total int64) {
	a.Warnings = append(a.Warnings, Warning{Code: WarnSkipped, Message: fmt.Sprintf(
		"%s was not computed: with %d units in all it would be slow (it is run up to %d); call it directly if you need it.",
		name, total, limit)})
}

// setHeadline picks the paired score test and score interval.
func (a *Analysis) setHeadline(c Counts, ivConf Confidence, h Hypothesis) error {
	im, err := LookupInterval(HeadlineIntervalKey)
	if err != nil {
		return fmt.Errorf("headline interval: %w", err)
	}
	tm, err := LookupTest(HeadlineTestKey)
	if err != nil {
		return fmt.Errorf("headline test: %w", err)
	}
	a.Interval = im.IntervalAt(c, ivConf)
	a.Test = tm.Run(c, h)
	return nil
}

// dataWarnings flags small expected counts and zero cells.
func dataWarnings(c Comparison) []Warning {
	var w []Warning
	n1, n2 := float64(c.First.Trials), float64(c.Second.Trials)
	pooled := float64(c.First.Events+c.Second.Events) / (n1 + n2)
	minExp := math.Min(math.Min(n1*pooled, n1*(1-pooled)), math.Min(n2*pooled, n2*(1-pooled)))
	if minExp < smallExpected {
		w = append(w, Warning{Code: WarnSmallExpected, Message: fmt.Sprintf(
			"The smallest expected count under equal rates is %.2g (below %d): the asymptotic tests and the Wald intervals "+
				"may be inaccurate here. Prefer the exact tests and check the coverage of the intervals for this design.",
			minExp, smallExpected)})
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
