package proportions

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"strconv"
)

// Alternative is the direction of the alternative hypothesis about the
// parameter θ (π1 − π2, π1/π2 or the odds ratio) against its null value θ0.
type Alternative int

const (
	// TwoSided: θ ≠ θ0.
	TwoSided Alternative = iota
	// Greater: θ > θ0 (the first group's rate is higher than the null allows).
	Greater
	// Less: θ < θ0.
	Less
)

var alternativeNames = [...]string{"two-sided", "greater", "less"}

// String returns "two-sided", "greater" or "less".
func (a Alternative) String() string {
	if a < 0 || int(a) >= len(alternativeNames) {
		return fmt.Sprintf("alternative(%d)", int(a))
	}
	return alternativeNames[a]
}

// Validate returns an error wrapping ErrAlternative for unknown values.
func (a Alternative) Validate() error {
	if a < 0 || int(a) >= len(alternativeNames) {
		return fmt.Errorf("alternative %d: %w; use TwoSided, Greater or Less", int(a), ErrAlternative)
	}
	return nil
}

// MarshalJSON writes the plain name.
func (a Alternative) MarshalJSON() ([]byte, error) { return json.Marshal(a.String()) }

// UnmarshalJSON reads the plain name.
func (a *Alternative) UnmarshalJSON(b []byte) error {
	var s string
	if err := json.Unmarshal(b, &s); err != nil {
		return err
	}
	for i, n := range alternativeNames {
		if n == s {
			*a = Alternative(i)
			return nil
		}
	}
	return fmt.Errorf("alternative %q: %w; use \"two-sided\", \"greater\" or \"less\"", s, ErrAlternative)
}

// Hypothesis is what a test is asked: the null value of the parameter, the
// alternative, and the confidence (the test's level is α = 1 − Level).
type Hypothesis struct {
	Null        float64     `json:"null"`
	Alternative Alternative `json:"alternative"`
	Conf        Confidence  `json:"confidence"`
	// shared, set by Analyze, keeps the work that several tests of one
	// analysis have in common (see sharedWork); nil elsewhere.
	shared *sharedWork
	// costLimit, set by TestContext and Analyze, is the guard a costly
	// test applies to the parts of its work sized on the way; zero means
	// MaxCost.
	costLimit Cost
}

// Alpha returns the significance level 1 − Conf.Level.
func (h Hypothesis) Alpha() float64 { return 1 - h.Conf.Level }

// TestMethod is a published test registered by name. Like IntervalMethod it
// is a value: adding a test is one file, one line in a registry list, and
// its tests.
type TestMethod struct {
	Key        string `json:"key"`
	Name       string `json:"name"`
	Citation   string `json:"citation"`
	Definition string `json:"definition"`
	// Scale is the scale of the null value (difference, ratio, odds ratio).
	Scale Scale `json:"scale"`
	// Margins reports whether the test accepts a null other than no effect.
	Margins bool `json:"margins"`
	// Exact marks tests whose size never exceeds α by construction.
	Exact bool `json:"exact"`
	// TrialLimit is the largest total n1 + n2 at which the test runs in about
	// a second or less; 0 means no limit. Analyze skips a test above its
	// limit and says so in a warning instead of hanging.
	TrialLimit int64 `json:"trial_limit,omitempty"`
	// ContinuityCorrected marks a continuity-corrected variant (Yates);
	// Analyze runs it only when WithYatesTest(true) is given.
	ContinuityCorrected bool `json:"continuity_corrected,omitempty"`
	// Check, when set, reports counts the test refuses to run (for example a
	// design too large for an exact unconditional test), with an error
	// wrapping a sentinel such as ErrTooLarge. Test calls it before Run.
	Check func(c Counts) error `json:"-"`
	// Run computes the test for validated counts and a validated hypothesis
	// (Test does the validation). It must never return NaN.
	Run func(c Counts, h Hypothesis) TestResult `json:"-"`
	// Cost, set on the costly tests (those with a TrialLimit), estimates
	// what the test would do for counts and a hypothesis before it runs
	// (see Cost). TestContext refuses a call above MaxCost and Analyze
	// skips a test above AnalysisCost.
	Cost func(c Counts, h Hypothesis) Cost `json:"-"`
	// RunContext, set on the costly tests, is Run with cancellation: it
	// returns ctx's error within a few milliseconds of ctx ending, and an
	// error wrapping ErrTooLarge when a part of the work that can only be
	// sized on the way (the log-space search of the unconditional tests)
	// would exceed the guard. The cheap tests leave it nil and are run
	// through Run; the registry keeps one value per test either way.
	RunContext func(ctx context.Context, c Counts, h Hypothesis) (TestResult, error) `json:"-"`
	// Window, set on the unconditional exact tests (not their Berger–Boos
	// variants), decides every outcome of a design at once with Run's
	// decisions, from one search for the critical value instead of one
	// nuisance search per outcome; the engine (package operating) uses it
	// for power, size and rejection regions.
	Window *WindowDecider `json:"-"`
}

// Test validates the counts and the options, then runs the test (see
// TestContext, which it calls with context.Background()).
func (m TestMethod) Test(c Counts, opts ...Option) (TestResult, error) {
	return m.TestContext(context.Background(), c, opts...)
}

