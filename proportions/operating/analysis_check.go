package operating

import (
	"context"
	"fmt"

	"github.com/propscope/propscope/proportions"
)

// CheckLimit is the largest group size at which CheckAnalysis computes
// exact coverage: up to it every method's table costs well under a second
// on two cores; beyond it the check is skipped (say so in the analysis).
const CheckLimit = 500

// dipMargin is how far below nominal a method's lowest coverage in the
// plausible region may fall before it is flagged even when its mean holds.
const dipMargin = 0.05

// checkGrid is the number of grid points per axis inside the plausible
// region; 21 × 21 points resolve the coverage's oscillation well enough
// for a warning at the 1-point level.
const checkGrid = 21

// CheckAnalysis adds an undercoverage warning to the analysis for each of
// its intervals for the difference whose exact coverage at this design
// falls short of the nominal level where the data say the true rates may
// be. The plausible region is the box of the two groups' first (Wilson)
// intervals at the analysis's interval level. A method is flagged when its
// mean exact coverage over that region is below nominal − ShortfallMargin
// (1 point), or its lowest coverage there is more than 5 points below
// nominal. The
// check depends on the design and on the region only; it reads the methods
// from the registry by key. Exact (conservative) methods are not checked.
// Above CheckLimit trials in a group it adds nothing and returns nil; a
// nil analysis is an error wrapping proportions.ErrEmptyInput.
func CheckAnalysis(ctx context.Context, a *proportions.Analysis) error {
	if a == nil {
		return fmt.Errorf("no analysis to check (nil): %w; pass the address of an analysis made by proportions.Analyze", proportions.ErrEmptyInput)
	}
	n1, n2 := a.Comparison.First.Trials, a.Comparison.Second.Trials
	if n1 > CheckLimit || n2 > CheckLimit || len(a.DifferenceIntervals) == 0 {
		return nil
	}
	level := a.DifferenceIntervals[0].Level
	d, err := NewDesign(int(n1), int(n2), level)
	if err != nil {
		return err
	}
	region, grid1, grid2 := plausibleRegion(a)
	for _, iv := range a.DifferenceIntervals {
		m, err := proportions.LookupInterval(iv.Method)
		if err != nil || m.Exact {
			continue
		}
		t, err := NewOutcomeLimits(ctx, m, d)
		if err != nil {
			return err
		}
		s, err := t.Surface(ctx, WithGrid(grid1, grid2))
		if err != nil {
			return err
		}
		sum, err := s.RegionSummary(region)
		if err != nil {
			return err
		}
		if sum.Mean < level-ShortfallMargin || sum.Min < level-dipMargin {
			a.Warnings = append(a.Warnings, undercoverageWarning(m.Name, d, sum))
		}
	}
	return nil
}

// plausibleRegion returns the box of the groups' first intervals and an
// even grid over it.
func plausibleRegion(a *proportions.Analysis) (Region, []float64, []float64) {
	b1, b2 := a.Groups[0].Intervals, a.Groups[1].Intervals
	r := Region{Pi1Min: 0, Pi1Max: 1, Pi2Min: 0, Pi2Max: 1}
	if len(b1) > 0 && len(b2) > 0 {
		r = Region{Pi1Min: b1[0].Lower, Pi1Max: b1[0].Upper, Pi2Min: b2[0].Lower, Pi2Max: b2[0].Upper}
	}
	return r, evenGrid(r.Pi1Min, r.Pi1Max), evenGrid(r.Pi2Min, r.Pi2Max)
}

func evenGrid(lo, hi float64) []float64 {
	g := make([]float64, checkGrid)
	for i := range g {
		g[i] = lo + (hi-lo)*float64(i)/float64(checkGrid-1)
	}
	g[checkGrid-1] = hi
	return g
}

func undercoverageWarning(name string, d Design, s Summary) proportions.Warning {
	if s.Mean < d.Level-ShortfallMargin {
		return proportions.Warning{Code: proportions.WarnUndercoverage, Message: fmt.Sprintf(
			"With %d and %d units, the %s interval's exact coverage over the rates compatible with the data averages %.1f%% "+
				"and falls to %.1f%%, short of the nominal %.4g%%: do not rely on it here.",
			d.N1, d.N2, name, 100*s.Mean, 100*s.Min, 100*d.Level)}
	}
	return proportions.Warning{Code: proportions.WarnUndercoverage, Message: fmt.Sprintf(
		"With %d and %d units, the %s interval's exact coverage over the rates compatible with the data averages %.1f%% "+
			"but falls to %.1f%% at some of them (nominal %.4g%%).",
		d.N1, d.N2, name, 100*s.Mean, 100*s.Min, 100*d.Level)}
}
