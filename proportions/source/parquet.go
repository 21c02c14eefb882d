package source

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"time"

	"github.com/parquet-go/parquet-go"
	"github.com/parquet-go/parquet-go/deprecated"
	"github.com/parquet-go/parquet-go/format"

	"github.com/propscope/propscope/proportions"
)

// checkEvery is how many rows a reader counts between looks at its context:
// about a millisecond of work, so a cancel returns promptly.
const checkEvery = 1 << 14

// ReadParquet streams a Parquet file of unit rows or cell rows (see
// spec.Layout) into a breakdown. It is ReadParquetContext without a
// deadline.
func ReadParquet(r io.ReaderAt, size int64, spec proportions.BreakdownSpec) (proportions.Breakdown, error) {
	return ReadParquetContext(context.Background(), r, size, spec)
}

// ReadParquetContext streams a Parquet file into a breakdown, row group by
// row group and page by page of the columns the layout reads (other columns
// are never decoded), so memory stays flat in the number of rows. The
// columns are top-level columns found by name as in a CSV header
// (proportions.FindColumns). The breakdown and group columns may hold text,
// integers or booleans (written as decimal numbers and "true"/"false";
// integers annotated as dates as 2006-01-02, as timestamps in RFC 3339);
// an outcome column of text, integers (1, 0) or booleans is classified by
// spec's outcome values; events and trials must be integer columns of
// plain integers (signed or unsigned; a decimal, time or date annotation is
// refused with ErrColumnType). A damaged file whose stated offsets make
// the Parquet reader fail is an error wrapping ErrSource, never a panic.
//
// A NULL in a column the layout reads is an error naming the column and the
// row (counted from 1 across row groups), unless spec.SkipNulls is set:
// then the row is left out and counted in Breakdown.SkippedRows. Errors wrap
// proportions.ErrSource (not a Parquet file), ErrMissingColumn,
// ErrColumnType, ErrNullValue, the errors of proportions.Tally with the
// row, or the context's error.
func ReadParquetContext(ctx context.Context, r io.ReaderAt, size int64, spec proportions.BreakdownSpec) (b proportions.Breakdown, err error) {
	// The Parquet reader trusts the offsets and lengths a file states, and
	// some damaged files make it index out of range (about 2 in 1000 files
	// with a few random bytes changed): such a file is one that cannot be
	// read, not a crash of the caller.
	defer func() {
		if p := recover(); p != nil {
			b, err = proportions.Breakdown{}, fmt.Errorf("parquet: %w: the file is damaged (the reader failed: %v)", proportions.ErrSource, p)
		}
	}()
	return readParquet(ctx, r, size, spec)
}

// readParquet is ReadParquetContext without the guard against the
// reader's panics.
func readParquet(ctx context.Context, r io.ReaderAt, size int64, spec proportions.BreakdownSpec) (proportions.Breakdown, error) {
	if err := spec.Check(); err != nil {
		return proportions.Breakdown{}, err
	}
	tally, err := proportions.NewTally(spec)
	if err != nil {
		return proportions.Breakdown{}, err
	}
	f, err := parquet.OpenFile(r, size, parquet.SkipPageIndex(true), parquet.SkipBloomFilters(true))
	if err != nil {
		return proportions.Breakdown{}, fmt.Errorf("parquet: %w: %w", proportions.ErrSource, err)
	}
	cols, err := parquetColumns(f, spec)
	if err != nil {
		return proportions.Breakdown{}, err
	}
	pr := parquetRows{tally: tally, layout: spec.Layout, skipNulls: spec.SkipNulls, cols: cols}
	for _, rg := range f.RowGroups() {
		if err := pr.rowGroup(ctx, rg); err != nil {
			return proportions.Breakdown{}, err
		}
	}
	if pr.row == 0 {
		return proportions.Breakdown{}, fmt.Errorf("%w: the Parquet file has no rows", proportions.ErrEmptyInput)
	}
	return tally.Breakdown()
}

