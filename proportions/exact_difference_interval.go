package proportions

import (
	"context"
	"math"
)

// Exact unconditional confidence intervals for π1 − π2 by inverting the
// exact unconditional score test of H0: π1 − π2 = δ (the test of Barnard
// with margin δ, see Barnard): a δ is inside the interval when the test does
// not reject it, the p-value being the supremum over the nuisance π2 (with
// π1 = π2 + δ) of the probability of the tables whose score statistic z(δ)
// is at least as extreme as the observed one. The coverage is at least the
// nominal level for every (π1, π2), by construction.
//
// Each limit is found by walking away from p1 − p2 (where the p-value is 1)
// in steps s = ½√(¼/n1 + ¼/n2) until the test rejects, then scanning in
// steps s/4 from the last accepted value outward, past the first rejection
// and on until the p-value falls below α/5: the p-value is not monotone in
// δ, and an accepted δ beyond the first rejection must widen the interval
// (Agresti & Min's interval undercovers without this). The boundary below
// the lowest accepted grid value is then bisected to 1e−6; the limit
// reported is the rejected end, so the interval errs on the wide side by at
// most 1e−6. Accepted islands narrower than s/4 or where the p-value has
// already fallen below α/5 would be missed. Each test costs O(n1·n2) for
// the region plus the nuisance search, and a limit takes about 30 tests
// (about 0.1 s of CPU for the interval at n1 = n2 = 100).
//
// ChanZhang and AgrestiMin are registered as the slow members of the
// difference scale (not in EnumerableIntervalMethods): Analyze and the result card
// include them up to their TrialLimit, while the coverage engine and the
// registry-wide property tests, which call a method for every outcome of a
// design, leave them out (tens of milliseconds per table would make that
// take minutes).

// ChanZhang is the exact unconditional interval of Chan ISF, Zhang Z (1999),
// "Test-based exact confidence intervals for the difference of two binomial
// proportions", Biometrics 55:1202–1209: the two one-sided exact score tests
// each at α/2, so
//
//	L = inf{δ : sup P(z(δ) ≥ z_obs(δ)) > α/2},  U = sup{δ : sup P(z(δ) ≤ z_obs(δ)) > α/2}.
var ChanZhang = IntervalMethod{
	Key:        "chan-zhang",
	Name:       "Chan–Zhang exact unconditional",
	Scale:      Difference,
	Citation:   "Chan ISF, Zhang Z (1999). Test-based exact confidence intervals for the difference of two binomial proportions. Biometrics 55:1202–1209.",
	Definition: "Inverts two one-sided exact unconditional score tests at α/2: δ is inside unless sup over π2 of P(z(δ) ≥ z_obs(δ)) or of P(z(δ) ≤ z_obs(δ)) is ≤ α/2.",
	Exact:      true,
	TrialLimit: exactIntervalTrialLimit,
	Limits: func(c Counts, conf Confidence) (float64, float64) {
		lo, hi, _ := exactScoreLimits(context.Background(), c, (1-conf.Level)/2, sideGreater)
		return lo, hi
	},
	LimitsContext: func(ctx context.Context, c Counts, conf Confidence) (float64, float64, error) {
		return exactScoreLimits(ctx, c, (1-conf.Level)/2, sideGreater)
	},
	Cost: func(c Counts, _ Confidence) Cost { return exactIntervalCost(c) },
}

// AgrestiMin is the exact unconditional interval of Agresti A, Min Y (2001),
// "On small-sample confidence intervals for parameters in discrete
// distributions", Biometrics 57:963–971: the inversion of one two-sided
// exact score test at α,
//
//	{δ : sup P(|z(δ)| ≥ |z_obs(δ)|) > α},
//
// usually narrower than Chan–Zhang because the two tails share one
// supremum.
var AgrestiMin = IntervalMethod{
	Key:        "agresti-min",
	Name:       "Agresti–Min exact unconditional",
	Scale:      Difference,
	Citation:   "Agresti A, Min Y (2001). On small-sample confidence intervals for parameters in discrete distributions. Biometrics 57:963–971.",
	Definition: "Inverts the two-sided exact unconditional score test at α: δ is inside unless sup over π2 of P(|z(δ)| ≥ |z_obs(δ)|) is ≤ α.",
	Exact:      true,
	TrialLimit: exactIntervalTrialLimit,
	Limits: func(c Counts, conf Confidence) (float64, float64) {
		lo, hi, _ := exactScoreLimits(context.Background(), c, 1-conf.Level, sideBoth)
		return lo, hi
	},
	LimitsContext: func(ctx context.Context, c Counts, conf Confidence) (float64, float64, error) {
		return exactScoreLimits(ctx, c, 1-conf.Level, sideBoth)
	},
	Cost: func(c Counts, _ Confidence) Cost { return exactIntervalCost(c) },
}

