package proportions

import (
	"encoding/json"
	"errors"
	"math"
	"strings"
	"testing"
)

// levelSeeds are the levels of issue 20 and the edges of the range.
var levelSeeds = []float64{
	0.95, 0.5, MinLevel, MaxLevel, math.Nextafter(MinLevel, 0), math.Nextafter(MaxLevel, 1),
	0.9999999999999999, 1 - 1e-15, 1 - 1e-13, 1e-100, 1e-300, 5e-324, 0, 1, -0.5, 2, math.NaN(), math.Inf(1),
	1e-5, 0.001, 0.999999, 1 - 1e-9,
}

// fuzzCounts turns fuzz integers into a valid table: n up to 5000 per
// group, or up to MaxTrials when big is set.
func fuzzCounts(x1, n1, x2, n2 uint64, big bool) Counts {
	top := uint64(5000)
	if big {
		top = uint64(MaxTrials)
	}
	c := Counts{N1: int64(1 + n1%top), N2: int64(1 + n2%top)}
	c.X1 = int64(x1 % uint64(c.N1+1))
	c.X2 = int64(x2 % uint64(c.N2+1))
	return c
}

// slowTotal is the largest n1 + n2 at which the fuzz target runs the
// costly methods (those with a TrialLimit), so that it stays fast.
const slowTotal = 12

// FuzzLevels checks, for any level and table, that a level outside
// [MinLevel, MaxLevel] is refused with ErrLevel naming the range, and that
// at an accepted level every registered method (interval, single-group
// interval and test) gives limits that are not NaN, in order, a p-value in
// [0, 1], and results that marshal; so does the default analysis. An
// invalid level is also mapped into the range, so every input exercises
// the methods.
func FuzzLevels(f *testing.F) {
	for i, l := range levelSeeds {
		f.Add(l, uint64(i), uint64(3+i), uint64(2*i), uint64(4+i), i%5 == 0)
	}
	f.Add(0.9999999999999999, uint64(0), uint64(0), uint64(3), uint64(28172342337), true)
	f.Add(1e-100, uint64(1), uint64(1), uint64(8), uint64(9), false)
	f.Fuzz(func(t *testing.T, level float64, x1, n1, x2, n2 uint64, big bool) {
		c := fuzzCounts(x1, n1, x2, n2, big)
		if err := ValidateLevel(level); err != nil {
			if !errors.Is(err, ErrLevel) || !strings.Contains(err.Error(), "1e-06") {
				t.Fatalf("level %v: error %v does not wrap ErrLevel or state the range", level, err)
			}
			if level >= MinLevel && level <= MaxLevel {
				t.Fatalf("level %v inside the range refused: %v", level, err)
			}
			frac := math.Abs(level) - math.Floor(math.Abs(level))
			if math.IsNaN(frac) || math.IsInf(level, 0) {
				frac = 0.5
			}
			level = MinLevel + frac*(MaxLevel-MinLevel)
		}
		conf, err := NewConfidence(level)
		if err != nil {
			t.Fatalf("level %v: %v", level, err)
		}
		total := c.N1 + c.N2
		for _, m := range TwoGroupIntervalMethods(ScopeAll) {
			if m.TrialLimit > 0 && total > slowTotal {
				continue
			}
			checkInterval(t, m.IntervalAt(c, conf), c)
		}
		for _, m := range RateMethods() {
			checkInterval(t, m.IntervalAt(c.X1, c.N1, conf), c)
		}
		for _, m := range Tests() {
			if m.TrialLimit > 0 && total > slowTotal {
				continue
			}
			r, err := m.Test(c, WithLevel(level))
			if err != nil {
				t.Fatalf("%s at level %v, %+v: %v", m.Key, level, c, err)
			}
			if !(r.PValue >= 0 && r.PValue <= 1) {
				t.Fatalf("%s at level %v, %+v: p = %v", m.Key, level, c, r.PValue)
			}
			if _, err := json.Marshal(r); err != nil {
				t.Fatalf("%s at level %v, %+v: %v", m.Key, level, c, err)
			}
		}
		// The default analysis, two-sided and one-sided: a one-sided level
		// must leave the intervals' level 1 − 2α in the range.
		for _, alt := range []Alternative{TwoSided, Greater, Less} {
			a, err := Analyze(Comparison{First: Group{"a", c.X1, c.N1}, Second: Group{"b", c.X2, c.N2}, Event: "e"},
				WithLevel(level), WithAlternative(alt))
			if alt != TwoSided && 1-2*(1-level) < MinLevel {
				if !errors.Is(err, ErrLevel) {
					t.Fatalf("one-sided analysis at level %v: got %v, want ErrLevel", level, err)
				}
				continue
			}
			if err != nil {
				t.Fatalf("%s analysis at level %v, %+v: %v", alt, level, c, err)
			}
			if _, err := json.Marshal(a); err != nil {
				t.Fatalf("%s analysis at level %v, %+v: %v", alt, level, c, err)
			}
			checkInterval(t, a.Interval, c)
		}
	})
}

func checkInterval(t *testing.T, iv Interval, c Counts) {
	t.Helper()
	if math.IsNaN(iv.RawLower) || math.IsNaN(iv.RawUpper) || math.IsNaN(iv.Lower) || math.IsNaN(iv.Upper) {
		t.Fatalf("%s at level %v, %+v: NaN limits %+v", iv.Method, iv.Level, c, iv)
	}
	if iv.RawLower > iv.RawUpper || iv.Lower > iv.Upper {
		t.Fatalf("%s at level %v, %+v: limits in the wrong order %+v", iv.Method, iv.Level, c, iv)
	}
	if _, err := json.Marshal(iv); err != nil {
		t.Fatalf("%s at level %v, %+v: %v", iv.Method, iv.Level, c, err)
	}
}
