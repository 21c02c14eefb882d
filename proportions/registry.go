package proportions

import (
	"fmt"
	"math"
	"slices"
)

// IntervalMethod is a published interval method for a two-group parameter
// (difference, ratio or odds ratio): a named value that knows its family,
// its citation and how to compute its raw limits from counts.
//
// Adding a method is one file holding its value and limits function, one
// line in the family's list below, and its tests; tables, cards, charts and
// coverage maps iterate over the registry and pick it up.
type IntervalMethod struct {
	// Key is the stable identifier used in JSON and lookups ("wald", "mee").
	Key string `json:"key"`
	// Name is the published name shown to users.
	Name string `json:"name"`
	// Family is the parameter the interval is for.
	Family Family `json:"family"`
	// Citation names the paper (authors, year, journal).
	Citation string `json:"citation"`
	// Definition states the method's formula in one or two sentences.
	Definition string `json:"definition"`
	// Exact marks methods whose coverage is guaranteed by construction
	// (exact or conservative); they can be slow.
	Exact bool `json:"exact"`
	// SizeLimit is the largest total n1 + n2 at which the method runs in
	// about a second or less; 0 means no limit. Analyze skips a method above
	// its limit and says so in a warning instead of hanging.
	SizeLimit int64 `json:"size_limit,omitempty"`
	// Symmetric declares that the method treats the two groups alike and
	// events and non-events alike: exchanging the groups (x1, n1) and
	// (x2, n2), or counting non-events in both groups (difference and odds
	// ratio only), turns the interval (L, U) into its mirror image, (−U, −L)
	// for the difference and (1/U, 1/L) for the ratio and the odds ratio.
	// The exact coverage engine (proportions/operating) then computes one
	// outcome of each mirror set, up to 4 times fewer; its tests check the
	// claim for every registered method.
	Symmetric bool `json:"symmetric,omitempty"`
	// Limits computes the raw (unclipped) limits for valid counts at the
	// given confidence. It must not allocate and must never return NaN:
	// it is called for every outcome of a design by the coverage engine.
	Limits func(c Counts, conf Confidence) (lower, upper float64) `json:"-"`
	// PointEstimate, when set, is the estimate the method reports in place
	// of Family.Estimate (the conditional odds-ratio methods report the
	// conditional maximum-likelihood estimate); NaN means not estimable.
	PointEstimate func(c Counts) float64 `json:"-"`
}

// Interval validates the counts and the level, computes the limits and
// applies the library's limit rule (see Interval).
func (m IntervalMethod) Interval(c Counts, level float64) (Interval, error) {
	if err := c.Validate(); err != nil {
		return Interval{}, err
	}
	conf, err := NewConfidence(level)
	if err != nil {
		return Interval{}, err
	}
	return m.IntervalAt(c, conf), nil
}

// IntervalAt is Interval for counts and confidence already validated.
func (m IntervalMethod) IntervalAt(c Counts, conf Confidence) Interval {
	rawLo, rawHi := m.Limits(c, conf)
	lo, hi, clipped := clip(m.Family, rawLo, rawHi)
	est := m.Family.Estimate(c)
	if m.PointEstimate != nil {
		est = m.PointEstimate(c)
	}
	return Interval{
		Method: m.Key, Name: m.Name, Family: m.Family, Level: conf.Level,
		Estimate: est, Defined: !math.IsNaN(est),
		Lower: lo, Upper: hi, RawLower: rawLo, RawUpper: rawHi, Clipped: clipped,
	}
}

// ProportionMethod is a published interval method for one group's
// proportion π, from x events out of n trials.
type ProportionMethod struct {
	Key        string `json:"key"`
	Name       string `json:"name"`
	Citation   string `json:"citation"`
	Definition string `json:"definition"`
	// Limits computes the raw limits for 0 ≤ x ≤ n, n > 0.
	Limits func(x, n int64, conf Confidence) (lower, upper float64) `json:"-"`
}

// Interval computes the interval for one group, validating its counts.
func (m ProportionMethod) Interval(x, n int64, level float64) (Interval, error) {
	if err := validateGroup("the", x, n); err != nil {
		return Interval{}, err
	}
	conf, err := NewConfidence(level)
	if err != nil {
		return Interval{}, err
	}
	return m.IntervalAt(x, n, conf), nil
}

// IntervalAt is Interval for counts and confidence already validated.
func (m ProportionMethod) IntervalAt(x, n int64, conf Confidence) Interval {
	rawLo, rawHi := m.Limits(x, n, conf)
	lo, hi, clipped := clip(Proportion, rawLo, rawHi)
	return Interval{
		Method: m.Key, Name: m.Name, Family: Proportion, Level: conf.Level,
		Estimate: float64(x) / float64(n), Defined: true,
		Lower: lo, Upper: hi, RawLower: rawLo, RawUpper: rawHi, Clipped: clipped,
	}
}

