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

// outcomeReader classifies outcome values and counts them per group,
// keeping the order in which groups first appear.
type outcomeReader struct {
	spec   RecordSpec
	event  []string
	non    []string
	order  []string
	events map[string]int64
	trials map[string]int64
}

func newOutcomeReader(spec RecordSpec) (*outcomeReader, error) {
	ev, non := spec.EventValues, spec.NonEventValues
	if len(ev) == 0 && len(non) == 0 {
		ev, non = defaultEventValues, defaultNonEventValues
	}
	if len(ev) == 0 || len(non) == 0 {
		return nil, fmt.Errorf("outcome values: %w; give both EventValues and NonEventValues (or neither, for the defaults %v and %v)",
			ErrOutcomeValue, defaultEventValues, defaultNonEventValues)
	}
	r := &outcomeReader{spec: spec, events: map[string]int64{}, trials: map[string]int64{}}
	for _, v := range ev {
		r.event = append(r.event, normalizeValue(v))
	}
	for _, v := range non {
		n := normalizeValue(v)
		if slices.Contains(r.event, n) {
			return nil, fmt.Errorf("outcome value %q: %w; it is listed both as the event and as a non-event", v, ErrOutcomeValue)
		}
		r.non = append(r.non, n)
	}
	return r, nil
}

func normalizeValue(v string) string { return strings.ToLower(strings.TrimSpace(v)) }

// add counts one unit; where names the unit in error messages.
func (r *outcomeReader) add(group, outcome, where string) error {
	g := strings.TrimSpace(group)
	if g == "" {
		return fmt.Errorf("%s: %w; the group is empty", where, ErrMalformedRow)
	}
	o := normalizeValue(outcome)
	var isEvent bool
	switch {
	case slices.Contains(r.event, o):
		isEvent = true
	case slices.Contains(r.non, o):
	default:
		return fmt.Errorf("%s: outcome %q: %w; allowed event values %q, non-event values %q",
			where, outcome, ErrOutcomeValue, r.event, r.non)
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
	first, second := r.order[0], r.order[1]
	if want := strings.TrimSpace(r.spec.FirstGroup); want != "" {
		switch want {
		case first:
		case second:
			first, second = second, first
		default:
			return Comparison{}, fmt.Errorf("first group %q: %w; the groups in the data are %q and %q", want, ErrUnknownGroup, first, second)
		}
	}
	event := r.spec.EventName
	if strings.TrimSpace(event) == "" {
		event = defaultEvent
	}
	return NewComparison(r.events[first], r.trials[first], r.events[second], r.trials[second],
		Labels{First: first, Second: second, Event: event})
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
