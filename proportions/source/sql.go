package source

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/propscope/propscope/proportions"
)

// Queryer runs a query: a *sql.DB, *sql.Conn or *sql.Tx.
type Queryer interface {
	QueryContext(ctx context.Context, query string, args ...any) (*sql.Rows, error)
}

// SQLSpec says which table to read and how: the table's name and the
// breakdown spec (layout, columns, outcome values, first group, SkipNulls).
type SQLSpec struct {
	// Table names the table or view, as one identifier (a dot is part of
	// the name, not a schema separator).
	Table string
	proportions.BreakdownSpec
}

// QuerySQL reads a breakdown from a table of unit rows or cell rows with
// one grouped query, so the database sends counts per breakdown value and
// group, never the rows. It is QuerySQLContext without a deadline.
func QuerySQL(db Queryer, spec SQLSpec) (proportions.Breakdown, error) {
	return QuerySQLContext(context.Background(), db, spec)
}

// QuerySQLContext reads a breakdown from a table with one grouped query.
// Rows come in the database's order of the breakdown values (ORDER BY),
// and the groups in the order of the first value's groups, so set
// FirstGroup to fix which group is first.
//
// The columns are found as in a CSV header (proportions.FindColumns) among
// the names the table reports, so a missing column's error lists them. Every
// table and column name is quoted as an SQL identifier ("name", a quote
// inside doubled), so a name is data whatever it holds; a name with a NUL
// or invalid UTF-8 is refused. No other user text enters the query: for
// unit rows the database counts the rows per breakdown value, group and
// outcome value (GROUP BY all three), and the distinct outcome values are
// classified here by the same rules as every other source (trimmed,
// ignoring case; integers read as "1"/"0", booleans as the driver writes
// them), so the event values never reach the SQL text or the database.
//
// Nothing is dropped silently: an outcome that is neither the event nor a
// non-event is an error naming the value; a NULL in a column
// the layout reads is an error naming the column and the breakdown value
// and group where it occurs, unless spec.SkipNulls is set (then the rows
// are counted in Breakdown.SkippedRows); a cell row with negative counts,
// more events than trials or a count that is not a whole number (a
// fraction, text that is not a number) is an error showing that row, even
// when the sums would look valid. Counts are compared as numbers (count +
// 0) with core SQL only (CASE, ROUND), so that SQLite builds without their
// math functions read them too. Errors wrap proportions.ErrSource (the database's own
// error: no such table, a failed query), ErrMissingColumn, ErrColumnType,
// ErrNullValue, ErrOutcomeValue, ErrNegativeCount, ErrEventsExceedTrials,
// the errors of proportions.Tally, or the context's error.
func QuerySQLContext(ctx context.Context, db Queryer, spec SQLSpec) (proportions.Breakdown, error) {
	q, err := newSQLQuery(ctx, db, spec)
	if err != nil {
		return proportions.Breakdown{}, err
	}
	tally, err := proportions.NewTally(spec.BreakdownSpec)
	if err != nil {
		return proportions.Breakdown{}, err
	}
	if spec.Layout == proportions.CellRows {
		err = q.cells(ctx, tally)
	} else {
		err = q.units(ctx, tally)
	}
	if err != nil {
		return proportions.Breakdown{}, err
	}
	return tally.Breakdown()
}

// QuoteIdentifier quotes name as an SQL identifier in the standard way
// (double quotes, a double quote inside doubled), which SQLite, PostgreSQL,
// SQL Server and MySQL in ANSI_QUOTES mode read as a name whatever it
// holds. An empty name, a NUL or invalid UTF-8 is refused (ErrMissingColumn
// or ErrColumnType), since some databases cut a name at a NUL.
func QuoteIdentifier(name string) (string, error) {
	switch {
	case name == "":
		return "", fmt.Errorf("an empty name: %w; give the table's or column's name", proportions.ErrMissingColumn)
	case strings.ContainsRune(name, 0):
		return "", fmt.Errorf("name %q: %w; a name may not hold a NUL character", name, proportions.ErrColumnType)
	case !utf8.ValidString(name):
		return "", fmt.Errorf("name %q: %w; a name must be valid UTF-8", name, proportions.ErrColumnType)
	}
	return `"` + strings.ReplaceAll(name, `"`, `""`) + `"`, nil
}

