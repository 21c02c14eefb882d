package planning

import (
	"context"
	"fmt"
	"math"

	"github.com/propscope/propscope/proportions"
)

// DefaultMaxN1 is the largest group-1 size the exact search visits unless
// Search.MaxN1 says otherwise; the search also keeps group 2 within
// MaxExactTrials.
const DefaultMaxN1 = MaxExactTrials

// Search bounds the exact sample-size search. The zero value scans from
// n1 = 1 with the default horizon and DefaultMaxN1.
type Search struct {
	// From is the first group-1 size scanned (default 1). Exact power is
	// saw-toothed, so only a scan from 1 guarantees that the reported
	// smallest size is the smallest; a later start saves time with slow tests.
	From int64 `json:"from"`
	// Horizon is the largest group-1 size checked when looking for the size
	// from which the power stays at or above the target. The default is
	// max(first + 10, ⌈1.25·first⌉), first the smallest size reaching the
	// target, widened by a quarter at a time (up to MaxN1) until the power
	// at the horizon itself reaches the target.
	Horizon int64 `json:"horizon"`
	// MaxN1 caps the scan (default DefaultMaxN1, lowered when needed so
	// that group 2, ⌈r·n1⌉, stays within MaxExactTrials).
	MaxN1 int64 `json:"max_n1"`
}

// maxN1 is the cap of the scan: MaxN1 (default DefaultMaxN1), lowered so
// that group 2 stays within MaxExactTrials.
func (s Search) maxN1(d Plan) int64 {
	maxN := s.MaxN1
	if maxN == 0 {
		maxN = DefaultMaxN1
	}
	// Group 2, ⌈r·n1⌉, stays within MaxExactTrials up to about
	// MaxExactTrials/r: start there (a cap far above it was once lowered
	// one size at a time, for hours at MaxTrials) and step over the rounding.
	if limit := float64(MaxExactTrials)/d.allocation() + 1; float64(maxN) > limit {
		maxN = int64(limit)
	}
	for maxN > 1 && d.SecondGroupSize(maxN) > MaxExactTrials {
		maxN--
	}
	return maxN
}

// validate checks the bounds of the search against the cap it really has
// (maxN1), before any work: From 0 (meaning 1) or from 1 to the cap,
// MaxN1 0 (the default) or positive, and Horizon 0 (the default) or from
// From to the cap. Errors wrap ErrPlan and name the bound at fault.
func (s Search) validate(d Plan) error {
	maxN := s.maxN1(d)
	from := max(s.From, 1)
	var bad string
	switch {
	case s.MaxN1 < 0:
		bad = fmt.Sprintf("MaxN1 %d", s.MaxN1)
	case s.From < 0 || from > maxN:
		bad = fmt.Sprintf("From %d", s.From)
	case s.Horizon < 0 || s.Horizon > 0 && (s.Horizon < from || s.Horizon > maxN):
		bad = fmt.Sprintf("horizon %d", s.Horizon)
	default:
		return nil
	}
	return fmt.Errorf("search %s: %w; the search can visit n1 from 1 to %d here (MaxN1, default %d, lowered so that group 2 stays within %d units): give From and a horizon in that range (0 for the defaults) and MaxN1 of 0 or more",
		bad, proportions.ErrPlan, maxN, DefaultMaxN1, MaxExactTrials)
}

// powerFunc is exact power at group sizes (n1, n2).
type powerFunc func(ctx context.Context, n1, n2 int64) (float64, error)

// scanResult is the outcome of a search.
type scanResult struct {
	first, stable, horizon int64
	from                   int64
	curve                  []PowerPoint
	// stableFound is false when the power at a user-set horizon is below
	// the target, so no size is stable up to it.
	stableFound bool
}

// scan walks n1 upward from s.From until the power reaches the target, then
// on to the horizon, and finds the smallest size from which every size up
// to the horizon reaches the target. Each size done adds its estimated
// cost, sizeCost(n1), to prog; once the horizon is known (or widened) the
// estimate of the rest is revised to the sizes left.
func scan(ctx context.Context, d Plan, s Search, power powerFunc, prog *progress, sizeCost func(n1 int64) float64) (scanResult, error) {
	if err := s.validate(d); err != nil {
		return scanResult{}, err
	}
	from, maxN := max(s.From, 1), s.maxN1(d)
	res := scanResult{from: from}
	at := func(n1 int64) (float64, error) {
		n2 := d.SecondGroupSize(n1)
		p, err := power(ctx, n1, n2)
		if err != nil {
			return 0, err
		}
		res.curve = append(res.curve, PowerPoint{N1: n1, N2: n2, Rate1: d.Rate1,
			Difference: d.Rate1 - d.Rate2, Ratio: d.Rate1 / d.Rate2, Power: p})
		prog.add(sizeCost(n1))
		return p, nil
	}
	rest := func(from, to int64) float64 {
		var c float64
		for n := from; n <= to; n++ {
			c += sizeCost(n)
		}
		return c
	}
	n := from
	for ; ; n++ {
		if n > maxN {
			return res, fmt.Errorf("exact power stays below %v for every n1 from %d to %d (n2 up to %d): %w; raise Search.MaxN1 (at most %d units per group) or check the design with the asymptotic SampleSize",
				d.Power, from, maxN, d.SecondGroupSize(maxN), proportions.ErrUnreachable, MaxExactTrials)
		}
		p, err := at(n)
		if err != nil {
			return res, err
		}
		if p >= d.Power {
			break
		}
	}
	res.first = n
	horizon, userHorizon := max(s.Horizon, n), s.Horizon > 0
	if !userHorizon {
		horizon = min(maxN, max(n+10, int64(math.Ceil(1.25*float64(n)))))
	}
	for {
		prog.revise(rest(n+1, horizon))
		for n++; n <= horizon; n++ {
			if _, err := at(n); err != nil {
				return res, err
			}
		}
		n = horizon
		last := res.curve[len(res.curve)-1]
		if last.Power >= d.Power || userHorizon || horizon >= maxN {
			break
		}
		horizon = min(maxN, int64(math.Ceil(1.25*float64(horizon))))
	}
	res.horizon = horizon
	res.stable, res.stableFound = stableFrom(res.curve, d.Power)
	return res, nil
}

// stableFrom returns the smallest n1 from which every point of the curve
// (ordered by n1, ending at the horizon) reaches the target.
func stableFrom(curve []PowerPoint, target float64) (int64, bool) {
	i := len(curve)
	for i > 0 && curve[i-1].Power >= target {
		i--
	}
	if i == len(curve) {
		return 0, false
	}
	return curve[i].N1, true
}
