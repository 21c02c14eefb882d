package proportions

import (
	"encoding/json"

	"github.com/propscope/propscope/internal/jsonlist"
)

// GroupEstimate is one group's data and its proportion with intervals from
// every registered single-proportion method (Wilson first).
type GroupEstimate struct {
	Group     Group      `json:"group"`
	Rate      float64    `json:"rate"`
	Intervals []Interval `json:"intervals"`
}

// Warning is a caution attached to an analysis. Code is a stable
// machine-readable key (listed with the constants below); Message is plain
// language for the reader.
type Warning struct {
	Code    string `json:"code"`
	Message string `json:"message"`
}

// Warning codes.
const (
	// WarnSmallExpected: an expected cell count under the null is below 5,
	// so asymptotic tests and intervals may mislead; exact methods are advised.
	WarnSmallExpected = "small-expected-counts"
	// WarnZeroCell: a cell of the 2×2 table is zero.
	WarnZeroCell = "zero-cell"
	// WarnUndercoverage: a method's exact coverage at this design falls
	// below the nominal level by more than the tolerance.
	WarnUndercoverage = "undercoverage"
	// WarnSkipped: a registered method was not run because the data exceed
	// its TrialLimit or its cost guard, or (Yates' test, asked for with
	// WithYatesTest) because it tests a difference of 0 only and the
	// analysis tests another null.
	WarnSkipped = "method-skipped"
)

// Analysis is the default analysis of a comparison: what the one-call
// [Analyze] returns and what the notebook's result card renders. Its JSON
// field names are stable.
type Analysis struct {
	Comparison Comparison `json:"comparison"`
	Level      float64    `json:"level"`
	// Null and Alternative are the hypothesis about π1 − π2 that was tested.
	Null        float64     `json:"null"`
	Alternative Alternative `json:"alternative"`
	// Scope is the method scope the analysis ran with ("quick", "all" or
	// "large-sample"): which registered methods it includes.
	Scope MethodScope `json:"scope"`
	// Omitted lists the keys of the registered methods that apply but that
	// the scope left out (see MethodScope), so a reader knows what else
	// could be run; methods skipped for the size of the data are named in
	// Warnings instead.
	Omitted []string `json:"omitted"`
	// Groups holds the two groups' estimates, first then second.
	Groups [2]GroupEstimate `json:"groups"`
	// Difference is p1 − p2.
	Difference float64 `json:"difference"`
	// Interval is the headline interval for π1 − π2, the one that inverts
	// Test (so it excludes Null exactly when Test rejects).
	Interval Interval `json:"interval"`
	// Test is the headline test, paired with Interval.
	Test TestResult `json:"test"`
	// Tests are every registered test on the difference scale that applies.
	Tests []TestResult `json:"tests"`
	// DifferenceIntervals are every registered interval method for the difference.
	DifferenceIntervals []Interval `json:"difference_intervals"`
	// RatioIntervals and OddsRatios hold every registered ratio and odds-ratio
	// interval (empty until those methods are registered).
	RatioIntervals     []Interval `json:"ratio_intervals"`
	OddsRatioIntervals []Interval `json:"odds_ratio_intervals"`
	// Conclusion is a plain-language reading of the headline result. It
	// never reads a non-rejection as evidence of equality.
	Conclusion string    `json:"conclusion"`
	Warnings   []Warning `json:"warnings"`
	// Caution is the standing reminder that statistical significance is not
	// practical importance and that health or safety decisions follow the
	// applicable regulations and a qualified statistician.
	Caution string `json:"caution"`
}

// MarshalJSON writes the analysis with every list present: an empty list is
// [] (never null), whether the analysis came from Analyze or was built by hand.
func (a Analysis) MarshalJSON() ([]byte, error) {
	type plain Analysis // without this method
	p := plain(a)
	p.Omitted = jsonlist.NonNil(p.Omitted)
	for i := range p.Groups {
		p.Groups[i].Intervals = jsonlist.NonNil(p.Groups[i].Intervals)
	}
	p.Tests = jsonlist.NonNil(p.Tests)
	p.DifferenceIntervals = jsonlist.NonNil(p.DifferenceIntervals)
	p.RatioIntervals = jsonlist.NonNil(p.RatioIntervals)
	p.OddsRatioIntervals = jsonlist.NonNil(p.OddsRatioIntervals)
	p.Warnings = jsonlist.NonNil(p.Warnings)
	return json.Marshal(p)
}
