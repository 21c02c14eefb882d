package proportions

import (
	"context"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"
)

// Layout says how the rows of a source hold a breakdown's data.
type Layout int

const (
	// UnitRows: one row per unit, with its breakdown value, group and
	// outcome (a defect inspection log: one row per part inspected).
	UnitRows Layout = iota
	// CellRows: one row per cell of counts, with its breakdown value,
	// group, events and trials (a summary table: 3 defective of 120
	// inspected). A value and group may have several rows; they add up.
	CellRows
)

// String returns the layout's name: "unit-rows" or "cell-rows".
func (l Layout) String() string {
	switch l {
	case UnitRows:
		return "unit-rows"
	case CellRows:
		return "cell-rows"
	}
	return fmt.Sprintf("layout(%d)", int(l))
}

// Default column names of the cell-rows layout.
const (
	DefaultEventsColumn = "events"
	DefaultTrialsColumn = "trials"
)

// BreakdownSpec says how to read a source (records, CSV, Parquet, SQL) into
// a [Breakdown]. Empty fields take defaults: Layout UnitRows, ByColumn
// "stratum", GroupColumn "group", OutcomeColumn "outcome" (unit rows),
// EventsColumn "events" and TrialsColumn "trials" (cell rows). Column names
// are found exactly, or else ignoring case (see [FindColumns]). The embedded
// RecordSpec classifies outcomes and picks the first group; the event's
// name defaults to the outcome column's name (unit rows) or the events
// column's name (cell rows).
type BreakdownSpec struct {
	// Layout says whether a row is a unit or a cell of counts.
	Layout Layout
	// ByColumn names the breakdown column (a block, a segment, a cluster).
	ByColumn string
	// GroupColumn names the column holding the two groups.
	GroupColumn string
	// OutcomeColumn names the outcome column of unit rows.
	OutcomeColumn string
	// EventsColumn and TrialsColumn name the count columns of cell rows.
	EventsColumn, TrialsColumn string
	// Comma is the CSV delimiter; zero detects it as [CSVSpec] does.
	Comma rune
	// SkipNulls, for SQL and Parquet sources, leaves out rows where a
	// column the layout needs is NULL and counts them in
	// [Breakdown.SkippedRows]; without it a NULL is an error naming the column.
	SkipNulls bool
	RecordSpec
}

// Columns returns the column names the layout reads, defaults filled in:
// breakdown, group, outcome for unit rows; breakdown, group, events,
// trials for cell rows.
func (s BreakdownSpec) Columns() []string {
	by := defaultString(s.ByColumn, DefaultBreakdownColumn)
	group := defaultString(s.GroupColumn, DefaultGroupColumn)
	if s.Layout == CellRows {
		return []string{by, group, defaultString(s.EventsColumn, DefaultEventsColumn), defaultString(s.TrialsColumn, DefaultTrialsColumn)}
	}
	return []string{by, group, defaultString(s.OutcomeColumn, DefaultOutcomeColumn)}
}

// Check reports an unknown layout (ErrLayout) or incomplete outcome values
// (ErrOutcomeValue) before any data is read.
func (s BreakdownSpec) Check() error {
	if s.Layout != UnitRows && s.Layout != CellRows {
		return fmt.Errorf("%v: %w; use UnitRows or CellRows", s.Layout, ErrLayout)
	}
	_, err := newOutcomeValues(s.RecordSpec)
	return err
}

// BreakdownRecord is one unit of a breakdown: the value of the breakdown
// column, its group and its outcome as written in the data.
type BreakdownRecord struct {
	Value   string `json:"value"`
	Group   string `json:"group"`
	Outcome string `json:"outcome"`
}

// BreakdownCell is one cell of counts of a breakdown: Events of Trials
// units of Group under Value.
type BreakdownCell struct {
	Value  string `json:"value"`
	Group  string `json:"group"`
	Events int64  `json:"events"`
	Trials int64  `json:"trials"`
}

// BreakdownFromRecords counts one record per unit into a breakdown by
// spec.ByColumn (the column names and Layout are not read; the event's name
// defaults to "event"). Errors are those of [Tally], naming the record by
// its index.
func BreakdownFromRecords(records []BreakdownRecord, spec BreakdownSpec) (Breakdown, error) {
	spec.Layout = UnitRows
	spec.EventName = defaultString(spec.EventName, DefaultEventName)
	t, err := NewTally(spec)
	if err != nil {
		return Breakdown{}, err
	}
	for i, r := range records {
		if err := t.AddUnit(r.Value, r.Group, r.Outcome); err != nil {
			return Breakdown{}, fmt.Errorf("record %d: %w", i, err)
		}
	}
	return t.Breakdown()
}

