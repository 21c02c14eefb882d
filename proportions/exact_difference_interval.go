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
// The p-value is not monotone in δ (the set of tables at least as extreme
// changes with δ), so the set of accepted δ can have gaps, and accepted
// stretches can be far narrower than any grid step; each limit is the
// outermost accepted value, found by a scan on a grid and a bound that
// proves stretches between grid values rejected (exactScoreLower). The
// limit reported is the rejected end of a stretch of 1e−6 whose other end
// is accepted, so the interval errs on the wide side by at most 1e−6. Each
// test costs O(n1 + n2) statistics for its region (a staircase walk along
// the region's edge, see staircaseRegion) plus the nuisance search, and a
// limit takes about 35–50 tests and bounds (measured as CPU time on the
// shared 2-core machine: about 0.05 s for the interval at n1 = n2 = 100,
// 0.25 s at 500 and 0.6 s at 1000; BenchmarkExactIntervalTargets compares
// it with a plain grid-and-bisection yardstick).
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
// an exact unconditional interval. It was set when one interval took about
// 0.4 s of CPU at 200 per group; with the staircase regions that is about
// 0.1 s (0.25 s at 500 per group), and the limit is kept where it was so
// that analyses keep their scope (raising it is a separate decision).
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

// exactScoreSearch evaluates the exact score test of one table at many
// values of δ for the limit search. Its regions are built by a staircase
// walk (staircaseRegion) that computes the score statistic of about
// n1 + n2 tables instead of all (n1+1)·(n2+1): computing the statistic of
// every table, the restricted-likelihood cubic each, was most of the cost
// of an interval (84% at 500 per group).
type exactScoreSearch struct {
	c    Counts
	side regionSide
	work *tailWork
	// ctx is looked at before every p-value and bound; its error, once
	// seen, is kept in err and every later evaluation returns 0.
	ctx context.Context
	err error
}

func newExactScoreSearch(ctx context.Context, c Counts, side regionSide) *exactScoreSearch {
	return &exactScoreSearch{c: c, side: side, work: newTailWork(int(c.N1), int(c.N2)), ctx: ctx}
}

// stopped reports whether ctx has ended, keeping its error.
func (e *exactScoreSearch) stopped() bool {
	if e.err == nil {
		e.err = e.ctx.Err()
	}
	return e.err != nil
}

// region returns the tables whose score statistic at delta is on side of
// zobs.
func (e *exactScoreSearch) region(delta, zobs float64, side regionSide) region {
	n1, n2 := float64(e.c.N1), float64(e.c.N2)
	z := func(x1, x2 int) float64 { return exactScoreZ(float64(x1), n1, float64(x2), n2, delta) }
	return staircaseRegion(e.ctx, int(e.c.N1), int(e.c.N2), z, zobs, side)
}

// obs returns the observed score statistic at delta.
func (e *exactScoreSearch) obs(delta float64) float64 {
	return exactScoreZ(float64(e.c.X1), float64(e.c.N1), float64(e.c.X2), float64(e.c.N2), delta)
}

// p is exactScoreP(c, delta, side) (the same statistic, without its
// shortcut for δ = 0).
func (e *exactScoreSearch) p(delta float64) float64 {
	if checkUnconditionalSize(e.c) != nil {
		return 1
	}
	if e.stopped() {
		return 0
	}
	reg := e.region(delta, e.obs(delta), e.side)
	s := nuisanceSearch{work: e.work, reg: &reg, delta: delta, a: max(0, -delta), b: min(1, 1-delta), ctx: e.ctx}
	logp, _ := s.supremum()
	if s.err != nil {
		e.err = s.err
		return 0
	}
	return math.Exp(logp)
}

