package proportions

import (
	"errors"
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
