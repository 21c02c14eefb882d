package proportions

import (
	"context"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"
	"unicode/utf8"
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
	// Comma is the field delimiter. Zero detects it from the header: ','
	// unless the header has no comma outside quotes but has ';' or '\t',
	// which is then the delimiter (a header with both is an error: set it).
	Comma rune
	RecordSpec
}

// ReadCSV reads one row per unit from r and counts it into a comparison.
// Other columns are ignored. Lines may end in LF, CRLF or CR alone (old Mac
// files), and a UTF-8 byte-order mark before the header is skipped. With no
// Comma set, a header with no comma but with semicolons or tabs sets the
// delimiter (see [CSVSpec]). Errors wrap ErrEmptyInput (no header or no
// rows), ErrMissingColumn, ErrMalformedRow (with the line number; also for a
// header that names the group or outcome column twice), ErrOutcomeValue
// (with the line number), ErrGroupCount or ErrUnknownGroup. It is
// ReadCSVContext without a deadline.
func ReadCSV(r io.Reader, spec CSVSpec) (Comparison, error) {
	return ReadCSVContext(context.Background(), r, spec)
}

// ReadCSVContext is ReadCSV that a cancel stops: it looks at ctx every
// few thousand rows (well under a millisecond of work) and returns its
// error, so a reader of a file of billions of rows, or of a pipe that
// never ends, can be stopped.
func ReadCSVContext(ctx context.Context, r io.Reader, spec CSVSpec) (Comparison, error) {
	groupCol := defaultString(spec.GroupColumn, DefaultGroupColumn)
	outcomeCol := defaultString(spec.OutcomeColumn, DefaultOutcomeColumn)
	counter, err := newOutcomeReader(spec.RecordSpec)
	if err != nil {
		return Comparison{}, err
	}
	table, err := openCSV(r, spec.Comma, groupCol, outcomeCol)
	if err != nil {
		return Comparison{}, err
	}
	gi, oi := table.cols[0], table.cols[1]
	for rows := 0; ; rows++ {
		if rows%rowsPerContextCheck == 0 {
			if err := ctx.Err(); err != nil {
				return Comparison{}, err
			}
		}
		row, where, err := table.next()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return Comparison{}, err
		}
		if err := counter.add(row[gi], row[oi], where); err != nil {
			return Comparison{}, err
		}
	}
	if len(counter.order) == 0 {
		return Comparison{}, fmt.Errorf("%w: the CSV has a header but no data rows", ErrEmptyInput)
	}
	return counter.comparison(outcomeCol)
}

// csvTable reads the rows of a CSV file after its header, where the named
// columns were found at cols. Readers of every layout share it, so they
// handle line ends, the byte-order mark, the delimiter and the header alike.
type csvTable struct {
	cr   *csv.Reader
	cols []int
}

// openCSV reads the header of r and finds the columns named in want (see
// [FindColumns]). comma 0 detects the delimiter from the header.
func openCSV(r io.Reader, comma rune, want ...string) (*csvTable, error) {
	if comma != 0 && !validComma(comma) {
		return nil, fmt.Errorf("delimiter %q: %w; the delimiter (Comma) must be one character other than a double quote, a line break or U+FFFD, such as ',', ';' or '\\t', or 0 to detect it from the header",
			comma, ErrMalformedRow)
	}
	ends := newLineEnds(r)
	if comma == 0 {
		var err error
		if comma, err = detectComma(ends.peekLine()); err != nil {
			return nil, err
		}
	}
	cr := csv.NewReader(ends)
	cr.Comma = comma
	cr.ReuseRecord = true
	header, err := cr.Read()
	if errors.Is(err, io.EOF) {
		return nil, fmt.Errorf("%w: the CSV has no header row and no data", ErrEmptyInput)
	}
	if err != nil {
		return nil, csvError(err)
	}
	cols, err := FindColumns(header, want...)
	if errors.Is(err, ErrMalformedRow) {
		return nil, fmt.Errorf("line 1 (the header): %w", err) // FindColumns serves SQL and Parquet too, which have no lines
	}
	if err != nil {
		return nil, err
	}
	return &csvTable{cr: cr, cols: cols}, nil
}

