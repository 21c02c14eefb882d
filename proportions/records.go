package proportions

import (
	"fmt"
	"slices"
	"strconv"
	"strings"
)

// Record is one observed unit: the group it belongs to and its outcome
// value as written in the data (for example "coated", "yes").
type Record struct {
	Group   string `json:"group"`
	Outcome string `json:"outcome"`
}

// Default outcome values, matched after trimming spaces and ignoring case.
var (
	defaultEventValues    = []string{"1", "yes", "true"}
	defaultNonEventValues = []string{"0", "no", "false"}
)

// RecordSpec says how to read records into a comparison.
//
// Defaults: the first group is the first one met in the data; outcome values
// "1", "yes", "true" count as the event and "0", "no", "false" as a
// non-event (trimmed, case-insensitive); the event's name is "event" for
// records and the outcome column's name for CSV. Giving EventValues or
// NonEventValues replaces both default lists, so give both; any outcome
// value in neither list is an error (nothing is dropped silently).
type RecordSpec struct {
	// FirstGroup names the group reported first (group 1 in π1 − π2).
	FirstGroup string
	// EventValues are the outcome values that count as the event.
	EventValues []string
	// NonEventValues are the outcome values that count as a non-event.
	NonEventValues []string
	// EventName names the event in every result ("germinated").
	EventName string
}

// outcomeValues classifies outcome values as the event or a non-event,
// after trimming spaces and ignoring case. Every reader shares it (records,
// CSV, breakdown sources), so a value means the same in every source.
type outcomeValues struct {
	event []string
	non   []string
}

func newOutcomeValues(spec RecordSpec) (outcomeValues, error) {
	ev, non := spec.EventValues, spec.NonEventValues
	if len(ev) == 0 && len(non) == 0 {
		ev, non = defaultEventValues, defaultNonEventValues
	}
	if len(ev) == 0 || len(non) == 0 {
		return outcomeValues{}, fmt.Errorf("outcome values: %w; give both EventValues and NonEventValues (or neither, for the defaults %v and %v)",
			ErrOutcomeValue, defaultEventValues, defaultNonEventValues)
	}
	var o outcomeValues
	for _, v := range ev {
		o.event = append(o.event, normalizeValue(v))
	}
	for _, v := range non {
		n := normalizeValue(v)
		if slices.Contains(o.event, n) {
			return outcomeValues{}, fmt.Errorf("outcome value %q: %w; it is listed both as the event and as a non-event", v, ErrOutcomeValue)
		}
		o.non = append(o.non, n)
	}
	return o, nil
}

// classify reports whether outcome is the event; a value in neither list is
// an error naming it and the allowed values (the caller adds where it is).
func (o outcomeValues) classify(outcome string) (bool, error) {
	n := normalizeValue(outcome)
	switch {
	case slices.Contains(o.event, n):
		return true, nil
	case slices.Contains(o.non, n):
		return false, nil
	}
	return false, fmt.Errorf("outcome %q: %w; allowed event values %q, non-event values %q",
		outcome, ErrOutcomeValue, o.event, o.non)
}

// outcomeReader classifies outcome values and counts them per group,
// keeping the order in which groups first appear.
type outcomeReader struct {
	spec   RecordSpec
	values outcomeValues
	order  []string
	events map[string]int64
	trials map[string]int64
}

func newOutcomeReader(spec RecordSpec) (*outcomeReader, error) {
	values, err := newOutcomeValues(spec)
	if err != nil {
		return nil, err
	}
	return &outcomeReader{spec: spec, values: values, events: map[string]int64{}, trials: map[string]int64{}}, nil
}

func normalizeValue(v string) string { return strings.ToLower(strings.TrimSpace(v)) }

// add counts one unit; where names the unit in error messages.
func (r *outcomeReader) add(group, outcome, where string) error {
	g := strings.TrimSpace(group)
	if g == "" {
		return fmt.Errorf("%s: %w; the group is empty", where, ErrMalformedRow)
	}
	isEvent, err := r.values.classify(outcome)
	if err != nil {
		return fmt.Errorf("%s: %w", where, err)
	}
	if _, seen := r.trials[g]; !seen {
		r.order = append(r.order, g)
	}
	r.trials[g]++
	if isEvent {
		r.events[g]++
	}
	return nil
}

// comparison turns the counts into a validated two-group comparison.
func (r *outcomeReader) comparison(defaultEvent string) (Comparison, error) {
	if len(r.order) == 0 {
		return Comparison{}, fmt.Errorf("%w: no records to count", ErrEmptyInput)
	}
	if len(r.order) != 2 {
		return Comparison{}, groupCountError(r.order)
	}
	first, second, _, err := orderGroups(r.order[0], r.order[1], r.spec.FirstGroup)
	if err != nil {
		return Comparison{}, err
	}
	event := r.spec.EventName
	if strings.TrimSpace(event) == "" {
		event = defaultEvent
	}
	return NewComparison(r.events[first], r.trials[first], r.events[second], r.trials[second],
		Labels{First: first, Second: second, Event: event})
}

// orderGroups puts the groups a and b (in the order met) in reporting
// order: as met, or with the named first group first (swap reports the
// exchange). A first group that is neither is an error listing both.
func orderGroups(a, b, firstGroup string) (first, second string, swap bool, err error) {
	switch want := strings.TrimSpace(firstGroup); want {
	case "", a:
		return a, b, false, nil
	case b:
		return b, a, true, nil
	default:
		return "", "", false, fmt.Errorf("first group %q: %w; the groups in the data are %q and %q", want, ErrUnknownGroup, a, b)
	}
}

// FromRecords counts records into a comparison following spec (see
// RecordSpec for the defaults). Errors wrap ErrEmptyInput, ErrGroupCount,
// ErrUnknownGroup, ErrOutcomeValue or ErrMalformedRow; the message names the
// offending record by its index.
func FromRecords(records []Record, spec RecordSpec) (Comparison, error) {
	r, err := newOutcomeReader(spec)
	if err != nil {
		return Comparison{}, err
	}
	for i, rec := range records {
		if err := r.add(rec.Group, rec.Outcome, fmt.Sprintf("record %d", i)); err != nil {
			return Comparison{}, err
		}
	}
	return r.comparison(DefaultEventName)
}

// groupCountError says how many groups the data hold, with their names,
// and what to do: the sentinel already says that two are needed.
func groupCountError(groups []string) error {
	names := make([]string, len(groups))
	for i, g := range groups {
		names[i] = strconv.Quote(g)
	}
	if len(groups) == 1 {
		return fmt.Errorf("%w; the data hold one group, %s: check that the group column is the right one", ErrGroupCount, names[0])
	}
	return fmt.Errorf("%w; the data hold %d groups, %s: keep only the rows of the pair to compare", ErrGroupCount, len(groups), strings.Join(names, ", "))
}
