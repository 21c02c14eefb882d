package segments

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/propscope/propscope/proportions"
)

// Segment is the headline analysis of one row of a breakdown: the same
// interval and test as proportions.Analyze's (Mee's score interval and the
// Farrington–Manning score test that it inverts), computed directly on the
// counts. Numbers that a segment with an empty group does not have (rates
// of an empty group, the difference, the limits, the p-value) are NaN,
// written as null in JSON and empty in CSV.
type Segment struct {
	// Number is the row's position in the breakdown, from 1.
	Number int `json:"number"`
	// Value is the value of the breakdown column.
	Value  string             `json:"value"`
	Counts proportions.Counts `json:"counts"`
	// Empty reports a group without trials: the segment is kept, not
	// analysed, and left out of the adjustment.
	Empty bool `json:"empty"`
	// Sparse reports a smallest expected count below 5 or a group with
	// fewer trials than the minimum: the large-sample interval and test
	// may mislead here.
	Sparse bool `json:"sparse"`
	// SmallestExpected is the smallest of the four expected counts under
	// equal rates.
	SmallestExpected float64 `json:"smallest_expected"`
	// Rate1 and Rate2 are the groups' observed rates x/n.
	Rate1 float64 `json:"rate1"`
	Rate2 float64 `json:"rate2"`
	// Difference is p1 − p2.
	Difference float64 `json:"difference"`
	// Lower and Upper are the headline interval's limits (clipped to
	// [−1, 1], as in Analyze) at the summary's interval level.
	Lower float64 `json:"lower"`
	Upper float64 `json:"upper"`
	// Statistic is the score test's z and PValue its p-value, before any
	// adjustment; Reject is its decision at α = 1 − level.
	Statistic float64 `json:"statistic"`
	PValue    float64 `json:"p_value"`
	Reject    bool    `json:"reject"`
}

// Adjusted is what the adjustment adds to a segment: the adjusted p-value
// and the simultaneous interval. An empty segment has neither (NaN, null
// in JSON).
type Adjusted struct {
	Number int    `json:"number"`
	Value  string `json:"value"`
	// Adjustment and Tested say how the p-value was adjusted and over how
	// many segments (m): an adjusted p-value means nothing without them,
	// so every record carries them.
	Adjustment Adjustment `json:"adjustment"`
	Tested     int        `json:"tested"`
	// AdjustedPValue is the segment's p-value after the summary's
	// adjustment over the m tested segments.
	AdjustedPValue float64 `json:"adjusted_p_value"`
	// SimultaneousLower and SimultaneousUpper are the headline interval at
	// the summary's simultaneous level.
	SimultaneousLower float64 `json:"simultaneous_lower"`
	SimultaneousUpper float64 `json:"simultaneous_upper"`
	// Reject is the decision after adjustment: AdjustedPValue ≤ α.
	Reject bool `json:"reject"`
}

// analyzer holds what every segment's analysis shares: the two methods,
// the confidences and the hypothesis, resolved once.
type analyzer struct {
	interval  proportions.IntervalMethod
	test      proportions.TestMethod
	ivConf    proportions.Confidence
	hyp       proportions.Hypothesis
	minTrials int64
	alpha     float64
}

func newAnalyzer(s settings) (analyzer, error) {
	ps, err := proportions.NewSettings(s.analysis...)
	if err != nil {
		return analyzer{}, err
	}
	null := ps.NullFor(proportions.Difference)
	if err := proportions.ValidateNull(proportions.Difference, null); err != nil {
		return analyzer{}, err
	}
	conf, err := proportions.NewConfidence(ps.Level)
	if err != nil {
		return analyzer{}, err
	}
	ivConf := conf
	if ps.Alternative != proportions.TwoSided { // as Analyze: the two-sided interval at 1 − 2α
		if ivConf, err = proportions.NewConfidence(1 - 2*(1-ps.Level)); err != nil {
			return analyzer{}, fmt.Errorf("level %v with a one-sided alternative: %w; use a level above 0.5", ps.Level, proportions.ErrLevel)
		}
	}
	iv, err := proportions.LookupInterval(proportions.HeadlineIntervalKey)
	if err != nil {
		return analyzer{}, err
	}
	tm, err := proportions.LookupTest(proportions.HeadlineTestKey)
	if err != nil {
		return analyzer{}, err
	}
	return analyzer{interval: iv, test: tm, ivConf: ivConf, minTrials: s.minTrials, alpha: 1 - ps.Level,
		hyp: proportions.Hypothesis{Null: null, Alternative: ps.Alternative, Conf: conf}}, nil
}

