package segments_test

import (
	"context"
	"fmt"
	"log"
	"os"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/segments"
)

// A retailer compares the conversion of two checkout pages store by store
// (invented counts): every store's result, the adjusted p-values, and the
// summary that states m and the adjustment.
func ExampleAnalyze() {
	b, err := proportions.NewBreakdown("store", proportions.Labels{First: "new page", Second: "old page", Event: "converted"},
		[]proportions.BreakdownRow{
			{Value: "Leeds", Counts: proportions.Counts{X1: 130, N1: 1000, X2: 95, N2: 1000}},
			{Value: "Bristol", Counts: proportions.Counts{X1: 61, N1: 500, X2: 58, N2: 480}},
			{Value: "Cardiff", Counts: proportions.Counts{X1: 12, N1: 90}}, // the old page was not shown
		})
	if err != nil {
		log.Fatal(err)
	}
	r, err := segments.Analyze(b, segments.WithAdjustment(segments.BenjaminiHochberg))
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println(r) // the summary (m = 2, Benjamini–Hochberg), the notes, the stores by adjusted p
}

// The same stores streamed: the per-store lines as JSON Lines, then the
// adjusted values as CSV, then the summary.
func ExampleStream() {
	b, err := proportions.NewBreakdown("store", proportions.Labels{First: "new page", Second: "old page", Event: "converted"},
		[]proportions.BreakdownRow{
			{Value: "Leeds", Counts: proportions.Counts{X1: 130, N1: 1000, X2: 95, N2: 1000}},
			{Value: "Bristol", Counts: proportions.Counts{X1: 61, N1: 500, X2: 58, N2: 480}},
		})
	if err != nil {
		log.Fatal(err)
	}
	// A file reader would reopen its file in Rows; Stream reads the rows twice.
	src := segments.BreakdownSource(b)
	out := segments.Outputs{SegmentsJSON: os.Stdout, AdjustedCSV: os.Stdout, SummaryJSON: os.Stdout}
	if _, err := segments.Stream(context.Background(), src, out); err != nil {
		log.Fatal(err)
	}
}