// parquetColumn is one column the layout reads: its name, its leaf index
// in a row group, and a text converter that keeps the strings it made.
type parquetColumn struct {
	name     string
	leaf     int
	kind     parquet.Kind
	unsigned bool // an unsigned integer annotation
	texts    texts
	// calendar, set for an integer column annotated as dates or
	// timestamps, writes a value as its date or moment; moments keeps the
	// strings made (bounded by maxTexts, as texts).
	calendar func(int64) string
	moments  map[int64]string
}

// parquetColumns finds the layout's columns among the file's top-level
// columns and checks their types.
func parquetColumns(f *parquet.File, spec proportions.BreakdownSpec) ([]*parquetColumn, error) {
	top := f.Root().Columns()
	names := make([]string, len(top))
	for i, c := range top {
		names[i] = c.Name()
	}
	want := spec.Columns()
	at, err := proportions.FindColumns(names, want...)
	if err != nil {
		return nil, err
	}
	cols := make([]*parquetColumn, len(at))
	for k, i := range at {
		c := top[i]
		if !c.Leaf() || c.Repeated() {
			return nil, fmt.Errorf("column %q: %w; it is a nested or repeated column, and a source reads flat columns of one value per row", c.Name(), proportions.ErrColumnType)
		}
		kind := c.Type().Kind()
		counts := spec.Layout == proportions.CellRows && k >= 2
		if err := checkKind(c.Name(), kind, counts); err != nil {
			return nil, err
		}
		unsigned, err := integerAnnotation(c.Name(), c.Type(), counts)
		if err != nil {
			return nil, err
		}
		cols[k] = &parquetColumn{name: c.Name(), leaf: c.Index(), kind: kind, unsigned: unsigned, texts: texts{}}
		if !counts {
			cols[k].calendar = calendar(c.Type())
			cols[k].moments = map[int64]string{}
		}
	}
	return cols, nil
}

// checkKind allows integer columns for counts, and text, integers or
// booleans elsewhere.
func checkKind(name string, kind parquet.Kind, counts bool) error {
	switch kind {
	case parquet.Int32, parquet.Int64:
		return nil
	case parquet.ByteArray, parquet.FixedLenByteArray, parquet.Boolean:
		if !counts {
			return nil
		}
	}
	allowed := "text, integers or booleans"
	if counts {
		allowed = "integers"
	}
	return fmt.Errorf("column %q holds %v values: %w; this column must hold %s", name, kind, proportions.ErrColumnType, allowed)
}

// integerAnnotation reads what an integer column's annotation says its
// numbers are: unsigned integers (read as such: a UINT32 of 3·10⁹ is not
// −1294967296), or, for a count column, anything but plain integers (a
// DECIMAL(9, 2) stores 2.50 as 250, a timestamp or date counts time), which
// is refused: read as raw integers they gave wrong counts silently.
func integerAnnotation(name string, t parquet.Type, counts bool) (unsigned bool, err error) {
	if k := t.Kind(); k != parquet.Int32 && k != parquet.Int64 {
		return false, nil
	}
	annotation := ""
	if lt := t.LogicalType(); lt != nil && lt.Value != nil {
		if it, ok := lt.Value.(*format.IntType); ok {
			return !it.IsSigned, nil
		}
		annotation = lt.String()
	} else if ct := t.ConvertedType(); ct != nil {
		switch *ct {
		case deprecated.Uint8, deprecated.Uint16, deprecated.Uint32, deprecated.Uint64:
			return true, nil
		case deprecated.Int8, deprecated.Int16, deprecated.Int32, deprecated.Int64:
			return false, nil
		}
		annotation = fmt.Sprintf("converted type %d", int(*ct))
	}
	if annotation != "" && counts {
		return false, fmt.Errorf("column %q holds %s values: %w; a count column must hold plain integers, not decimals, times or dates", name, annotation, proportions.ErrColumnType)
	}
	return false, nil
}