// TestContext validates the counts and the options, then runs the test. It
// reads the settings Level, Null (default: the scale's no-effect value) and
// Alternative. A costly test is refused with an error wrapping ErrTooLarge
// when its Cost exceeds MaxCost, and stops with ctx's error when ctx ends.
func (m TestMethod) TestContext(ctx context.Context, c Counts, opts ...Option) (TestResult, error) {
	if err := c.Validate(); err != nil {
		return TestResult{}, err
	}
	s, err := NewSettings(opts...)
	if err != nil {
		return TestResult{}, err
	}
	h, err := m.Hypothesis(s)
	if err != nil {
		return TestResult{}, err
	}
	if m.Check != nil {
		if err := m.Check(c); err != nil {
			return TestResult{}, err
		}
	}
	return m.runContext(ctx, c, h, MaxCost)
}

// runContext runs the test with ctx under a cost guard: through RunContext
// for a costly test, through Run for a cheap one.
func (m TestMethod) runContext(ctx context.Context, c Counts, h Hypothesis, guard Cost) (TestResult, error) {
	if err := ctx.Err(); err != nil {
		return TestResult{}, err
	}
	if m.Cost != nil {
		if err := m.Cost(c, h).guard(fmt.Sprintf("%s at %d/%d vs %d/%d (null %v)", m.Name, c.X1, c.N1, c.X2, c.N2, h.Null), guard); err != nil {
			return TestResult{}, err
		}
	}
	if m.RunContext == nil {
		return m.Run(c, h), nil
	}
	h.costLimit = guard
	return m.RunContext(ctx, c, h)
}

// Hypothesis turns settings into a validated hypothesis for this test.
func (m TestMethod) Hypothesis(s Settings) (Hypothesis, error) {
	null := s.NullFor(m.Scale)
	if err := ValidateNull(m.Scale, null); err != nil {
		return Hypothesis{}, err
	}
	if !m.Margins && null != m.Scale.NoEffect() {
		return Hypothesis{}, fmt.Errorf("%s with null %v: %w; this test is defined only for a null of %v",
			m.Name, null, ErrUnsupported, m.Scale.NoEffect())
	}
	conf, err := NewConfidence(s.Level)
	if err != nil {
		return Hypothesis{}, err
	}
	return Hypothesis{Null: null, Alternative: s.Alternative, Conf: conf}, nil
}

// TestResult is the outcome of one test.
//
// Decision rule: Reject is true when PValue ≤ α = 1 − Level. PValue is
// accurate far into the tail; when it is below the smallest float64
// (about 1e−308) it is 0 and LogPValue (natural log, always set) still
// carries its value.
type TestResult struct {
	Method        string      `json:"method"`
	MethodName    string      `json:"method_name"`
	Scale         Scale       `json:"scale"`
	Null          float64     `json:"null"`
	Alternative   Alternative `json:"alternative"`
	Level         float64     `json:"level"`
	StatisticName string      `json:"statistic_name"`
	Statistic     float64     `json:"statistic"`
	// DF is the degrees of freedom of a chi-square statistic; 0 when not defined.
	DF        int     `json:"df,omitempty"`
	PValue    float64 `json:"p_value"`
	LogPValue float64 `json:"log_p_value"`
	// CriticalValue is the statistic's rejection threshold at the level,
	// nil where the test has none (exact tests).
	CriticalValue *float64 `json:"critical_value,omitempty"`
	Reject        bool     `json:"reject"`
	// Nuisance is, for unconditional exact tests, the common success
	// probability at which the supremum of the tail probability was found.
	Nuisance *float64 `json:"nuisance,omitempty"`
	// PValueBound is, for unconditional exact tests, a proven upper bound
	// on the true supremum behind PValue (branch and bound over the
	// nuisance parameter, see unconditional_bound.go): the exact p-value
	// lies in [PValue, PValueBound], and (PValueBound − PValue)/PValue is
	// below 1e−9 (supBoundTolerance). Nil for other tests; 0, like PValue,
	// when the bound is below the float64 range.
	PValueBound *float64 `json:"p_value_bound,omitempty"`
}

// String prints a one-line summary such as
// "Score (Farrington–Manning) z = 2.65, p = 0.0080: reject at 5%".
func (r TestResult) String() string {
	decision := "do not reject"
	if r.Reject {
		decision = "reject"
	}
	stat := ""
	if r.StatisticName != "" {
		stat = fmt.Sprintf(" %s = %.4g,", r.StatisticName, r.Statistic)
	}
	bound := ""
	if r.PValueBound != nil {
		bound = ", proven bound " + strconv.FormatFloat(*r.PValueBound, 'g', 12, 64)
	}
	return fmt.Sprintf("%s:%s p = %s%s (%s, null %v): %s at %s%%", r.MethodName, stat, FormatP(r.PValue, r.LogPValue), bound,
		r.Alternative, r.Null, decision, strconv.FormatFloat(100*(1-r.Level), 'g', 4, 64))
}

// FormatP prints a p-value: 4 significant digits, scientific below 1e−4,
// and from its log when the value underflows float64.
func FormatP(p, logp float64) string {
	switch {
	case p == 0 && !math.IsInf(logp, -1):
		e := logp / math.Ln10
		exp := math.Floor(e)
		return fmt.Sprintf("%.3fe%d", math.Pow(10, e-exp), int(exp))
	case p < 1e-4:
		return strconv.FormatFloat(p, 'e', 3, 64)
	}
	var buf [24]byte
	return string(appendSignificant4(buf[:0], p))
}

// decide fills the decision fields of a result from its p-value.
func (r *TestResult) decide(h Hypothesis) {
	r.Null, r.Alternative, r.Level = h.Null, h.Alternative, h.Conf.Level
	r.Reject = r.PValue <= h.Alpha()
}
