package source

import (
	"context"
	"errors"
	"reflect"
	"strings"
	"testing"

	"github.com/parquet-go/parquet-go"

	"github.com/propscope/propscope/proportions"
)

// unitSpec reads the hostile columns as unit rows with supplier "X" first.
func unitSpec() proportions.BreakdownSpec {
	return proportions.BreakdownSpec{ByColumn: hostileCols[0], GroupColumn: hostileCols[1], OutcomeColumn: hostileCols[2],
		RecordSpec: proportions.RecordSpec{FirstGroup: hostileGroups[0]}}
}

// cellSpec reads cell rows with the hostile breakdown and group columns.
func cellSpec() proportions.BreakdownSpec {
	s := unitSpec()
	s.Layout, s.EventsColumn, s.TrialsColumn = proportions.CellRows, "défauts", "contrôlés"
	return s
}

// cellsOf sums units into cells, two per value and group (each half of
// the units), so the readers must add cells up.
func cellsOf(units []unit) [][]any {
	var out [][]any
	for _, half := range [][]unit{units[:len(units)/2], units[len(units)/2:]} {
		for k, c := range countByLoop(half) {
			out = append(out, []any{k[0], k[1], c[0], c[1]})
		}
	}
	return out
}

// TestSourcesAgree: the same generated units, as unit rows and as cells,
// read from CSV, Parquet (several row groups) and SQLite under hostile
// table and column names, give the same breakdown, equal to the plain
// loop's count; the canary table survives.
func TestSourcesAgree(t *testing.T) {
	units := generate(11, 20000)
	want := countByLoop(units)
	dir := t.TempDir()

	var csvText strings.Builder
	csvText.WriteString(`"id","` + strings.ReplaceAll(hostileCols[2], `"`, `""`) + `","` + strings.ReplaceAll(hostileCols[1], `"`, `""`) + `","` + strings.ReplaceAll(hostileCols[0], `"`, `""`) + "\"\n")
	for i, u := range units {
		csvText.WriteString(strings.Join([]string{csvField(string(rune('0' + i%10))), csvField(u.outcome), csvField(u.group), csvField(u.value)}, ",") + "\n")
	}
	fromCSV, err := proportions.ReadBreakdownCSV(strings.NewReader(csvText.String()), unitSpec())
	if err != nil {
		t.Fatal(err)
	}
	checkCounts(t, "csv", fromCSV, want)

	cols := []column{{name: hostileCols[0], node: parquet.String()}, {name: hostileCols[1], node: parquet.String()},
		{name: hostileCols[2], node: parquet.String()}, {name: "note", node: parquet.Int(64)}}
	for _, u := range units {
		cols[0].data = append(cols[0].data, u.value)
		cols[1].data = append(cols[1].data, u.group)
		cols[2].data = append(cols[2].data, u.outcome)
		cols[3].data = append(cols[3].data, int64(7))
	}
	fromParquet, err := readParquetFile(t, writeParquet(t, dir, 3000, cols), unitSpec())
	if err != nil {
		t.Fatal(err)
	}
	checkCounts(t, "parquet", fromParquet, want)

	db := openDB(t, dir)
	rows := make([][]any, len(units))
	for i, u := range units {
		rows[i] = []any{u.value, u.outcome, u.group}
	}
	createTable(t, db, hostileTable, []string{hostileCols[0], hostileCols[2], hostileCols[1]}, []string{"TEXT", "TEXT", "TEXT"}, rows)
	fromSQL, err := QuerySQL(db, SQLSpec{Table: hostileTable, BreakdownSpec: unitSpec()})
	if err != nil {
		t.Fatal(err)
	}
	checkCounts(t, "sql", fromSQL, want)
	canaryAlive(t, db)

	if !reflect.DeepEqual(sorted(fromCSV), sorted(fromParquet)) || !reflect.DeepEqual(sorted(fromCSV), sorted(fromSQL)) {
		t.Errorf("sources differ:\ncsv     %+v\nparquet %+v\nsql     %+v", fromCSV, fromParquet, fromSQL)
	}

	// The same data as cell rows, integer count columns.
	cells := cellsOf(units)
	spec := cellSpec()
	cellCols := []column{{name: hostileCols[0], node: parquet.String()}, {name: hostileCols[1], node: parquet.String()},
		{name: spec.EventsColumn, node: parquet.Int(32)}, {name: spec.TrialsColumn, node: parquet.Int(64)}}
	for _, c := range cells {
		cellCols[0].data = append(cellCols[0].data, c[0])
		cellCols[1].data = append(cellCols[1].data, c[1])
		cellCols[2].data = append(cellCols[2].data, int32(c[2].(int64)))
		cellCols[3].data = append(cellCols[3].data, c[3])
	}
	cellParquet, err := readParquetFile(t, writeParquet(t, dir, 5, cellCols), spec)
	if err != nil {
		t.Fatal(err)
	}
	checkCounts(t, "parquet cells", cellParquet, want)
	createTable(t, db, "cells "+hostileTable, []string{hostileCols[0], hostileCols[1], spec.EventsColumn, spec.TrialsColumn},
		[]string{"TEXT", "TEXT", "INTEGER", "INTEGER"}, cells)
	cellSQL, err := QuerySQL(db, SQLSpec{Table: "cells " + hostileTable, BreakdownSpec: spec})
	if err != nil {
		t.Fatal(err)
	}
	checkCounts(t, "sql cells", cellSQL, want)
	canaryAlive(t, db)
	for _, b := range []proportions.Breakdown{cellParquet, cellSQL} {
		b.Event = fromCSV.Event // the event's name follows the events column here
		if !reflect.DeepEqual(sorted(b), sorted(fromCSV)) {
			t.Errorf("cells differ from units:\n%+v\n%+v", b, fromCSV)
		}
	}
}

