package operating

import (
	"context"
	"fmt"
	"slices"

	"github.com/propscope/propscope/proportions"
)

// Decision is how a study decides: Test is run with each of Hypotheses
// and the study rejects when every run rejects. Equality, superiority and
// non-inferiority designs have one hypothesis; an equivalence design has
// two one-sided ones (the two one-sided tests procedure).
type Decision struct {
	Test       proportions.TestMethod   `json:"test"`
	Hypotheses []proportions.Hypothesis `json:"hypotheses"`
	// memory, set by Remembering, carries the critical values of a test
	// with a window decider from one design to the next.
	memory *proportions.DecisionMemory
}

// Remembering returns the decision with a memory of the critical values
// of its test (for tests with a window decider, proportions.WindowDecider):
// a scan over group sizes then starts each design's search near the last
// answer. The decisions are the same with or without it.
func (d Decision) Remembering() Decision {
	d.memory = &proportions.DecisionMemory{}
	return d
}

// decideWindow runs the test's window decider for every hypothesis on the
// outcomes x1 = lo1..hi1, x2 = lo2..hi2 and returns where the decision
// rejects (every hypothesis rejected), row by row.
func (d Decision) decideWindow(ctx context.Context, n1, n2, lo1, hi1, lo2, hi2 int) ([]bool, error) {
	w := proportions.OutcomeWindow{N1: n1, N2: n2, X1From: lo1, X1To: hi1, X2From: lo2, X2To: hi2}
	var all []bool
	for _, h := range d.Hypotheses {
		r, err := d.Test.Window.Decide(ctx, w, h, d.memory)
		if err != nil {
			return nil, err
		}
		if all == nil {
			all = r
			continue
		}
		for i := range all {
			all[i] = all[i] && r[i]
		}
	}
	return all, nil
}

// Rejects reports whether the decision rejects for counts c.
func (d Decision) Rejects(c proportions.Counts) bool {
	for _, h := range d.Hypotheses {
		if !d.Test.Run(c, h).Reject {
			return false
		}
	}
	return len(d.Hypotheses) > 0
}

// RejectsContext is Rejects with cancellation: a costly test (one with a
// RunContext) looks at ctx inside its own work and its error is returned,
// ctx's when ctx ends and one wrapping proportions.ErrTooLarge when the
// test refuses the outcome; a cheap test runs through Run.
func (d Decision) RejectsContext(ctx context.Context, c proportions.Counts) (bool, error) {
	if d.Test.RunContext == nil {
		return d.Rejects(c), nil
	}
	for _, h := range d.Hypotheses {
		r, err := d.Test.RunContext(ctx, c, h)
		if err != nil {
			return false, err
		}
		if !r.Reject {
			return false, nil
		}
	}
	return len(d.Hypotheses) > 0, nil
}

// rejectsRow runs the decision on the outcomes (x1, x2), x2 = lo..hi, and
// calls f(x2, rejects) for each; it looks at ctx before every outcome of a
// costly test and every ctxStride outcomes of a cheap one, so a cancel is
// seen inside the row.
func (d Decision) rejectsRow(ctx context.Context, x1, n1, n2, lo, hi int, f func(x2 int, rejects bool)) error {
	c := proportions.Counts{X1: int64(x1), N1: int64(n1), N2: int64(n2)}
	costly := d.Test.RunContext != nil
	for x2 := lo; x2 <= hi; x2++ {
		if costly || (x2-lo)%ctxStride == 0 {
			if err := ctx.Err(); err != nil {
				return err
			}
		}
		c.X2 = int64(x2)
		r, err := d.RejectsContext(ctx, c)
		if err != nil {
			return err
		}
		f(x2, r)
	}
	return nil
}

// Validate checks that the decision can be run.
func (d Decision) Validate() error {
	if d.Test.Run == nil {
		return fmt.Errorf("test %q: %w; it has no Run function", d.Test.Key, proportions.ErrUnsupported)
	}
	if len(d.Hypotheses) == 0 {
		return fmt.Errorf("test %q: %w; give at least one hypothesis", d.Test.Key, proportions.ErrEmptyInput)
	}
	for _, h := range d.Hypotheses {
		if err := h.Alternative.Validate(); err != nil {
			return err
		}
		if err := proportions.ValidateLevel(h.Conf.Level); err != nil {
			return err
		}
		if err := proportions.ValidateNull(d.Test.Scale, h.Null); err != nil {
			return err
		}
		if !d.Test.Margins && h.Null != d.Test.Scale.NoEffect() {
			return fmt.Errorf("%s with null %v: %w; this test is defined only for a null of %v",
				d.Test.Name, h.Null, proportions.ErrUnsupported, d.Test.Scale.NoEffect())
		}
	}
	return nil
}

