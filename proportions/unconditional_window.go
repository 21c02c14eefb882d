package proportions

import (
	"context"
	"fmt"
	"math"
	"slices"
	"sync"

	"github.com/propscope/propscope/internal/special"
	"github.com/propscope/propscope/internal/workpool"
)

// Deciding every outcome of a design at once, for the unconditional exact
// tests (the exact planning and the engine's power and size need nothing
// else).
//
// For one design (n1, n2), null δ0 and side, the region of an outcome
// depends on the outcome only through its observed statistic s (zRegionAt,
// fisherRegionAt), and so does its p-value F(s), the largest tail of that
// region over the nuisance parameter (sideSupremum). The regions are
// nested, smaller the more extreme s is, so F falls as s becomes more
// extreme, and the test rejects exactly the outcomes at least as extreme as
// the least extreme statistic it rejects: the critical value. The decider
//
//  1. computes s for every outcome of the window and sorts the distinct
//     values, most extreme first;
//  2. finds the critical value among them by a galloping search followed by
//     bisection, started from the last critical value of the same side and
//     level (DecisionMemory) or from the normal approximation's; each probe
//     is the test's own computation for that statistic, so it gives the
//     p-value Run gives every outcome with that statistic;
//  3. decides each outcome by comparing its statistic with the critical
//     value.
//
// A probe that does not reject is usually settled at once: the p-value is
// at least the tail at each angle of the search's grid, so one grid value
// above α (with room for the search's cutoff and rounding, see
// exceedsOnGrid) decides it without the refinement or the proven bound.
// Probes that reject run the whole computation, bound included, because
// the branch and bound of the bound can raise the p-value. F is monotone in
// exact arithmetic; the computed p-values of nested regions could cross
// only if two of them agreed to about 10⁻¹³ right at α, and the tests
// compare every decision with Run on many designs.
//
// The Berger–Boos variants search the nuisance over an interval that
// depends on the outcome's counts, so their p-value is not a function of the
// statistic alone: they have no window decider.

// OutcomeWindow is a rectangle of the outcomes (x1, x2) of a design with N1
// and N2 trials: rows X1From…X1To and columns X2From…X2To, ends included.
type OutcomeWindow struct {
	N1, N2       int
	X1From, X1To int
	X2From, X2To int
}

// Outcomes returns the number of outcomes in the window.
func (w OutcomeWindow) Outcomes() int { return (w.X1To - w.X1From + 1) * (w.X2To - w.X2From + 1) }

// Validate checks the design and that the window lies inside it.
func (w OutcomeWindow) Validate() error {
	if w.N1 < 1 || w.N2 < 1 || w.X1From < 0 || w.X1To > w.N1 || w.X1From > w.X1To || w.X2From < 0 || w.X2To > w.N2 || w.X2From > w.X2To {
		return fmt.Errorf("outcome window rows %d..%d, columns %d..%d of a design with %d and %d trials: %w; give 1 or more trials per group and 0 ≤ from ≤ to ≤ trials",
			w.X1From, w.X1To, w.X2From, w.X2To, w.N1, w.N2, ErrEmptyInput)
	}
	return nil
}

// WindowDecider decides every outcome of a window of one design at once,
// with the decisions Run makes one outcome at a time, for a test whose
// region is a threshold on one ordering statistic (Barnard's and Boschloo's
// tests; see unconditional_window.go).
type WindowDecider struct {
	// Decide returns, row by row (x1 outer, x2 inner), whether the test
	// rejects h at each outcome of w. memory, when not nil, carries the
	// critical values from one call to the next, so that a scan over group
	// sizes starts each search near the last answer; it changes the work,
	// never the decisions. Errors: w invalid (ErrEmptyInput), the test's
	// cost guard (ErrTooLarge, as Run's), or ctx's error when ctx ends.
	Decide func(ctx context.Context, w OutcomeWindow, h Hypothesis, memory *DecisionMemory) ([]bool, error)
	// Cost estimates Decide for w and h.
	Cost func(w OutcomeWindow, h Hypothesis) Cost
}

// DecisionMemory carries critical values between calls of
// WindowDecider.Decide (one per side, level and null). The zero value is
// empty and ready; it is safe for concurrent use.
type DecisionMemory struct {
	mu   sync.Mutex
	last map[memoryKey]memoryEntry
}

type memoryKey struct {
	side        regionSide
	null, alpha float64
}

