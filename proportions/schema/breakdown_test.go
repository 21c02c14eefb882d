package schema_test

import (
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/schema"
)

// checkBreakdowns validates breakdowns with full rows, a row with an empty
// group, and hostile labels and values.
func checkBreakdowns(t *testing.T, c *corpus) {
	for _, rows := range [][]proportions.BreakdownRow{
		{{Value: "block 1", Counts: proportions.Counts{X1: 12, N1: 20, X2: 9, N2: 20}}},
		{{Value: "a", Counts: proportions.Counts{X1: 1, N1: 5, X2: 2, N2: 6}}, {Value: "b", Counts: proportions.Counts{X2: 3, N2: 4}}},
		{{Value: `<script>alert(1)</script>`, Counts: proportions.Counts{X1: 0, N1: 1, X2: 1, N2: 1}}},
	} {
		b, err := proportions.NewBreakdown("block", proportions.Labels{First: "coated", Second: "plain", Event: "germinated"}, rows)
		if err != nil {
			t.Fatal(err)
		}
		c.check(schema.Breakdown, b)
	}
	// A breakdown counted by a Tally that left rows out for NULLs.
	tally, err := proportions.NewTally(proportions.BreakdownSpec{ByColumn: "segment"})
	if err != nil {
		t.Fatal(err)
	}
	for _, u := range [][3]string{{"s1", "a", "1"}, {"s1", "b", "0"}, {"s2", "b", "1"}} {
		if err := tally.AddUnit(u[0], u[1], u[2]); err != nil {
			t.Fatal(err)
		}
	}
	tally.Skip(2)
	b, err := tally.Breakdown()
	if err != nil || b.SkippedRows != 2 {
		t.Fatalf("tally: %+v, %v", b, err)
	}
	c.check(schema.Breakdown, b)
}

func mustBreakdown(t *testing.T) proportions.Breakdown {
	b, err := proportions.NewBreakdown("tray", proportions.Labels{}, []proportions.BreakdownRow{{Value: "t1", Counts: proportions.Counts{X1: 3, N1: 9, X2: 4, N2: 8}}})
	if err != nil {
		t.Fatal(err)
	}
	return b
}