// csvField quotes a CSV field by hand (RFC 4180).
func csvField(s string) string { return `"` + strings.ReplaceAll(s, `"`, `""`) + `"` }

// TestSQLBindsEventValues: an event value written as SQL is bound as a
// parameter: it matches the same text in the data and nothing else.
func TestSQLBindsEventValues(t *testing.T) {
	db := openDB(t, t.TempDir())
	hostile := `x') OR 1=1; DROP TABLE canary; --`
	createTable(t, db, "t", []string{"stratum", "group", "outcome"}, []string{"TEXT", "TEXT", "TEXT"}, [][]any{
		{"s", "a", hostile}, {"s", "a", "no"}, {"s", "b", "no"}, {"s", "b", "no"}, {"s", "b", hostile},
	})
	spec := proportions.BreakdownSpec{RecordSpec: proportions.RecordSpec{EventValues: []string{hostile}, NonEventValues: []string{"no"}}}
	b, err := QuerySQL(db, SQLSpec{Table: "t", BreakdownSpec: spec})
	if err != nil {
		t.Fatal(err)
	}
	if b.Rows[0].Counts != (proportions.Counts{X1: 1, N1: 2, X2: 1, N2: 3}) {
		t.Errorf("counts %+v, want 1 of 2 and 1 of 3 (counted by hand)", b.Rows[0].Counts)
	}
	canaryAlive(t, db)
}

// TestSQLOutcomeTypes: integer and boolean-as-integer outcomes match the
// default values, and integer breakdown values read as their decimal form.
func TestSQLOutcomeTypes(t *testing.T) {
	db := openDB(t, t.TempDir())
	createTable(t, db, "t", []string{"plant", "group", "defect"}, []string{"INTEGER", "TEXT", "INTEGER"}, [][]any{
		{3, "a", 1}, {3, "a", 0}, {3, "b", 0}, {12, "b", true}, {12, "a", false},
	})
	b, err := QuerySQL(db, SQLSpec{Table: "t", BreakdownSpec: proportions.BreakdownSpec{ByColumn: "Plant", OutcomeColumn: "defect"}})
	if err != nil {
		t.Fatal(err)
	}
	want := []proportions.BreakdownRow{{Value: "12", Counts: proportions.Counts{X1: 0, N1: 1, X2: 1, N2: 1}}, {Value: "3", Counts: proportions.Counts{X1: 1, N1: 2, X2: 0, N2: 1}}}
	if !reflect.DeepEqual(sorted(b).Rows, want) || b.Event != "defect" || b.By != "Plant" {
		t.Errorf("got %+v, want rows %+v (counted by hand)", b, want)
	}
}

