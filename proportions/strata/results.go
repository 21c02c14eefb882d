package strata

import (
	"encoding/json"
	"fmt"
	"strconv"

	"github.com/propscope/propscope/proportions"
)

// Estimate is a common estimate: one effect for every stratum at once
// (the effect the strata share if the effect is the same in each), with its
// confidence interval. Estimate, Lower and Upper are NaN when not estimable
// (no events in any stratum, for example) and may be 0 or +Inf on the ratio
// scales; JSON writes NaN as null and ±Inf as "Infinity"/"-Infinity".
type Estimate struct {
	// Key is the method's stable identifier (lower-case words with
	// hyphens, "-ratio" or "-odds-ratio" off the difference scale).
	Key string `json:"key"`
	// Name is the method's published name.
	Name     string            `json:"method_name"`
	Scale    proportions.Scale `json:"scale"`    // difference, ratio or odds ratio
	Level    float64           `json:"level"`    // the interval's confidence level
	Estimate float64           `json:"estimate"` // the common estimate
	Lower    float64           `json:"lower"`    // the interval's lower limit
	Upper    float64           `json:"upper"`    // the interval's upper limit
	// Citation names the paper; Definition states the formula.
	Citation   string `json:"citation"`
	Definition string `json:"definition"`
}

// String prints "name: estimate (lower to upper), 95% confidence".
func (e Estimate) String() string {
	return fmt.Sprintf("%s: %s (%s to %s), %s%% confidence", e.Name, proportions.FormatValue(e.Estimate),
		proportions.FormatValue(e.Lower), proportions.FormatValue(e.Upper), strconv.FormatFloat(100*e.Level, 'g', -1, 64))
}

// Contains reports whether v lies in [Lower, Upper].
func (e Estimate) Contains(v float64) bool { return v >= e.Lower && v <= e.Upper }

// MarshalJSON writes NaN as null and ±Inf as strings.
func (e Estimate) MarshalJSON() ([]byte, error) {
	type plain Estimate
	return json.Marshal(struct {
		plain
		Estimate proportions.JSONFloat `json:"estimate"`
		Lower    proportions.JSONFloat `json:"lower"`
		Upper    proportions.JSONFloat `json:"upper"`
	}{plain(e), proportions.JSONFloat(e.Estimate), proportions.JSONFloat(e.Lower), proportions.JSONFloat(e.Upper)})
}

// Test is the result of a stratified test: of no association in any
// stratum (a common effect of zero), or of homogeneity (the same effect
// in every stratum). PValue is in [0, 1]; when it underflows it is 0 and
// LogPValue (natural log) keeps its size. Reject is PValue ≤ α = 1 − Level.
type Test struct {
	// Key is the test's stable identifier, ending in "-test".
	Key string `json:"key"`
	// Name is the test's published name.
	Name          string                  `json:"method_name"`
	StatisticName string                  `json:"statistic_name"` // X², z, Q or Σx1
	Statistic     float64                 `json:"statistic"`      // the statistic's value
	DF            int                     `json:"df,omitempty"`   // chi-square degrees of freedom; 0 for z or exact
	Alternative   proportions.Alternative `json:"alternative"`    // two-sided for homogeneity
	Level         float64                 `json:"level"`          // α = 1 − Level
	PValue        float64                 `json:"p_value"`        // in [0, 1]
	LogPValue     float64                 `json:"log_p_value"`    // natural log of the p-value
	Reject        bool                    `json:"reject"`         // PValue ≤ α
	Citation      string                  `json:"citation"`       // the paper
	Definition    string                  `json:"definition"`     // the formula
}

// String prints "name: statistic = 4.2, p = 0.04 (two-sided): reject at 5%".
func (t Test) String() string {
	decision := "do not reject"
	if t.Reject {
		decision = "reject"
	}
	stat := ""
	if t.StatisticName != "" {
		stat = fmt.Sprintf(" %s = %.4g,", t.StatisticName, t.Statistic)
	}
	df := ""
	if t.DF > 0 {
		df = fmt.Sprintf(", %d df", t.DF)
	}
	return fmt.Sprintf("%s:%s p = %s (%s%s): %s at %s%%", t.Name, stat, proportions.FormatP(t.PValue, t.LogPValue),
		t.Alternative, df, decision, strconv.FormatFloat(100*(1-t.Level), 'g', 4, 64))
}

// MarshalJSON writes an infinite log p-value (p = 0 exactly) as a string.
func (t Test) MarshalJSON() ([]byte, error) {
	type plain Test
	return json.Marshal(struct {
		plain
		LogPValue proportions.JSONFloat `json:"log_p_value"`
	}{plain(t), proportions.JSONFloat(t.LogPValue)})
}

// decide sets the level and the decision from the p-value.
func (t *Test) decide(level float64) {
	t.Level = level
	t.Reject = t.PValue <= 1-level
}
