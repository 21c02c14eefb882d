package proportions

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// A result with an infinite statistic and log p-value marshals (JSON has no
// infinities) and reads back unchanged.
func TestTestResultJSONInfinities(t *testing.T) {
	crit := 1.959963984540054
	r := TestResult{Method: "x", MethodName: "X", StatisticName: "z", Statistic: math.Inf(1), PValue: 0,
		LogPValue: math.Inf(-1), CriticalValue: &crit, Reject: true, DF: 1}
	b, err := json.Marshal(r)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(b), `"statistic":"Infinity"`) || !strings.Contains(string(b), `"log_p_value":"-Infinity"`) {
		t.Errorf("JSON %s", b)
	}
	var back TestResult
	if err := json.Unmarshal(b, &back); err != nil {
		t.Fatal(err)
	}
	if !math.IsInf(back.Statistic, 1) || !math.IsInf(back.LogPValue, -1) || *back.CriticalValue != crit || !back.Reject || back.DF != 1 || back.Method != "x" {
		t.Errorf("read back %+v", back)
	}
	h := Hypothesis{Null: 0, Alternative: TwoSided, Conf: Confidence{Level: 0.95, Z: crit}}
	fm := FarringtonManningTest.Run(Counts{X1: 56, N1: 70, X2: 48, N2: 80}, h)
	b, _ = json.Marshal(fm)
	var fm2 TestResult
	if err := json.Unmarshal(b, &fm2); err != nil || fm2.Statistic != fm.Statistic || fm2.PValue != fm.PValue || fm2.MethodName != fm.MethodName {
		t.Errorf("round trip %+v -> %s -> %+v (%v)", fm, b, fm2, err)
	}
}
