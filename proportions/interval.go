package proportions

import (
	"encoding/json"
	"fmt"
	"math"
	"strconv"
)

// Interval is a confidence interval as reported to users.
//
// Limit rule: Lower and Upper are the raw limits clipped to the scale's
// parameter space ([−1, 1] for a difference, [0, 1] for a proportion,
// [0, ∞] for a ratio or odds ratio); RawLower and RawUpper are the limits
// exactly as the method's formula gives them, so a user can see that (for
// example) a Wald limit of 1.03 was reported as 1. Clipped tells whether
// either limit was changed. Infinite limits are legitimate for ratios (a zero
// cell); they print as "∞" and marshal to JSON as the strings "Infinity" and
// "-Infinity", never as NaN. Estimate is NaN only when Defined is false (a
// ratio of 0/0), and then it marshals as null.
type Interval struct {
	Method     string  `json:"method"`
	MethodName string  `json:"method_name"`
	Scale      Scale   `json:"scale"`
	Level      float64 `json:"level"`
	Estimate   float64 `json:"estimate"`
	Defined    bool    `json:"estimate_defined"`
	Lower      float64 `json:"lower"`
	Upper      float64 `json:"upper"`
	RawLower   float64 `json:"raw_lower"`
	RawUpper   float64 `json:"raw_upper"`
	Clipped    bool    `json:"clipped"`
}

// Width returns Upper − Lower (+Inf for an unbounded interval).
func (iv Interval) Width() float64 { return iv.Upper - iv.Lower }

// Contains reports whether v lies in the closed interval [Lower, Upper].
func (iv Interval) Contains(v float64) bool { return v >= iv.Lower && v <= iv.Upper }

// String prints "name: estimate (lower, upper) at level%".
func (iv Interval) String() string {
	return fmt.Sprintf("%s: %s (%s to %s), %s%% confidence", iv.MethodName, FormatValue(iv.Estimate), FormatValue(iv.Lower), FormatValue(iv.Upper), strconv.FormatFloat(100*iv.Level, 'g', -1, 64))
}

// FormatValue prints a number with 4 decimals, "∞"/"−∞" for infinities and
// "not estimable" for NaN.
func FormatValue(v float64) string {
	switch {
	case math.IsInf(v, 1):
		return "∞"
	case math.IsInf(v, -1):
		return "−∞"
	case math.IsNaN(v):
		return "not estimable"
	}
	return strconv.FormatFloat(v, 'f', 4, 64)
}

// JSONFloat is a float64 that marshals ±Inf as the strings "Infinity" and
// "-Infinity" and NaN as null, since JSON has no such numbers.
type JSONFloat float64

// MarshalJSON implements json.Marshaler.
func (f JSONFloat) MarshalJSON() ([]byte, error) {
	v := float64(f)
	switch {
	case math.IsInf(v, 1):
		return []byte(`"Infinity"`), nil
	case math.IsInf(v, -1):
		return []byte(`"-Infinity"`), nil
	case math.IsNaN(v):
		return []byte(`null`), nil
	}
	return json.Marshal(v)
}

// UnmarshalJSON implements json.Unmarshaler.
func (f *JSONFloat) UnmarshalJSON(b []byte) error {
	switch string(b) {
	case `"Infinity"`:
		*f = JSONFloat(math.Inf(1))
		return nil
	case `"-Infinity"`:
		*f = JSONFloat(math.Inf(-1))
		return nil
	case `null`:
		*f = JSONFloat(math.NaN())
		return nil
	}
	var v float64
	if err := json.Unmarshal(b, &v); err != nil {
		return err
	}
	*f = JSONFloat(v)
	return nil
}

type intervalJSON struct {
	Method     string    `json:"method"`
	MethodName string    `json:"method_name"`
	Scale      Scale     `json:"scale"`
	Level      float64   `json:"level"`
	Estimate   JSONFloat `json:"estimate"`
	Defined    bool      `json:"estimate_defined"`
	Lower      JSONFloat `json:"lower"`
	Upper      JSONFloat `json:"upper"`
	RawLower   JSONFloat `json:"raw_lower"`
	RawUpper   JSONFloat `json:"raw_upper"`
	Clipped    bool      `json:"clipped"`
}

// MarshalJSON writes the interval with infinite limits as strings.
func (iv Interval) MarshalJSON() ([]byte, error) {
	return json.Marshal(intervalJSON{iv.Method, iv.MethodName, iv.Scale, iv.Level, JSONFloat(iv.Estimate), iv.Defined,
		JSONFloat(iv.Lower), JSONFloat(iv.Upper), JSONFloat(iv.RawLower), JSONFloat(iv.RawUpper), iv.Clipped})
}

// UnmarshalJSON reads what MarshalJSON writes.
func (iv *Interval) UnmarshalJSON(b []byte) error {
	var j intervalJSON
	if err := json.Unmarshal(b, &j); err != nil {
		return err
	}
	*iv = Interval{j.Method, j.MethodName, j.Scale, j.Level, float64(j.Estimate), j.Defined,
		float64(j.Lower), float64(j.Upper), float64(j.RawLower), float64(j.RawUpper), j.Clipped}
	return nil
}

// clip applies the limit rule documented on Interval.
func clip(f Scale, rawLo, rawHi float64) (lo, hi float64, clipped bool) {
	blo, bhi := f.Bounds()
	lo, hi = rawLo, rawHi
	if lo < blo {
		lo, clipped = blo, true
	}
	if hi > bhi {
		hi, clipped = bhi, true
	}
	return lo, hi, clipped
}
