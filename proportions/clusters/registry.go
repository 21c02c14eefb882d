package clusters

import (
	"fmt"
	"math"
	"slices"

	"github.com/propscope/propscope/internal/special"
	"github.com/propscope/propscope/proportions"
)

// IntervalMethod is a published interval for π1 − π2 that accounts for
// clustering: a named value, like proportions.IntervalMethod, whose limits
// are computed from the two groups' sufficient statistics (a Summary), so
// a simulation summarises each data set once and calls every method on it
// without allocating.
type IntervalMethod struct {
	// Key is the stable identifier used in JSON and lookups.
	Key string `json:"key"`
	// Name is the published name shown to users.
	Name string `json:"name"`
	// Citation names the paper (authors, year, journal).
	Citation string `json:"citation"`
	// Definition states the method's formula in one or two sentences.
	Definition string `json:"definition"`
	// Limits computes the raw (unclipped) limits for a summary that passed
	// Summary.Check. It does not allocate and never returns NaN.
	Limits func(s Summary, conf proportions.Confidence) (lower, upper float64) `json:"-"`
	// PointEstimate, when set, is the estimate the method reports in place
	// of p1 − p2 (the cluster-level interval reports the difference of the
	// mean cluster rates).
	PointEstimate func(s Summary) float64 `json:"-"`
}

// Interval validates the level and the data (as New does), summarises the
// data and computes the interval; see IntervalAt.
func (m IntervalMethod) Interval(d Data, level float64) (proportions.Interval, error) {
	conf, err := proportions.NewConfidence(level)
	if err != nil {
		return proportions.Interval{}, err
	}
	if err := d.validate(); err != nil {
		return proportions.Interval{}, err
	}
	s := Summarize(d)
	if err := s.Check(); err != nil {
		return proportions.Interval{}, err
	}
	return m.IntervalAt(s, conf), nil
}

// IntervalAt computes the interval for a summary that passed Check and a
// validated confidence, with the library's limit rule (limits clipped to
// [−1, 1], the raw limits kept; see proportions.Interval).
func (m IntervalMethod) IntervalAt(s Summary, conf proportions.Confidence) proportions.Interval {
	rawLo, rawHi := m.Limits(s, conf)
	lo, hi := max(rawLo, -1), min(rawHi, 1)
	est := s.Group1.Rate() - s.Group2.Rate()
	if m.PointEstimate != nil {
		est = m.PointEstimate(s)
	}
	return proportions.Interval{
		Method: m.Key, MethodName: m.Name, Scale: proportions.Difference, Level: conf.Level,
		Estimate: est, Defined: true, Lower: lo, Upper: hi, RawLower: rawLo, RawUpper: rawHi,
		Clipped: lo != rawLo || hi != rawHi,
	}
}

// TestMethod is a published test of H0: π1 = π2 that accounts for
// clustering, computed from a Summary like IntervalMethod.
type TestMethod struct {
	Key        string `json:"key"`
	Name       string `json:"name"`
	Citation   string `json:"citation"`
	Definition string `json:"definition"`
	// Run computes the test for a summary that passed Summary.Check and a
	// hypothesis with null 0. It does not allocate and never returns NaN.
	Run func(s Summary, h proportions.Hypothesis) proportions.TestResult `json:"-"`
}

// Test validates the options (it reads Level and Alternative; the null
// must be 0, the only one these tests are defined for) and the data (as New
// does), summarises the data and runs the test.
func (m TestMethod) Test(d Data, opts ...proportions.Option) (proportions.TestResult, error) {
	h, err := m.Hypothesis(opts...)
	if err != nil {
		return proportions.TestResult{}, err
	}
	if err := d.validate(); err != nil {
		return proportions.TestResult{}, err
	}
	s := Summarize(d)
	if err := s.Check(); err != nil {
		return proportions.TestResult{}, err
	}
	return m.Run(s, h), nil
}

// Hypothesis turns options into a validated hypothesis for this test: an
// error wrapping proportions.ErrUnsupported for a null other than 0.
func (m TestMethod) Hypothesis(opts ...proportions.Option) (proportions.Hypothesis, error) {
	st, err := proportions.NewSettings(opts...)
	if err != nil {
		return proportions.Hypothesis{}, err
	}
	if null := st.NullFor(proportions.Difference); null != 0 {
		return proportions.Hypothesis{}, fmt.Errorf("%s with null %v: %w; the clustered tests are defined only for a null of 0 (no difference)",
			m.Name, null, proportions.ErrUnsupported)
	}
	conf, err := proportions.NewConfidence(st.Level)
	if err != nil {
		return proportions.Hypothesis{}, err
	}
	return proportions.Hypothesis{Null: 0, Alternative: st.Alternative, Conf: conf}, nil
}

