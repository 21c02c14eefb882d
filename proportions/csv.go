package proportions

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strings"
)

// Default CSV column names.
const (
	DefaultGroupColumn   = "group"
	DefaultOutcomeColumn = "outcome"
)

// CSVSpec says how to read a CSV file of one row per unit into a
// comparison. The first row is the header. Empty fields take defaults:
// GroupColumn "group", OutcomeColumn "outcome", Comma ','; the embedded
// RecordSpec documents the outcome values and the first group. The event's
// name defaults to the outcome column's name.
type CSVSpec struct {
	GroupColumn   string
	OutcomeColumn string
	// Comma is the field delimiter (',' by default; ';' and '\t' are common).
	Comma rune
	RecordSpec
}

// ReadCSV reads one row per unit from r and counts it into a comparison.
// Other columns are ignored. Lines may end in LF, CRLF or CR alone (old Mac
// files), and a UTF-8 byte-order mark before the header is skipped. Errors
// wrap ErrEmptyInput (no header or no rows), ErrMissingColumn,
// ErrMalformedRow (with the line number; also for a header that names the
// group or outcome column twice), ErrOutcomeValue (with the line number),
// ErrGroupCount or ErrUnknownGroup.
func ReadCSV(r io.Reader, spec CSVSpec) (Comparison, error) {
	groupCol := defaultString(spec.GroupColumn, DefaultGroupColumn)
	outcomeCol := defaultString(spec.OutcomeColumn, DefaultOutcomeColumn)
	counter, err := newOutcomeReader(spec.RecordSpec)
	if err != nil {
		return Comparison{}, err
	}
	cr := csv.NewReader(newLineEnds(r))
	if spec.Comma != 0 {
		cr.Comma = spec.Comma
	}
	cr.ReuseRecord = true
	header, err := cr.Read()
	if errors.Is(err, io.EOF) {
		return Comparison{}, fmt.Errorf("%w: the CSV has no header row and no data", ErrEmptyInput)
	}
	if err != nil {
		return Comparison{}, csvError(err)
	}
	gi, oi, err := findColumns(header, groupCol, outcomeCol)
	if err != nil {
		return Comparison{}, err
	}
	for {
		row, err := cr.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return Comparison{}, csvError(err)
		}
		line, _ := cr.FieldPos(0)
		if err := counter.add(row[gi], row[oi], fmt.Sprintf("line %d", line)); err != nil {
			return Comparison{}, err
		}
	}
	if len(counter.order) == 0 {
		return Comparison{}, fmt.Errorf("%w: the CSV has a header but no data rows", ErrEmptyInput)
	}
	return counter.comparison(outcomeCol)
}

func defaultString(v, def string) string {
	if strings.TrimSpace(v) == "" {
		return def
	}
	return strings.TrimSpace(v)
}

// findColumns locates the two named columns, exactly after trimming spaces
// (and a UTF-8 byte-order mark), or else ignoring case when that is unique.
func findColumns(header []string, groupCol, outcomeCol string) (gi, oi int, err error) {
	names := make([]string, len(header))
	for i, h := range header {
		names[i] = strings.TrimSpace(strings.TrimPrefix(h, "\ufeff"))
	}
	if gi, err = findColumn(names, groupCol); err != nil {
		return 0, 0, err
	}
	if oi, err = findColumn(names, outcomeCol); err != nil {
		return 0, 0, err
	}
	if gi == oi {
		return 0, 0, fmt.Errorf("column %q: %w; the group and outcome columns must differ", groupCol, ErrMissingColumn)
	}
	return gi, oi, nil
}

// findColumn returns the one column named want: exactly, or else ignoring
// case. A name that occurs twice is an error rather than a guess: which
// column holds the data cannot be told from the header, and taking the
// first silently counted the wrong one.
func findColumn(names []string, want string) (int, error) {
	var exact, folded []int
	for i, n := range names {
		switch {
		case n == want:
			exact = append(exact, i)
		case strings.EqualFold(n, want):
			folded = append(folded, i)
		}
	}
	found := exact
	if len(found) == 0 {
		found = folded
	}
	switch len(found) {
	case 1:
		return found[0], nil
	case 0:
		return 0, fmt.Errorf("column %q: %w; the header has %q", want, ErrMissingColumn, names)
	}
	cols := make([]string, len(found))
	for k, i := range found {
		cols[k] = fmt.Sprintf("%d (%q)", i+1, names[i])
	}
	return 0, fmt.Errorf("line 1: %w: the header names column %q %d times (columns %s); each column name must occur once",
		ErrMalformedRow, want, len(found), strings.Join(cols, ", "))
}

func csvError(err error) error {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return fmt.Errorf("line %d: %w: %v", pe.Line, ErrMalformedRow, pe.Err)
	}
	return fmt.Errorf("%w: %v", ErrMalformedRow, err)
}
