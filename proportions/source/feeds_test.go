package source

import (
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/clusters"
	"github.com/propscope/propscope/proportions/strata"
)

// TestBreakdownsFeedTheAnalyses: a breakdown read from SQLite goes into the
// stratified analysis as it is, and one with a group per value (trays, each
// seeded with one treatment) into the clustered data, with the counts the
// table holds (summed by hand).
func TestBreakdownsFeedTheAnalyses(t *testing.T) {
	db := openDB(t, t.TempDir())
	createTable(t, db, "blocks", []string{"block", "treatment", "germinated", "sown"}, []string{"TEXT", "TEXT", "INTEGER", "INTEGER"}, [][]any{
		{"b1", "coated", 30, 40}, {"b1", "plain", 22, 40}, {"b2", "coated", 28, 40}, {"b2", "plain", 25, 40}, {"b3", "coated", 33, 40}, {"b3", "plain", 21, 40},
	})
	spec := SQLSpec{Table: "blocks", BreakdownSpec: proportions.BreakdownSpec{Layout: proportions.CellRows, ByColumn: "block", GroupColumn: "treatment",
		EventsColumn: "germinated", TrialsColumn: "sown", RecordSpec: proportions.RecordSpec{FirstGroup: "coated"}}}
	b, err := QuerySQL(db, spec)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := strata.Analyze(b); err != nil {
		t.Errorf("stratified analysis of the blocks: %v", err)
	}
	crude, err := b.Crude()
	if err != nil || crude.Counts() != (proportions.Counts{X1: 91, N1: 120, X2: 68, N2: 120}) {
		t.Errorf("pooled %+v, %v; want 91 of 120 and 68 of 120", crude, err)
	}
	createTable(t, db, "trays", []string{"tray", "treatment", "germinated", "sown"}, []string{"TEXT", "TEXT", "INTEGER", "INTEGER"}, [][]any{
		{"t1", "coated", 15, 20}, {"t2", "coated", 17, 20}, {"t3", "plain", 11, 20}, {"t4", "plain", 12, 20},
	})
	spec.Table, spec.ByColumn = "trays", "tray"
	b, err = QuerySQL(db, spec)
	if err != nil {
		t.Fatal(err)
	}
	d, err := clusters.FromBreakdown(b)
	if err != nil {
		t.Fatal(err)
	}
	if len(d.Group1) != 2 || len(d.Group2) != 2 || d.Group1[0].Events+d.Group1[1].Events != 32 || d.Group2[0].Events+d.Group2[1].Events != 23 {
		t.Errorf("clusters %+v; want trays t1, t2 (32 germinated) and t3, t4 (23)", d)
	}
}