// The registry, in display order.
var (
	intervalMethods = []IntervalMethod{DesignEffectWald, ZouDonner, RaoScottNewcombe, ClusterLevelT}
	testMethods     = []TestMethod{RaoScottTest, DonnerTest, ClusterLevelTTest}
)

// IntervalMethods returns the registered clustered interval methods for
// π1 − π2, in display order (a fresh slice).
func IntervalMethods() []IntervalMethod { return slices.Clone(intervalMethods) }

// Tests returns the registered clustered tests, in display order (a fresh
// slice).
func Tests() []TestMethod { return slices.Clone(testMethods) }

// LookupInterval finds a clustered interval method by key; an unknown key
// is an error wrapping proportions.ErrUnknownMethod.
func LookupInterval(key string) (IntervalMethod, error) {
	keys := make([]string, 0, len(intervalMethods))
	for _, m := range intervalMethods {
		if m.Key == key {
			return m, nil
		}
		keys = append(keys, m.Key)
	}
	return IntervalMethod{}, fmt.Errorf("clustered interval method %q: %w; known keys: %v", key, proportions.ErrUnknownMethod, keys)
}

// LookupTest finds a clustered test by key; an unknown key is an error
// wrapping proportions.ErrUnknownMethod.
func LookupTest(key string) (TestMethod, error) {
	keys := make([]string, 0, len(testMethods))
	for _, m := range testMethods {
		if m.Key == key {
			return m, nil
		}
		keys = append(keys, m.Key)
	}
	return TestMethod{}, fmt.Errorf("clustered test %q: %w; known keys: %v", key, proportions.ErrUnknownMethod, keys)
}

// wilsonLimits are Wilson's score limits for rate p from an effective
// number of units n (not necessarily whole; +Inf gives the point p):
// (p + z²/2n ± z·√(p(1−p)/n + z²/4n²)) / (1 + z²/n).
func wilsonLimits(p, n, z float64) (lower, upper float64) {
	a := z * z / n
	centre := p + a/2
	half := z * math.Sqrt(p*(1-p)/n+a/(4*n))
	lower, upper = (centre-half)/(1+a), (centre+half)/(1+a)
	if p == 0 {
		lower = 0
	}
	if p == 1 {
		upper = 1
	}
	return lower, upper
}

// newcombeCombine joins single-rate limits (l1, u1), (l2, u2) by
// Newcombe's square-and-add rule (Newcombe 1998, method 10), the MOVER.
func newcombeCombine(p1, p2, l1, u1, l2, u2 float64) (lower, upper float64) {
	d := p1 - p2
	return d - math.Hypot(p1-l1, u2-p2), d + math.Hypot(u1-p1, p2-l2)
}

// chiSquareResult fills a test result from a one-degree-of-freedom
// statistic x2 and the sign of p1 − p2: χ²₁ for a two-sided test, the
// signed root against the normal for a one-sided one (as Pearson's test
// in package proportions).
func chiSquareResult(key, name string, x2, diff float64, h proportions.Hypothesis) proportions.TestResult {
	r := proportions.TestResult{Method: key, MethodName: name, Scale: proportions.Difference}
	if h.Alternative == proportions.TwoSided {
		crit := h.Conf.Z * h.Conf.Z
		r.StatisticName, r.Statistic, r.DF, r.CriticalValue = "X²", x2, 1, &crit
		r.PValue, r.LogPValue = special.ChiSquare1UpperTail(x2)
	} else {
		z := math.Copysign(math.Sqrt(x2), diff)
		crit := special.NormalQuantile(h.Conf.Level)
		if h.Alternative == proportions.Less {
			crit = -crit
		}
		r.StatisticName, r.Statistic, r.CriticalValue = "signed √X²", z, &crit
		if h.Alternative == proportions.Less {
			z = -z
		}
		r.PValue, r.LogPValue = special.NormalUpperTail(z)
	}
	return decide(r, h)
}

// decide fills the decision fields from the p-value.
func decide(r proportions.TestResult, h proportions.Hypothesis) proportions.TestResult {
	r.Null, r.Alternative, r.Level = h.Null, h.Alternative, h.Conf.Level
	r.Reject = r.PValue <= h.Alpha()
	return r
}