// TestSQLErrors: each bad table wraps its sentinel and says where.
func TestSQLErrors(t *testing.T) {
	db := openDB(t, t.TempDir())
	text3 := []string{"TEXT", "TEXT", "TEXT"}
	createTable(t, db, "nulls", []string{"stratum", "group", "outcome"}, text3, [][]any{{"s", "a", "1"}, {"s", "b", nil}, {"s", "b", nil}, {nil, "a", "0"}, {"s", "b", "0"}})
	createTable(t, db, "nullout", []string{"stratum", "group", "outcome"}, text3, [][]any{{"s", "a", "1"}, {"s", "b", nil}, {"s", "b", nil}, {"s", "b", "0"}})
	createTable(t, db, "odd", []string{"stratum", "group", "outcome"}, text3, [][]any{{"s", "a", "1"}, {"s", "b", "maybe"}, {"s", "b", "n/a"}})
	createTable(t, db, "three", []string{"stratum", "group", "outcome"}, text3, [][]any{{"s", "a", "1"}, {"s", "b", "0"}, {"t", "c", "0"}})
	createTable(t, db, "hidden", []string{"stratum", "group", "events", "trials"}, []string{"TEXT", "TEXT", "INTEGER", "INTEGER"},
		[][]any{{"s", "a", 5, 4}, {"s", "a", 0, 6}, {"s", "b", 1, 3}})
	createTable(t, db, "negative", []string{"stratum", "group", "events", "trials"}, []string{"TEXT", "TEXT", "INTEGER", "INTEGER"},
		[][]any{{"s", "a", -1, 4}, {"s", "a", 2, 6}, {"s", "b", 1, 3}})
	createTable(t, db, "nullcells", []string{"stratum", "group", "events", "trials"}, []string{"TEXT", "TEXT", "INTEGER", "INTEGER"},
		[][]any{{"s", "a", 1, 4}, {"s", "a", 2, nil}, {"s", "b", 1, 3}})
	cells := proportions.BreakdownSpec{Layout: proportions.CellRows}
	for _, c := range []struct {
		name, table string
		spec        proportions.BreakdownSpec
		want        error
		inMessage   []string
	}{
		{"null outcome", "nullout", proportions.BreakdownSpec{}, proportions.ErrNullValue, []string{`"outcome"`, "2 rows", `group "b"`}},
		{"null breakdown", "nulls", proportions.BreakdownSpec{RecordSpec: proportions.RecordSpec{FirstGroup: "a"}}, proportions.ErrNullValue, []string{`"stratum"`}},
		{"odd outcomes", "odd", proportions.BreakdownSpec{}, proportions.ErrOutcomeValue, []string{`"maybe"`, `"outcome"`, `group "b"`}},
		{"three groups", "three", proportions.BreakdownSpec{}, proportions.ErrGroupCount, []string{`"a"`, `"b"`, `"c"`}},
		{"events over trials hidden by the sum", "hidden", cells, proportions.ErrEventsExceedTrials, []string{"5", "4"}},
		{"negative hidden by the sum", "negative", cells, proportions.ErrNegativeCount, []string{"-1"}},
		{"null trials", "nullcells", cells, proportions.ErrNullValue, []string{`"trials"`, "1 rows"}},
		{"missing column", "nulls", proportions.BreakdownSpec{ByColumn: "block"}, proportions.ErrMissingColumn, []string{`"block"`, `["stratum" "group" "outcome"]`}},
		{"missing table", "absent", proportions.BreakdownSpec{}, proportions.ErrSource, []string{`"absent"`}},
		{"NUL in a name", "a\x00b", proportions.BreakdownSpec{}, proportions.ErrColumnType, []string{"NUL"}},
	} {
		_, err := QuerySQL(db, SQLSpec{Table: c.table, BreakdownSpec: c.spec})
		if !errors.Is(err, c.want) {
			t.Errorf("%s: got %v, want %v", c.name, err, c.want)
			continue
		}
		for _, s := range c.inMessage {
			if !strings.Contains(err.Error(), s) {
				t.Errorf("%s: message %q lacks %s", c.name, err, s)
			}
		}
	}
	// Skipping NULLs counts the rows left out: 3 in "nulls" (two NULL
	// outcomes, one NULL stratum), 1 in "nullcells".
	b, err := QuerySQL(db, SQLSpec{Table: "nulls", BreakdownSpec: proportions.BreakdownSpec{SkipNulls: true}})
	if err != nil || b.SkippedRows != 3 || b.Rows[0].Counts != (proportions.Counts{X1: 1, N1: 1, X2: 0, N2: 1}) {
		t.Errorf("skipping NULLs: %+v, %v; want 3 skipped, 1 of 1 and 0 of 1", b, err)
	}
	cells.SkipNulls = true
	b, err = QuerySQL(db, SQLSpec{Table: "nullcells", BreakdownSpec: cells})
	if err != nil || b.SkippedRows != 1 || b.Rows[0].Counts != (proportions.Counts{X1: 1, N1: 4, X2: 1, N2: 3}) {
		t.Errorf("skipping NULL cells: %+v, %v; want 1 skipped, 1 of 4 and 1 of 3", b, err)
	}
	canaryAlive(t, db)
}

