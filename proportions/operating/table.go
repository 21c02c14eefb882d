package operating

import (
	"context"
	"fmt"
	"math"

	"github.com/propscope/propscope/internal/workpool"
	"github.com/propscope/propscope/proportions"
)

// OutcomeLimits holds the raw limits of one interval method for every outcome
// (x1, x2) of a design, computed once, and the split of each row x1 into
// pieces along which both limits are non-increasing in x2. Build it with
// [NewOutcomeLimits]; it is read-only afterwards and safe for concurrent use.
type OutcomeLimits struct {
	method proportions.IntervalMethod
	design Design
	conf   proportions.Confidence
	n1, n2 int
	stride int // n2 + 1
	// lower and upper are the raw limits at index x1·stride + x2.
	lower, upper []float64
	// width is the width of the reported interval: Upper − Lower for the
	// difference; for the ratio scales log(Upper/Lower), and 0 when the
	// interval is unbounded (L = 0 or U = ∞; see unbounded).
	width []float64
	// Row x1 is cut into pieces: cuts[rowCut[x1] : rowCut[x1+1]] lists
	// the first x2 of each piece followed by n2+1, so consecutive entries
	// bound a piece [s, e). Inside a piece both limits are non-increasing
	// in x2, which makes the covered x2 a single run for any truth.
	rowCut []int32
	cuts   []int32
	// multi lists the rows cut into more than one piece, ascending.
	multi []int32
}

// NewOutcomeLimits computes the limits of method m for every outcome of the design,
// on every core (or WithWorkers), and checks that they are numbers with
// lower ≤ upper. For a method declared Symmetric it computes one outcome
// of each mirror set and copies the mirror images (see
// proportions.IntervalMethod.Symmetric): half of the outcomes, a quarter
// when n1 = n2 on the difference and odds-ratio scales. It reads the
// options WithProgress (rows done out of n1+1) and WithWorkers, and stops
// early with ctx's error when ctx is cancelled. A method with a Cost
// function is refused before it starts, with an error wrapping
// proportions.ErrTooLarge, when IntervalCost exceeds EngineCost (or the
// guard set by WithCostGuard).
// Memory: 24·(n1+1)·(n2+1) bytes, 24 MB at 1000 per group.
func NewOutcomeLimits(ctx context.Context, m proportions.IntervalMethod, d Design, opts ...RunOption) (*OutcomeLimits, error) {
	if err := d.Validate(); err != nil {
		return nil, err
	}
	if m.Limits == nil {
		return nil, fmt.Errorf("interval method %q has no limits function: %w", m.Key, proportions.ErrUnknownMethod)
	}
	if m.Scale == proportions.SingleRate {
		return nil, fmt.Errorf("interval method %q is for one proportion: %w; use a method for the difference, ratio or odds ratio", m.Key, proportions.ErrUnsupported)
	}
	conf, err := proportions.NewConfidence(d.Level)
	if err != nil {
		return nil, err
	}
	cfg := newConfig(opts)
	if c, ok := IntervalCost(m, d); ok {
		if err := guardRun(fmt.Sprintf("the limits of %s at every outcome of %v", m.Name, d), c, cfg.guardOr()); err != nil {
			return nil, err
		}
	}
	t := &OutcomeLimits{
		method: m, design: d, conf: conf, n1: d.N1, n2: d.N2, stride: d.N2 + 1,
		lower: make([]float64, (d.N1+1)*(d.N2+1)),
		upper: make([]float64, (d.N1+1)*(d.N2+1)),
		width: make([]float64, (d.N1+1)*(d.N2+1)),
	}
	rowCuts := make([][]int32, d.N1+1)
	rep := newReporter(cfg.progress, d.N1+1)
	sym := t.symmetries()
	// Rows [0, half] are computed (the part of each that stands for its
	// mirror set), then completed from themselves; rows above half are the
	// mirror images of rows below.
	half := d.N1
	if sym.complement {
		half = d.N1 / 2
	}
	err = parallel(ctx, cfg.workers, half+1, func(x1 int) error {
		return t.computeRow(ctx, x1, sym)
	})
	if err != nil {
		return nil, err
	}
	finish := func(x1 int) error {
		rowCuts[x1] = t.finishRow(x1)
		rep.Add(1)
		return nil
	}
	err = parallel(ctx, cfg.workers, half+1, func(x1 int) error {
		t.completeRow(x1, sym)
		return finish(x1)
	})
	if err != nil {
		return nil, err
	}
	err = parallel(ctx, cfg.workers, d.N1-half, func(i int) error {
		x1 := half + 1 + i
		t.complementRow(x1)
		return finish(x1)
	})
	if err != nil {
		return nil, err
	}
	t.rowCut = make([]int32, d.N1+2)
	for x1, c := range rowCuts {
		t.rowCut[x1] = int32(len(t.cuts))
		t.cuts = append(t.cuts, c...)
		if len(c) > 2 {
			t.multi = append(t.multi, int32(x1))
		}
	}
	t.rowCut[d.N1+1] = int32(len(t.cuts))
	return t, nil
}

