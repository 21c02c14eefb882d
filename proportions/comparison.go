package proportions

import (
	"fmt"
	"strings"
)

// MaxTrials is the largest number of trials accepted for one group. Counts
// are int64 and every formula works in float64, which represents integers
// exactly up to 2^53; 2^50 leaves room for sums and products of the two
// groups' counts without loss.
const MaxTrials int64 = 1 << 50

// Default labels used when the caller gives none.
const (
	DefaultFirstLabel  = "group 1"
	DefaultSecondLabel = "group 2"
	DefaultEventName   = "event"
)

// Group is one arm of a comparison: Events out of Trials, with its label.
type Group struct {
	Label  string `json:"label"`
	Events int64  `json:"events"`
	Trials int64  `json:"trials"`
}

// Proportion returns Events/Trials (Trials is never zero in a validated group).
func (g Group) Proportion() float64 { return float64(g.Events) / float64(g.Trials) }

// NonEvents returns Trials − Events.
func (g Group) NonEvents() int64 { return g.Trials - g.Events }

// String prints "label: events/trials".
func (g Group) String() string { return fmt.Sprintf("%s: %d/%d", g.Label, g.Events, g.Trials) }

// Comparison is validated two-group binary data: the first and the second
// group, and the name of the event being counted (for example "germinated").
// Build one with [NewComparison], [FromTable], [FromRecords] or [ReadCSV];
// those constructors guarantee 0 ≤ events ≤ trials, 0 < trials ≤ MaxTrials.
type Comparison struct {
	First  Group  `json:"first"`
	Second Group  `json:"second"`
	Event  string `json:"event"`
}

// Counts returns the bare counts used by the methods.
func (c Comparison) Counts() Counts {
	return Counts{X1: c.First.Events, N1: c.First.Trials, X2: c.Second.Events, N2: c.Second.Trials}
}

// Swapped returns the comparison with the groups exchanged.
func (c Comparison) Swapped() Comparison {
	return Comparison{First: c.Second, Second: c.First, Event: c.Event}
}

// String prints "event: first x1/n1 vs second x2/n2".
func (c Comparison) String() string {
	return fmt.Sprintf("%s: %s vs %s", c.Event, c.First, c.Second)
}

// Counts is the bare data of a 2×2 comparison: X1 events of N1 trials in the
// first group and X2 of N2 in the second. Methods take Counts so that the
// operating-characteristics engine can call them for every outcome of a
// design without allocating.
type Counts struct {
	X1 int64 `json:"x1"`
	N1 int64 `json:"n1"`
	X2 int64 `json:"x2"`
	N2 int64 `json:"n2"`
}

// P1 returns X1/N1.
func (c Counts) P1() float64 { return float64(c.X1) / float64(c.N1) }

// P2 returns X2/N2.
func (c Counts) P2() float64 { return float64(c.X2) / float64(c.N2) }

// Swapped exchanges the groups.
func (c Counts) Swapped() Counts { return Counts{X1: c.X2, N1: c.N2, X2: c.X1, N2: c.N1} }

// Validate reports whether the counts form a valid comparison.
func (c Counts) Validate() error {
	if err := validateGroup("first", c.X1, c.N1); err != nil {
		return err
	}
	return validateGroup("second", c.X2, c.N2)
}

func validateGroup(which string, x, n int64) error {
	switch {
	case x < 0 || n < 0:
		return fmt.Errorf("%s group: %d events of %d trials: %w; counts must be 0 or more", which, x, n, ErrNegativeCount)
	case n == 0:
		return fmt.Errorf("%s group: %w; each group needs at least one trial", which, ErrNoTrials)
	case x > n:
		return fmt.Errorf("%s group: %d events of %d trials: %w; events must be between 0 and the number of trials", which, x, n, ErrEventsExceedTrials)
	case n > MaxTrials:
		return fmt.Errorf("%s group: %d trials: %w; at most %d trials per group are supported", which, n, ErrTooLarge, MaxTrials)
	}
	return nil
}

// Labels names the groups and the event of a comparison. Empty fields take
// the defaults DefaultFirstLabel, DefaultSecondLabel and DefaultEventName.
type Labels struct {
	First  string `json:"first"`
	Second string `json:"second"`
	Event  string `json:"event"`
}

func (l Labels) withDefaults() Labels {
	if strings.TrimSpace(l.First) == "" {
		l.First = DefaultFirstLabel
	}
	if strings.TrimSpace(l.Second) == "" {
		l.Second = DefaultSecondLabel
	}
	if strings.TrimSpace(l.Event) == "" {
		l.Event = DefaultEventName
	}
	return l
}

// NewComparison builds a comparison from counts: x1 events of n1 trials in
// the first group and x2 of n2 in the second. It returns an error wrapping
// ErrNegativeCount, ErrEventsExceedTrials, ErrNoTrials or ErrTooLarge when
// the counts are not valid.
func NewComparison(x1, n1, x2, n2 int64, labels Labels) (Comparison, error) {
	c := Counts{X1: x1, N1: n1, X2: x2, N2: n2}
	if err := c.Validate(); err != nil {
		return Comparison{}, err
	}
	l := labels.withDefaults()
	return Comparison{
		First:  Group{Label: l.First, Events: x1, Trials: n1},
		Second: Group{Label: l.Second, Events: x2, Trials: n2},
		Event:  l.Event,
	}, nil
}

// Table is a 2×2 table of counts with the groups as rows and the outcomes as
// columns:
//
//	               event      no event
//	first group    [0][0]=a   [0][1]=b
//	second group   [1][0]=c   [1][1]=d
//
// so x1 = a, n1 = a + b, x2 = c, n2 = c + d.
type Table [2][2]int64

// FromTable builds a comparison from a 2×2 table in the orientation
// documented on [Table].
func FromTable(t Table, labels Labels) (Comparison, error) {
	for i := range 2 {
		for j := range 2 {
			if t[i][j] < 0 {
				return Comparison{}, fmt.Errorf("table cell [%d][%d] = %d: %w; counts must be 0 or more", i, j, t[i][j], ErrNegativeCount)
			}
			if t[i][j] > MaxTrials {
				return Comparison{}, fmt.Errorf("table cell [%d][%d] = %d: %w; at most %d per cell", i, j, t[i][j], ErrTooLarge, MaxTrials)
			}
		}
	}
	return NewComparison(t[0][0], t[0][0]+t[0][1], t[1][0], t[1][0]+t[1][1], labels)
}

// Table returns the comparison as a 2×2 table (groups as rows, event first).
func (c Comparison) Table() Table {
	return Table{
		{c.First.Events, c.First.NonEvents()},
		{c.Second.Events, c.Second.NonEvents()},
	}
}
