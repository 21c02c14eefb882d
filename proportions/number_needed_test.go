package proportions

import (
	"encoding/json"
	"errors"
	"math"
	"strings"
	"testing"
)

// TestNumberNeededBenefitOnly uses Newcombe (1998b, Statistics in Medicine
// 17:873–890, Table II, method 1) example (a): 56/70 vs 48/80, Wald interval
// 0.0575049 to 0.3424951 (value recalled from the paper, confirmed by
// recomputation). The number needed is 1/0.2 = 5, interval
// 1/0.3424951 to 1/0.0575049 (Altman 1998, BMJ 317:1309–1312).
func TestNumberNeededBenefitOnly(t *testing.T) {
	c, _ := NewComparison(56, 70, 48, 80, Labels{First: "coated", Second: "plain", Event: "germinated"})
	n, err := NumberNeededToTreat(c, Wald, HigherIsBetter)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(n.Estimate-5) > 1e-12 || n.Direction != "benefit" || n.IncludesNoEffect || n.HarmRange != nil || n.BenefitRange == nil {
		t.Fatalf("%+v", n)
	}
	if math.Abs(n.BenefitRange.From-1/0.3424951) > 1e-5 || math.Abs(n.BenefitRange.To-1/0.0575049) > 1e-3 {
		t.Errorf("range %+v, want %.5f to %.4f", *n.BenefitRange, 1/0.3424951, 1/0.0575049)
	}
	if got := n.Interval(); got != "NNTB 2.9 to 17.4" {
		t.Errorf("Interval() = %q", got)
	}
	// The same data with the event counted as bad: harm, the same numbers.
	h, _ := NumberNeededToTreat(c, Wald, LowerIsBetter)
	if h.Direction != "harm" || h.BenefitRange != nil || h.HarmRange == nil || *h.HarmRange != *n.BenefitRange {
		t.Errorf("event bad: %+v", h)
	}
	if !strings.Contains(h.String(), "gives one more germinated (harm)") {
		t.Errorf("String %q", h.String())
	}
}

// TestNumberNeededSpansZero: 12/40 vs 5/38 has a Wald interval from below 0
// to above 0, computed here from the Wald formula by hand; Altman's form is
// "NNTH 1/|lower| to ∞ to NNTB 1/upper".
func TestNumberNeededSpansZero(t *testing.T) {
	c, _ := NewComparison(12, 40, 5, 38, Labels{})
	p1, p2 := 12.0/40, 5.0/38
	se := math.Sqrt(p1*(1-p1)/40 + p2*(1-p2)/38)
	lo, hi := p1-p2-1.959963984540054*se, p1-p2+1.959963984540054*se
	n, err := NumberNeededToTreat(c, Wald, HigherIsBetter)
	if err != nil {
		t.Fatal(err)
	}
	if !(lo < 0 && hi > 0) || !n.IncludesNoEffect || n.BenefitRange == nil || n.HarmRange == nil {
		t.Fatalf("%+v (hand limits %v, %v)", n, lo, hi)
	}
	if math.Abs(n.HarmRange.From-1/-lo) > 1e-6*(1/-lo) || !math.IsInf(n.HarmRange.To, 1) ||
		math.Abs(n.BenefitRange.From-1/hi) > 1e-9 || !math.IsInf(n.BenefitRange.To, 1) {
		t.Errorf("ranges %+v %+v, want NNTH %v to ∞ to NNTB %v", *n.HarmRange, *n.BenefitRange, 1/-lo, 1/hi)
	}
	s := n.String()
	if !strings.Contains(s, "to ∞ to NNTB") || !strings.Contains(s, "benefit, no difference and harm") {
		t.Errorf("String %q", s)
	}
	b, err := json.Marshal(n)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(b), `"nnth":{"from":`) || !strings.Contains(string(b), `"to":"Infinity"`) || strings.Contains(string(b), "NaN") {
		t.Errorf("JSON %s", b)
	}
}

// TestNumberNeededNoDifference: no events in either group gives a Wald
// interval that is the single point 0: the number needed is infinite,
// reported as such in text and JSON, never NaN.
func TestNumberNeededNoDifference(t *testing.T) {
	c, _ := NewComparison(0, 10, 0, 10, Labels{})
	n, err := NumberNeededToTreat(c, Wald, HigherIsBetter)
	if err != nil {
		t.Fatal(err)
	}
	if !math.IsInf(n.Estimate, 1) || n.Direction != "no difference" || n.BenefitRange != nil || n.HarmRange != nil || !n.IncludesNoEffect {
		t.Errorf("%+v", n)
	}
	b, _ := json.Marshal(n)
	if !strings.Contains(string(b), `"estimate":"Infinity"`) {
		t.Errorf("JSON %s", b)
	}
	if !strings.Contains(n.String(), "NNT ∞") {
		t.Errorf("String %q", n.String())
	}
}

// TestNumberNeededBadInput: only difference intervals make sense.
func TestNumberNeededBadInput(t *testing.T) {
	c, _ := NewComparison(3, 10, 5, 10, Labels{})
	if _, err := NumberNeededToTreat(c, Koopman, HigherIsBetter); !errors.Is(err, ErrUnsupported) {
		t.Errorf("ratio method: err %v, want ErrUnsupported", err)
	}
	if _, err := NumberNeededToTreat(c, Wald, HigherIsBetter, WithLevel(2)); !errors.Is(err, ErrLevel) {
		t.Errorf("level 2: err %v, want ErrLevel", err)
	}
	iv, _ := Katz.Interval(c.Counts(), 0.95)
	if _, err := NumberNeededFromInterval(iv, Labels{}, HigherIsBetter); !errors.Is(err, ErrUnsupported) {
		t.Errorf("ratio interval: err %v, want ErrUnsupported", err)
	}
}
