package proportions

import (
	"encoding/json"
	"math"
	"testing"
)

// FuzzAnalyze: the main analysis call never panics; it either returns an
// error or a result in which every number that claims to be finite is, and
// which marshals to JSON.
func FuzzAnalyze(f *testing.F) {
	f.Add(int64(56), int64(70), int64(48), int64(80), 0.95, 0.0, uint8(0))
	f.Add(int64(0), int64(10), int64(0), int64(10), 0.95, 0.0, uint8(0))
	f.Add(int64(10), int64(10), int64(0), int64(10), 0.9, -0.1, uint8(1))
	f.Add(int64(1), int64(1), int64(1), int64(1), 0.99, 0.2, uint8(2))
	f.Add(int64(1)<<31, int64(1)<<32, int64(5), int64(1)<<32, 0.95, 0.0, uint8(0))
	f.Add(int64(-1), int64(10), int64(3), int64(10), 0.95, 0.0, uint8(0))
	f.Add(int64(3), int64(10), int64(3), int64(10), 1.5, 0.0, uint8(0))
	f.Add(int64(3), int64(10), int64(3), int64(10), 0.95, 1.0, uint8(0))
	f.Fuzz(func(t *testing.T, x1, n1, x2, n2 int64, level, null float64, alt uint8) {
		if n1+n2 > 1<<40 || n1+n2 < 0 {
			return // keep the exact methods' work bounded; validation is tested elsewhere
		}
		c := Comparison{First: Group{"a", x1, n1}, Second: Group{"b", x2, n2}, Event: "e"}
		a, err := Analyze(c, WithLevel(level), WithNull(null), WithAlternative(Alternative(alt%4)))
		if err != nil {
			if err.Error() == "" {
				t.Fatal("empty error message")
			}
			return
		}
		assertFiniteAnalysis(t, a)
		if _, err := json.Marshal(a); err != nil {
			t.Fatalf("marshal: %v", err)
		}
	})
}

func assertFiniteAnalysis(t *testing.T, a Analysis) {
	t.Helper()
	for _, v := range []float64{a.Difference, a.Level, a.Null} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			t.Fatalf("non-finite headline number in %+v", a)
		}
	}
	ivs := append([]Interval{a.Interval}, a.DifferenceIntervals...)
	for _, g := range a.Groups {
		ivs = append(ivs, g.Intervals...)
	}
	for _, iv := range ivs {
		for _, v := range []float64{iv.Estimate, iv.Lower, iv.Upper, iv.RawLower, iv.RawUpper} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("non-finite limit in %s: %+v", iv.Method, iv)
			}
		}
		if iv.Lower > iv.Upper {
			t.Fatalf("reversed interval %+v", iv)
		}
	}
	for _, iv := range append(append([]Interval{}, a.RatioIntervals...), a.OddsRatioIntervals...) {
		if math.IsNaN(iv.Lower) || math.IsNaN(iv.Upper) || iv.Lower > iv.Upper {
			t.Fatalf("bad ratio interval %+v", iv)
		}
	}
	for _, r := range append([]TestResult{a.Test}, a.Tests...) {
		if math.IsNaN(r.Statistic) || math.IsNaN(r.PValue) || math.IsNaN(r.LogPValue) || r.PValue < 0 || r.PValue > 1 {
			t.Fatalf("bad test result %+v", r)
		}
	}
}