// memoryEntry is the last critical value's key and the nuisance value at
// which its p-value was attained.
type memoryEntry struct{ key, pi2 float64 }

func (m *DecisionMemory) get(k memoryKey) (memoryEntry, bool) {
	if m == nil {
		return memoryEntry{}, false
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	e, ok := m.last[k]
	return e, ok
}

func (m *DecisionMemory) put(k memoryKey, e memoryEntry) {
	if m == nil {
		return
	}
	m.mu.Lock()
	defer m.mu.Unlock()
	if m.last == nil {
		m.last = map[memoryKey]memoryEntry{}
	}
	m.last[k] = e
}

// unconditionalWindow returns the window decider of a variant, nil for the
// Berger–Boos variants (see above).
func unconditionalWindow(d UnconditionalVariant) *WindowDecider {
	if d.BergerBoosGamma > 0 {
		return nil
	}
	return &WindowDecider{
		Decide: func(ctx context.Context, w OutcomeWindow, h Hypothesis, m *DecisionMemory) ([]bool, error) {
			return decideWindow(ctx, w, h, d, m)
		},
		Cost: func(w OutcomeWindow, h Hypothesis) Cost { return windowCost(w, h, d) },
	}
}

// windowSides returns the sides a hypothesis is decided on and the factor
// on their p-values: 2 for the doubled two-sided rule, which rejects when
// either doubled one-sided p-value is at most α (min commutes with the
// doubling and the cap at 1).
func windowSides(h Hypothesis, d UnconditionalVariant) ([]regionSide, float64) {
	switch {
	case h.Alternative == Greater:
		return []regionSide{sideGreater}, 1
	case h.Alternative == Less:
		return []regionSide{sideLess}, 1
	case d.TwoSided == TwoSidedDoubled:
		return []regionSide{sideGreater, sideLess}, 2
	}
	return []regionSide{sideBoth}, 1
}

// decideWindow is WindowDecider.Decide for a variant.
func decideWindow(ctx context.Context, w OutcomeWindow, h Hypothesis, d UnconditionalVariant, m *DecisionMemory) ([]bool, error) {
	if err := w.Validate(); err != nil {
		return nil, err
	}
	c := Counts{N1: int64(w.N1), N2: int64(w.N2)}
	if err := checkUnconditionalSize(c); err != nil {
		return nil, err
	}
	guard := h.costLimit
	if guard == (Cost{}) {
		guard = MaxCost
	}
	// The per-outcome cost does not depend on the counts: Run would refuse
	// every outcome of the design, so the window is refused as a whole.
	key, name, _, _ := unconditionalNames(d)
	if err := unconditionalCost(c, h, d).guard(fmt.Sprintf("%s at %d vs %d trials (null %v)", name, w.N1, w.N2, h.Null), guard); err != nil {
		return nil, fmt.Errorf("%s: %w", key, err)
	}
	sides, factor := windowSides(h, d)
	out := make([]bool, w.Outcomes())
	keys := make([]float64, len(out))
	sorted := make([]float64, len(out))
	a, b := nuisanceRange(c, h.Null, 0)
	for _, side := range sides {
		if err := windowStatistics(ctx, w, h.Null, d.Statistic, side, keys); err != nil {
			return nil, err
		}
		p := sideProbe{ctx: ctx, guard: guard, n1: c.N1, n2: c.N2, delta: h.Null, stat: d.Statistic, side: side,
			a: a, b: b, alpha: h.Alpha(), factor: factor, work: newTailWork(w.N1, w.N2), hintPi2: -1}
		copy(sorted, keys)
		crit, ok, err := p.critical(sorted, memoryKey{side: side, null: h.Null, alpha: h.Alpha()}, m)
		if err != nil {
			return nil, err
		}
		if !ok {
			continue
		}
		for i, k := range keys {
			out[i] = out[i] || k >= crit
		}
	}
	return out, nil
}

// windowStatistics fills, for every outcome of the window (row by row),
// the key of its observed statistic on a side (statisticKey), the rows
// shared among the cores when the window is large (Fisher's p-value costs
// about half a microsecond per outcome).
func windowStatistics(ctx context.Context, w OutcomeWindow, delta float64, stat OrderingStatistic, side regionSide, keys []float64) error {
	width := w.X2To - w.X2From + 1
	rows := w.X1To - w.X1From + 1
	row := func(x1 int) {
		c := Counts{X1: int64(x1), N1: int64(w.N1), N2: int64(w.N2)}
		out := keys[(x1-w.X1From)*width:]
		for j := range width {
			c.X2 = int64(w.X2From + j)
			out[j] = statisticKey(observedStatistic(c, delta, stat, side), stat, side)
		}
	}
	workers := 0 // every core
	if len(keys) < windowParallelOutcomes {
		workers = 1
	}
	if err := workpool.Run(ctx, workers, rows, func(i int) error { row(w.X1From + i); return nil }); err != nil {
		return err
	}
	return ctx.Err()
}

// windowParallelOutcomes is the window size from which the statistics are
// computed on every core.
const windowParallelOutcomes = 2048

// statisticKey orders observed statistics: the larger, the more extreme
// (z, −z or |z| for the z orderings by side, −log p for Fisher's). The
// region of a side depends on the observed statistic only through its key
// (through |z| on the two-sided side), and observedOf inverts it exactly.
func statisticKey(obs float64, stat OrderingStatistic, side regionSide) float64 {
	switch {
	case stat == FisherPValue:
		return -obs
	case side == sideLess:
		return -obs
	case side == sideBoth:
		return math.Abs(obs)
	}
	return obs
}

// observedOf returns an observed statistic with the given key.
func observedOf(key float64, stat OrderingStatistic, side regionSide) float64 {
	if stat == FisherPValue || side == sideLess {
		return -key
	}
	return key
}

// sideProbe decides the outcomes of one statistic on one side.
type sideProbe struct {
	ctx          context.Context
	guard        Cost
	n1, n2       int64
	delta        float64
	stat         OrderingStatistic
	side         regionSide
	a, b         float64
	alpha        float64
	factor       float64 // 2 for a doubled two-sided p-value, else 1
	work         *tailWork
	hintPi2      float64 // where the last p-value was attained (−1: unknown)
	probes, full int     // probes made, and those that ran the whole computation
}

// rejects reports whether the test rejects the outcomes whose observed
// statistic is obs: Run's p-value for them, times the factor and capped at
// 1, is at most α.
func (p *sideProbe) rejects(obs float64) (bool, error) {
	p.probes++
	reg := regionAt(p.ctx, p.n1, p.n2, obs, p.delta, p.stat, p.side)
	if err := p.ctx.Err(); err != nil {
		return false, err
	}
	if p.exceedsOnGrid(&reg) {
		return false, nil
	}
	p.full++
	logp, nuis, _, err := regionSupremum(p.ctx, p.guard, &reg, p.delta, p.a, p.b, p.work)
	if err != nil {
		return false, err
	}
	p.hintPi2 = nuis
	if p.factor == 2 {
		logp = min(logp+math.Ln2, 0) // as runUnconditional does
	}
	return math.Exp(logp) <= p.alpha, nil
}

// gridLook is how many grid angles, from the one nearest the last
// maximum outward, exceedsOnGrid looks at before leaving the decision to
// the whole computation.
const gridLook = 6

// exceedsOnGrid reports whether the tail of reg at one of the search's own
// grid angles is above α/factor with room to spare: then Run's p-value,
// which is at least the tail Run computes at that angle, exceeds α. The two
// computations of a grid value differ only in the cutoff of negligible
// binomial terms (each leaves out at most 10⁻¹³, see nuisanceSearch.at)
// and in rounding, hence the room of 10⁻⁹ relative and 10⁻¹² absolute.
func (p *sideProbe) exceedsOnGrid(reg *region) bool {
	thr := p.alpha*(1+1e-9)/p.factor + 1e-12
	if reg.full() {
		return true // p-value 1
	}
	s := nuisanceSearch{work: p.work, reg: reg, delta: p.delta, a: p.a, b: p.b, ctx: p.ctx, best: thr}
	s.setAngleRange()
	g, step := s.gridSpec()
	start := g / 2
	if s.thetaMax < math.Pi/2 {
		start = g - 1 // the mirrored tail often peaks at π = ½, the range's end
	}
	if p.hintPi2 >= 0 {
		start = min(max(int(math.Round(s.exactAngle(p.hintPi2)/step)), 0), g-1)
		if s.thetaMax < math.Pi/2 && p.hintPi2 > 0.5 {
			start = min(max(int(math.Round(s.exactAngle(1-p.hintPi2)/step)), 0), g-1)
		}
	}
	for k := range gridLook {
		i := start - k/2 // start, start+1, start−1, start+2, ...
		if k%2 == 1 {
			i = start + (k+1)/2
		}
		if i < 0 || i >= g {
			continue
		}
		if s.at(float64(i)*step) > thr {
			return true
		}
	}
	return false
}

// critical returns the key of the least extreme statistic the test
// rejects among keys (ok false when it rejects none); it sorts keys.
func (p *sideProbe) critical(keys []float64, mk memoryKey, m *DecisionMemory) (float64, bool, error) {
	// A design of 2000 per group has four million keys: a plain sort would
	// run for hundreds of milliseconds without seeing a cancel.
	if err := workpool.SortFloats(p.ctx, 0, keys); err != nil {
		return 0, false, err
	}
	cands := slices.Compact(keys) // ascending: the most extreme last
	guess, ok := m.get(mk)
	if ok {
		p.hintPi2 = guess.pi2
	} else {
		guess.key = p.normalGuess()
	}
	// The most extreme candidate no more extreme than the guess.
	g, found := slices.BinarySearch(cands, guess.key)
	if !found {
		g--
	}
	g = min(max(g, 0), len(cands)-1)
	first, err := p.boundary(cands, g)
	if err != nil {
		return 0, false, err
	}
	m.put(mk, memoryEntry{key: cands[min(first, len(cands)-1)], pi2: p.hintPi2})
	if first == len(cands) {
		return 0, false, nil
	}
	return cands[first], true, nil
}

// boundary returns the first index of cands (ascending keys, the most
// extreme last) from which the test rejects, len(cands) for none: a
// galloping search away from the guess g, then bisection.
func (p *sideProbe) boundary(cands []float64, g int) (int, error) {
	lo, hi := -1, len(cands) // cands[lo] not rejected, cands[hi] rejected (virtually at the ends)
	at := func(i int) (bool, error) { return p.rejects(observedOf(cands[i], p.stat, p.side)) }
	r, err := at(g)
	if err != nil {
		return 0, err
	}
	if r {
		hi = g
		for step := 1; hi-step >= 0; step *= 2 {
			if r, err = at(hi - step); err != nil {
				return 0, err
			}
			if !r {
				lo = hi - step
				break
			}
			hi -= step
		}
	} else {
		lo = g
		for step := 1; lo+step < len(cands); step *= 2 {
			if r, err = at(lo + step); err != nil {
				return 0, err
			}
			if r {
				hi = lo + step
				break
			}
			lo += step
		}
	}
	for hi-lo > 1 {
		mid := lo + (hi-lo)/2
		if r, err = at(mid); err != nil {
			return 0, err
		}
		if r {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi, nil
}

// normalGuess is the key of the normal approximation's critical value.
func (p *sideProbe) normalGuess() float64 {
	a := p.alpha / p.factor
	if p.side == sideBoth {
		a /= 2
	}
	if p.stat == FisherPValue {
		return -math.Log(p.alpha / p.factor)
	}
	return special.NormalQuantile(1 - a)
}

// windowCost estimates decideWindow: the statistic of every outcome of
// the window, and per side about ½·log2(outcomes) + 3 probes, each a
// region and a whole nuisance search. The galloping search and bisection
// make up to 2·log2(outcomes) probes, but most of them do not reject and
// are settled by a few grid values; measured at 50 to 500 per group
// (without memory, the costliest case) the estimate is about twice the
// CPU time.
func windowCost(w OutcomeWindow, h Hypothesis, d UnconditionalVariant) Cost {
	sides, _ := windowSides(h, d)
	outcomes := float64(w.Outcomes())
	per := float64(costWindowZ)
	if d.Statistic == FisherPValue {
		per = costWindowFisher
	}
	c := Counts{N1: int64(w.N1), N2: int64(w.N2)}
	probe := unconditionalSideCost(c, h.Null, d.Statistic)
	probes := math.Log2(outcomes+1)/2 + 3
	cost := probe.Scale(probes)
	cost.Steps += outcomes * (per + 10*math.Log2(outcomes+1)) // statistics and their sort
	cost.Bytes += 40 * outcomes
	return cost.Scale(float64(len(sides)))
}

// Step weights of the window decider's statistics, measured with the
// benchmarks: one z statistic, one Fisher p-value.
const (
	costWindowZ      = 40
	costWindowFisher = 500
)
