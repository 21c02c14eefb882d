package operating

import (
	"encoding/json"
	"fmt"
	"math"

	"github.com/propscope/propscope/proportions"
)

// ShortfallMargin is how far below the nominal level a grid point's
// coverage must fall to count in Summary.ShareBelow: one percentage point.
const ShortfallMargin = 0.01

// Summary condenses a coverage surface (or a part of it) into the figures
// used to compare methods. Only grid points with a defined truth count.
type Summary struct {
	// Nominal is the design's level.
	Nominal float64 `json:"nominal"`
	// Points is the number of grid points summarised.
	Points int `json:"points"`
	// Min is the lowest coverage, found at (MinPi1, MinPi2) (the first
	// such point in grid order).
	Min    float64 `json:"min"`
	MinPi1 float64 `json:"min_pi1"`
	MinPi2 float64 `json:"min_pi2"`
	// Mean is the average coverage over the points (each point weighs the same).
	Mean float64 `json:"mean"`
	// ShareBelow is the share of the points whose coverage is below
	// Nominal − ShortfallMargin.
	ShareBelow float64 `json:"share_below"`
	// MeanWidth is the average expected width (log scale for the ratio
	// scales, among bounded intervals; +Inf if some point has only
	// unbounded intervals).
	MeanWidth float64 `json:"mean_width"`
}

// String prints "min 93.12% at (0.05, 0.1), mean 94.88%, 3.1% of points below 94%, mean width 0.2345".
func (s Summary) String() string {
	if s.Points == 0 {
		return "no grid points"
	}
	return fmt.Sprintf("min %s at (%g, %g), mean %s, %.1f%% of points below %s, mean width %s",
		percent(s.Min), s.MinPi1, s.MinPi2, percent(s.Mean), 100*s.ShareBelow,
		percent(s.Nominal-ShortfallMargin), proportions.FormatValue(s.MeanWidth))
}

// MarshalJSON writes an infinite mean width as "Infinity".
func (s Summary) MarshalJSON() ([]byte, error) {
	type plain Summary
	return json.Marshal(struct {
		plain
		MeanWidth proportions.JSONFloat `json:"mean_width"`
	}{plain(s), jf(s.MeanWidth)})
}

// Region is a rectangle of success rates: Pi1Min ≤ π1 ≤ Pi1Max and
// Pi2Min ≤ π2 ≤ Pi2Max, for example the rates a study can plausibly meet.
type Region struct {
	Pi1Min float64 `json:"pi1_min"`
	Pi1Max float64 `json:"pi1_max"`
	Pi2Min float64 `json:"pi2_min"`
	Pi2Max float64 `json:"pi2_max"`
}

// Contains reports whether (π1, π2) lies in the closed rectangle.
func (r Region) Contains(pi1, pi2 float64) bool {
	return pi1 >= r.Pi1Min && pi1 <= r.Pi1Max && pi2 >= r.Pi2Min && pi2 <= r.Pi2Max
}

// Validate checks that the bounds are rates with min ≤ max.
func (r Region) Validate() error {
	for _, v := range [4]float64{r.Pi1Min, r.Pi1Max, r.Pi2Min, r.Pi2Max} {
		if err := validateRate("region bound", v); err != nil {
			return err
		}
	}
	if r.Pi1Min > r.Pi1Max || r.Pi2Min > r.Pi2Max {
		return fmt.Errorf("region %+v: %w; each minimum must not exceed its maximum", r, proportions.ErrPlan)
	}
	return nil
}

// Summary summarises the whole grid.
func (s *Surface) Summary() Summary {
	return s.summarise(func(float64, float64) bool { return true })
}

// RegionSummary summarises the grid points inside r. It returns an error
// wrapping proportions.ErrPlan for bounds outside [0, 1] or reversed,
// and proportions.ErrEmptyInput when no grid point with a defined truth lies
// inside.
func (s *Surface) RegionSummary(r Region) (Summary, error) {
	if err := r.Validate(); err != nil {
		return Summary{}, err
	}
	sum := s.summarise(r.Contains)
	if sum.Points == 0 {
		return sum, fmt.Errorf("region %+v: %w; no grid point lies inside it", r, proportions.ErrEmptyInput)
	}
	return sum, nil
}

func (s *Surface) summarise(keep func(pi1, pi2 float64) bool) Summary {
	sum := Summary{Nominal: s.Design.Level, Min: math.Inf(1)}
	var total, width float64
	var below int
	for i, p1 := range s.Pi1 {
		for j, p2 := range s.Pi2 {
			k := i*len(s.Pi2) + j
			if !s.Defined[k] || !keep(p1, p2) {
				continue
			}
			c := s.Coverage[k]
			sum.Points++
			total += c
			width += s.Width[k]
			if c < sum.Min {
				sum.Min, sum.MinPi1, sum.MinPi2 = c, p1, p2
			}
			if c < s.Design.Level-ShortfallMargin {
				below++
			}
		}
	}
	if sum.Points == 0 {
		return Summary{Nominal: s.Design.Level}
	}
	n := float64(sum.Points)
	sum.Mean, sum.ShareBelow, sum.MeanWidth = total/n, float64(below)/n, width/n
	return sum
}