// sqlQuery holds a table's quoted name, the quoted columns of the layout
// (in the order of BreakdownSpec.Columns), their names as the table spells
// them, and the spec.
type sqlQuery struct {
	db    Queryer
	spec  SQLSpec
	table string
	cols  []string
	names []string
}

// newSQLQuery quotes the table, reads its column names with a query that
// returns no rows, and finds the layout's columns among them.
func newSQLQuery(ctx context.Context, db Queryer, spec SQLSpec) (*sqlQuery, error) {
	if err := spec.Check(); err != nil {
		return nil, err
	}
	table, err := QuoteIdentifier(spec.Table)
	if err != nil {
		return nil, fmt.Errorf("table: %w", err)
	}
	header, err := tableColumns(ctx, db, table, spec.Table)
	if err != nil {
		return nil, err
	}
	at, err := proportions.FindColumns(header, spec.Columns()...)
	if err != nil {
		return nil, fmt.Errorf("table %q: %w", spec.Table, err)
	}
	q := &sqlQuery{db: db, spec: spec, table: table}
	for _, i := range at {
		quoted, err := QuoteIdentifier(header[i])
		if err != nil {
			return nil, fmt.Errorf("table %q: column: %w", spec.Table, err)
		}
		q.cols = append(q.cols, quoted)
		q.names = append(q.names, header[i])
	}
	return q, nil
}

// tableColumns returns the column names the table reports.
func tableColumns(ctx context.Context, db Queryer, quoted, name string) ([]string, error) {
	rows, err := db.QueryContext(ctx, "SELECT * FROM "+quoted+" WHERE 1 = 0")
	if err != nil {
		return nil, fmt.Errorf("table %q: %w: %w", name, proportions.ErrSource, err)
	}
	defer rows.Close()
	header, err := rows.Columns()
	if err != nil {
		return nil, fmt.Errorf("table %q: %w: %w", name, proportions.ErrSource, err)
	}
	return header, nil
}

// units runs the unit-rows query: the units per breakdown value, group
// and outcome value.
func (q *sqlQuery) units(ctx context.Context, t *proportions.Tally) error {
	by, group, o := q.cols[0], q.cols[1], q.cols[2]
	query := "SELECT " + by + ", " + group + ", " + o + ", COUNT(*)\nFROM " + q.table +
		"\nGROUP BY " + by + ", " + group + ", " + o + "\nORDER BY " + by + ", " + group + ", " + o
	return q.eachGroup(ctx, t, query, 1, func(g sqlGroup, n []int64) error {
		if !g.outcome.Valid {
			if !q.spec.SkipNulls {
				return q.nullError(2, n[0])
			}
			t.Skip(n[0])
			return nil
		}
		if err := t.AddUnits(g.value, g.group, g.outcome.String, n[0]); err != nil {
			return fmt.Errorf("column %q: %w", q.names[2], err)
		}
		return nil
	})
}