// staircaseRegion builds the region {t : zInRegion(z(t), zobs, side)} of a
// statistic z that rises with x1 and falls with x2 (the score statistic
// at any δ: TestScoreStatisticMonotone), from the statistic of about
// n1 + n2 tables: the part z ≥ threshold of row x1 is x2 = 0..c(x1), with
// c never falling as x1 rises, so its edge is walked once across the
// table; the part z ≤ threshold is x2 = d(x1)..n2, likewise. A two-sided
// region is both parts for |zobs| (every table when zobs = 0).
// TestStaircaseRegion compares it with the table-by-table region.
func staircaseRegion(ctx context.Context, n1, n2 int, z func(x1, x2 int) float64, zobs float64, side regionSide) region {
	upper, lower := side == sideGreater, side == sideLess
	if side == sideBoth {
		if zobs == 0 {
			return fullRegion(n1, n2)
		}
		upper, lower = true, true
	}
	r := region{n1: n1, n2: n2, rowStart: make([]int32, n1+2)}
	c, d := -1, 0 // the upper part's last x2, the lower part's first
	for x1 := 0; x1 <= n1; x1++ {
		r.rowStart[x1] = int32(len(r.runs))
		if ctx.Err() != nil {
			for k := x1 + 1; k <= n1+1; k++ {
				r.rowStart[k] = int32(len(r.runs))
			}
			return r
		}
		if upper {
			for c < n2 {
				v := z(x1, c+1)
				if (side == sideBoth && v <= 0) || !zInRegion(v, zobs, side) {
					break
				}
				c++
			}
		}
		if lower {
			for d <= n2 {
				v := z(x1, d)
				if (side != sideBoth || v < 0) && zInRegion(v, zobs, side) {
					break
				}
				d++
			}
		}
		lo, hi := int32(-1), int32(n2+1) // no upper run, no lower run
		if upper && c >= 0 {
			lo = int32(c)
		}
		if lower && d <= n2 {
			hi = int32(d)
		}
		if lo >= 0 && hi <= int32(n2) && lo+1 >= hi { // the parts touch: one run
			r.runs = append(r.runs, [2]int32{0, int32(n2)})
			r.tables += int64(n2 + 1)
			continue
		}
		if lo >= 0 {
			r.runs = append(r.runs, [2]int32{0, lo})
			r.tables += int64(lo) + 1
		}
		if hi <= int32(n2) {
			r.runs = append(r.runs, [2]int32{hi, int32(n2)})
			r.tables += int64(int32(n2) - hi + 1)
		}
	}
	r.rowStart[n1+1] = int32(len(r.runs))
	return r
}

// fullRegion is the region of every table.
func fullRegion(n1, n2 int) region {
	r := region{n1: n1, n2: n2, rowStart: make([]int32, n1+2), tables: int64(n1+1) * int64(n2+1)}
	for x1 := 0; x1 <= n1; x1++ {
		r.rowStart[x1] = int32(len(r.runs))
		r.runs = append(r.runs, [2]int32{0, int32(n2)})
	}
	r.rowStart[n1+1] = int32(len(r.runs))
	return r
}

// bound returns an upper bound on the p-value (side Greater or Both) over
// the whole stretch lo ≤ δ ≤ hi, for hi ≤ p1 − p2; a bound of at most α
// proves that the test rejects every δ there. It rests on three
// monotonicities of the score statistic z_t(δ) of a table t: it falls as δ
// rises, rises with x1 and falls with x2 (TestScoreStatisticMonotone
// checks them on three designs, and the sweep tests check the resulting
// intervals against brute force).
//
// For δ in the stretch, z_obs(δ) ≥ z_obs(hi) ≥ 0, so a table at least as
// large as z_obs(δ) has z_t(lo) ≥ z_t(δ) ≥ z_obs(hi): the upper part of
// every region lies in U = {t : z_t(lo) ≥ z_obs(hi)}, and the lower part of
// a two-sided region, z_t(δ) ≤ −z_obs(δ), in D = {t : z_t(hi) ≤
// −z_obs(hi)}. U contains with each table those with more events in group
// 1 or fewer in group 2, so its probability rises with π1 and falls with
// π2, and D's does the opposite: at a given π2, the region's probability on
// the line π1 = π2 + δ is at most P(U) at π1 = π2 + hi plus P(D) at
// π1 = π2 + lo. The supremum of that sum over π2 bounds the p-value on the
// whole stretch, and it tends to the p-value as the stretch shrinks away
// from the values of δ where the region changes. (The π2 above 1 − hi, on
// the lines of smaller δ, need no more: there P(U) at (1, π2) is at most
// its value at (1, 1 − hi).)
func (e *exactScoreSearch) bound(lo, hi float64) float64 {
	if checkUnconditionalSize(e.c) != nil {
		return 1
	}
	if e.stopped() {
		return 0
	}
	zobs := e.obs(hi)
	up := e.region(lo, zobs, sideGreater)
	s := nuisanceSearch{work: e.work, reg: &up, delta: hi, a: max(0, -hi), b: min(1, 1-lo), ctx: e.ctx}
	if e.side == sideBoth {
		down := e.region(hi, -zobs, sideLess)
		s.low, s.lowDelta = &down, lo
	}
	logp, _ := s.supremum()
	if s.err != nil {
		e.err = s.err
		return 0
	}
	return math.Exp(logp)
}

