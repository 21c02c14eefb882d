package proportions

import "fmt"

// Better says which way a group's rate is good: up when the counted event is
// wanted (seeds that germinate, patients who respond), down when it is not
// (defects, failures). One concept serves everything that needs a direction
// of benefit: a study plan derives its one-sided alternative from it, and
// the number needed to treat uses it to say "benefit" or "harm".
type Better int

const (
	// HigherIsBetter, the zero value: more events are better.
	HigherIsBetter Better = iota
	// LowerIsBetter: fewer events are better, such as defect rates.
	LowerIsBetter
)

var betterNames = [...]string{"higher", "lower"}

// String returns "higher" or "lower".
func (b Better) String() string {
	if b < 0 || int(b) >= len(betterNames) {
		return fmt.Sprintf("Better(%d)", int(b))
	}
	return betterNames[b]
}

// Validate returns an error wrapping ErrBetter unless b is HigherIsBetter
// or LowerIsBetter.
func (b Better) Validate() error {
	if b < 0 || int(b) >= len(betterNames) {
		return fmt.Errorf("better %d: %w; use HigherIsBetter or LowerIsBetter", int(b), ErrBetter)
	}
	return nil
}

// Alternative is the one-sided alternative hypothesis that the first group
// is better: Greater when higher is better, Less when lower is better.
func (b Better) Alternative() Alternative {
	if b == LowerIsBetter {
		return Less
	}
	return Greater
}

// MarshalText writes "higher" or "lower".
func (b Better) MarshalText() ([]byte, error) {
	if err := b.Validate(); err != nil {
		return nil, err
	}
	return []byte(b.String()), nil
}

// UnmarshalText reads "higher" or "lower".
func (b *Better) UnmarshalText(t []byte) error {
	for i, n := range betterNames {
		if string(t) == n {
			*b = Better(i)
			return nil
		}
	}
	return fmt.Errorf("better %q: %w; use \"higher\" or \"lower\"", t, ErrBetter)
}
