package operating

import (
	"fmt"
	"math"

	"github.com/propscope/propscope/proportions"
)

// MaxDesignTrials is the largest number of trials per group that the engine
// accepts. An [OutcomeLimits] stores two limits and a width per outcome,
// 24·(n1+1)·(n2+1) bytes: 24 MB at 1000 per group, 96 MB at 2000.
const MaxDesignTrials = 2000

// Design is a study design: N1 trials in the first group, N2 in the
// second, and the two-sided confidence level of the intervals (tests use
// α = 1 − Level).
type Design struct {
	N1    int     `json:"n1"`
	N2    int     `json:"n2"`
	Level float64 `json:"level"`
}

// NewDesign validates a design. Errors wrap proportions.ErrNoTrials (a
// group with fewer than one trial), proportions.ErrTooLarge (more than
// MaxDesignTrials) or proportions.ErrLevel.
func NewDesign(n1, n2 int, level float64) (Design, error) {
	d := Design{N1: n1, N2: n2, Level: level}
	return d, d.Validate()
}

// Validate reports whether the design can be evaluated.
func (d Design) Validate() error {
	if err := validateSizes(d.N1, d.N2); err != nil {
		return err
	}
	return proportions.ValidateLevel(d.Level)
}

// String prints "n1 = 24, n2 = 30, 95% level".
func (d Design) String() string {
	return fmt.Sprintf("n1 = %d, n2 = %d, %s%% level", d.N1, d.N2, formatPercent(d.Level))
}

func validateSizes(n1, n2 int) error {
	for i, n := range [2]int{n1, n2} {
		which := [2]string{"first", "second"}[i]
		switch {
		case n < 0:
			return fmt.Errorf("%s group: %d trials: %w; a design needs at least 1 trial per group", which, n, proportions.ErrNegativeCount)
		case n == 0:
			return fmt.Errorf("%s group: %d trials: %w; a design needs at least 1 trial per group", which, n, proportions.ErrNoTrials)
		case n > MaxDesignTrials:
			return fmt.Errorf("%s group: %d trials: %w; exact operating characteristics are computed for at most %d trials per group", which, n, proportions.ErrTooLarge, MaxDesignTrials)
		}
	}
	return nil
}

// validateRates checks a pair of success rates.
func validateRates(pi1, pi2 float64) error {
	if err := validateRate("π1", pi1); err != nil {
		return err
	}
	return validateRate("π2", pi2)
}

func validateRate(name string, pi float64) error {
	if !(pi >= 0 && pi <= 1) {
		return fmt.Errorf("%s = %v: %w; a success rate must lie between 0 and 1", name, pi, proportions.ErrPlan)
	}
	return nil
}

// formatPercent prints 0.95 as "95" and 0.975 as "97.5".
func formatPercent(level float64) string {
	return fmt.Sprintf("%g", math.Round(level*1e6)/1e4)
}
