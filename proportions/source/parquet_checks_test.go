package source

import (
	"bytes"
	"errors"
	"math/rand/v2"
	"os"
	"strings"
	"testing"

	"github.com/parquet-go/parquet-go"

	"github.com/propscope/propscope/proportions"
)

// TestParquetCountAnnotations checks integer count columns whose
// annotation changes what the integers mean. A DECIMAL(9, 2) stores 2.50
// as 250, and was read as 250 events; a timestamp column was read as a
// count; an unsigned 32-bit count of 3·10⁹ was read as −1294967296 and
// refused as negative. The first two are refused naming the column, the
// third reads as the number the file holds.
func TestParquetCountAnnotations(t *testing.T) {
	rows := func(events, trials column) []column {
		return []column{
			{"stratum", parquet.String(), []any{"x", "x"}},
			{"group", parquet.String(), []any{"a", "b"}},
			events, trials,
		}
	}
	plainTrials := column{"trials", parquet.Int(32), []any{int32(1000), int32(1000)}}
	cell := proportions.BreakdownSpec{Layout: proportions.CellRows}
	for _, tc := range []struct {
		name string
		cols []column
	}{
		{"decimal events", rows(column{"events", parquet.Decimal(2, 9, parquet.Int32Type), []any{int32(250), int32(100)}}, plainTrials)},
		{"timestamp trials", rows(column{"events", parquet.Int(64), []any{int64(1), int64(1)}},
			column{"trials", parquet.Timestamp(parquet.Millisecond), []any{int64(10), int64(10)}})},
	} {
		_, err := readParquetFile(t, writeParquet(t, t.TempDir(), 100, tc.cols), cell)
		if !errors.Is(err, proportions.ErrColumnType) || !strings.Contains(err.Error(), "plain integers") {
			t.Errorf("%s: error %v, want one wrapping ErrColumnType that asks for plain integers", tc.name, err)
		}
	}
	b, err := readParquetFile(t, writeParquet(t, t.TempDir(), 100, rows(
		column{"events", parquet.Uint(32), []any{uint32(7), uint32(1)}},
		column{"trials", parquet.Uint(32), []any{uint32(3_000_000_000), uint32(10)}})), cell)
	if err != nil {
		t.Fatalf("unsigned counts: %v", err)
	}
	if want := (proportions.Counts{X1: 7, N1: 3_000_000_000, X2: 1, N2: 10}); b.Rows[0].Counts != want {
		t.Errorf("unsigned counts: %+v, want %+v", b.Rows[0].Counts, want)
	}
	_, err = readParquetFile(t, writeParquet(t, t.TempDir(), 100, rows(
		column{"events", parquet.Uint(64), []any{uint64(1), uint64(1)}},
		column{"trials", parquet.Uint(64), []any{uint64(1 << 63), uint64(10)}})), cell)
	if !errors.Is(err, proportions.ErrTooLarge) {
		t.Errorf("unsigned trials of 2⁶³: error %v, want one wrapping ErrTooLarge", err)
	}
}

// TestDamagedParquetIsAnErrorNotAPanic changes a few random bytes of a
// small Parquet file, thousands of times (seeded), and reads each: the
// reader indexed out of range on about 2 in 1000 such files, which
// crashed the caller. Each must come back as a breakdown or an error.
func TestDamagedParquetIsAnErrorNotAPanic(t *testing.T) {
	path := writeParquet(t, t.TempDir(), 3, []column{
		{"stratum", parquet.Optional(parquet.String()), []any{"x", "y", "x", "y", "z", nil, "x"}},
		{"group", parquet.String(), []any{"a", "b", "b", "a", "a", "b", "a"}},
		{"outcome", parquet.Int(32), []any{int32(1), int32(0), int32(1), int32(0), int32(1), int32(1), int32(0)}},
	})
	good, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(1, 2))
	for i := range 6000 {
		b := bytes.Clone(good)
		for range 1 + rng.IntN(4) {
			b[rng.IntN(len(b))] = byte(rng.IntN(256))
		}
		func() {
			defer func() {
				if p := recover(); p != nil {
					t.Errorf("damaged file %d: panic %v", i, p)
				}
			}()
			_, err := ReadParquet(bytes.NewReader(b), int64(len(b)), proportions.BreakdownSpec{SkipNulls: true})
			if err != nil && !errors.Is(err, proportions.ErrSource) && !isDataError(err) {
				t.Errorf("damaged file %d: error %v wraps no sentinel of a source", i, err)
			}
		}()
	}
}

// isDataError reports whether err wraps a sentinel that a damaged file
// can legitimately reach through its (changed) data or schema.
func isDataError(err error) bool {
	for _, s := range []error{proportions.ErrMissingColumn, proportions.ErrColumnType, proportions.ErrNullValue,
		proportions.ErrOutcomeValue, proportions.ErrGroupCount, proportions.ErrEmptyInput, proportions.ErrMalformedRow,
		proportions.ErrTooLarge, proportions.ErrNegativeCount, proportions.ErrEventsExceedTrials, proportions.ErrNoTrials,
		proportions.ErrDuplicateValue, proportions.ErrUnknownGroup} {
		if errors.Is(err, s) {
			return true
		}
	}
	return false
}

// TestParquetCalendarColumns: a breakdown column of dates or timestamps is
// read as dates and moments, not as the days or milliseconds since 1970
// the file stores (a DATE column gave segments named "19000"). Expected
// values by hand: day 19000 after 1970-01-01 is 2022-01-08, day −1 is
// 1969-12-31; 1.6·10¹² ms is 2020-09-13T12:26:40Z. Count columns with such
// annotations stay refused (TestParquetCountAnnotations).
func TestParquetCalendarColumns(t *testing.T) {
	cell := proportions.BreakdownSpec{Layout: proportions.CellRows}
	counts := func(by column) []column {
		return []column{by,
			{"group", parquet.String(), []any{"a", "b", "a", "b"}},
			{"events", parquet.Int(32), []any{int32(1), int32(2), int32(3), int32(4)}},
			{"trials", parquet.Int(32), []any{int32(10), int32(10), int32(10), int32(10)}},
		}
	}
	for _, tc := range []struct {
		name string
		by   column
		want []string
	}{
		{"date", column{"stratum", parquet.Date(), []any{int32(19000), int32(19000), int32(-1), int32(-1)}}, []string{"2022-01-08", "1969-12-31"}},
		{"UTC timestamp in ms", column{"stratum", parquet.Timestamp(parquet.Millisecond), []any{int64(1_600_000_000_000), int64(1_600_000_000_000), int64(1_600_000_000_250), int64(1_600_000_000_250)}},
			[]string{"2020-09-13T12:26:40Z", "2020-09-13T12:26:40.25Z"}},
		{"local timestamp in µs", column{"stratum", parquet.TimestampAdjusted(parquet.Microsecond, false), []any{int64(-1), int64(-1), int64(0), int64(0)}},
			[]string{"1969-12-31T23:59:59.999999", "1970-01-01T00:00:00"}},
	} {
		b, err := readParquetFile(t, writeParquet(t, t.TempDir(), 100, counts(tc.by)), cell)
		if err != nil {
			t.Errorf("%s: %v", tc.name, err)
			continue
		}
		var got []string
		for _, r := range b.Rows {
			got = append(got, r.Value)
		}
		if strings.Join(got, " | ") != strings.Join(tc.want, " | ") {
			t.Errorf("%s: values %q, want %q", tc.name, got, tc.want)
		}
	}
}
