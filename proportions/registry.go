package proportions

import (
	"context"
	"fmt"
	"math"
	"slices"
)

// IntervalMethod is a published interval method for a two-group parameter
// (difference, ratio or odds ratio): a named value that knows its scale,
// its citation and how to compute its raw limits from counts.
//
// Adding a method is one file holding its value and limits function, one
// line in the scale's list below, and its tests; tables, cards, charts and
// coverage maps iterate over the registry and pick it up.
type IntervalMethod struct {
	// Key is the stable identifier used in JSON and lookups ("wald", "mee").
	Key string `json:"key"`
	// Name is the published name shown to users.
	Name string `json:"name"`
	// Scale is the parameter the interval is for.
	Scale Scale `json:"scale"`
	// Citation names the paper (authors, year, journal).
	Citation string `json:"citation"`
	// Definition states the method's formula in one or two sentences.
	Definition string `json:"definition"`
	// Exact marks methods whose coverage is guaranteed by construction
	// (exact or conservative); they can be slow.
	Exact bool `json:"exact"`
	// TrialLimit is the largest total n1 + n2 at which the method runs in
	// about a second or less; 0 means no limit. Analyze skips a method above
	// its limit and says so in a warning instead of hanging.
	TrialLimit int64 `json:"trial_limit,omitempty"`
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
	// of Scale.Estimate (the conditional odds-ratio methods report the
	// conditional maximum-likelihood estimate); NaN means not estimable.
	PointEstimate func(c Counts) float64 `json:"-"`
	// Cost, set on the costly methods (those with a TrialLimit), estimates
	// what the method would do for counts before it runs (see Cost).
	// IntervalContext refuses a call above MaxCost and Analyze skips a
	// method above AnalysisCost.
	Cost func(c Counts, conf Confidence) Cost `json:"-"`
	// LimitsContext, set on the costly methods, is Limits with
	// cancellation: it returns ctx's error within a few milliseconds of ctx
	// ending. Limits stays set and is what the cheap methods have; the
	// registry keeps one value per method either way, and callers that can
	// wait long (the engine, Analyze, the cards) use LimitsContext when it
	// is set.
	LimitsContext func(ctx context.Context, c Counts, conf Confidence) (lower, upper float64, err error) `json:"-"`
}

// Interval validates the counts and the level, computes the limits and
// applies the library's limit rule (see Interval). It is IntervalContext
// with context.Background().
func (m IntervalMethod) Interval(c Counts, level float64) (Interval, error) {
	return m.IntervalContext(context.Background(), c, level)
}

// IntervalContext is Interval with cancellation and the cost guard: a
// costly method is refused with an error wrapping ErrTooLarge when its Cost
// exceeds MaxCost, and stops with ctx's error when ctx ends.
func (m IntervalMethod) IntervalContext(ctx context.Context, c Counts, level float64) (Interval, error) {
	if err := c.Validate(); err != nil {
		return Interval{}, err
	}
	conf, err := NewConfidence(level)
	if err != nil {
		return Interval{}, err
	}
	return m.intervalContext(ctx, c, conf, MaxCost)
}

// intervalContext computes the interval with ctx under a cost guard.
func (m IntervalMethod) intervalContext(ctx context.Context, c Counts, conf Confidence, guard Cost) (Interval, error) {
	if err := ctx.Err(); err != nil {
		return Interval{}, err
	}
	if m.Cost != nil {
		if err := m.Cost(c, conf).guard(fmt.Sprintf("%s at %d/%d vs %d/%d", m.Name, c.X1, c.N1, c.X2, c.N2), guard); err != nil {
			return Interval{}, err
		}
	}
	if m.LimitsContext == nil {
		return m.IntervalAt(c, conf), nil
	}
	lo, hi, err := m.LimitsContext(ctx, c, conf)
	if err != nil {
		return Interval{}, err
	}
	return m.interval(c, conf, lo, hi), nil
}

