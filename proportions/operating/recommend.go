package operating

import (
	"context"
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/propscope/propscope/proportions"
)

// DefaultTolerance is how far below the nominal level a method's minimum
// coverage may fall and still count as holding its level in [Recommend]:
// two percentage points (half the level for levels below 0.04).
const DefaultTolerance = 0.02

// closenessStep is the resolution at which mean coverages are compared
// with the nominal level: a quarter of a percentage point. Methods whose
// distances fall in the same step are ranked by their mean width.
const closenessStep = 0.0025

// Criterion states the ranking rule of [Recommend] in plain words.
const Criterion = "Coverage is computed exactly at every grid point with both rates strictly between 0 and 1. " +
	"Methods whose lowest exact coverage there stays within the tolerance of the nominal level " +
	"come first. Among them, the one whose average coverage is closer to the nominal level ranks higher " +
	"(compared in steps of a quarter of a percentage point); at equal closeness, the one with the shorter " +
	"average expected width. Methods that fall further below come after, the higher lowest coverage first."

// Ranked is one method's place in a recommendation.
type Ranked struct {
	Rank       int    `json:"rank"`
	Method     string `json:"method"`
	MethodName string `json:"method_name"`
	// HoldsLevel: the lowest coverage is at least nominal − tolerance.
	HoldsLevel bool    `json:"holds_level"`
	Summary    Summary `json:"summary"`
	// Reason is one sentence on why the method sits where it does.
	Reason string `json:"reason"`
}

// Skipped is a registered method left out of a recommendation, and why.
type Skipped struct {
	Method     string `json:"method"`
	MethodName string `json:"method_name"`
	Reason     string `json:"reason"`
}

// Recommendation ranks the interval methods of one scale for a design
// and level. It depends on the design only (the group sizes, the level and
// the grid of rates), never on observed data, so it can be read before a
// study is run and does not invite choosing the method after seeing the
// results.
type Recommendation struct {
	Design    Design            `json:"design"`
	Scale     proportions.Scale `json:"scale"`
	Tolerance float64           `json:"tolerance"`
	Criterion string            `json:"criterion"`
	Ranking   []Ranked          `json:"ranking"`
	Skipped   []Skipped         `json:"skipped"`
}

// Best returns the first-ranked method (false when none was ranked).
func (r *Recommendation) Best() (Ranked, bool) {
	if len(r.Ranking) == 0 {
		return Ranked{}, false
	}
	return r.Ranking[0], true
}

// String prints the ranking, one method per line with its reason.
func (r *Recommendation) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "Interval methods for the %s at %s, ranked by exact coverage (tolerance %s points):\n",
		r.Scale, r.Design, formatPoints(r.Tolerance))
	for _, m := range r.Ranking {
		fmt.Fprintf(&b, "%d. %s: %s\n", m.Rank, m.MethodName, m.Reason)
	}
	for _, s := range r.Skipped {
		fmt.Fprintf(&b, "not ranked: %s: %s\n", s.MethodName, s.Reason)
	}
	return b.String()
}

