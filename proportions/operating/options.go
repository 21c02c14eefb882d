package operating

import (
	"fmt"

	"github.com/propscope/propscope/internal/workpool"
	"github.com/propscope/propscope/proportions"
)

// Progress receives the amount of work done out of the total, for a
// progress bar. It is called from worker goroutines, never concurrently,
// with done increasing up to total.
type Progress func(done, total int)

// RunOption tunes a long computation. Each function documents which options
// it reads; the others are ignored.
type RunOption func(*config)

type config struct {
	progress     Progress
	pi1, pi2     []float64
	steps        int
	tolerance    float64 // with toleranceSet; else DefaultTolerance capped by the level
	toleranceSet bool
	workers      int
	guard        *proportions.Cost // nil: EngineCost
}

// WithProgress reports progress to f.
func WithProgress(f Progress) RunOption { return func(c *config) { c.progress = f } }

// ProgressOf returns the function set by WithProgress among opts, or nil.
// Packages that run the engine in steps of their own (the exact searches
// of package planning) use it to report their progress to the same
// function.
func ProgressOf(opts ...RunOption) Progress { return newConfig(opts).progress }

// WorkersOf returns the number of goroutines set by WithWorkers among
// opts, or 0 for the default (GOMAXPROCS). Packages that split work of
// their own (the simulations of package clusters/simulate) read it.
func WorkersOf(opts ...RunOption) int { return newConfig(opts).workers }

// WithGrid sets the success rates of a surface: π1 takes the values pi1,
// π2 the values pi2 (each in [0, 1]). The default is 0, 0.01, …, 1 for both.
func WithGrid(pi1, pi2 []float64) RunOption {
	return func(c *config) { c.pi1, c.pi2 = pi1, pi2 }
}

// WithSteps sets the number of evenly spaced points of a slice or of a
// size curve (at least 2; default 101 for slices and 1001 for size curves).
func WithSteps(k int) RunOption { return func(c *config) { c.steps = k } }

// WithTolerance sets how far below the nominal level a method's minimum
// coverage may fall and still count as holding its level in [Recommend]
// (default 0.02, that is 2 percentage points, or half the level when the
// level is below 0.04; between 0 and the level).
func WithTolerance(t float64) RunOption {
	return func(c *config) { c.tolerance, c.toleranceSet = t, true }
}

// WithWorkers sets the number of goroutines (default GOMAXPROCS).
func WithWorkers(n int) RunOption { return func(c *config) { c.workers = n } }

func newConfig(opts []RunOption) config {
	var c config
	for _, o := range opts {
		if o != nil {
			o(&c)
		}
	}
	return c
}

// toleranceFor returns the configured tolerance, or for a level the
// default cannot serve (below 0.04: a tolerance of 0.02 would leave little
// or no coverage to hold) half the level.
func (c config) toleranceFor(level float64) float64 {
	if !c.toleranceSet {
		return min(DefaultTolerance, level/2)
	}
	return c.tolerance
}

// stepsOr returns the configured number of steps or def, validated.
func (c config) stepsOr(def int) (int, error) {
	k := c.steps
	if k == 0 {
		k = def
	}
	if k < 2 || k > maxSteps {
		return 0, fmt.Errorf("%d steps: %w; use between 2 and %d points", k, proportions.ErrEmptyInput, maxSteps)
	}
	return k, nil
}

// maxSteps is the most points of a slice, a size curve or an effect line.
const maxSteps = 1_000_001

// reporter serialises progress calls from several workers.
type reporter = workpool.Reporter

func newReporter(f Progress, total int) *reporter { return workpool.NewReporter(f, total) }

// evenly returns k evenly spaced values from lo to hi inclusive, computed
// as lo + i·(hi − lo)/(k − 1) so that the ends are exact.
func evenly(lo, hi float64, k int) []float64 {
	v := make([]float64, k)
	for i := range v {
		v[i] = lo + float64(i)*(hi-lo)/float64(k-1)
	}
	v[k-1] = hi
	return v
}

// DefaultGrid returns the default success rates of a surface: 0, 0.01, …, 1,
// each value computed as i/100.
func DefaultGrid() []float64 {
	v := make([]float64, 101)
	for i := range v {
		v[i] = float64(i) / 100
	}
	return v
}
