package simulate

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// The text names every method with its kind and the SE; the JSON reads
// back to the same figures, and a method with no interval in any study
// writes null figures and says so in its text instead of a NaN.
func TestResultTextAndJSON(t *testing.T) {
	p := NewPlan(4, 10, 0.6, 0.6, 0.1)
	p.Studies = 500
	p.Methods = []string{"wald", "zou-donner", "pearson-chi-square-test", "donner-test"}
	r := mustRun(t, p)
	text := r.String()
	for _, want := range []string{"Simulated 500 studies (seed 1)", "2 × 4 clusters of 10 units", "Wald (unit-level): coverage",
		"Zou–Donner (accounts for clusters)", "type I error", "(Monte Carlo SE)"} {
		if !strings.Contains(text, want) {
			t.Errorf("text lacks %q:\n%s", want, text)
		}
	}
	b, err := json.Marshal(r)
	if err != nil {
		t.Fatal(err)
	}
	var back Result
	if err := json.Unmarshal(b, &back); err != nil {
		t.Fatal(err)
	}
	if back.Intervals[1] != r.Intervals[1] || back.Tests[0] != r.Tests[0] || back.Plan.Design.Correlation != 0.1 {
		t.Errorf("JSON round trip changed the result:\n%+v\n%+v", back, r)
	}
	none := SimulatedCoverage{Method: "wald", MethodName: "Wald", Undefined: 500, Coverage: math.NaN(), StandardError: math.NaN(),
		Below: math.NaN(), Above: math.NaN(), MeanWidth: math.NaN(), WidthError: math.NaN()}
	b, err = json.Marshal(none)
	if err != nil || !strings.Contains(string(b), `"coverage":null`) {
		t.Errorf("no interval in any study: %s, %v", b, err)
	}
	if s := none.String(); strings.Contains(s, "NaN") || !strings.Contains(s, "no interval in any of 500") {
		t.Errorf("text %q", s)
	}
}