// validComma reports whether encoding/csv accepts r as a delimiter; it
// refuses the others only when the first row is read, with a message that
// blamed the row ("malformed row: invalid field or comment delimiter").
func validComma(r rune) bool {
	return r != '"' && r != '\r' && r != '\n' && utf8.ValidRune(r) && r != utf8.RuneError
}

// next returns the next row and its place ("line 7") for error messages;
// io.EOF after the last row. The row is reused by the following call.
func (t *csvTable) next() (row []string, where string, err error) {
	row, err = t.cr.Read()
	if errors.Is(err, io.EOF) {
		return nil, "", io.EOF
	}
	if err != nil {
		return nil, "", csvError(err)
	}
	line, _ := t.cr.FieldPos(0)
	return row, "line " + strconv.Itoa(line), nil
}

// detectComma picks the delimiter from the header line: a comma outside
// quotes means ',' (the default, also for a one-column header); a header
// with no comma but semicolons (spreadsheets in locales with decimal
// commas) or tabs uses that. A header with both, and no comma, cannot be
// told apart and is an error asking for the delimiter.
func detectComma(header []byte) (rune, error) {
	var commas, semicolons, tabs int
	quoted := false
	for _, c := range header {
		switch {
		case c == '"':
			quoted = !quoted
		case quoted:
		case c == ',':
			commas++
		case c == ';':
			semicolons++
		case c == '\t':
			tabs++
		}
	}
	switch {
	case commas > 0 || semicolons+tabs == 0:
		return ',', nil
	case semicolons > 0 && tabs > 0:
		return 0, fmt.Errorf("line 1: %w: the header has %d semicolons and %d tabs and no comma, so the delimiter is unclear; set the delimiter (Comma) to ';' or '\\t'",
			ErrMalformedRow, semicolons, tabs)
	case semicolons > 0:
		return ';', nil
	}
	return '\t', nil
}

func defaultString(v, def string) string {
	if strings.TrimSpace(v) == "" {
		return def
	}
	return strings.TrimSpace(v)
}

// FindColumns returns the index in header of each column named in want,
// found exactly after trimming spaces (and a UTF-8 byte-order mark), or else
// ignoring case when that is unique. A wanted name missing from the header
// is an error wrapping ErrMissingColumn that lists the header; a wanted
// name the header holds twice, or two wanted names that find the same
// column, wrap ErrMalformedRow and ErrMissingColumn respectively and name
// the column. Columns nobody asked for may repeat. Every source that reads
// named columns (CSV, Parquet, SQL) finds them here, so names match alike.
func FindColumns(header []string, want ...string) ([]int, error) {
	names := make([]string, len(header))
	for i, h := range header {
		names[i] = strings.TrimSpace(strings.TrimPrefix(h, "\ufeff"))
	}
	cols := make([]int, len(want))
	for k, w := range want {
		i, err := findColumn(names, w)
		if err != nil {
			return nil, err
		}
		for j := range k {
			if cols[j] == i {
				return nil, fmt.Errorf("columns %q and %q: %w; both name column %d (%q), and each role needs a column of its own",
					want[j], w, ErrMissingColumn, i+1, names[i])
			}
		}
		cols[k] = i
	}
	return cols, nil
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
	return 0, fmt.Errorf("%w: the column names hold %q %d times (columns %s); each column name must occur once",
		ErrMalformedRow, want, len(found), strings.Join(cols, ", "))
}

func csvError(err error) error {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return fmt.Errorf("line %d: %w: %v", pe.Line, ErrMalformedRow, pe.Err)
	}
	return fmt.Errorf("%w: %v", ErrMalformedRow, err)
}
