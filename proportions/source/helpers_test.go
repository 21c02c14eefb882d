package source

import (
	"database/sql"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/parquet-go/parquet-go"
	_ "modernc.org/sqlite" // the embedded engine the tests start (pure Go, no cgo)

	"github.com/propscope/propscope/proportions"
)

// unit is one generated unit.
type unit struct {
	value, group, outcome string
}

// Hostile names and values: they must stay data in every source.
var (
	hostileValues = []string{`plant "A"; line 1`, "line,2", "<b>night</b>", `'); DROP TABLE canary; --`, "Nacht Schicht", "ünïcødé 夜", `a\nb`}
	hostileGroups = []string{`supplier "X"`, "supplier <Y>'"}
	hostileCols   = []string{`plant "line"; shift`, `méthode') --`, `défaut"`} // breakdown, group, outcome
	hostileTable  = `inspections"; DROP TABLE canary; --`
)

// generate makes n units over the hostile values and groups, outcomes in
// several spellings, the event rate rising with the value's index.
func generate(seed uint64, n int) []unit {
	rng := rand.New(rand.NewPCG(seed, 2))
	yes, no := []string{"1", "yes", " TRUE "}, []string{"0", "No", "false"}
	out := make([]unit, n)
	for i := range out {
		v := rng.IntN(len(hostileValues))
		u := unit{value: hostileValues[v], group: hostileGroups[rng.IntN(2)], outcome: no[rng.IntN(3)]}
		if rng.Float64() < 0.05+0.02*float64(v) {
			u.outcome = yes[rng.IntN(3)]
		}
		out[i] = u
	}
	return out
}

// countByLoop is the independent count: a plain loop keyed by value and
// group, the event judged by its own spelling list.
func countByLoop(units []unit) map[[2]string][2]int64 {
	out := map[[2]string][2]int64{}
	for _, u := range units {
		k := [2]string{u.value, u.group}
		c := out[k]
		c[1]++
		if u.outcome == "1" || u.outcome == "yes" || u.outcome == " TRUE " {
			c[0]++
		}
		out[k] = c
	}
	return out
}

// checkCounts compares a breakdown with the loop's counts, row by row.
func checkCounts(t *testing.T, name string, b proportions.Breakdown, want map[[2]string][2]int64) {
	t.Helper()
	values := map[string]bool{}
	for k := range want {
		values[k[0]] = true
	}
	if len(b.Rows) != len(values) {
		t.Fatalf("%s: %d rows, want %d", name, len(b.Rows), len(values))
	}
	for _, r := range b.Rows {
		a, c := want[[2]string{r.Value, b.First}], want[[2]string{r.Value, b.Second}]
		if got := (proportions.Counts{X1: a[0], N1: a[1], X2: c[0], N2: c[1]}); r.Counts != got {
			t.Errorf("%s: %q: %+v, want %+v", name, r.Value, r.Counts, got)
		}
	}
}

// sorted returns the breakdown with its rows sorted by value, so sources
// that meet values in different orders compare equal.
func sorted(b proportions.Breakdown) proportions.Breakdown {
	b.Rows = slices.Clone(b.Rows)
	slices.SortFunc(b.Rows, func(x, y proportions.BreakdownRow) int { return strings.Compare(x.Value, y.Value) })
	return b
}

// column is one column of a test Parquet file: its name and node, and
// each row's value (nil for NULL).
type column struct {
	name string
	node parquet.Node
	data []any
}

