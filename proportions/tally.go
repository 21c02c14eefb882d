package proportions

import (
	"fmt"
	"strings"
)

// Tally counts the rows of a source into a [Breakdown] as they stream by:
// events and trials per value of the breakdown column and group, so memory
// grows with the number of values, never with the number of rows. Every
// source shares it (records, CSV, Parquet, SQL), so a source only reads
// rows and the counting, the checks and the errors are the same for all.
//
// The Add methods return errors without the row's place; the source wraps
// them with it ("line 7: ...", "row 12: ...").
type Tally struct {
	by      string
	spec    RecordSpec
	event   string
	values  outcomeValues
	groups  []string
	index   map[string]int
	rows    []tallyRow
	skipped int64
}

// tallyRow holds one breakdown value's counts, by group index.
type tallyRow struct {
	value  string
	events [2]int64
	trials [2]int64
}

// NewTally starts a count following spec: its breakdown column names the
// result, its RecordSpec classifies outcomes and picks the first group. The
// event's name defaults to the outcome column's name for unit rows and the
// events column's name for cell rows. Errors wrap ErrOutcomeValue (event
// and non-event lists that are incomplete or overlap).
func NewTally(spec BreakdownSpec) (*Tally, error) {
	values, err := newOutcomeValues(spec.RecordSpec)
	if err != nil {
		return nil, err
	}
	cols := spec.Columns()
	event := defaultString(spec.EventName, cols[2])
	return &Tally{by: cols[0], spec: spec.RecordSpec, event: event, values: values, index: map[string]int{}}, nil
}

// AddUnit counts one unit of group with the given outcome under value.
// Spaces around value and group are trimmed. Errors wrap ErrMalformedRow
// (an empty value or group), ErrOutcomeValue (an outcome that is neither
// the event nor a non-event), ErrGroupCount (a third group) or ErrTooLarge.
func (t *Tally) AddUnit(value, group, outcome string) error {
	isEvent, err := t.values.classify(outcome)
	if err != nil {
		return err
	}
	var events int64
	if isEvent {
		events = 1
	}
	return t.add(value, group, events, 1)
}

// AddUnits counts units units of group, all with the given outcome, under
// value: what AddUnit does units times, for a source that has already
// counted equal rows (a database's GROUP BY). Errors are AddUnit's, and
// ErrNegativeCount for a negative number of units.
func (t *Tally) AddUnits(value, group, outcome string, units int64) error {
	if units < 0 {
		return fmt.Errorf("%d units: %w; counts must be 0 or more", units, ErrNegativeCount)
	}
	isEvent, err := t.values.classify(outcome)
	if err != nil {
		return err
	}
	var events int64
	if isEvent {
		events = units
	}
	return t.add(value, group, events, units)
}

// AddCell adds a cell of aggregated counts: events of trials units of group
// under value. A value and group may come in several cells; their counts
// add up. A cell of zero trials is allowed (it records the group and the
// value). Errors wrap ErrMalformedRow (an empty value or group),
// ErrNegativeCount, ErrEventsExceedTrials, ErrGroupCount (a third group) or
// ErrTooLarge (more than MaxTrials trials in one row and group).
func (t *Tally) AddCell(value, group string, events, trials int64) error {
	switch {
	case events < 0 || trials < 0:
		return fmt.Errorf("%d events of %d trials: %w; counts must be 0 or more", events, trials, ErrNegativeCount)
	case events > trials:
		return fmt.Errorf("%d events of %d trials: %w; events must be between 0 and the number of trials", events, trials, ErrEventsExceedTrials)
	case trials > MaxTrials:
		return fmt.Errorf("%d trials: %w; at most %d trials per group are supported", trials, ErrTooLarge, MaxTrials)
	}
	return t.add(value, group, events, trials)
}

// add counts validated events of trials.
func (t *Tally) add(value, group string, events, trials int64) error {
	v, g := strings.TrimSpace(value), strings.TrimSpace(group)
	if v == "" {
		return fmt.Errorf("%w; the %s is empty, and every row needs one", ErrMalformedRow, t.by)
	}
	gi, err := t.groupIndex(g)
	if err != nil {
		return err
	}
	ri, ok := t.index[v]
	if !ok {
		ri = len(t.rows)
		t.index[v] = ri
		t.rows = append(t.rows, tallyRow{value: v})
	}
	r := &t.rows[ri]
	if r.trials[gi] > MaxTrials-trials {
		return fmt.Errorf("%s %q, group %q: %w; at most %d trials per group and row are supported", t.by, v, g, ErrTooLarge, MaxTrials)
	}
	r.events[gi] += events
	r.trials[gi] += trials
	return nil
}

// groupIndex returns 0 or 1 for the group, in the order groups first came;
// a third group is an error listing the three.
func (t *Tally) groupIndex(g string) (int, error) {
	for i, h := range t.groups {
		if h == g {
			return i, nil
		}
	}
	if g == "" {
		return 0, fmt.Errorf("%w; the group is empty", ErrMalformedRow)
	}
	if len(t.groups) == 2 {
		return 0, fmt.Errorf("found groups %q, %q and %q: %w; the data must hold exactly two groups", t.groups[0], t.groups[1], g, ErrGroupCount)
	}
	t.groups = append(t.groups, g)
	return len(t.groups) - 1, nil
}

// Skip records n source rows left out because a column they need was NULL
// (only on request: BreakdownSpec.SkipNulls). The count is reported in
// [Breakdown.SkippedRows], so nothing is dropped silently. A count of
// rows left out cannot go down: n ≤ 0 changes nothing (a negative n made
// SkippedRows negative).
func (t *Tally) Skip(n int64) {
	if n > 0 {
		t.skipped += n
	}
}

// Breakdown returns the counts as a breakdown, one row per value in the
// order first met; a value where one group never occurs is kept as an
// empty row (see [BreakdownRow.Empty]). Errors wrap ErrEmptyInput (no
// rows), ErrGroupCount (one group only), ErrUnknownGroup (a FirstGroup not
// in the data) or an error of [NewBreakdown].
func (t *Tally) Breakdown() (Breakdown, error) {
	if len(t.rows) == 0 {
		return Breakdown{}, fmt.Errorf("%w: no rows to count (%d rows skipped)", ErrEmptyInput, t.skipped)
	}
	if len(t.groups) != 2 {
		return Breakdown{}, fmt.Errorf("found %d group %q: %w; the data must hold exactly two groups", len(t.groups), t.groups, ErrGroupCount)
	}
	first, second, swap, err := orderGroups(t.groups[0], t.groups[1], t.spec.FirstGroup)
	if err != nil {
		return Breakdown{}, err
	}
	a, b := 0, 1
	if swap {
		a, b = 1, 0
	}
	rows := make([]BreakdownRow, len(t.rows))
	for i, r := range t.rows {
		rows[i] = BreakdownRow{Value: r.value, Counts: Counts{X1: r.events[a], N1: r.trials[a], X2: r.events[b], N2: r.trials[b]}}
	}
	bd, err := NewBreakdown(t.by, Labels{First: first, Second: second, Event: t.event}, rows)
	if err != nil {
		return Breakdown{}, err
	}
	bd.SkippedRows = t.skipped
	return bd, nil
}
