package exact

import (
	"context"
	"fmt"
	"math"
	"runtime"
	"sync"
	"sync/atomic"

	"github.com/propscope/propscope/proportions"
)

// Table holds the raw limits of one interval method for every outcome
// (x1, x2) of a design, computed once, and the split of each row x1 into
// pieces along which both limits are non-increasing in x2. Build it with
// [NewTable]; it is read-only afterwards and safe for concurrent use.
type Table struct {
	method proportions.IntervalMethod
	design Design
	conf   proportions.Confidence
	n1, n2 int
	stride int // n2 + 1
	// lower and upper are the raw limits at index x1·stride + x2.
	lower, upper []float64
	// width is the width of the reported interval: Upper − Lower for the
	// difference; for the ratio families log(Upper/Lower), and 0 when the
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

// NewTable computes the limits of method m for every outcome of the design,
// on every core (or WithWorkers), and checks that they are numbers with
// lower ≤ upper. It reads the options WithProgress (rows done out of n1+1)
// and WithWorkers, and stops early with ctx's error when ctx is cancelled.
// Memory: 24·(n1+1)·(n2+1) bytes, 24 MB at 1000 per group.
func NewTable(ctx context.Context, m proportions.IntervalMethod, d Design, opts ...Option) (*Table, error) {
	if err := d.Validate(); err != nil {
		return nil, err
	}
	if m.Limits == nil {
		return nil, fmt.Errorf("interval method %q has no limits function: %w", m.Key, proportions.ErrUnknownMethod)
	}
	if m.Family == proportions.Proportion {
		return nil, fmt.Errorf("interval method %q is for one proportion: %w; use a method for the difference, ratio or odds ratio", m.Key, proportions.ErrUnsupported)
	}
	conf, err := proportions.NewConfidence(d.Level)
	if err != nil {
		return nil, err
	}
	cfg := newConfig(opts)
	t := &Table{
		method: m, design: d, conf: conf, n1: d.N1, n2: d.N2, stride: d.N2 + 1,
		lower: make([]float64, (d.N1+1)*(d.N2+1)),
		upper: make([]float64, (d.N1+1)*(d.N2+1)),
		width: make([]float64, (d.N1+1)*(d.N2+1)),
	}
	rowCuts := make([][]int32, d.N1+1)
	rep := newReporter(cfg.progress, d.N1+1)
	err = parallel(ctx, cfg.workers, d.N1+1, func(x1 int) error {
		cuts, err := t.fillRow(x1)
		if err != nil {
			return err
		}
		rowCuts[x1] = cuts
		rep.add(1)
		return nil
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
func (t *Table) Method() proportions.IntervalMethod { return t.method }

// Design returns the table's design.
func (t *Table) Design() Design { return t.design }

// Limits returns the raw limits at outcome (x1, x2); it panics outside the
// design like a slice index would.
func (t *Table) Limits(x1, x2 int) (lower, upper float64) {
	if x2 < 0 || x2 > t.n2 {
		panic(fmt.Sprintf("exact: x2 = %d outside 0..%d", x2, t.n2))
	}
	k := x1*t.stride + x2
	return t.lower[k], t.upper[k]
}

// Pieces returns the number of monotone pieces the rows were cut into
// (n1+1 when every row is a single piece).
func (t *Table) Pieces() int { return len(t.cuts) - (t.n1 + 1) }

// fillRow computes row x1's limits and widths and cuts it into pieces
// where either limit rises with x2.
func (t *Table) fillRow(x1 int) ([]int32, error) {
	c := proportions.Counts{X1: int64(x1), N1: int64(t.n1), N2: int64(t.n2)}
	base := x1 * t.stride
	lower, upper, width := t.lower[base:base+t.stride], t.upper[base:base+t.stride], t.width[base:base+t.stride]
	difference := t.method.Family == proportions.Difference
	cuts := []int32{0}
	for x2 := range lower {
		c.X2 = int64(x2)
		lo, hi := t.method.Limits(c, t.conf)
		if !(lo <= hi) { // also catches NaN
			return nil, fmt.Errorf("interval method %q gave limits (%v, %v) at %d/%d vs %d/%d; the engine needs numbers with lower ≤ upper",
				t.method.Key, lo, hi, x1, t.n1, x2, t.n2)
		}
		lower[x2], upper[x2] = lo, hi
		if difference {
			// The reported interval is clipped to [−1, 1].
			if lo < -1 {
				lo = -1
			}
			if hi > 1 {
				hi = 1
			}
			width[x2] = hi - lo
		} else {
			width[x2] = t.reportedWidth(lo, hi)
		}
		if x2 > 0 && (lower[x2] > lower[x2-1] || upper[x2] > upper[x2-1]) {
			cuts = append(cuts, int32(x2))
		}
	}
	return append(cuts, int32(t.stride)), nil
}

// reportedWidth is the width of the clipped interval: U − L for the
// difference, log(U/L) for the ratio families (0 when unbounded).
func (t *Table) reportedWidth(lo, hi float64) float64 {
	blo, bhi := t.method.Family.Bounds()
	lo, hi = max(lo, blo), min(hi, bhi)
	if t.method.Family == proportions.Difference {
		return hi - lo
	}
	if w := logWidth(lo, hi); !math.IsInf(w, 1) {
		return w
	}
	return 0
}

// unbounded reports whether the ratio-family interval at index k reaches 0 or ∞.
func (t *Table) unbounded(k int) bool { return !(t.lower[k] > 0) || math.IsInf(t.upper[k], 1) }

// logWidth is log(U/L) of the reported (clipped at 0) ratio limits, +Inf
// when the interval is unbounded.
func logWidth(lo, hi float64) float64 {
	if !(lo > 0) || math.IsInf(hi, 1) {
		return math.Inf(1)
	}
	return math.Log(hi) - math.Log(lo)
}

// parallel runs job(i) for i in [0, n) on the given number of workers
// (GOMAXPROCS when 0), stopping at the first error or when ctx ends.
func parallel(ctx context.Context, workers, n int, job func(i int) error) error {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = min(workers, n)
	var next atomic.Int64
	var once sync.Once
	var first error
	var failed atomic.Bool
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for !failed.Load() {
				i := int(next.Add(1) - 1)
				if i >= n {
					return
				}
				err := ctx.Err()
				if err == nil {
					err = job(i)
				}
				if err != nil {
					failed.Store(true)
					once.Do(func() { first = err })
					return
				}
			}
		}()
	}
	wg.Wait()
	return first
}