// IntervalAt is Interval for counts and confidence already validated.
func (m IntervalMethod) IntervalAt(c Counts, conf Confidence) Interval {
	rawLo, rawHi := m.Limits(c, conf)
	return m.interval(c, conf, rawLo, rawHi)
}

// interval applies the limit rule to raw limits.
func (m IntervalMethod) interval(c Counts, conf Confidence, rawLo, rawHi float64) Interval {
	lo, hi, clipped := clip(m.Scale, rawLo, rawHi)
	est := m.Scale.Estimate(c)
	if m.PointEstimate != nil {
		est = m.PointEstimate(c)
	}
	return Interval{
		Method: m.Key, MethodName: m.Name, Scale: m.Scale, Level: conf.Level,
		Estimate: est, Defined: !math.IsNaN(est),
		Lower: lo, Upper: hi, RawLower: rawLo, RawUpper: rawHi, Clipped: clipped,
	}
}

// RateMethod is a published interval method for one group's
// proportion π, from x events out of n trials.
type RateMethod struct {
	Key        string `json:"key"`
	Name       string `json:"name"`
	Citation   string `json:"citation"`
	Definition string `json:"definition"`
	// TrialLimit, as for IntervalMethod, marks a method that costs more than
	// a few microseconds per group: ScopeQuick leaves it out, and Analyze
	// skips it when the total n1 + n2 exceeds the limit. Single-rate methods
	// are left out for their cost only, never for being exact: the
	// large-sample scope keeps Clopper–Pearson beside Wilson.
	TrialLimit int64 `json:"trial_limit,omitempty"`
	// Limits computes the raw limits for 0 ≤ x ≤ n, n > 0.
	Limits func(x, n int64, conf Confidence) (lower, upper float64) `json:"-"`
}

// Interval computes the interval for one group, validating its counts.
func (m RateMethod) Interval(x, n int64, level float64) (Interval, error) {
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
func (m RateMethod) IntervalAt(x, n int64, conf Confidence) Interval {
	rawLo, rawHi := m.Limits(x, n, conf)
	lo, hi, clipped := clip(SingleRate, rawLo, rawHi)
	return Interval{
		Method: m.Key, MethodName: m.Name, Scale: SingleRate, Level: conf.Level,
		Estimate: float64(x) / float64(n), Defined: true,
		Lower: lo, Upper: hi, RawLower: rawLo, RawUpper: rawHi, Clipped: clipped,
	}
}

// The registry: one list per scale. Each list is owned by the file group
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
		Haldane,
		JeffreysPerks,
		ProfileLikelihood,
		// The profile tail-area intervals cost 0.1 ms per table at 100
		// per group and 3 ms at 10⁴: they carry a TrialLimit, so the default
		// analysis leaves them out, but the coverage engine enumerates
		// them like the rest.
		ProfileExactTails,
		ProfileMidPTails,
	}
	// slowDifferenceMethods are exact intervals that cost milliseconds to
	// seconds each: Analyze, result cards and lookups include them (up to
	// their TrialLimit), but the coverage engine, which calls a method for
	// every outcome of a design, does not offer them (it can still take one
	// directly for a tiny design).
	slowDifferenceMethods = []IntervalMethod{ChanZhang, AgrestiMin}
	ratioMethods          = []IntervalMethod{
		Katz, KatzZeroAdjusted, Koopman, MiettinenNurminenRatio,
	}
	oddsRatioMethods = []IntervalMethod{
		Woolf, GartAdjusted, MiettinenNurminenOddsRatio, CornfieldExact, CornfieldMidP, BaptistaPike,
	}
	proportionMethods = []RateMethod{Wilson, WilsonCC, ClopperPearson, Jeffreys, MidPRate, LikelihoodRate}
	// Tests: asymptotic tests on the difference, exact tests, and tests on
	// the ratio and odds-ratio scales.
	asymptoticTests = []TestMethod{
		FarringtonManningTest, MiettinenNurminenTest, PearsonChiSquareTest, YatesTest, LikelihoodRatioTest,
	}
	exactTests = []TestMethod{
		FisherTest, FisherMidPTest, BarnardTest, BarnardWaldTest, BoschlooTest, BoschlooDoubledTest,
	}
	ratioTests = []TestMethod{
		FarringtonManningRatioTest, MiettinenNurminenRatioTest, MiettinenNurminenOddsRatioTest,
	}
)

