package proportions

import (
	"fmt"
	"strings"
)

// Validate checks one row as NewBreakdown does, for code that reads rows
// one at a time without building a Breakdown (a stream of segments): the
// value must not be blank, and the counts must satisfy 0 ≤ events ≤
// trials ≤ MaxTrials with at most one group without trials. It does not
// check that values are distinct, which needs every row. Errors wrap
// ErrEmptyInput, ErrNegativeCount, ErrEventsExceedTrials, ErrTooLarge or
// ErrNoTrials.
func (r BreakdownRow) Validate() error {
	if strings.TrimSpace(r.Value) == "" {
		return fmt.Errorf("%w; every row needs a value", ErrEmptyInput)
	}
	return validateRow(r.Counts)
}