// cells runs the cell-rows query: per breakdown value and group, the rows,
// the rows with a NULL in events, with a NULL in trials, with either, the
// rows whose counts are impossible, and the sums of events and trials over
// the rows with both. Impossible rows are found row by row, since sums can
// hide them (−1 events in one row, +1 in another; 2.5 events in one row,
// 0.5 in another).
func (q *sqlQuery) cells(ctx context.Context, t *proportions.Tally) error {
	by, group, e, n := q.cols[0], q.cols[1], q.cols[2], q.cols[3]
	either := e + " IS NULL OR " + n + " IS NULL"
	query := "SELECT " + by + ", " + group + ",\n" +
		"  COUNT(*),\n" +
		"  SUM(CASE WHEN " + e + " IS NULL THEN 1 ELSE 0 END),\n" +
		"  SUM(CASE WHEN " + n + " IS NULL THEN 1 ELSE 0 END),\n" +
		"  SUM(CASE WHEN " + either + " THEN 1 ELSE 0 END),\n" +
		"  SUM(" + q.impossible() + "),\n" +
		"  SUM(CASE WHEN " + either + " THEN 0 ELSE " + e + " END),\n" +
		"  SUM(CASE WHEN " + either + " THEN 0 ELSE " + n + " END)\n" +
		"FROM " + q.table + "\nGROUP BY " + by + ", " + group + "\nORDER BY " + by + ", " + group
	err := q.eachGroup(ctx, t, query, 7, func(g sqlGroup, c []int64) error {
		nullE, nullN, nullRows, bad, events, trials := c[1], c[2], c[3], c[4], c[5], c[6]
		if bad > 0 {
			return errImpossible
		}
		if nullRows > 0 {
			if !q.spec.SkipNulls {
				if nullE > 0 {
					return q.nullError(2, nullE)
				}
				return q.nullError(3, nullN)
			}
			t.Skip(nullRows)
		}
		if nullRows == c[0] {
			return nil
		}
		return t.AddCell(g.value, g.group, events, trials)
	})
	if errors.Is(err, errImpossible) {
		return q.badCell(ctx)
	}
	return err
}

// impossible is 1 for a cell row with both counts whose counts cannot be:
// negative, more events than trials, or not whole numbers (a fraction, or
// text that is not a number, which the database's SUM would count as 0);
// 0 otherwise, and for a row with a NULL (the NULL checks report those).
// Counts are compared as numbers (x + 0), so that a count column of text
// holding digits (a CSV imported as text) reads as its numbers. It uses
// core SQL only: FLOOR is missing from SQLite builds without their math
// functions (the default of common drivers), ROUND is in every database.
func (q *sqlQuery) impossible() string {
	e, n := q.cols[2], q.cols[3]
	return "CASE WHEN " + e + " IS NULL OR " + n + " IS NULL THEN 0" +
		" WHEN " + e + " + 0 < 0 OR " + n + " + 0 < 0 OR " + e + " + 0 > " + n + " + 0 THEN 1" +
		" WHEN " + notCount(e) + " OR " + notCount(n) + " THEN 1 ELSE 0 END"
}

// notCount is an SQL condition, true when the non-NULL column c holds no
// whole number: a fraction (ROUND changes it), or text that is not a
// number, which reads as 0 in x + 0 yet differs from the number 0 and from
// the texts '0' and '0.0' (SQLite compares a TEXT column with a number as
// text, an untyped one by type; '0.0' is how data frames write a zero of a
// column of reals). A zero written otherwise in a TEXT column ('00', ' 0')
// is taken for text and reported with its row.
func notCount(c string) string {
	return "(ROUND(" + c + " + 0) <> " + c + " + 0 OR (" + c + " + 0 = 0 AND " + c + " <> 0 AND " + c + " NOT IN ('0', '0.0')))"
}

// errImpossible stops the grouped query when a group holds a cell row with
// impossible counts; badCell then finds and shows the row.
var errImpossible = errors.New("a cell row has impossible counts")

// sqlGroup is one result row's breakdown value, group and, for unit rows,
// outcome value.
type sqlGroup struct {
	value, group string
	outcome      sql.NullString
}