// TestParquetNullsAndTypes: integer and boolean columns read as text and
// outcomes; a NULL is an error naming the column and row, or a skipped row.
func TestParquetNullsAndTypes(t *testing.T) {
	dir := t.TempDir()
	cols := []column{
		{name: "plant", node: parquet.Int(32), data: []any{int32(1), int32(1), int32(2), int32(2), int32(2)}},
		{name: "supplier", node: parquet.String(), data: []any{"a", "b", "a", "b", "b"}},
		{name: "defective", node: parquet.Optional(parquet.Leaf(parquet.BooleanType)), data: []any{true, false, nil, true, false}},
	}
	path := writeParquet(t, dir, 2, cols)
	spec := proportions.BreakdownSpec{ByColumn: "plant", GroupColumn: "supplier", OutcomeColumn: "defective"}
	_, err := readParquetFile(t, path, spec)
	if !errors.Is(err, proportions.ErrNullValue) || !strings.Contains(err.Error(), "row 3") || !strings.Contains(err.Error(), `"defective"`) {
		t.Errorf("NULL: %v, want ErrNullValue naming row 3 and the column", err)
	}
	spec.SkipNulls = true
	b, err := readParquetFile(t, path, spec)
	want := []proportions.BreakdownRow{{Value: "1", Counts: proportions.Counts{X1: 1, N1: 1, X2: 0, N2: 1}}, {Value: "2", Counts: proportions.Counts{X1: 0, N1: 0, X2: 1, N2: 2}}}
	if err != nil || b.SkippedRows != 1 || !reflect.DeepEqual(b.Rows, want) || !b.Rows[1].Empty() {
		t.Errorf("skipping: %+v, %v; want 1 skipped and rows %+v (counted by hand)", b, err, want)
	}
	// A text column as a count column is refused before any row is read.
	_, err = readParquetFile(t, path, proportions.BreakdownSpec{Layout: proportions.CellRows, ByColumn: "plant", GroupColumn: "defective", EventsColumn: "supplier", TrialsColumn: "plant"})
	if !errors.Is(err, proportions.ErrMissingColumn) && !errors.Is(err, proportions.ErrColumnType) {
		t.Errorf("text count column: %v", err)
	}
	_, err = readParquetFile(t, path, proportions.BreakdownSpec{ByColumn: "lot", GroupColumn: "supplier", OutcomeColumn: "defective"})
	if !errors.Is(err, proportions.ErrMissingColumn) || !strings.Contains(err.Error(), `["plant" "supplier" "defective"]`) && !strings.Contains(err.Error(), `"defective" "plant" "supplier"`) {
		t.Errorf("missing column: %v, want the header listed", err)
	}
	// An integer outcome column: 1 is the event, 0 a non-event, 2 neither.
	ints := []column{
		{name: "lot", node: parquet.String(), data: []any{"L1", "L1", "L1", "L2"}},
		{name: "group", node: parquet.String(), data: []any{"a", "b", "a", "b"}},
		{name: "outcome", node: parquet.Int(64), data: []any{int64(1), int64(0), int64(1), int64(1)}},
	}
	b, err = readParquetFile(t, writeParquet(t, t.TempDir(), 10, ints), proportions.BreakdownSpec{ByColumn: "lot"})
	if err != nil || b.Rows[0].Counts != (proportions.Counts{X1: 2, N1: 2, X2: 0, N2: 1}) || b.Rows[1].Counts != (proportions.Counts{X2: 1, N2: 1}) {
		t.Errorf("integer outcomes: %+v, %v; want 2 of 2 vs 0 of 1, then 0 of 0 vs 1 of 1 (counted by hand)", b, err)
	}
	ints[2].data[3] = int64(2)
	if _, err = readParquetFile(t, writeParquet(t, t.TempDir(), 10, ints), proportions.BreakdownSpec{ByColumn: "lot"}); !errors.Is(err, proportions.ErrOutcomeValue) || !strings.Contains(err.Error(), "row 4") {
		t.Errorf("outcome 2: %v, want ErrOutcomeValue on row 4", err)
	}
	_, err = ReadParquet(strings.NewReader("not parquet"), 11, spec)
	if !errors.Is(err, proportions.ErrSource) {
		t.Errorf("not a Parquet file: %v, want ErrSource", err)
	}
}