// Power returns the exact power of test t with hypothesis h for a study of
// n1 and n2 trials when the true rates are (π1, π2): the probability of
// the outcomes for which t rejects,
//
//	Σ_{x1, x2} b(x1; n1, π1) b(x2; n2, π2) · 1{t rejects at (x1, x2)}.
//
// It runs the test only on the outcomes whose probability is not
// negligible at (π1, π2) (binomial tails below 1e-16 are skipped), on every
// core. This is the function for sample-size searches; to evaluate one
// design at many (π1, π2), build a [RejectionRegion] once instead.
func Power(t proportions.TestMethod, n1, n2 int, h proportions.Hypothesis, pi1, pi2 float64) (float64, error) {
	return Decision{Test: t, Hypotheses: []proportions.Hypothesis{h}}.Power(n1, n2, pi1, pi2)
}

// Power is the exact power of the decision (see the function [Power]).
func (d Decision) Power(n1, n2 int, pi1, pi2 float64) (float64, error) {
	return d.PowerContext(context.Background(), n1, n2, pi1, pi2)
}

// PowerContext is Power with cancellation, for tests slow enough to need
// it (exact tests that search a nuisance parameter at every outcome). A
// test with a window decider (proportions.TestMethod.Window) decides the
// outcomes all at once, with the same decisions. Of opts it reads
// WithProgress (rows of outcomes done out of the rows of the binomial
// window; a window decider reports once, at the end) and WithWorkers.
func (d Decision) PowerContext(ctx context.Context, n1, n2 int, pi1, pi2 float64, opts ...RunOption) (float64, error) {
	if err := validateSizes(n1, n2); err != nil {
		return 0, err
	}
	if err := validateRates(pi1, pi2); err != nil {
		return 0, err
	}
	if err := d.Validate(); err != nil {
		return 0, err
	}
	var b1, b2 binomial
	b1.fill(n1, pi1, make([]float64, n1+1))
	b2.fill(n2, pi2, make([]float64, n2+1))
	rows := b1.hi - b1.lo + 1
	cfg := newConfig(opts)
	rep := newReporter(cfg.progress, rows)
	if d.Test.Window != nil {
		return d.windowPower(ctx, n1, n2, &b1, &b2, rep)
	}
	sums := make([]float64, rows)
	workers := cfg.workers // default: every core
	if rows*(b2.hi-b2.lo+1) < 4096 {
		workers = 1
	}
	err := parallel(ctx, workers, rows, func(i int) error {
		var s float64
		err := d.rejectsRow(ctx, b1.lo+i, n1, n2, b2.lo, b2.hi, func(x2 int, rejects bool) {
			if rejects {
				s += b2.p[x2]
			}
		})
		sums[i] = s
		if err == nil {
			rep.Add(1)
		}
		return err
	})
	if err != nil {
		return 0, err
	}
	var power float64
	for i, s := range sums {
		power += b1.p[b1.lo+i] * s
	}
	return min(power, 1), nil
}

// windowPower is PowerContext through the test's window decider.
func (d Decision) windowPower(ctx context.Context, n1, n2 int, b1, b2 *binomial, rep *reporter) (float64, error) {
	rej, err := d.decideWindow(ctx, n1, n2, b1.lo, b1.hi, b2.lo, b2.hi)
	if err != nil {
		return 0, err
	}
	var power float64
	i := 0
	for x1 := b1.lo; x1 <= b1.hi; x1++ {
		var s float64
		for x2 := b2.lo; x2 <= b2.hi; x2++ {
			if rej[i] {
				s += b2.p[x2]
			}
			i++
		}
		power += b1.p[x1] * s
	}
	rep.Add(b1.hi - b1.lo + 1)
	return min(power, 1), nil
}

// RejectionRegion is the set of outcomes (x1, x2) of a study with N1 and
// N2 trials for which a decision rejects, stored as runs of consecutive
// x2 in each row x1, so that the power at any (π1, π2) costs O(n1 + n2 +
// runs). Build it with [NewRejectionRegion]; it is read-only afterwards.
type RejectionRegion struct {
	Decision Decision `json:"decision"`
	N1       int      `json:"n1"`
	N2       int      `json:"n2"`
	// rowRuns[x1] .. rowRuns[x1+1] index the runs of row x1 in runs, which
	// holds pairs (first x2, last x2 + 1).
	rowRuns []int32
	runs    []int32
	size    int
}

