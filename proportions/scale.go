package proportions

import (
	"encoding/json"
	"fmt"
	"math"
)

// Scale is the quantity an interval method estimates or a test is about.
type Scale int

// The scales of methods.
const (
	// Difference is π1 − π2, in [−1, 1].
	Difference Scale = iota
	// Ratio is the relative risk π1/π2, in [0, ∞].
	Ratio
	// OddsRatio is π1(1−π2) / (π2(1−π1)), in [0, ∞].
	OddsRatio
	// SingleRate is one group's π, in [0, 1].
	SingleRate
)

var (
	scaleNames = [...]string{"difference", "ratio", "odds ratio", "rate"}
	// scaleKeys are the JSON spellings: hyphenated like every other
	// enumerated value (two-sided, large-sample, non-inferiority).
	scaleKeys = [...]string{"difference", "ratio", "odds-ratio", "rate"}
)

// String returns the scale's plain name.
func (f Scale) String() string {
	if f < 0 || int(f) >= len(scaleNames) {
		return fmt.Sprintf("scale(%d)", int(f))
	}
	return scaleNames[f]
}

// MarshalJSON writes the scale's JSON spelling: "difference", "ratio",
// "odds-ratio" or "rate".
func (f Scale) MarshalJSON() ([]byte, error) {
	if f < 0 || int(f) >= len(scaleKeys) {
		return nil, fmt.Errorf("scale %d: %w; use Difference, Ratio, OddsRatio or SingleRate", int(f), ErrUnsupported)
	}
	return json.Marshal(scaleKeys[f])
}

// UnmarshalJSON reads what MarshalJSON writes.
func (f *Scale) UnmarshalJSON(b []byte) error {
	var s string
	if err := json.Unmarshal(b, &s); err != nil {
		return err
	}
	for i, n := range scaleKeys {
		if n == s {
			*f = Scale(i)
			return nil
		}
	}
	return fmt.Errorf("scale %q: %w; use \"difference\", \"ratio\", \"odds-ratio\" or \"rate\"", s, ErrUnsupported)
}

// NoEffect is the value of the scale's parameter when the groups do not
// differ: 0 for a difference, 1 for a ratio or odds ratio.
func (f Scale) NoEffect() float64 {
	if f == Ratio || f == OddsRatio {
		return 1
	}
	return 0
}

// Bounds returns the parameter space [lo, hi] of the scale. Reported
// interval limits are clipped to it (the raw limits are kept beside them).
func (f Scale) Bounds() (lo, hi float64) {
	switch f {
	case Difference:
		return -1, 1
	case Ratio, OddsRatio:
		return 0, math.Inf(1)
	default:
		return 0, 1
	}
}

// Estimate returns the scale's point estimate from counts: p1 − p2 for
// the difference; p1/p2 for the ratio and (x1(n2−x2))/(x2(n1−x1)) for the
// odds ratio, which are +Inf when only the denominator is zero. When both
// numerator and denominator are zero the ratio or odds ratio is not
// estimable; Estimate then returns NaN and callers must report it as not
// estimable (EstimateDefined tells which case applies).
func (f Scale) Estimate(c Counts) float64 {
	switch f {
	case Difference:
		return c.P1() - c.P2()
	case Ratio:
		return ratioOf(float64(c.X1)*float64(c.N2), float64(c.X2)*float64(c.N1))
	case OddsRatio:
		return ratioOf(float64(c.X1)*float64(c.N2-c.X2), float64(c.X2)*float64(c.N1-c.X1))
	default:
		return c.P1()
	}
}

// EstimateDefined reports whether Estimate returns a number (possibly +Inf)
// rather than the not-estimable 0/0 case.
func (f Scale) EstimateDefined(c Counts) bool { return !math.IsNaN(f.Estimate(c)) }

func ratioOf(num, den float64) float64 {
	switch {
	case den == 0 && num == 0:
		return math.NaN()
	case den == 0:
		return math.Inf(1)
	}
	return num / den
}