// writeParquet writes the columns to a Parquet file in dir with rowGroup
// rows per row group, building each row's values by hand (their column
// index from the schema), and returns its path.
func writeParquet(t testing.TB, dir string, rowGroup int64, cols []column) string {
	t.Helper()
	group := parquet.Group{}
	for _, c := range cols {
		group[c.name] = c.node
	}
	schema := parquet.NewSchema("rows", group)
	index := make([]int, len(cols))
	optional := make([]bool, len(cols))
	for k, c := range cols {
		leaf, ok := schema.Lookup(c.name)
		if !ok {
			t.Fatalf("column %q not in schema", c.name)
		}
		index[k], optional[k] = leaf.ColumnIndex, c.node.Optional()
	}
	path := filepath.Join(dir, fmt.Sprintf("data-%d.parquet", len(cols[0].data)))
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	w := parquet.NewWriter(f, schema, parquet.MaxRowsPerRowGroup(rowGroup))
	n := len(cols[0].data)
	const batch = 4096
	rows := make([]parquet.Row, 0, batch)
	for i := 0; i < n; i++ {
		row := make(parquet.Row, len(cols))
		for k, c := range cols {
			row[index[k]] = parquetValue(c.data[i], optional[k]).Level(0, definition(c.data[i], optional[k]), index[k])
		}
		rows = append(rows, row)
		if len(rows) == batch || i == n-1 {
			if _, err := w.WriteRows(rows); err != nil {
				t.Fatal(err)
			}
			rows = rows[:0]
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	if err := f.Close(); err != nil {
		t.Fatal(err)
	}
	return path
}

func parquetValue(v any, optional bool) parquet.Value {
	if v == nil {
		return parquet.NullValue()
	}
	return parquet.ValueOf(v)
}

func definition(v any, optional bool) int {
	if optional && v != nil {
		return 1
	}
	return 0
}

// readParquetFile opens path and reads it with spec.
func readParquetFile(t testing.TB, path string, spec proportions.BreakdownSpec) (proportions.Breakdown, error) {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	st, err := f.Stat()
	if err != nil {
		t.Fatal(err)
	}
	return ReadParquet(f, st.Size(), spec)
}

// quote is the test's own identifier quoting (written here, not taken
// from the package), so the table the tests make does not depend on the
// code under test.
func quote(name string) string { return `"` + strings.ReplaceAll(name, `"`, `""`) + `"` }

// openDB starts an embedded SQLite database in dir with a canary table
// that a successful injection would drop.
func openDB(t testing.TB, dir string) *sql.DB {
	t.Helper()
	db, err := sql.Open("sqlite", filepath.Join(dir, "data.db"))
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { db.Close() })
	if _, err := db.Exec(`CREATE TABLE canary (x INTEGER); INSERT INTO canary VALUES (1)`); err != nil {
		t.Fatal(err)
	}
	return db
}

// createTable makes table with the named columns (SQLite types given) and
// inserts rows in one transaction with a prepared statement.
func createTable(t testing.TB, db *sql.DB, table string, names, types []string, rows [][]any) {
	t.Helper()
	defs := make([]string, len(names))
	marks := make([]string, len(names))
	for i := range names {
		defs[i] = quote(names[i]) + " " + types[i]
		marks[i] = "?"
	}
	if _, err := db.Exec("CREATE TABLE " + quote(table) + " (" + strings.Join(defs, ", ") + ")"); err != nil {
		t.Fatal(err)
	}
	tx, err := db.Begin()
	if err != nil {
		t.Fatal(err)
	}
	stmt, err := tx.Prepare("INSERT INTO " + quote(table) + " VALUES (" + strings.Join(marks, ", ") + ")")
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range rows {
		if _, err := stmt.Exec(r...); err != nil {
			t.Fatal(err)
		}
	}
	if err := tx.Commit(); err != nil {
		t.Fatal(err)
	}
}

// canaryAlive fails the test when the canary table is gone.
func canaryAlive(t *testing.T, db *sql.DB) {
	t.Helper()
	var n int
	if err := db.QueryRow("SELECT COUNT(*) FROM canary").Scan(&n); err != nil || n != 1 {
		t.Errorf("canary table: %d rows, %v; an identifier or value was run as SQL", n, err)
	}
}

// openForTest opens path for reading, closed when the test ends.
func openForTest(t testing.TB, path string) (*os.File, int64) {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { f.Close() })
	st, err := f.Stat()
	if err != nil {
		t.Fatal(err)
	}
	return f, st.Size()
}