// Recommend ranks the registered interval methods of scale f for the
// design by their exact coverage over a grid of rates (default 0, 0.01, …,
// 1 in both groups; the points with a rate of exactly 0 or 1 are left
// out of the ranking), following [Criterion]. It depends on the design
// only, never on observed data. It reads WithGrid, WithTolerance,
// WithProgress (methods done out of those ranked) and WithWorkers, and
// stops with ctx's error when ctx is cancelled. Methods whose TrialLimit is
// below n1 + n2 are listed as skipped.
func Recommend(ctx context.Context, f proportions.Scale, d Design, opts ...RunOption) (*Recommendation, error) {
	if err := d.Validate(); err != nil {
		return nil, err
	}
	cfg := newConfig(opts)
	cfg.tolerance = cfg.toleranceFor(d.Level)
	if !(cfg.tolerance >= 0 && cfg.tolerance < d.Level) {
		return nil, fmt.Errorf("tolerance %v: %w; use a value from 0 up to the level %v, such as %v", cfg.tolerance, proportions.ErrPlan, d.Level, min(DefaultTolerance, d.Level/2))
	}
	rec := &Recommendation{Design: d, Scale: f, Tolerance: cfg.tolerance, Criterion: Criterion}
	var methods []proportions.IntervalMethod
	for _, m := range proportions.EnumerableIntervalMethods(f) {
		if m.TrialLimit > 0 && int64(d.N1+d.N2) > m.TrialLimit {
			rec.Skipped = append(rec.Skipped, Skipped{m.Key, m.Name,
				fmt.Sprintf("too slow for exact enumeration beyond %d trials in all (this design has %d)", m.TrialLimit, d.N1+d.N2)})
			continue
		}
		methods = append(methods, m)
	}
	if len(methods) == 0 {
		return nil, fmt.Errorf("%s: %w; no registered interval method can be evaluated at %s", f, proportions.ErrUnknownMethod, d)
	}
	rep := newReporter(cfg.progress, len(methods))
	inner := cfg
	inner.progress = nil
	innerOpts := []RunOption{func(c *config) { *c = inner }}
	for _, m := range methods {
		tab, err := NewOutcomeLimits(ctx, m, d, innerOpts...)
		if err != nil {
			return nil, err
		}
		s, err := tab.Surface(ctx, innerOpts...)
		if err != nil {
			return nil, err
		}
		sum := s.summarise(inside)
		rec.Ranking = append(rec.Ranking, Ranked{Method: m.Key, MethodName: m.Name,
			HoldsLevel: sum.Min >= d.Level-cfg.tolerance, Summary: sum})
		rep.Add(1)
	}
	slices.SortStableFunc(rec.Ranking, func(a, b Ranked) int { return compareRanked(a, b, d.Level) })
	anyHolds := rec.Ranking[0].HoldsLevel
	for i := range rec.Ranking {
		rec.Ranking[i].Rank = i + 1
		rec.Ranking[i].Reason = reason(rec.Ranking[i], f, d.Level, cfg.tolerance, anyHolds)
	}
	return rec, nil
}

// inside keeps the grid points where neither group's outcome is certain
// (0 < π < 1), as coverage comparisons usually do: at π = 0 or 1 every
// study sees the same count in that group.
func inside(pi1, pi2 float64) bool { return pi1 > 0 && pi1 < 1 && pi2 > 0 && pi2 < 1 }

// compareRanked orders two methods by Criterion.
func compareRanked(a, b Ranked, nominal float64) int {
	switch {
	case a.HoldsLevel != b.HoldsLevel:
		if a.HoldsLevel {
			return -1
		}
		return 1
	case !a.HoldsLevel:
		return cmpFloat(b.Summary.Min, a.Summary.Min)
	}
	ca, cb := closeness(a.Summary.Mean, nominal), closeness(b.Summary.Mean, nominal)
	if ca != cb {
		return cmpFloat(ca, cb)
	}
	return cmpFloat(a.Summary.MeanWidth, b.Summary.MeanWidth)
}

func closeness(mean, nominal float64) float64 {
	return math.Floor(math.Abs(mean-nominal) / closenessStep)
}

// reason writes the one-sentence explanation of a method's place.
func reason(r Ranked, f proportions.Scale, nominal, tol float64, anyHolds bool) string {
	s := r.Summary
	where := fmt.Sprintf("(π1 = %g, π2 = %g)", s.MinPi1, s.MinPi2)
	if r.HoldsLevel {
		return fmt.Sprintf("holds the level, its lowest coverage being %s at %s; average %s, %s points from %s; mean width %s.",
			percent(s.Min), where, percent(s.Mean), formatPoints(math.Abs(s.Mean-nominal)), percent(nominal),
			widthText(s.MeanWidth, f))
	}
	if !anyHolds {
		return fmt.Sprintf("falls to %s at %s, more than %s points below %s; no method holds the level at this design, so this lowest coverage sets the rank; average %s.",
			percent(s.Min), where, formatPoints(tol), percent(nominal), percent(s.Mean))
	}
	return fmt.Sprintf("falls to %s at %s, more than %s points below %s, so it ranks after the methods that hold the level; average %s.",
		percent(s.Min), where, formatPoints(tol), percent(nominal), percent(s.Mean))
}

// widthText prints a mean width in the unit of its scale's axis: a
// difference's width in percentage points ("6.09 percentage points"), a
// ratio's or odds ratio's as a plain number.
func widthText(w float64, f proportions.Scale) string {
	if f == proportions.Difference && !math.IsInf(w, 0) && !math.IsNaN(w) {
		return fmt.Sprintf("%.2f percentage points", 100*w)
	}
	return proportions.FormatValue(w)
}

// formatPoints prints a difference of proportions as percentage points.
func formatPoints(v float64) string { return fmt.Sprintf("%.2g", 100*v) }