// calendar returns how to write the integers of a breakdown, group or
// outcome column whose annotation makes them dates or timestamps, or nil
// for plain integers: a date as 2006-01-02, a timestamp in RFC 3339 (with
// Z when the file says it is adjusted to UTC, without a zone when it is
// local time), as the people who wrote the file read them, rather than as
// days or milliseconds since 1970 (a segment named "19000").
func calendar(t parquet.Type) func(int64) string {
	lt := t.LogicalType()
	if lt == nil || lt.Value == nil {
		return legacyCalendar(t.ConvertedType())
	}
	switch v := lt.Value.(type) {
	case *format.DateType:
		return formatDate
	case *format.TimestampType:
		if v.Unit.Value == nil {
			return nil
		}
		return formatMoment(v.Unit.Value.Duration(), v.IsAdjustedToUTC)
	}
	return nil
}

// legacyCalendar is calendar for files that annotate with the older
// converted types only (dates and UTC timestamps in milli- or
// microseconds).
func legacyCalendar(ct *deprecated.ConvertedType) func(int64) string {
	if ct == nil {
		return nil
	}
	switch *ct {
	case deprecated.Date:
		return formatDate
	case deprecated.TimestampMillis:
		return formatMoment(time.Millisecond, true)
	case deprecated.TimestampMicros:
		return formatMoment(time.Microsecond, true)
	}
	return nil
}

// formatDate writes a count of days since 1970-01-01 as a date.
func formatDate(days int64) string {
	return time.Unix(0, 0).UTC().AddDate(0, 0, int(days)).Format(time.DateOnly)
}

// formatMoment writes counts of unit since 1970-01-01T00:00:00 as moments
// in RFC 3339 with the fraction the value has, in UTC or without a zone.
func formatMoment(unit time.Duration, utc bool) func(int64) string {
	layout := "2006-01-02T15:04:05.999999999"
	if utc {
		layout = time.RFC3339Nano
	}
	perSecond := int64(time.Second / unit)
	return func(n int64) string {
		sec, frac := n/perSecond, n%perSecond
		if frac < 0 {
			sec, frac = sec-1, frac+perSecond
		}
		return time.Unix(sec, frac*int64(unit)).UTC().Format(layout)
	}
}

// moment returns the date or moment of an integer value of a calendar
// column, reusing the strings already made.
func (c *parquetColumn) moment(n int64) string {
	if s, ok := c.moments[n]; ok {
		return s
	}
	s := c.calendar(n)
	if len(c.moments) < maxTexts {
		c.moments[n] = s
	}
	return s
}

// parquetRows counts the rows of a file, row group after row group.
type parquetRows struct {
	tally     *proportions.Tally
	layout    proportions.Layout
	skipNulls bool
	cols      []*parquetColumn
	row       int64 // rows read so far, over every row group
	values    []parquet.Value
}

// rowGroup counts one row group: a cursor per column, advanced together.
func (p *parquetRows) rowGroup(ctx context.Context, rg parquet.RowGroup) error {
	chunks := rg.ColumnChunks()
	cursors := make([]*cursor, len(p.cols))
	for k, c := range p.cols {
		cursors[k] = newCursor(chunks[c.leaf])
		defer cursors[k].close()
	}
	if cap(p.values) < len(p.cols) {
		p.values = make([]parquet.Value, len(p.cols))
	}
	vals := p.values[:len(p.cols)]
	for i := rg.NumRows(); i > 0; i-- {
		if p.row%checkEvery == 0 {
			if err := ctx.Err(); err != nil {
				return err
			}
		}
		p.row++
		for k, c := range cursors {
			v, err := c.next()
			if err != nil {
				return fmt.Errorf("row %d, column %q: %w: %w", p.row, p.cols[k].name, proportions.ErrSource, err)
			}
			vals[k] = v
		}
		if err := p.add(vals); err != nil {
			return fmt.Errorf("row %d: %w", p.row, err)
		}
	}
	return nil
}