// checkRow validates one row read from outside (Analyze's breakdown is
// valid already) and names it.
func checkRow(number int, r proportions.BreakdownRow) error {
	if err := r.Validate(); err != nil {
		return fmt.Errorf("segment %d (%q): %w", number, r.Value, err)
	}
	return nil
}

// checkUnique returns an error wrapping ErrDuplicateValue naming the first
// value (by position) that two rows share, as NewBreakdown does for the
// breakdowns it builds: a segment counted twice would enter the
// adjustment twice. It sorts row numbers (8 bytes a row) rather than
// filling a map of the values.
func checkUnique(by string, rows []proportions.BreakdownRow) error {
	order := make([]int, len(rows))
	for i := range order {
		order[i] = i
	}
	value := func(i int) string { return strings.TrimSpace(rows[i].Value) }
	slices.SortStableFunc(order, func(a, b int) int { return strings.Compare(value(a), value(b)) })
	first, second := -1, -1
	for k := 1; k < len(order); k++ {
		if i, j := order[k-1], order[k]; value(i) == value(j) && (first < 0 || j < second) {
			first, second = i, j
		}
	}
	if first < 0 {
		return nil
	}
	return fmt.Errorf("segments %d and %d: %q: %w; each value of %q may appear once",
		first+1, second+1, value(first), proportions.ErrDuplicateValue, by)
}

// segment analyses one valid row.
func (a *analyzer) segment(number int, r proportions.BreakdownRow) Segment {
	c := r.Counts
	nan := math.NaN()
	s := Segment{Number: number, Value: strings.TrimSpace(r.Value), Counts: c, Empty: r.Empty(),
		SmallestExpected: nan, Rate1: rate(c.X1, c.N1), Rate2: rate(c.X2, c.N2),
		Difference: nan, Lower: nan, Upper: nan, Statistic: nan, PValue: nan}
	if s.Empty {
		return s
	}
	s.SmallestExpected = smallestExpected(c)
	s.Sparse = s.SmallestExpected < 5 || min(c.N1, c.N2) < a.minTrials
	s.Difference = s.Rate1 - s.Rate2
	iv := a.interval.IntervalAt(c, a.ivConf)
	s.Lower, s.Upper = iv.Lower, iv.Upper
	t := a.test.Run(c, a.hyp)
	s.Statistic, s.PValue, s.Reject = t.Statistic, t.PValue, t.Reject
	return s
}

// simultaneous returns the headline interval's limits at conf, NaN for an
// empty row.
func (a *analyzer) simultaneous(r proportions.BreakdownRow, conf proportions.Confidence) (lo, hi float64) {
	if r.Empty() {
		return math.NaN(), math.NaN()
	}
	iv := a.interval.IntervalAt(r.Counts, conf)
	return iv.Lower, iv.Upper
}

func rate(x, n int64) float64 {
	if n == 0 {
		return math.NaN()
	}
	return float64(x) / float64(n)
}

// smallestExpected is the smallest expected cell count under equal rates,
// the same figure Analyze warns on.
func smallestExpected(c proportions.Counts) float64 {
	n1, n2 := float64(c.N1), float64(c.N2)
	pooled := float64(c.X1+c.X2) / (n1 + n2)
	return math.Min(math.Min(n1*pooled, n1*(1-pooled)), math.Min(n2*pooled, n2*(1-pooled)))
}