// NewRejectionRegion runs the decision on every outcome of the design,
// on every core; a test with a window decider (Barnard's and Boschloo's,
// proportions.TestMethod.Window) decides them all at once instead, with
// the same decisions and a progress report at the end. It reads WithProgress (rows done out of n1+1) and
// WithWorkers, and stops with ctx's error when ctx is cancelled. Exact
// tests that search a nuisance parameter at each outcome make this slow at
// large n: a test with a Cost function is refused before it starts, with
// an error wrapping proportions.ErrTooLarge, when DecisionCost exceeds
// EngineCost (or the guard set by WithCostGuard).
func NewRejectionRegion(ctx context.Context, d Decision, n1, n2 int, opts ...RunOption) (*RejectionRegion, error) {
	if err := validateSizes(n1, n2); err != nil {
		return nil, err
	}
	if err := d.Validate(); err != nil {
		return nil, err
	}
	cfg := newConfig(opts)
	if c, ok := DecisionCost(d, n1, n2); ok {
		what := fmt.Sprintf("the rejection region of %s at n1 = %d, n2 = %d", d.Test.Name, n1, n2)
		if err := guardRun(what, c, cfg.guardOr()); err != nil {
			return nil, err
		}
	}
	rowRuns := make([][]int32, n1+1)
	rep := newReporter(cfg.progress, n1+1)
	if d.Test.Window != nil {
		rej, err := d.decideWindow(ctx, n1, n2, 0, n1, 0, n2)
		if err != nil {
			return nil, err
		}
		for x1 := range rowRuns {
			rowRuns[x1] = runsOf(rej[x1*(n2+1) : (x1+1)*(n2+1)])
		}
		rep.Add(n1 + 1)
		return newRegionFromRuns(d, n1, n2, rowRuns), nil
	}
	err := parallel(ctx, cfg.workers, n1+1, func(x1 int) error {
		var runs []int32
		inRun := false
		err := d.rejectsRow(ctx, x1, n1, n2, 0, n2, func(x2 int, r bool) {
			switch {
			case r && !inRun:
				runs = append(runs, int32(x2))
			case !r && inRun:
				runs = append(runs, int32(x2))
			}
			inRun = r
		})
		if err != nil {
			return err
		}
		if inRun {
			runs = append(runs, int32(n2+1))
		}
		rowRuns[x1] = runs
		rep.Add(1)
		return nil
	})
	if err != nil {
		return nil, err
	}
	return newRegionFromRuns(d, n1, n2, rowRuns), nil
}

// runsOf returns the runs of true values of one row of decisions, as
// pairs (first x2, last x2 + 1).
func runsOf(row []bool) []int32 {
	var runs []int32
	for x2, r := range row {
		if r && (x2 == 0 || !row[x2-1]) {
			runs = append(runs, int32(x2))
		}
		if r && (x2 == len(row)-1 || !row[x2+1]) {
			runs = append(runs, int32(x2+1))
		}
	}
	return runs
}

// newRegionFromRuns packs the runs of every row into a region.
func newRegionFromRuns(d Decision, n1, n2 int, rowRuns [][]int32) *RejectionRegion {
	r := &RejectionRegion{Decision: d, N1: n1, N2: n2, rowRuns: make([]int32, n1+2)}
	for x1, runs := range rowRuns {
		r.rowRuns[x1] = int32(len(r.runs))
		r.runs = append(r.runs, runs...)
		for k := 0; k < len(runs); k += 2 {
			r.size += int(runs[k+1] - runs[k])
		}
	}
	r.rowRuns[n1+1] = int32(len(r.runs))
	return r
}

// Contains reports whether the decision rejects at outcome (x1, x2).
func (r *RejectionRegion) Contains(x1, x2 int) bool {
	if x1 < 0 || x1 > r.N1 || x2 < 0 || x2 > r.N2 {
		return false
	}
	runs := r.runs[r.rowRuns[x1]:r.rowRuns[x1+1]]
	k, _ := slices.BinarySearch(runs, int32(x2)+1)
	return k%2 == 1
}

// Outcomes returns the number of outcomes in the region.
func (r *RejectionRegion) Outcomes() int { return r.size }

// Runs returns the number of runs of consecutive x2 the region is made of
// (n1+1 or fewer for a region that is one run per row).
func (r *RejectionRegion) Runs() int { return len(r.runs) / 2 }

// Power returns the exact probability of the region at (π1, π2).
func (r *RejectionRegion) Power(pi1, pi2 float64) (float64, error) {
	if err := validateRates(pi1, pi2); err != nil {
		return 0, err
	}
	var b1, b2 binomial
	b1.fill(r.N1, pi1, make([]float64, r.N1+1))
	cum := make([]float64, r.N2+2)
	b2.fill(r.N2, pi2, make([]float64, r.N2+1))
	b2.prefix(cum)
	return r.power(&b1, cum), nil
}

func (r *RejectionRegion) power(b1 *binomial, cum []float64) float64 {
	var power float64
	for x1 := b1.lo; x1 <= b1.hi; x1++ {
		var s float64
		runs := r.runs[r.rowRuns[x1]:r.rowRuns[x1+1]]
		for k := 0; k+1 < len(runs); k += 2 {
			s += cum[runs[k+1]] - cum[runs[k]]
		}
		power += b1.p[x1] * s
	}
	return min(power, 1)
}