// The registry: one list per family. Each list is owned by the file group
// that implements its methods; order is the order of display.
var (
	differenceMethods = []IntervalMethod{
		Wald,
		WaldCC,
		AgrestiCaffo,
		Newcombe,
		NewcombeCC,
		Mee,
		MiettinenNurminen,
	}
	// slowDifferenceMethods are exact intervals that cost milliseconds to
	// seconds each: Analyze, result cards and lookups include them (up to
	// their SizeLimit), but the coverage engine, which calls a method for
	// every outcome of a design, does not offer them (it can still take one
	// directly for a tiny design).
	slowDifferenceMethods = []IntervalMethod{ChanZhang, AgrestiMin}
	ratioMethods          = []IntervalMethod{
		Katz, KatzZeroAdjusted, Koopman, MiettinenNurminenRatio,
	}
	oddsRatioMethods = []IntervalMethod{
		Woolf, GartAdjusted, MiettinenNurminenOddsRatio, CornfieldExact, CornfieldMidP, BaptistaPike,
	}
	proportionMethods = []ProportionMethod{Wilson, WilsonCC, ClopperPearson, Jeffreys}
	// Tests: asymptotic tests on the difference, exact tests, and tests on
	// the ratio and odds-ratio scales.
	asymptoticTests = []TestMethod{
		FarringtonManning, MiettinenNurminenTest, PearsonChiSquare, Yates, LikelihoodRatio,
	}
	exactTests = []TestMethod{
		Fisher, FisherMidP, Barnard, BarnardWald, Boschloo, BoschlooDoubled,
	}
	ratioTests = []TestMethod{
		FarringtonManningRatio, MiettinenNurminenRatioTest, MiettinenNurminenOddsRatioTest,
	}
)

// IntervalMethods returns the registered interval methods of a family that
// are fast enough to be computed for every outcome of a design, in display
// order. The slice is a fresh copy. SlowIntervalMethods lists the others.
func IntervalMethods(f Family) []IntervalMethod {
	switch f {
	case Difference:
		return slices.Clone(differenceMethods)
	case Ratio:
		return slices.Clone(ratioMethods)
	case OddsRatio:
		return slices.Clone(oddsRatioMethods)
	}
	return nil
}

// SlowIntervalMethods returns the registered exact interval methods of a
// family that take milliseconds to seconds per table (the exact
// unconditional intervals for the difference). Analyze includes them up to
// their SizeLimit; the coverage engine does not enumerate them.
func SlowIntervalMethods(f Family) []IntervalMethod {
	if f == Difference {
		return slices.Clone(slowDifferenceMethods)
	}
	return nil
}

// AllIntervalMethods returns every registered two-group interval method
// that is fast enough for enumeration (see SlowIntervalMethods for the rest).
func AllIntervalMethods() []IntervalMethod {
	return slices.Concat(differenceMethods, ratioMethods, oddsRatioMethods)
}

// ProportionMethods returns the registered single-proportion methods.
func ProportionMethods() []ProportionMethod { return slices.Clone(proportionMethods) }

// Tests returns every registered test, asymptotic first.
func Tests() []TestMethod { return slices.Concat(asymptoticTests, exactTests, ratioTests) }

// LookupInterval finds a two-group interval method by key.
func LookupInterval(key string) (IntervalMethod, error) {
	for _, m := range slices.Concat(AllIntervalMethods(), slowDifferenceMethods) {
		if m.Key == key {
			return m, nil
		}
	}
	return IntervalMethod{}, fmt.Errorf("interval method %q: %w; known keys: %v", key, ErrUnknownMethod, intervalKeys())
}

// LookupProportion finds a single-proportion method by key.
func LookupProportion(key string) (ProportionMethod, error) {
	for _, m := range proportionMethods {
		if m.Key == key {
			return m, nil
		}
	}
	keys := make([]string, 0, len(proportionMethods))
	for _, m := range proportionMethods {
		keys = append(keys, m.Key)
	}
	return ProportionMethod{}, fmt.Errorf("proportion method %q: %w; known keys: %v", key, ErrUnknownMethod, keys)
}

// LookupTest finds a test by key.
func LookupTest(key string) (TestMethod, error) {
	tests := Tests()
	for _, t := range tests {
		if t.Key == key {
			return t, nil
		}
	}
	keys := make([]string, 0, len(tests))
	for _, t := range tests {
		keys = append(keys, t.Key)
	}
	return TestMethod{}, fmt.Errorf("test %q: %w; known keys: %v", key, ErrUnknownMethod, keys)
}

func intervalKeys() []string {
	all := slices.Concat(AllIntervalMethods(), slowDifferenceMethods)
	keys := make([]string, 0, len(all))
	for _, m := range all {
		keys = append(keys, m.Key)
	}
	return keys
}