// TestParquetCancel: a cancelled context stops the reader.
func TestParquetCancel(t *testing.T) {
	units := generate(3, 50000)
	cols := []column{{name: "stratum", node: parquet.String()}, {name: "group", node: parquet.String()}, {name: "outcome", node: parquet.String()}}
	for _, u := range units {
		cols[0].data = append(cols[0].data, u.value)
		cols[1].data = append(cols[1].data, u.group)
		cols[2].data = append(cols[2].data, u.outcome)
	}
	path := writeParquet(t, t.TempDir(), 1<<20, cols)
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	f, size := openForTest(t, path)
	if _, err := ReadParquetContext(ctx, f, size, proportions.BreakdownSpec{}); !errors.Is(err, context.Canceled) {
		t.Errorf("got %v, want context.Canceled", err)
	}
}

// TestSQLCountsMustBeWholeNumbers checks the cell rows of SQL tables whose
// count columns hold what is not a count: fractions that add up to a whole
// number per group (2.5 + 0.5 events were read as 3) and text that is not a
// number (SQLite's SUM counts it as 0, so 'abc' of 'def' trials became an
// empty group). Each is refused naming the row and the column; counts
// written as text digits (a CSV imported with text columns) and whole
// numbers stored as reals still read as their numbers, checked against a
// count by hand. A negative count beside a NULL is reported as the NULL,
// not as an unreadable column.
func TestSQLCountsMustBeWholeNumbers(t *testing.T) {
	db := openDB(t, t.TempDir())
	names := []string{"stratum", "group", "events", "trials"}
	cell := proportions.BreakdownSpec{Layout: proportions.CellRows}
	for _, tc := range []struct {
		name  string
		types []string
		rows  [][]any
		want  error
		words []string
	}{
		{"fractions adding up to whole", []string{"TEXT", "TEXT", "", ""},
			[][]any{{"x", "a", 2.5, 10}, {"x", "a", 0.5, 10}, {"x", "b", 1, 10}}, proportions.ErrColumnType, []string{`"events"`, "2.5", "whole"}},
		{"text that is no number", []string{"TEXT", "TEXT", "", ""},
			[][]any{{"x", "a", "abc", "def"}, {"x", "b", 1, 10}}, proportions.ErrColumnType, []string{`"events"`, "abc"}},
		{"empty text trials", []string{"TEXT", "TEXT", "TEXT", "TEXT"},
			[][]any{{"x", "a", "0", ""}, {"x", "b", "1", "10"}}, proportions.ErrColumnType, []string{`"trials"`}},
		{"negative beside a NULL", []string{"TEXT", "TEXT", "", ""},
			[][]any{{"x", "a", -1, nil}, {"x", "b", 1, 10}}, proportions.ErrNullValue, []string{`"trials"`}},
	} {
		table := strings.ReplaceAll(tc.name, " ", "_")
		createTable(t, db, table, names, tc.types, tc.rows)
		_, err := QuerySQL(db, SQLSpec{Table: table, BreakdownSpec: cell})
		if !errors.Is(err, tc.want) {
			t.Errorf("%s: error %v, want one wrapping %v", tc.name, err, tc.want)
			continue
		}
		for _, w := range tc.words {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: error %q does not say %q", tc.name, err, w)
			}
		}
	}
	createTable(t, db, "digits", names, []string{"TEXT", "TEXT", "TEXT", "REAL"},
		[][]any{{"x", "a", "3", 10.0}, {"x", "a", " 4", 20.0}, {"x", "b", "1", 10.0}})
	b, err := QuerySQL(db, SQLSpec{Table: "digits", BreakdownSpec: cell})
	if err != nil {
		t.Fatalf("text digits and whole reals: %v", err)
	}
	if want := (proportions.Counts{X1: 7, N1: 30, X2: 1, N2: 10}); len(b.Rows) != 1 || b.Rows[0].Counts != want {
		t.Errorf("text digits and whole reals: %+v, want one row %+v", b.Rows, want)
	}
	// Zero counts in every storage: text '0' and the numbers 0 and 0.0, in
	// untyped and in TEXT columns (SQLite compares them differently with a
	// number), are counts of zero, not text that is no number.
	for _, types := range [][]string{{"TEXT", "TEXT", "", ""}, {"TEXT", "TEXT", "TEXT", "TEXT"}} {
		table := "zeros_" + strings.ToLower(types[2]) + "x"
		createTable(t, db, table, names, types,
			[][]any{{"x", "a", "0", 10}, {"x", "a", 0, "5"}, {"x", "a", 0.0, 5.0}, {"x", "b", "2", "10"}})
		b, err := QuerySQL(db, SQLSpec{Table: table, BreakdownSpec: cell})
		if err != nil {
			t.Errorf("zero counts in %v columns: %v", types[2:], err)
			continue
		}
		if want := (proportions.Counts{X1: 0, N1: 20, X2: 2, N2: 10}); len(b.Rows) != 1 || b.Rows[0].Counts != want {
			t.Errorf("zero counts in %v columns: %+v, want one row %+v", types[2:], b.Rows, want)
		}
	}
}

// TestSQLCountCheckUsesCoreFunctions: the row check must run on SQLite
// builds without their math functions (the default of common drivers),
// which lack FLOOR and CEIL; a query naming them fails there on every
// table of cell rows.
func TestSQLCountCheckUsesCoreFunctions(t *testing.T) {
	q := sqlQuery{cols: []string{`"s"`, `"g"`, `"e"`, `"n"`}}
	check := strings.ToUpper(q.impossible())
	for _, f := range []string{"FLOOR", "CEIL", "TRUNC", "MOD("} {
		if strings.Contains(check, f) {
			t.Errorf("the count check uses %s, missing from SQLite builds without math functions: %s", f, check)
		}
	}
}