// IntervalMethods returns the registered interval methods of a scale that
// the scope includes, in display order (a fresh slice). ScopeQuick gives the
// methods that cost microseconds per table, the ones the coverage engine
// enumerates for every outcome of a design; ScopeAll adds the costly exact
// intervals (those with a TrialLimit); ScopeLargeSample keeps only the
// methods justified by large-sample theory. An unknown scale gives none.
func IntervalMethods(s Scale, scope MethodScope) []IntervalMethod {
	var all []IntervalMethod
	switch s {
	case Difference:
		all = slices.Concat(differenceMethods, slowDifferenceMethods)
	case Ratio:
		all = ratioMethods
	case OddsRatio:
		all = oddsRatioMethods
	}
	var out []IntervalMethod
	for _, m := range all {
		if scope.Runs(m.Exact, m.TrialLimit) {
			out = append(out, m)
		}
	}
	return out
}

// EnumerableIntervalMethods returns the registered interval methods of a
// scale that are fast enough for the coverage engine to compute at every
// outcome of a design (a fresh slice, in display order): every method but
// the exact unconditional intervals for the difference, which cost
// milliseconds to seconds per table. It differs from IntervalMethods with
// ScopeQuick in the conditional odds-ratio intervals, costly for one large
// table but cheap at every outcome of a design the engine accepts.
func EnumerableIntervalMethods(s Scale) []IntervalMethod {
	switch s {
	case Difference:
		return slices.Clone(differenceMethods)
	case Ratio:
		return slices.Clone(ratioMethods)
	case OddsRatio:
		return slices.Clone(oddsRatioMethods)
	}
	return nil
}

// TwoGroupIntervalMethods returns the registered interval methods of every
// two-group scale (difference, ratio, odds ratio, in that order) that the
// scope includes.
func TwoGroupIntervalMethods(scope MethodScope) []IntervalMethod {
	return slices.Concat(IntervalMethods(Difference, scope), IntervalMethods(Ratio, scope), IntervalMethods(OddsRatio, scope))
}

// RateMethods returns the registered single-proportion methods.
func RateMethods() []RateMethod { return slices.Clone(proportionMethods) }

// Tests returns every registered test, asymptotic first.
func Tests() []TestMethod { return slices.Concat(asymptoticTests, exactTests, ratioTests) }

// LookupInterval finds a two-group interval method by key.
func LookupInterval(key string) (IntervalMethod, error) {
	for _, m := range TwoGroupIntervalMethods(ScopeAll) {
		if m.Key == key {
			return m, nil
		}
	}
	return IntervalMethod{}, fmt.Errorf("interval method %q: %w; known keys: %v", key, ErrUnknownMethod, intervalKeys())
}

// LookupRate finds a single-proportion method by key.
func LookupRate(key string) (RateMethod, error) {
	for _, m := range proportionMethods {
		if m.Key == key {
			return m, nil
		}
	}
	keys := make([]string, 0, len(proportionMethods))
	for _, m := range proportionMethods {
		keys = append(keys, m.Key)
	}
	return RateMethod{}, fmt.Errorf("proportion method %q: %w; known keys: %v", key, ErrUnknownMethod, keys)
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
	all := TwoGroupIntervalMethods(ScopeAll)
	keys := make([]string, 0, len(all))
	for _, m := range all {
		keys = append(keys, m.Key)
	}
	return keys
}
