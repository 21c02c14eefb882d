package proportions

import (
	"encoding/json"
	"fmt"
	"strings"

	"github.com/propscope/propscope/internal/jsonlist"
)

// BreakdownRow is one row of a [Breakdown]: the value of the breakdown
// column (a block, a tray, a segment such as "plant A / night shift") and
// the 2×2 counts of the units that carry it. Unlike a [Comparison], a row
// may have a group with no trials (a block where one treatment was lost):
// such a row is kept and flagged by [BreakdownRow.Empty], never dropped.
type BreakdownRow struct {
	Value  string `json:"value"`
	Counts Counts `json:"counts"`
}

// Empty reports whether one of the row's groups has no trials, so that a
// method that needs both groups in every table cannot use the row.
func (r BreakdownRow) Empty() bool { return r.Counts.N1 == 0 || r.Counts.N2 == 0 }

// Breakdown is a comparison broken down by the values of one column: one
// 2×2 table per value, in the order the values were first met. The same
// data feed a stratified analysis (several tables, one question), a
// per-segment analysis (one question per table) and, with one group per
// value, clustered units. By names the column ("block"); the labels name
// the two groups and the event as in every other result.
//
// Build one with [NewBreakdown] (or a reader that aggregates records), which
// guarantees valid counts, distinct values and at least one row.
type Breakdown struct {
	By     string         `json:"by"`
	First  string         `json:"first"`
	Second string         `json:"second"`
	Event  string         `json:"event"`
	Rows   []BreakdownRow `json:"rows"`
	// SkippedRows counts the source rows left out because a column they need
	// was NULL, only when the reader was asked to (BreakdownSpec.SkipNulls);
	// otherwise a NULL is an error and SkippedRows is 0.
	SkippedRows int64 `json:"skipped_rows"`
}

// DefaultBreakdownColumn names the breakdown column when the caller gives
// no name.
const DefaultBreakdownColumn = "stratum"

// NewBreakdown validates rows and labels and returns the breakdown. Each
// row's counts must satisfy 0 ≤ events ≤ trials ≤ MaxTrials; a group may
// have zero trials (see [BreakdownRow.Empty]) but not both groups of one
// row; values must be distinct (compared exactly, after trimming spaces) and
// not empty. Errors wrap ErrEmptyInput, ErrNegativeCount,
// ErrEventsExceedTrials, ErrTooLarge, ErrNoTrials or ErrDuplicateValue and
// name the offending row.
func NewBreakdown(by string, labels Labels, rows []BreakdownRow) (Breakdown, error) {
	if len(rows) == 0 {
		return Breakdown{}, fmt.Errorf("breakdown: %w; give at least one row", ErrEmptyInput)
	}
	if strings.TrimSpace(by) == "" {
		by = DefaultBreakdownColumn
	}
	l := labels.withDefaults()
	seen := make(map[string]int, len(rows))
	out := make([]BreakdownRow, len(rows))
	for i, r := range rows {
		r.Value = strings.TrimSpace(r.Value)
		if r.Value == "" {
			return Breakdown{}, fmt.Errorf("breakdown row %d: %w; every row needs a value of %q", i+1, ErrEmptyInput, by)
		}
		if j, ok := seen[r.Value]; ok {
			return Breakdown{}, fmt.Errorf("breakdown rows %d and %d: %q: %w; each value of %q may appear once", j+1, i+1, r.Value, ErrDuplicateValue, by)
		}
		seen[r.Value] = i
		if err := validateRow(r.Counts); err != nil {
			return Breakdown{}, fmt.Errorf("breakdown row %d (%s %q): %w", i+1, by, r.Value, err)
		}
		out[i] = r
	}
	return Breakdown{By: by, First: l.First, Second: l.Second, Event: l.Event, Rows: out}, nil
}

// validateRow is Counts.Validate with one group allowed to have no trials.
func validateRow(c Counts) error {
	if c.N1 == 0 && c.N2 == 0 {
		return fmt.Errorf("%w; at least one group of a row needs trials", ErrNoTrials)
	}
	for _, g := range []struct {
		which string
		x, n  int64
	}{{"first", c.X1, c.N1}, {"second", c.X2, c.N2}} {
		if g.n == 0 && g.x == 0 {
			continue
		}
		if err := validateGroup(g.which, g.x, g.n); err != nil {
			return err
		}
	}
	return nil
}

// Labels returns the group and event labels of the breakdown.
func (b Breakdown) Labels() Labels {
	return Labels{First: b.First, Second: b.Second, Event: b.Event}
}

// Comparison returns row i as a comparison with the breakdown's labels. It
// fails with ErrNoTrials for an empty row, and with ErrEmptyInput when the
// breakdown has no row i (rows count from 0).
func (b Breakdown) Comparison(i int) (Comparison, error) {
	if len(b.Rows) == 0 {
		return Comparison{}, fmt.Errorf("row %d of a breakdown by %q: %w; the breakdown has no rows", i, b.By, ErrEmptyInput)
	}
	if i < 0 || i >= len(b.Rows) {
		return Comparison{}, fmt.Errorf("row %d of a breakdown by %q: %w; its rows are numbered from 0 to %d",
			i, b.By, ErrEmptyInput, len(b.Rows)-1)
	}
	r := b.Rows[i]
	c, err := NewComparison(r.Counts.X1, r.Counts.N1, r.Counts.X2, r.Counts.N2, b.Labels())
	if err != nil {
		return Comparison{}, fmt.Errorf("%s %q: %w", b.By, r.Value, err)
	}
	return c, nil
}

// Crude returns the comparison of the pooled counts, summed over every row:
// the analysis that ignores the breakdown.
//
// A pooled group of more than MaxTrials trials is an error wrapping
// ErrTooLarge: the sums are checked as they grow, since 8192 rows of
// MaxTrials trials overflow int64 and came out as a negative count.
func (b Breakdown) Crude() (Comparison, error) {
	var s Counts
	for _, r := range b.Rows {
		s.X1 += r.Counts.X1
		s.N1 += r.Counts.N1
		s.X2 += r.Counts.X2
		s.N2 += r.Counts.N2
		// Each row's counts are at most MaxTrials = 2⁵⁰, so checking after
		// every row keeps the sums far from int64's limit of 2⁶³.
		for _, n := range [2]struct {
			which  string
			trials int64
		}{{"first", s.N1}, {"second", s.N2}} {
			if n.trials > MaxTrials {
				return Comparison{}, fmt.Errorf("pooled over every %s: %s group: more than %d trials: %w; at most %d trials per group are supported, so analyse the %ss separately",
					b.By, n.which, MaxTrials, ErrTooLarge, MaxTrials, b.By)
			}
		}
	}
	c, err := NewComparison(s.X1, s.N1, s.X2, s.N2, b.Labels())
	if err != nil {
		return Comparison{}, fmt.Errorf("pooled over every %s: %w", b.By, err)
	}
	return c, nil
}

// String prints the column, the labels and the number of rows.
func (b Breakdown) String() string {
	return fmt.Sprintf("%s: %s vs %s by %s (%d rows)", b.Event, b.First, b.Second, b.By, len(b.Rows))
}

// MarshalJSON writes the breakdown with rows as a list, never null.
func (b Breakdown) MarshalJSON() ([]byte, error) {
	type plain Breakdown // without this method
	p := plain(b)
	p.Rows = jsonlist.NonNil(p.Rows)
	return json.Marshal(p)
}