// Method returns the table's interval method.
func (t *OutcomeLimits) Method() proportions.IntervalMethod { return t.method }

// Design returns the table's design.
func (t *OutcomeLimits) Design() Design { return t.design }

// Limits returns the raw limits stored for outcome (x1, x2), the mirror
// image of a computed outcome for a Symmetric method. Outcomes outside the
// design are an error wrapping proportions.ErrNegativeCount or
// proportions.ErrEventsExceedTrials.
func (t *OutcomeLimits) Limits(x1, x2 int) (lower, upper float64, err error) {
	if err := (proportions.Counts{X1: int64(x1), N1: int64(t.n1), X2: int64(x2), N2: int64(t.n2)}).Validate(); err != nil {
		return 0, 0, err
	}
	k := x1*t.stride + x2
	return t.lower[k], t.upper[k], nil
}

// Pieces returns the number of monotone pieces the rows were cut into
// (n1+1 when every row is a single piece).
func (t *OutcomeLimits) Pieces() int { return len(t.cuts) - (t.n1 + 1) }

// symmetry says which mirror images of an outcome the method's Symmetric
// declaration lets the table copy instead of compute.
type symmetry struct {
	swap       bool // (x1, x2) ↔ (x2, x1), when n1 = n2
	complement bool // (x1, x2) ↔ (n1 − x1, n2 − x2), difference and odds ratio
}

func (t *OutcomeLimits) symmetries() symmetry {
	if !t.method.Symmetric {
		return symmetry{}
	}
	return symmetry{swap: t.n1 == t.n2, complement: t.method.Scale != proportions.Ratio}
}

// computedRange returns the x2 of row x1 (x1 ≤ n1/2 when the complement
// symmetry holds) whose limits are computed: with the groups exchangeable,
// x2 < x1 is the mirror of (x2, x1) and, with the complement too,
// x2 > n − x1 is (n − x2, n − x1) exchanged and complemented; both lie in
// earlier rows' computed ranges.
func (t *OutcomeLimits) computedRange(x1 int, sym symmetry) (lo, hi int) {
	lo, hi = 0, t.n2
	if sym.swap {
		lo = x1
		if sym.complement {
			hi = t.n2 - x1
		}
	}
	return lo, hi
}

// computeRow calls the method for the computed range of row x1 and checks
// the limits. It looks at ctx inside the row, before every outcome of a
// costly method (which also looks at ctx inside its own work, through
// LimitsContext) and every ctxStride outcomes of a cheap one, so a cancel
// is seen within milliseconds however long the row.
func (t *OutcomeLimits) computeRow(ctx context.Context, x1 int, sym symmetry) error {
	c := proportions.Counts{X1: int64(x1), N1: int64(t.n1), N2: int64(t.n2)}
	base := x1 * t.stride
	lo, hi := t.computedRange(x1, sym)
	costly := t.method.LimitsContext != nil
	for x2 := lo; x2 <= hi; x2++ {
		c.X2 = int64(x2)
		if costly || (x2-lo)%ctxStride == 0 {
			if err := ctx.Err(); err != nil {
				return err
			}
		}
		var l, u float64
		if costly {
			var err error
			if l, u, err = t.method.LimitsContext(ctx, c, t.conf); err != nil {
				return err
			}
		} else {
			l, u = t.method.Limits(c, t.conf)
		}
		if !(l <= u) { // also catches NaN
			return fmt.Errorf("interval method %q gave limits (%v, %v) at %d/%d vs %d/%d; the engine needs numbers with lower ≤ upper",
				t.method.Key, l, u, x1, t.n1, x2, t.n2)
		}
		t.lower[base+x2], t.upper[base+x2] = l, u
	}
	return nil
}