// exactLimitTolerance is the width to which a limit is located: the limit
// reported is the rejected end of a stretch this wide whose other end is
// accepted, so the interval errs on the wide side by at most this much.
const exactLimitTolerance = 1e-6

// exactScoreLower returns the lower limit: the smallest δ below p1 − p2
// that the exact score test on the given side does not reject at level
// alpha (side Greater or Both).
//
// The p-value is not monotone in δ: the region of tables at least as
// extreme changes with δ, and the p-value jumps where a table enters or
// leaves it, so the accepted set can have gaps and accepted stretches
// narrower than any grid. The search walks away from p1 − p2 (where the
// p-value is 1) in steps s = ½√(¼/n1 + ¼/n2) until the test rejects, then
// scans in steps s/4 from the last accepted value outward, past the first
// rejection and on until the p-value falls below α/5. Every stretch between
// scanned values below the lowest accepted one is then settled, from the
// outermost inward: it is dismissed when the bound of
// exactScoreSearch.bound is at most α, else halved and its halves settled
// the same way, the outer half first; a stretch of exactLimitTolerance
// whose inner end is accepted gives the limit (its outer end). The stretch
// just below the lowest accepted scanned value holds a crossing, located
// first by bisection so that only the part outside it needs the bound.
// What remains unsearched: accepted stretches narrower than
// exactLimitTolerance, and any beyond the point where the scan stopped.
// When ctx ends it returns ctx's error (every p-value and bound is then 0,
// so the search winds down at once).
func exactScoreLower(ctx context.Context, c Counts, alpha float64, side regionSide) (float64, error) {
	d := c.P1() - c.P2()
	if d <= -1 {
		return -1, nil
	}
	e := newExactScoreSearch(ctx, c, side)
	step := 0.5 * math.Sqrt(0.25/float64(c.N1)+0.25/float64(c.N2))
	// Coarse walk: in is not rejected, out is (δ = −1 is, unless d = −1).
	in, out := d, -1.0
	for next := in - step; next > -1; next -= step {
		if e.p(next) <= alpha {
			out = next
			break
		}
		in = next
	}
	// Fine scan from in outward, past out and on while the p-value stays
	// near alpha. grid holds the scanned values from the lowest accepted
	// one outward, all but the first rejected.
	h := step / 4
	grid := []float64{in}
	for next := in - h; ; next -= h {
		if next <= -1 {
			grid = append(grid, -1)
			break
		}
		pv := e.p(next)
		if pv > alpha {
			grid = append(grid[:0], next)
			continue
		}
		grid = append(grid, next)
		if next < out && pv < 0.2*alpha {
			break
		}
	}
	// settle returns the outer end of the outermost accepted stretch in
	// [lo, hi] found as described above; acceptedHi says p(hi) > alpha.
	var settle func(lo, hi float64, acceptedHi bool) (float64, bool)
	settle = func(lo, hi float64, acceptedHi bool) (float64, bool) {
		if hi-lo <= exactLimitTolerance {
			if acceptedHi || e.p(hi) > alpha {
				return lo, true
			}
			return 0, false
		}
		if !acceptedHi && e.bound(lo, hi) <= alpha {
			return 0, false
		}
		mid := lo + (hi-lo)/2
		if v, ok := settle(lo, mid, false); ok {
			return v, true
		}
		return settle(mid, hi, acceptedHi)
	}
	for i := len(grid) - 2; i >= 1; i-- {
		if v, ok := settle(grid[i+1], grid[i], false); ok {
			return v, e.err
		}
	}
	// The crossing next to the lowest accepted value, then the part of
	// its stretch outside the crossing.
	in, out = grid[0], grid[1]
	for in-out > exactLimitTolerance {
		mid := out + (in-out)/2
		if e.p(mid) > alpha {
			in = mid
		} else {
			out = mid
		}
	}
	if v, ok := settle(grid[1], out, false); ok {
		return v, e.err
	}
	return out, e.err
}