// add counts one row's values, or skips it for a NULL when asked to.
func (p *parquetRows) add(vals []parquet.Value) error {
	for k, v := range vals {
		if v.IsNull() {
			if p.skipNulls {
				p.tally.Skip(1)
				return nil
			}
			return fmt.Errorf("column %q is NULL: %w; fill it in, or set SkipNulls to leave such rows out and count them", p.cols[k].name, proportions.ErrNullValue)
		}
	}
	value, group := p.cols[0].text(vals[0]), p.cols[1].text(vals[1])
	if p.layout == proportions.UnitRows {
		return p.tally.AddUnit(value, group, p.cols[2].text(vals[2]))
	}
	return p.tally.AddCell(value, group, p.cols[2].integer(vals[2]), p.cols[3].integer(vals[3]))
}

// maxTexts bounds how many distinct strings a column keeps for reuse: a
// breakdown or group column has few values, and a column with many more
// (an error in the making) must not grow memory with the rows.
const maxTexts = 1 << 12

// texts maps the raw bytes (or decimal form) of a column's values to the
// strings made for them, so that a row costs no allocation.
type texts map[string]string

// text returns a value as text: the bytes of a text column, the decimal
// form of an integer (a date or moment for a calendar column), "true" or
// "false".
func (c *parquetColumn) text(v parquet.Value) string {
	switch c.kind {
	case parquet.Boolean:
		return strconv.FormatBool(v.Boolean())
	case parquet.Int32, parquet.Int64:
		n := c.integer(v)
		if c.calendar != nil {
			return c.moment(n)
		}
		if n >= 0 && n < int64(len(smallInts)) {
			return smallInts[n]
		}
		return strconv.FormatInt(n, 10)
	}
	b := v.ByteArray()
	if s, ok := c.texts[string(b)]; ok {
		return s
	}
	s := string(b)
	if len(c.texts) < maxTexts {
		c.texts[s] = s
	}
	return s
}

// integer returns the value of an integer column, read at its own width
// and signedness; an unsigned 64-bit value beyond int64 comes back as
// math.MaxInt64, which the count checks refuse as too large.
func (c *parquetColumn) integer(v parquet.Value) int64 {
	switch {
	case c.kind == parquet.Int32 && c.unsigned:
		return int64(v.Uint32())
	case c.kind == parquet.Int32:
		return int64(v.Int32())
	case c.unsigned:
		return int64(min(v.Uint64(), math.MaxInt64))
	}
	return v.Int64()
}

// smallInts are the decimal forms of 0 to 999, made once per process:
// integer breakdown columns (plant numbers, lines, shifts) and 0/1
// outcomes then cost no allocation per row.
var smallInts = func() [1000]string {
	var s [1000]string
	for i := range s {
		s[i] = strconv.Itoa(i)
	}
	return s
}()

// cursor reads one column chunk's values one at a time through a buffer.
// A value's bytes stay valid until the cursor refills, which happens only
// after every buffered value was used.
type cursor struct {
	r    parquet.ColumnChunkValueReader
	buf  []parquet.Value
	n, i int
}

func newCursor(c parquet.ColumnChunk) *cursor {
	return &cursor{r: parquet.NewColumnChunkValueReader(c), buf: make([]parquet.Value, 1024)}
}

// next returns the chunk's next value; running out before the row group's
// last row is an error (a damaged file).
func (c *cursor) next() (parquet.Value, error) {
	for c.i == c.n {
		n, err := c.r.ReadValues(c.buf)
		c.n, c.i = n, 0
		if n > 0 {
			break
		}
		if errors.Is(err, io.EOF) {
			return parquet.Value{}, errors.New("the column chunk ends before its row group")
		}
		if err != nil {
			return parquet.Value{}, err
		}
	}
	v := c.buf[c.i]
	c.i++
	return v, nil
}

func (c *cursor) close() { _ = c.r.Close() }