// BreakdownFromCells adds cells of counts into a breakdown by
// spec.ByColumn (the event's name defaults to "event"). Errors are those of
// [Tally], naming the cell by its index.
func BreakdownFromCells(cells []BreakdownCell, spec BreakdownSpec) (Breakdown, error) {
	spec.Layout = CellRows
	spec.EventName = defaultString(spec.EventName, DefaultEventName)
	t, err := NewTally(spec)
	if err != nil {
		return Breakdown{}, err
	}
	for i, c := range cells {
		if err := t.AddCell(c.Value, c.Group, c.Events, c.Trials); err != nil {
			return Breakdown{}, fmt.Errorf("cell %d (%q, %q): %w", i, c.Value, c.Group, err)
		}
	}
	return t.Breakdown()
}

// ReadBreakdownCSV is ReadBreakdownCSVContext without a deadline.
func ReadBreakdownCSV(r io.Reader, spec BreakdownSpec) (Breakdown, error) {
	return ReadBreakdownCSVContext(context.Background(), r, spec)
}

// rowsPerContextCheck is how many rows a reader counts between looks at
// its context: well under a millisecond of work.
const rowsPerContextCheck = 1 << 14

// ReadBreakdownCSVContext streams a CSV file of unit rows or cell rows (see
// spec.Layout) into a breakdown; memory grows with the number of breakdown
// values, not rows. Line ends, the byte-order mark and the delimiter are
// handled as by [ReadCSV]; other columns are ignored. Errors wrap
// ErrEmptyInput, ErrMissingColumn (listing the header), ErrMalformedRow
// (with the line number: a ragged row, a count that is not a whole number,
// an empty value or group), ErrOutcomeValue, ErrNegativeCount,
// ErrEventsExceedTrials, ErrGroupCount, ErrUnknownGroup or ErrTooLarge; a
// row's error names its line. A cancelled ctx stops the read with its error.
func ReadBreakdownCSVContext(ctx context.Context, r io.Reader, spec BreakdownSpec) (Breakdown, error) {
	if err := spec.Check(); err != nil {
		return Breakdown{}, err
	}
	cols := spec.Columns()
	t, err := NewTally(spec)
	if err != nil {
		return Breakdown{}, err
	}
	table, err := openCSV(r, spec.Comma, cols...)
	if err != nil {
		return Breakdown{}, err
	}
	rows := 0
	for ; ; rows++ {
		if rows%rowsPerContextCheck == 0 {
			if err := ctx.Err(); err != nil {
				return Breakdown{}, err
			}
		}
		row, where, err := table.next()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return Breakdown{}, err
		}
		if err := addCSVRow(t, spec.Layout, row, table.cols, cols); err != nil {
			return Breakdown{}, fmt.Errorf("%s: %w", where, err)
		}
	}
	if rows == 0 {
		return Breakdown{}, fmt.Errorf("%w: the CSV has a header but no data rows", ErrEmptyInput)
	}
	return t.Breakdown()
}

// addCSVRow counts one CSV row of the layout; at holds the columns' indexes
// and names their names, in the order of BreakdownSpec.Columns.
func addCSVRow(t *Tally, layout Layout, row []string, at []int, names []string) error {
	if layout == UnitRows {
		return t.AddUnit(row[at[0]], row[at[1]], row[at[2]])
	}
	events, err := ParseCount(row[at[2]], names[2])
	if err != nil {
		return err
	}
	trials, err := ParseCount(row[at[3]], names[3])
	if err != nil {
		return err
	}
	return t.AddCell(row[at[0]], row[at[1]], events, trials)
}

// ParseCount reads a count written as a whole number (spaces around it
// allowed); anything else is an error wrapping ErrMalformedRow that names
// the column, and a whole number beyond int64 one wrapping ErrTooLarge.
// Signs are kept, so a negative count reaches the count checks.
func ParseCount(s, column string) (int64, error) {
	n, err := strconv.ParseInt(strings.TrimSpace(s), 10, 64)
	if errors.Is(err, strconv.ErrRange) {
		return 0, fmt.Errorf("column %q: %q: %w; a count may be at most %d", column, s, ErrTooLarge, MaxTrials)
	}
	if err != nil {
		return 0, fmt.Errorf("column %q: %q: %w; a count must be a whole number", column, s, ErrMalformedRow)
	}
	return n, nil
}