// eachGroup runs query and calls fn with each result row's value, group,
// outcome (unit rows) and its sums (the first being the rows it counts). A
// NULL value or group is an error naming the column, or, with SkipNulls,
// its rows are counted as skipped.
func (q *sqlQuery) eachGroup(ctx context.Context, t *proportions.Tally, query string, sums int, fn func(sqlGroup, []int64) error) error {
	rows, err := q.db.QueryContext(ctx, query)
	if err != nil {
		return fmt.Errorf("table %q: %w: %w", q.spec.Table, proportions.ErrSource, err)
	}
	defer rows.Close()
	var value, group, outcome sql.NullString
	n := make([]int64, sums)
	dest := []any{&value, &group}
	if q.spec.Layout == proportions.UnitRows {
		dest = append(dest, &outcome)
	}
	for i := range n {
		dest = append(dest, &n[i])
	}
	for rows.Next() {
		if err := rows.Scan(dest...); err != nil {
			return fmt.Errorf("table %q: %w; the breakdown and group columns must hold text or numbers, the counts whole numbers (%w)", q.spec.Table, proportions.ErrColumnType, err)
		}
		if k := nullAt(value, group); k >= 0 {
			if !q.spec.SkipNulls {
				where := fmt.Sprintf("group %q", group.String)
				if k == 1 {
					where = fmt.Sprintf("%s %q", q.names[0], value.String)
				}
				return fmt.Errorf("table %q, %s: %w", q.spec.Table, where, q.nullError(k, n[0]))
			}
			t.Skip(n[0])
			continue
		}
		g := sqlGroup{value.String, group.String, outcome}
		if err := fn(g, n); errors.Is(err, errImpossible) {
			return err
		} else if err != nil {
			return fmt.Errorf("table %q, %s %q, group %q: %w", q.spec.Table, q.names[0], g.value, g.group, err)
		}
	}
	if err := rows.Err(); err != nil {
		return fmt.Errorf("table %q: %w: %w", q.spec.Table, proportions.ErrSource, err)
	}
	return nil
}

// nullAt returns the index of the first NULL among the columns, or −1.
func nullAt(cols ...sql.NullString) int {
	for k, c := range cols {
		if !c.Valid {
			return k
		}
	}
	return -1
}

// nullError says that column k holds NULL in rows rows; the caller adds
// the table and where.
func (q *sqlQuery) nullError(k int, rows int64) error {
	return fmt.Errorf("column %q is NULL in %d rows: %w; fill it in, or set SkipNulls to leave such rows out and count them",
		q.names[k], rows, proportions.ErrNullValue)
}

// badCell shows the first cell row with negative counts, more events
// than trials or a count that is not a whole number, with its breakdown
// value and group: a count that is not a whole number wraps ErrColumnType,
// other counts are checked by a Tally so the error is the one every source
// gives.
func (q *sqlQuery) badCell(ctx context.Context) error {
	by, group, e, n := q.cols[0], q.cols[1], q.cols[2], q.cols[3]
	query := "SELECT " + by + ", " + group + ", " + e + ", " + n + " FROM " + q.table +
		"\nWHERE " + q.impossible() + " = 1"
	rows, err := q.db.QueryContext(ctx, query)
	if err != nil {
		return fmt.Errorf("table %q: %w: %w", q.spec.Table, proportions.ErrSource, err)
	}
	defer rows.Close()
	var value, grp, events, trials sql.NullString
	if !rows.Next() {
		return fmt.Errorf("table %q: %w: the database reported impossible counts that it then did not return", q.spec.Table, proportions.ErrSource)
	}
	if err := rows.Scan(&value, &grp, &events, &trials); err != nil {
		return fmt.Errorf("table %q: %w: %w", q.spec.Table, proportions.ErrColumnType, err)
	}
	where := fmt.Sprintf("table %q, %s %q, group %q: a row has %q %s and %q %s",
		q.spec.Table, q.names[0], value.String, grp.String, q.names[2], events.String, q.names[3], trials.String)
	var counts [2]int64
	for i, v := range [2]string{events.String, trials.String} {
		n, err := strconv.ParseInt(strings.TrimSpace(v), 10, 64)
		if err != nil {
			return fmt.Errorf("%s: %w; column %q must hold whole numbers, and %q is not one", where, proportions.ErrColumnType, q.names[2+i], v)
		}
		counts[i] = n
	}
	x, nt := counts[0], counts[1]
	t, err := proportions.NewTally(q.spec.BreakdownSpec)
	if err != nil {
		return err
	}
	if err := t.AddCell("row", "group", x, nt); err != nil {
		return fmt.Errorf("%s: %w", where, err)
	}
	return fmt.Errorf("table %q: %w: the database reported impossible counts that it then did not return", q.spec.Table, proportions.ErrSource)
}
