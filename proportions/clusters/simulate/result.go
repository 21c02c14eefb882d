package simulate

import (
	"encoding/json"
	"fmt"
	"math"
	"strings"

	"github.com/propscope/propscope/internal/jsonlist"
	"github.com/propscope/propscope/proportions"
)

// Result is what one simulation found: per interval method its simulated
// coverage and width, per test how often it rejected equal rates (its type
// I error when the plan's rates are equal, its power otherwise), each with
// its Monte Carlo standard error.
type Result struct {
	Plan Plan `json:"plan"`
	// Truth is the true difference π1 − π2 of the design.
	Truth float64 `json:"truth"`
	// EqualRates is true when the design's rates are equal, so a test's
	// rejection rate is its type I error.
	EqualRates bool                 `json:"equal_rates"`
	Intervals  []SimulatedCoverage  `json:"intervals"`
	Tests      []SimulatedRejection `json:"tests"`
}

// SimulatedCoverage is one interval method's behaviour over the simulated
// studies. The figures are over the Studies in which the method gave an
// interval; Undefined counts the others. When it gave none the figures are
// NaN (null in JSON).
type SimulatedCoverage struct {
	Method     string `json:"method"`
	MethodName string `json:"method_name"`
	Adjusted   bool   `json:"adjusted"`
	Studies    int    `json:"studies"`
	Undefined  int    `json:"undefined"`
	// Coverage is the share of intervals that contain the true difference,
	// and StandardError its Monte Carlo standard error √(c(1 − c)/Studies).
	Coverage      float64 `json:"coverage"`
	StandardError float64 `json:"standard_error"`
	// Below is the share of intervals entirely below the truth, Above the
	// share entirely above it.
	Below float64 `json:"below"`
	Above float64 `json:"above"`
	// MeanWidth is the mean of upper − lower, WidthError its Monte Carlo
	// standard error (the standard deviation of the widths over √Studies).
	MeanWidth  float64 `json:"mean_width"`
	WidthError float64 `json:"width_error"`
}

// SimulatedRejection is one test's behaviour over the simulated studies.
type SimulatedRejection struct {
	Method     string `json:"method"`
	MethodName string `json:"method_name"`
	Adjusted   bool   `json:"adjusted"`
	Studies    int    `json:"studies"`
	Undefined  int    `json:"undefined"`
	// RejectionRate is the share of studies in which the test rejected
	// equal rates at α = 1 − level, StandardError its Monte Carlo standard
	// error.
	RejectionRate float64 `json:"rejection_rate"`
	StandardError float64 `json:"standard_error"`
}

// result turns the summed tallies into a Result.
func (r *runner) result(p Plan, t tally) *Result {
	d := p.Design
	res := &Result{Plan: p, Truth: d.Truth(), EqualRates: d.Rate1 == d.Rate2}
	res.Plan.Methods = jsonlist.NonNil(p.Methods)
	res.Plan.Design.Sizes = jsonlist.NonNil(d.Sizes)
	for k, m := range r.intervals {
		a := t.intervals[k]
		c := SimulatedCoverage{Method: m.Key, MethodName: m.Name, Adjusted: m.Adjusted, Studies: a.defined, Undefined: p.Studies - a.defined}
		c.Coverage, c.StandardError = share(a.covered, a.defined)
		c.Below, _ = share(a.below, a.defined)
		c.Above, _ = share(a.above, a.defined)
		c.MeanWidth, c.WidthError = meanAndError(a.width, a.width2, a.defined)
		res.Intervals = append(res.Intervals, c)
	}
	for k, m := range r.tests {
		a := t.tests[k]
		s := SimulatedRejection{Method: m.Key, MethodName: m.Name, Adjusted: m.Adjusted, Studies: a.defined, Undefined: p.Studies - a.defined}
		s.RejectionRate, s.StandardError = share(a.rejected, a.defined)
		res.Tests = append(res.Tests, s)
	}
	return res
}

// share returns k/n and its binomial standard error √(p(1 − p)/n); NaN
// for both when n = 0.
func share(k, n int) (p, se float64) {
	if n == 0 {
		return math.NaN(), math.NaN()
	}
	p = float64(k) / float64(n)
	return p, math.Sqrt(p * (1 - p) / float64(n))
}

// meanAndError returns the mean of n values from their sum and sum of
// squares, and the standard error of that mean (0 for a single value).
func meanAndError(sum, sum2 float64, n int) (mean, se float64) {
	if n == 0 {
		return math.NaN(), math.NaN()
	}
	mean = sum / float64(n)
	if n == 1 {
		return mean, 0
	}
	v := max(0, (sum2-float64(n)*mean*mean)/float64(n-1))
	return mean, math.Sqrt(v / float64(n))
}

// Interval returns the row of the interval method with the key.
func (r *Result) Interval(key string) (SimulatedCoverage, bool) {
	for _, c := range r.Intervals {
		if c.Method == key {
			return c, true
		}
	}
	return SimulatedCoverage{}, false
}

// Test returns the row of the test with the key.
func (r *Result) Test(key string) (SimulatedRejection, bool) {
	for _, s := range r.Tests {
		if s.Method == key {
			return s, true
		}
	}
	return SimulatedRejection{}, false
}

// RejectionName is what a test's rejection rate is in this result: "type I
// error" at equal rates, "power" otherwise.
func (r *Result) RejectionName() string {
	if r.EqualRates {
		return "type I error"
	}
	return "power"
}