// exactScoreLimits returns both limits of an exact unconditional interval,
// the upper one as the mirror of the lower one for the groups exchanged,
// or ctx's error when ctx ends.
func exactScoreLimits(ctx context.Context, c Counts, alpha float64, side regionSide) (lower, upper float64, err error) {
	lower, err = exactScoreLower(ctx, c, alpha, side)
	if err != nil {
		return 0, 0, err
	}
	negUpper, err := exactScoreLower(ctx, c.Swapped(), alpha, side)
	if err != nil {
		return 0, 0, err
	}
	return lower, -negUpper, nil
}

// exactIntervalTrialLimit is the total n1 + n2 up to which Analyze computes
// an exact unconditional interval: about 0.3 s for one interval at 200 per
// group (measured on a 2-core machine), so an analysis with both stays
// under a second.
const exactIntervalTrialLimit = 400

// exactScoreP returns the exact unconditional score-test p-value at δ for
// the region side (no Berger–Boos restriction). Designs above
// UnconditionalMaxTables give 1, so the interval is the whole range rather
// than a hang (the registry's TrialLimit keeps analyses far below that).
// When ctx ends it returns 0 and ctx's error.
func exactScoreP(ctx context.Context, c Counts, delta float64, side regionSide) (float64, error) {
	if checkUnconditionalSize(c) != nil {
		return 1, nil
	}
	reg, _ := zRegionContext(ctx, c, delta, true, side)
	if err := ctx.Err(); err != nil {
		return 0, err
	}
	a, b := max(0, -delta), min(1, 1-delta)
	s := nuisanceSearch{work: newTailWork(reg.n1, reg.n2), reg: &reg, delta: delta, a: a, b: b, ctx: ctx}
	logp, _ := s.supremum()
	return math.Exp(logp), s.err
}

// exactScoreLower returns the lower limit: the smallest δ below p1 − p2
// that the exact score test on the given side does not reject at level
// alpha, located as described at the top of this file, or ctx's error when
// ctx ends (every p-value is then 0, so the search winds down at once).
func exactScoreLower(ctx context.Context, c Counts, alpha float64, side regionSide) (float64, error) {
	d := c.P1() - c.P2()
	if d <= -1 {
		return -1, nil
	}
	var stopped error
	p := func(delta float64) float64 {
		if stopped != nil {
			return 0
		}
		v, err := exactScoreP(ctx, c, delta, side)
		stopped = err
		return v
	}
	step := 0.5 * math.Sqrt(0.25/float64(c.N1)+0.25/float64(c.N2))
	// Coarse walk: in is not rejected, out is (δ = −1 is, unless d = −1).
	in, out := d, -1.0
	for next := in - step; next > -1; next -= step {
		if p(next) <= alpha {
			out = next
			break
		}
		in = next
	}
	// Fine scan from in outward, past out and on while the p-value stays
	// near alpha: the p-value need not fall monotonically, and an accepted
	// δ beyond the first rejection moves the limit out.
	h := step / 4
	for next := in - h; next > -1; next -= h {
		pv := p(next)
		if pv > alpha {
			in, out = next, max(next-h, -1)
			continue
		}
		if next < out && pv < 0.2*alpha {
			break
		}
		if next > out {
			out = next
		}
	}
	if in-out > h {
		out = max(in-h, -1) // rejected at the grid point below the lowest accepted one
	}
	for in-out > 1e-6 {
		mid := out + (in-out)/2
		if p(mid) > alpha {
			in = mid
		} else {
			out = mid
		}
	}
	return out, stopped
}