// completeRow fills the rest of row x1 from the computed ranges.
func (t *OutcomeLimits) completeRow(x1 int, sym symmetry) {
	lo, hi := t.computedRange(x1, sym)
	base := x1 * t.stride
	for x2 := 0; x2 < lo; x2++ { // groups exchanged
		k := x2*t.stride + x1
		t.lower[base+x2], t.upper[base+x2] = t.mirror(t.lower[k], t.upper[k])
	}
	for x2 := hi + 1; x2 <= t.n2; x2++ { // exchanged and complemented
		k := (t.n2-x2)*t.stride + t.n1 - x1
		t.lower[base+x2], t.upper[base+x2] = t.lower[k], t.upper[k]
	}
}

// complementRow fills row x1 > n1/2 with the mirror images of row n1 − x1
// read backwards (counting non-events in both groups).
func (t *OutcomeLimits) complementRow(x1 int) {
	base, src := x1*t.stride, (t.n1-x1)*t.stride
	lower, upper := t.lower[base:base+t.stride], t.upper[base:base+t.stride]
	srcLower, srcUpper := t.lower[src:src+t.stride], t.upper[src:src+t.stride]
	if t.method.Scale == proportions.Difference {
		for x2, k := 0, t.n2; k >= 0; x2, k = x2+1, k-1 {
			lower[x2], upper[x2] = -srcUpper[k], -srcLower[k]
		}
		return
	}
	for x2, k := 0, t.n2; k >= 0; x2, k = x2+1, k-1 {
		lower[x2], upper[x2] = t.mirror(srcLower[k], srcUpper[k])
	}
}

// mirror returns the mirror image of an interval: (−U, −L) for the
// difference, (1/U, 1/L) for the ratio scales (1/0 = ∞, 1/∞ = 0).
func (t *OutcomeLimits) mirror(lo, hi float64) (float64, float64) {
	if t.method.Scale == proportions.Difference {
		return -hi, -lo
	}
	inv := func(v float64) float64 {
		switch {
		case v <= 0:
			return math.Inf(1)
		case math.IsInf(v, 1):
			return 0
		}
		return 1 / v
	}
	return inv(hi), inv(lo)
}

// finishRow computes row x1's reported widths and cuts it into pieces
// where either limit rises with x2.
func (t *OutcomeLimits) finishRow(x1 int) []int32 {
	base := x1 * t.stride
	lower := t.lower[base : base+t.stride]
	upper := t.upper[base : base+t.stride][:len(lower)]
	width := t.width[base : base+t.stride][:len(lower)]
	cuts := []int32{0}
	for x2 := 1; x2 < len(lower); x2++ {
		if lower[x2] > lower[x2-1] || upper[x2] > upper[x2-1] {
			cuts = append(cuts, int32(x2))
		}
	}
	if t.method.Scale != proportions.Difference {
		for x2, lo := range lower {
			width[x2] = t.reportedWidth(lo, upper[x2])
		}
		return append(cuts, int32(t.stride))
	}
	for x2, lo := range lower {
		// The reported interval is clipped to [−1, 1].
		hi := upper[x2]
		if lo < -1 {
			lo = -1
		}
		if hi > 1 {
			hi = 1
		}
		width[x2] = hi - lo
	}
	return append(cuts, int32(t.stride))
}

// reportedWidth is the width of the clipped interval: U − L for the
// difference, log(U/L) for the ratio scales (0 when unbounded).
func (t *OutcomeLimits) reportedWidth(lo, hi float64) float64 {
	blo, bhi := t.method.Scale.Bounds()
	lo, hi = max(lo, blo), min(hi, bhi)
	if t.method.Scale == proportions.Difference {
		return hi - lo
	}
	if w := logWidth(lo, hi); !math.IsInf(w, 1) {
		return w
	}
	return 0
}

// unbounded reports whether the ratio-scale interval at index k reaches 0 or ∞.
func (t *OutcomeLimits) unbounded(k int) bool { return !(t.lower[k] > 0) || math.IsInf(t.upper[k], 1) }

// logWidth is log(U/L) of the reported (clipped at 0) ratio limits, +Inf
// when the interval is unbounded.
func logWidth(lo, hi float64) float64 {
	if !(lo > 0) || math.IsInf(hi, 1) {
		return math.Inf(1)
	}
	return math.Log(hi) - math.Log(lo)
}

// ctxStride is how many outcomes of a cheap method (microseconds each) a
// row computes between two looks at the context.
const ctxStride = 256

// parallel runs job(i) for i in [0, n) on the given number of workers
// (GOMAXPROCS when 0), stopping at the first error or when ctx ends.
func parallel(ctx context.Context, workers, n int, job func(i int) error) error {
	return workpool.Run(ctx, workers, n, job)
}
