package proportions_test

import (
	"errors"
	"fmt"
	"strings"

	"github.com/propscope/propscope/proportions"
)

// A comparison from counts: 41 of 50 coated seeds and 33 of 50 bare seeds
// germinated (an invented trial).
func ExampleNewComparison() {
	c, err := proportions.NewComparison(41, 50, 33, 50, proportions.Labels{First: "coated", Second: "bare", Event: "germinated"})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(c)
	fmt.Printf("%.2f vs %.2f\n", c.First.Proportion(), c.Second.Proportion())
	// Output:
	// germinated: coated: 41/50 vs bare: 33/50
	// 0.82 vs 0.66
}

// Bad input is an error that says what is allowed and can be tested with
// errors.Is.
func ExampleNewComparison_badInput() {
	_, err := proportions.NewComparison(12, 10, 3, 10, proportions.Labels{})
	fmt.Println(err)
	fmt.Println(errors.Is(err, proportions.ErrEventsExceedTrials))
	// Output:
	// first group: 12 events of 10 trials: events exceed trials; events must be between 0 and the number of trials
	// true
}

// A 2×2 table has the groups as rows and event / no event as columns.
func ExampleFromTable() {
	c, _ := proportions.FromTable(proportions.Table{{7, 193}, {15, 185}}, proportions.Labels{First: "line A", Second: "line B", Event: "defective"})
	fmt.Println(c.Counts())
	// Output:
	// {7 200 15 200}
}

// One row per unit; the caller names the columns, the first group and the
// outcome values.
func ExampleReadCSV() {
	const data = `tray,treatment,result
1,coated,sprouted
2,coated,sprouted
3,bare,dormant
4,bare,sprouted
5,coated,dormant
6,bare,dormant
`
	c, err := proportions.ReadCSV(strings.NewReader(data), proportions.CSVSpec{
		GroupColumn:   "treatment",
		OutcomeColumn: "result",
		RecordSpec: proportions.RecordSpec{
			FirstGroup:     "coated",
			EventValues:    []string{"sprouted"},
			NonEventValues: []string{"dormant"},
			EventName:      "germinated",
		},
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(c)
	// Output:
	// germinated: coated: 2/3 vs bare: 1/3
}

// A malformed file names the line at fault.
func ExampleReadCSV_error() {
	_, err := proportions.ReadCSV(strings.NewReader("group,outcome\nA,1\nB,maybe\n"), proportions.CSVSpec{})
	fmt.Println(errors.Is(err, proportions.ErrOutcomeValue))
	fmt.Println(err)
	// Output:
	// true
	// line 3: outcome "maybe": outcome is neither event nor non-event; allowed event values ["1" "yes" "true"], non-event values ["0" "no" "false"]
}