// String prints the design and one line per method.
func (r *Result) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "Simulated %d studies (seed %d): %s; true difference %s\n", r.Plan.Studies, r.Plan.Seed, r.Plan.Design, signedPP(r.Truth))
	for _, c := range r.Intervals {
		fmt.Fprintf(&b, "  %s: %s\n", tagged(c.MethodName, c.Adjusted), c)
	}
	for _, s := range r.Tests {
		fmt.Fprintf(&b, "  %s: %s %s\n", tagged(s.MethodName, s.Adjusted), r.RejectionName(), s)
	}
	return strings.TrimSuffix(b.String(), "\n")
}

// String prints "coverage 93.1% ± 0.25 (MC SE), mean width 0.1123".
func (c SimulatedCoverage) String() string {
	if c.Studies == 0 {
		return fmt.Sprintf("no interval in any of %d studies", c.Undefined)
	}
	s := fmt.Sprintf("coverage %s ± %s points (Monte Carlo SE), mean width %s", pctf(c.Coverage), ppf(c.StandardError), proportions.FormatValue(c.MeanWidth))
	if c.Undefined > 0 {
		s += fmt.Sprintf("; no interval in %d studies", c.Undefined)
	}
	return s
}

// String prints "5.2% ± 0.22 points (Monte Carlo SE)".
func (s SimulatedRejection) String() string {
	if s.Studies == 0 {
		return fmt.Sprintf("no answer in any of %d studies", s.Undefined)
	}
	out := fmt.Sprintf("%s ± %s points (Monte Carlo SE)", pctf(s.RejectionRate), ppf(s.StandardError))
	if s.Undefined > 0 {
		out += fmt.Sprintf("; no answer in %d studies", s.Undefined)
	}
	return out
}

func tagged(name string, adjusted bool) string {
	if adjusted {
		return name + " (accounts for clusters)"
	}
	return name + " (unit-level)"
}

func pctf(v float64) string { return fmt.Sprintf("%.2f%%", 100*v) }
func ppf(v float64) string  { return fmt.Sprintf("%.2f", 100*v) }
func signedPP(v float64) string {
	return fmt.Sprintf("%+.4g points", 100*v)
}

type coverageJSON struct {
	Method        string                `json:"method"`
	MethodName    string                `json:"method_name"`
	Adjusted      bool                  `json:"adjusted"`
	Studies       int                   `json:"studies"`
	Undefined     int                   `json:"undefined"`
	Coverage      proportions.JSONFloat `json:"coverage"`
	StandardError proportions.JSONFloat `json:"standard_error"`
	Below         proportions.JSONFloat `json:"below"`
	Above         proportions.JSONFloat `json:"above"`
	MeanWidth     proportions.JSONFloat `json:"mean_width"`
	WidthError    proportions.JSONFloat `json:"width_error"`
}

// MarshalJSON writes NaN figures (no interval in any study) as null.
func (c SimulatedCoverage) MarshalJSON() ([]byte, error) {
	j := coverageJSON{c.Method, c.MethodName, c.Adjusted, c.Studies, c.Undefined, jf(c.Coverage), jf(c.StandardError),
		jf(c.Below), jf(c.Above), jf(c.MeanWidth), jf(c.WidthError)}
	return json.Marshal(j)
}

// UnmarshalJSON reads what MarshalJSON writes.
func (c *SimulatedCoverage) UnmarshalJSON(b []byte) error {
	var j coverageJSON
	if err := json.Unmarshal(b, &j); err != nil {
		return err
	}
	*c = SimulatedCoverage{j.Method, j.MethodName, j.Adjusted, j.Studies, j.Undefined, float64(j.Coverage), float64(j.StandardError),
		float64(j.Below), float64(j.Above), float64(j.MeanWidth), float64(j.WidthError)}
	return nil
}

type rejectionJSON struct {
	Method        string                `json:"method"`
	MethodName    string                `json:"method_name"`
	Adjusted      bool                  `json:"adjusted"`
	Studies       int                   `json:"studies"`
	Undefined     int                   `json:"undefined"`
	RejectionRate proportions.JSONFloat `json:"rejection_rate"`
	StandardError proportions.JSONFloat `json:"standard_error"`
}

// MarshalJSON writes NaN figures (no answer in any study) as null.
func (s SimulatedRejection) MarshalJSON() ([]byte, error) {
	return json.Marshal(rejectionJSON{s.Method, s.MethodName, s.Adjusted, s.Studies, s.Undefined, jf(s.RejectionRate), jf(s.StandardError)})
}

// UnmarshalJSON reads what MarshalJSON writes.
func (s *SimulatedRejection) UnmarshalJSON(b []byte) error {
	var j rejectionJSON
	if err := json.Unmarshal(b, &j); err != nil {
		return err
	}
	*s = SimulatedRejection{j.Method, j.MethodName, j.Adjusted, j.Studies, j.Undefined, float64(j.RejectionRate), float64(j.StandardError)}
	return nil
}

// MarshalJSON writes the lists as arrays even when empty.
func (r Result) MarshalJSON() ([]byte, error) {
	type plain Result
	p := plain(r)
	p.Intervals, p.Tests = jsonlist.NonNil(r.Intervals), jsonlist.NonNil(r.Tests)
	p.Plan.Methods, p.Plan.Design.Sizes = jsonlist.NonNil(r.Plan.Methods), jsonlist.NonNil(r.Plan.Design.Sizes)
	return json.Marshal(p)
}

func jf(v float64) proportions.JSONFloat { return proportions.JSONFloat(v) }
