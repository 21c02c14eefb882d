package proportions

import (
	"encoding/json"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// NumberNeeded is the number needed to treat: how many units (patients,
// seed lots, parts) must receive the first group's treatment instead of the
// second's for one more favourable outcome, 1/|π1 − π2| (Laupacis A,
// Sackett DL, Roberts RS 1988, New England Journal of Medicine
// 318:1728–1733), with its confidence interval taken from an interval for
// the difference by inverting its limits.
//
// Benefit or harm: with b = π1 − π2 when the event is good (germination,
// response) and b = π2 − π1 when it is bad (a defect, an infarction), b > 0
// is benefit and NNTB = 1/b is the number needed to treat for one more
// good outcome; b < 0 is harm and NNTH = 1/|b| the number needed for one
// more bad outcome (Altman DG 1998, "Confidence intervals for the number
// needed to treat", BMJ 317:1309–1312).
//
// When the difference interval includes zero the NNT interval is not an
// interval of ordinary numbers: following Altman (1998) it runs from NNTH
// = 1/|lower| through infinity (no difference) to NNTB = 1/upper, printed
// "NNTH 12.3 to ∞ to NNTB 4.5". Benefit and Harm hold the two pieces: each
// is nil when the difference interval does not reach into that direction,
// and a piece reaching no difference ends at +Inf. Infinite values print
// as "∞" and marshal to JSON as "Infinity", never NaN.
//
// Values are kept with their decimals; in reports the number needed is
// often rounded up to a whole number (common practice).
type NumberNeeded struct {
	First  string `json:"first"`
	Second string `json:"second"`
	Event  string `json:"event"`
	// Better tells which way the rate is good: HigherIsBetter when the
	// counted event is the favourable outcome.
	Better Better  `json:"better"`
	Level  float64 `json:"level"`
	// Method and MethodName name the difference interval used.
	Method     string `json:"method"`
	MethodName string `json:"method_name"`
	// Benefit is b: π1 − π2 when higher is better, π2 − π1 otherwise,
	// with its interval.
	Benefit      float64 `json:"benefit_difference"`
	BenefitLower float64 `json:"benefit_lower"`
	BenefitUpper float64 `json:"benefit_upper"`
	// Direction is "benefit", "harm" or "no difference" (b > 0, < 0, = 0).
	Direction string `json:"direction"`
	// Estimate is 1/|b|: NNTB for benefit, NNTH for harm, +Inf for no
	// difference.
	Estimate float64 `json:"estimate"`
	// IncludesNoEffect reports whether the difference interval contains 0,
	// so the data are compatible with no difference.
	IncludesNoEffect bool `json:"includes_no_effect"`
	// BenefitRange and HarmRange are the NNTB and NNTH pieces of the
	// interval (nil when absent).
	BenefitRange *NumberRange `json:"nntb,omitempty"`
	HarmRange    *NumberRange `json:"nnth,omitempty"`
	// Caution is the standing reminder that goes with results that may
	// drive decisions.
	Caution string `json:"caution"`
}

// NumberRange is one piece of a number-needed interval, From ≤ To; To is
// +Inf when the piece reaches no difference.
type NumberRange struct {
	From float64 `json:"from"`
	To   float64 `json:"to"`
}

// MarshalJSON writes ±Inf as "Infinity"/"-Infinity".
func (r NumberRange) MarshalJSON() ([]byte, error) {
	return json.Marshal(struct {
		From JSONFloat `json:"from"`
		To   JSONFloat `json:"to"`
	}{JSONFloat(r.From), JSONFloat(r.To)})
}

// MarshalJSON writes the result with infinite values as strings.
func (n NumberNeeded) MarshalJSON() ([]byte, error) {
	type plain NumberNeeded
	return json.Marshal(struct {
		plain
		Estimate JSONFloat `json:"estimate"`
	}{plain(n), JSONFloat(n.Estimate)})
}

// NumberNeededToTreat computes the number needed to treat for the first
// group's treatment against the second's from the difference interval of
// method m (Scale must be Difference, for example the Newcombe or
// Miettinen–Nurminen interval). better says which way the rate is good
// (HigherIsBetter when the counted event is the favourable outcome). It
// reads the setting Level (default 0.95).
func NumberNeededToTreat(c Comparison, m IntervalMethod, better Better, opts ...Option) (NumberNeeded, error) {
	if m.Scale != Difference || m.Limits == nil {
		return NumberNeeded{}, fmt.Errorf("number needed to treat from %q: %w; it needs an interval method for the difference π1 − π2", m.Key, ErrUnsupported)
	}
	s, err := NewSettings(opts...)
	if err != nil {
		return NumberNeeded{}, err
	}
	iv, err := m.Interval(c.Counts(), s.Level)
	if err != nil {
		return NumberNeeded{}, err
	}
	return NumberNeededFromInterval(iv, Labels{First: c.First.Label, Second: c.Second.Label, Event: c.Event}, better)
}

// NumberNeededFromInterval computes the number needed to treat from an
// interval for π1 − π2 already computed (for example Analysis.Interval).
// Empty labels take the defaults.
func NumberNeededFromInterval(iv Interval, labels Labels, better Better) (NumberNeeded, error) {
	if err := better.Validate(); err != nil {
		return NumberNeeded{}, err
	}
	if iv.Scale != Difference {
		return NumberNeeded{}, fmt.Errorf("number needed to treat from a %s interval: %w; it needs an interval for the difference π1 − π2", iv.Scale, ErrUnsupported)
	}
	if math.IsNaN(iv.Estimate) || math.IsNaN(iv.Lower) || math.IsNaN(iv.Upper) || iv.Lower > iv.Upper {
		return NumberNeeded{}, fmt.Errorf("number needed to treat from interval %v: %w; the interval must be numbers with lower ≤ upper", iv, ErrUnsupported)
	}
	l := labels.withDefaults()
	b, lo, hi := iv.Estimate, iv.Lower, iv.Upper
	if better == LowerIsBetter {
		b, lo, hi = -b, -hi, -lo
	}
	n := NumberNeeded{
		First: l.First, Second: l.Second, Event: l.Event, Better: better,
		Level: iv.Level, Method: iv.Method, MethodName: iv.MethodName,
		Benefit: b, BenefitLower: lo, BenefitUpper: hi,
		Estimate:         reciprocalMagnitude(b),
		IncludesNoEffect: lo <= 0 && hi >= 0,
		Caution:          Caution,
	}
	switch {
	case b > 0:
		n.Direction = "benefit"
	case b < 0:
		n.Direction = "harm"
	default:
		n.Direction = "no difference"
	}
	if hi > 0 {
		n.BenefitRange = &NumberRange{From: 1 / hi, To: reciprocalOrInf(lo)}
	}
	if lo < 0 {
		n.HarmRange = &NumberRange{From: 1 / -lo, To: reciprocalOrInf(-hi)}
	}
	return n, nil
}

// reciprocalMagnitude returns 1/|v|, +Inf at 0.
func reciprocalMagnitude(v float64) float64 {
	if v == 0 {
		return math.Inf(1)
	}
	return 1 / math.Abs(v)
}

// reciprocalOrInf returns 1/v for v > 0 and +Inf otherwise (the piece
// reaches no difference).
func reciprocalOrInf(v float64) float64 {
	if v > 0 {
		return 1 / v
	}
	return math.Inf(1)
}

// Interval prints the interval in Altman's form: "NNTB 4.1 to 12.5",
// "NNTH 7.0 to 30.2", or "NNTH 12.3 to ∞ to NNTB 4.5" when it spans no
// difference.
func (n NumberNeeded) Interval() string {
	switch {
	case n.BenefitRange != nil && n.HarmRange != nil:
		return fmt.Sprintf("NNTH %s to ∞ to NNTB %s", formatNumber(n.HarmRange.From), formatNumber(n.BenefitRange.From))
	case n.BenefitRange != nil:
		return fmt.Sprintf("NNTB %s to %s", formatNumber(n.BenefitRange.From), formatNumber(n.BenefitRange.To))
	case n.HarmRange != nil:
		return fmt.Sprintf("NNTH %s to %s", formatNumber(n.HarmRange.From), formatNumber(n.HarmRange.To))
	}
	return "∞ (the interval for the difference is the single point 0)"
}

// String states the result in plain words, for example
// "NNTB 8.3 (95% interval NNTH 40.1 to ∞ to NNTB 4.2, from the Newcombe
// interval): treating about 8.3 with coated instead of plain gives one more
// germinated. The interval for the difference includes zero, so the data
// are compatible with benefit, no difference and harm."
func (n NumberNeeded) String() string {
	var b strings.Builder
	level := strconv.FormatFloat(100*n.Level, 'g', -1, 64)
	head := "no difference observed: NNT ∞"
	more := "more"
	if n.Better == LowerIsBetter {
		more = "fewer"
	}
	switch n.Direction {
	case "benefit":
		head = "NNTB " + formatNumber(n.Estimate)
	case "harm":
		head = "NNTH " + formatNumber(n.Estimate)
		if n.Better == HigherIsBetter {
			more = "fewer"
		} else {
			more = "more"
		}
	}
	fmt.Fprintf(&b, "%s (%s%% interval %s, from the %s interval for the difference)", head, level, n.Interval(), n.MethodName)
	if n.Direction != "no difference" {
		fmt.Fprintf(&b, ": treating about %s with %s instead of %s gives one %s %s (%s)", formatNumber(n.Estimate), n.First, n.Second, more, n.Event, n.Direction)
	}
	b.WriteString(".")
	if n.IncludesNoEffect {
		b.WriteString(" The interval for the difference includes zero, so the data are compatible with")
		switch {
		case n.BenefitRange != nil && n.HarmRange != nil:
			b.WriteString(" benefit, no difference and harm.")
		case n.BenefitRange != nil:
			b.WriteString(" benefit or no difference.")
		case n.HarmRange != nil:
			b.WriteString(" harm or no difference.")
		default:
			b.WriteString(" no difference only.")
		}
	}
	return b.String()
}

// formatNumber prints a number needed with one decimal, "∞" for +Inf.
func formatNumber(v float64) string {
	if math.IsInf(v, 1) {
		return "∞"
	}
	return strconv.FormatFloat(v, 'f', 1, 64)
}
