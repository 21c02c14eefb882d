package proportions

import (
	"errors"
	"strconv"
	"strings"
	"testing"
)

func TestNewBreakdownChecksRows(t *testing.T) {
	ok := []BreakdownRow{{"a", Counts{1, 5, 2, 6}}, {"b", Counts{0, 0, 3, 4}}}
	b, err := NewBreakdown("block", Labels{}, ok)
	if err != nil {
		t.Fatal(err)
	}
	if !b.Rows[1].Empty() || b.Rows[0].Empty() {
		t.Errorf("Empty flags wrong: %+v", b.Rows)
	}
	if _, err := b.Comparison(1); !errors.Is(err, ErrNoTrials) {
		t.Errorf("empty row as comparison: %v, want ErrNoTrials", err)
	}
	crude, err := b.Crude()
	if err != nil || crude.Counts() != (Counts{1, 5, 5, 10}) {
		t.Errorf("Crude = %v, %v; want 1/5 vs 5/10", crude, err)
	}
	for _, tc := range []struct {
		rows []BreakdownRow
		want error
	}{
		{nil, ErrEmptyInput},
		{[]BreakdownRow{{" ", Counts{1, 2, 1, 2}}}, ErrEmptyInput},
		{[]BreakdownRow{{"a", Counts{1, 2, 1, 2}}, {" a", Counts{1, 2, 1, 2}}}, ErrDuplicateValue},
		{[]BreakdownRow{{"a", Counts{0, 0, 0, 0}}}, ErrNoTrials},
		{[]BreakdownRow{{"a", Counts{3, 2, 1, 2}}}, ErrEventsExceedTrials},
		{[]BreakdownRow{{"a", Counts{1, 0, 1, 2}}}, ErrNoTrials},
		{[]BreakdownRow{{"a", Counts{-1, 2, 1, 2}}}, ErrNegativeCount},
		{[]BreakdownRow{{"a", Counts{1, 2, 1, MaxTrials + 1}}}, ErrTooLarge},
	} {
		if _, err := NewBreakdown("", Labels{}, tc.rows); !errors.Is(err, tc.want) {
			t.Errorf("NewBreakdown(%v) error %v, want %v", tc.rows, err, tc.want)
		}
	}
}

// TestCrudeRefusesSumsBeyondMaxTrials checks that pooling rows whose
// trials add up beyond MaxTrials is refused as too large: 8192 rows of
// MaxTrials trials wrapped int64 around and were reported as a negative
// count.
func TestCrudeRefusesSumsBeyondMaxTrials(t *testing.T) {
	for _, n := range []int{2, 8200} {
		rows := make([]BreakdownRow, n)
		for i := range rows {
			rows[i] = BreakdownRow{Value: strconv.Itoa(i), Counts: Counts{X1: 1, N1: MaxTrials, X2: 1, N2: MaxTrials}}
		}
		b, err := NewBreakdown("batch", Labels{}, rows)
		if err != nil {
			t.Fatal(err)
		}
		_, err = b.Crude()
		if !errors.Is(err, ErrTooLarge) || errors.Is(err, ErrNegativeCount) {
			t.Errorf("%d rows of %d trials: error %v, want one wrapping ErrTooLarge only", n, MaxTrials, err)
		}
	}
}

// TestHugeCountsAreTooLargeNotMalformed checks that a whole number beyond
// int64 in a count column is reported as too large (with the limit), not
// as "not a whole number", which it is.
func TestHugeCountsAreTooLargeNotMalformed(t *testing.T) {
	csv := "stratum,group,events,trials\nx,a,1,99999999999999999999\nx,b,1,2\n"
	_, err := ReadBreakdownCSV(strings.NewReader(csv), BreakdownSpec{Layout: CellRows})
	if !errors.Is(err, ErrTooLarge) || strings.Contains(err.Error(), "whole number") {
		t.Errorf("error %v, want one wrapping ErrTooLarge that does not call the count not whole", err)
	}
	if _, err := ParseCount("2.5", "events"); !errors.Is(err, ErrMalformedRow) {
		t.Errorf("2.5: error %v, want one wrapping ErrMalformedRow", err)
	}
}

// TestComparisonOfAMissingRow: asking for a row the breakdown does not
// have (negative, past the end, any row of an empty breakdown) is an error
// wrapping ErrEmptyInput that gives the rows' numbers; it panicked
// with an index out of range.
func TestComparisonOfAMissingRow(t *testing.T) {
	b, err := NewBreakdown("tray", Labels{First: "coated", Second: "bare", Event: "germinated"},
		[]BreakdownRow{{Value: "t1", Counts: Counts{X1: 3, N1: 10, X2: 2, N2: 10}}})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := b.Comparison(0); err != nil {
		t.Errorf("row 0: %v", err)
	}
	for _, c := range []struct {
		b     Breakdown
		i     int
		words string
	}{
		{b, 1, "from 0 to 0"},
		{b, -1, "from 0 to 0"},
		{Breakdown{By: "tray"}, 0, "no rows"},
	} {
		_, err := c.b.Comparison(c.i)
		if !errors.Is(err, ErrEmptyInput) || !strings.Contains(err.Error(), c.words) {
			t.Errorf("row %d of %d: %v, want an error wrapping ErrEmptyInput that says %q", c.i, len(c.b.Rows), err, c.words)
		}
	}
}
