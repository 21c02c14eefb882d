package proportions

import (
	"fmt"
	"math"
)

// Cost is the work a costly method would do for one table, estimated
// before it runs from what the computation really does (tables scanned,
// nuisance values visited, binomial terms summed at each) and the memory
// it would hold at once. Steps are the method's innermost operations
// weighted by what they cost (one step is about a nanosecond on one core of
// an unloaded machine, see StepsPerSecond); the estimate is within a small
// factor of the real cost, never a timing.
type Cost struct {
	// Steps is the estimated number of elementary steps.
	Steps float64 `json:"steps"`
	// Bytes is the estimated memory held at once.
	Bytes float64 `json:"bytes"`
}

// StepsPerSecond is the rate at which one core of an unloaded machine does
// the steps a Cost counts: about 10⁹ (measured on the benchmarks of the
// unconditional tests). A shared or loaded machine does fewer.
const StepsPerSecond = 1e9

// MaxCost is the cost guard of a direct call of a costly method (Test,
// Interval, their Context forms): about ten seconds on one core and
// 512 MB. A call estimated above it is refused with an error wrapping
// ErrTooLarge that gives the estimate.
var MaxCost = Cost{Steps: 1e10, Bytes: 512 << 20}

// AnalysisCost is the cost guard of each costly method in an analysis
// (Analyze with ScopeAll): about a second on one core. A method estimated
// above it is skipped with a warning, like a method above its TrialLimit.
var AnalysisCost = Cost{Steps: 1e9, Bytes: 256 << 20}

// Add returns the sum of two costs (work done one after the other; the
// memory of both is counted, an upper bound).
func (c Cost) Add(o Cost) Cost { return Cost{Steps: c.Steps + o.Steps, Bytes: c.Bytes + o.Bytes} }

// Scale returns the cost of k runs one after the other that each cost c
// (the memory is held by one run at a time).
func (c Cost) Scale(k float64) Cost { return Cost{Steps: k * c.Steps, Bytes: c.Bytes} }

// Seconds returns the estimated time on one core of an unloaded machine.
func (c Cost) Seconds() float64 { return c.Steps / StepsPerSecond }

// Within reports whether the cost stays inside a guard.
func (c Cost) Within(guard Cost) bool { return c.Steps <= guard.Steps && c.Bytes <= guard.Bytes }

// String prints "about 3.2e+10 steps (32 s on one core) and 2.4 GB".
func (c Cost) String() string {
	return fmt.Sprintf("about %.2g steps (%s on one core) and %s", c.Steps, formatSeconds(c.Seconds()), formatBytes(c.Bytes))
}

// guard returns nil when the cost is inside the guard, else an error
// wrapping ErrTooLarge that says what the call would need and what is
// allowed.
func (c Cost) guard(what string, guard Cost) error {
	if c.Within(guard) {
		return nil
	}
	return fmt.Errorf("%s would need %v: %w; the limit is %v; use Fisher's exact test or an asymptotic method at this size",
		what, c, ErrTooLarge, guard)
}

func formatSeconds(s float64) string {
	switch {
	case s < 1:
		return fmt.Sprintf("%.2g s", s)
	case s < 120:
		return fmt.Sprintf("%.0f s", s)
	case s < 7200:
		return fmt.Sprintf("%.0f min", s/60)
	case s < 2*86400:
		return fmt.Sprintf("%.0f h", s/3600)
	}
	return fmt.Sprintf("%.2g days", s/86400)
}

func formatBytes(b float64) string {
	switch {
	case b < 1<<20:
		return fmt.Sprintf("%.0f kB", math.Ceil(b/1024))
	case b < 1<<30:
		return fmt.Sprintf("%.0f MB", b/(1<<20))
	}
	return fmt.Sprintf("%.1f GB", b/(1<<30))
}
