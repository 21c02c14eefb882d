package operating

import (
	"context"
	"encoding/json"
	"fmt"
	"math"

	"github.com/propscope/propscope/proportions"
)

// Point is the exact behaviour of an interval method at one pair of success
// rates (π1, π2) for a design.
//
// Coverage + Below + Above = 1 (up to the skipped tails, < 1e-15), where
// Below is the chance that the whole interval lies below the truth (the
// upper limit is under it) and Above the chance that it lies above. Width
// is the expected width of the reported interval: Upper − Lower for the
// difference; for the ratio and the odds ratio it is the expected
// log(Upper/Lower) among the intervals that are bounded, Unbounded being
// the chance of an interval reaching 0 or ∞ (always 0 for the difference).
// When the truth is not defined (ratio 0/0, see [Truth]) Defined is false
// and the coverage fields are NaN; they marshal to JSON as null.
type Point struct {
	Pi1       float64 `json:"pi1"`
	Pi2       float64 `json:"pi2"`
	Truth     float64 `json:"truth"`
	Defined   bool    `json:"defined"`
	Coverage  float64 `json:"coverage"`
	Below     float64 `json:"below"`
	Above     float64 `json:"above"`
	Width     float64 `json:"width"`
	Unbounded float64 `json:"unbounded"`
}

// String prints "π1 = 0.3, π2 = 0.45: coverage 94.57% (below 2.51%, above 2.92%), width 0.3818".
func (p Point) String() string {
	if !p.Defined {
		return fmt.Sprintf("π1 = %g, π2 = %g: truth not defined (0/0)", p.Pi1, p.Pi2)
	}
	s := fmt.Sprintf("π1 = %g, π2 = %g: coverage %s (below %s, above %s), width %s",
		p.Pi1, p.Pi2, percent(p.Coverage), percent(p.Below), percent(p.Above), proportions.FormatValue(p.Width))
	if p.Unbounded > 0 {
		s += fmt.Sprintf(", unbounded %s", percent(p.Unbounded))
	}
	return s
}

type pointJSON struct {
	Pi1       float64               `json:"pi1"`
	Pi2       float64               `json:"pi2"`
	Truth     proportions.JSONFloat `json:"truth"`
	Defined   bool                  `json:"defined"`
	Coverage  proportions.JSONFloat `json:"coverage"`
	Below     proportions.JSONFloat `json:"below"`
	Above     proportions.JSONFloat `json:"above"`
	Width     proportions.JSONFloat `json:"width"`
	Unbounded proportions.JSONFloat `json:"unbounded"`
}

// MarshalJSON writes infinities as "Infinity" and NaN as null.
func (p Point) MarshalJSON() ([]byte, error) {
	j := pointJSON{p.Pi1, p.Pi2, jf(p.Truth), p.Defined, jf(p.Coverage), jf(p.Below), jf(p.Above), jf(p.Width), jf(p.Unbounded)}
	return json.Marshal(j)
}

// UnmarshalJSON reads what MarshalJSON writes.
func (p *Point) UnmarshalJSON(b []byte) error {
	var j pointJSON
	if err := json.Unmarshal(b, &j); err != nil {
		return err
	}
	*p = Point{j.Pi1, j.Pi2, float64(j.Truth), j.Defined, float64(j.Coverage), float64(j.Below), float64(j.Above), float64(j.Width), float64(j.Unbounded)}
	return nil
}

func jf(v float64) proportions.JSONFloat { return proportions.JSONFloat(v) }

// percent prints 0.94565 as "94.57%".
func percent(v float64) string {
	if math.IsNaN(v) {
		return "not defined"
	}
	return fmt.Sprintf("%.2f%%", 100*v)
}

func undefinedPoint(pi1, pi2 float64) Point {
	nan := math.NaN()
	return Point{Pi1: pi1, Pi2: pi2, Truth: nan, Coverage: nan, Below: nan, Above: nan, Width: nan, Unbounded: nan}
}

// At returns the exact coverage, its two sides and the expected width at
// (π1, π2). Each call costs O(n1·n2) for the expected width and
// O((n1 + n2)·log n2) for the coverage; for many points use [OutcomeLimits.Surface]
// or the slices, which share that work.
func (t *OutcomeLimits) At(pi1, pi2 float64) (Point, error) {
	if err := validateRates(pi1, pi2); err != nil {
		return Point{}, err
	}
	pts, err := t.evaluate(context.Background(), []float64{pi1}, []float64{pi2}, []pair{{0, 0}}, config{workers: 1})
	if err != nil {
		return Point{}, err
	}
	return pts[0], nil
}

// Coverage returns the exact coverage of method m at (π1, π2) for the
// design, with the two sides of non-coverage and the expected width (see
// [Point]). It enumerates only the outcomes whose probability is not
// negligible at (π1, π2) and calls the method once for each: use it for a
// few points; for maps and slices build an [OutcomeLimits] once.
func Coverage(m proportions.IntervalMethod, d Design, pi1, pi2 float64) (Point, error) {
	if err := d.Validate(); err != nil {
		return Point{}, err
	}
	if err := validateRates(pi1, pi2); err != nil {
		return Point{}, err
	}
	if m.Limits == nil || m.Scale == proportions.SingleRate {
		return Point{}, fmt.Errorf("interval method %q: %w; use a registered method for the difference, ratio or odds ratio", m.Key, proportions.ErrUnsupported)
	}
	conf, err := proportions.NewConfidence(d.Level)
	if err != nil {
		return Point{}, err
	}
	theta, ok := Truth(m.Scale, pi1, pi2)
	if !ok {
		return undefinedPoint(pi1, pi2), nil
	}
	var b1, b2 binomial
	b1.fill(d.N1, pi1, make([]float64, d.N1+1))
	b2.fill(d.N2, pi2, make([]float64, d.N2+1))
	blo, bhi := m.Scale.Bounds()
	var r result
	c := proportions.Counts{N1: int64(d.N1), N2: int64(d.N2)}
	for x1 := b1.lo; x1 <= b1.hi; x1++ {
		c.X1 = int64(x1)
		for x2 := b2.lo; x2 <= b2.hi; x2++ {
			c.X2 = int64(x2)
			lo, hi := m.Limits(c, conf)
			if math.IsNaN(lo) || math.IsNaN(hi) || lo > hi {
				return Point{}, fmt.Errorf("interval method %q gave limits (%v, %v) at %d/%d vs %d/%d; the engine needs numbers with lower ≤ upper",
					m.Key, lo, hi, x1, d.N1, x2, d.N2)
			}
			w := b1.p[x1] * b2.p[x2]
			switch {
			case hi < theta:
				r.below += w
			case lo > theta:
				r.above += w
			default:
				r.cov += w
			}
			if m.Scale == proportions.Difference {
				r.width += w * (min(hi, bhi) - max(lo, blo))
			} else if lw := logWidth(lo, hi); math.IsInf(lw, 1) {
				r.unbounded += w
			} else {
				r.width += w * lw
			}
		}
	}
	if m.Scale != proportions.Difference {
		r.width = amongBounded(r.width, r.unbounded)
	}
	return Point{Pi1: pi1, Pi2: pi2, Truth: theta, Defined: true,
		Coverage: r.cov, Below: r.below, Above: r.above, Width: r.width, Unbounded: r.unbounded}, nil
}
