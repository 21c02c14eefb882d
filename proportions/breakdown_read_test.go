package proportions

import (
	"bytes"
	"context"
	"encoding/csv"
	"errors"
	"fmt"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/propscope/propscope/internal/canceltest"
)

// unitRow is one generated unit: its breakdown value, group and outcome.
type unitRow struct{ value, group, outcome string }

// hostileValues are breakdown values and groups that must stay data: CSV
// syntax, quotes, HTML, SQL, a NUL-free mix of scripts.
var hostileValues = []string{`plant "A"; line 1`, "line,2", "<b>night</b>", `'); DROP TABLE t; --`, "Nacht\tSchicht", "ünïcødé 夜", "a\nb"}

// generateUnits makes n units over the hostile values and two groups, with
// outcomes written in several spellings; the event rate differs by value.
func generateUnits(seed uint64, n int) []unitRow {
	rng := rand.New(rand.NewPCG(seed, 1))
	groups := []string{"supplier <X>", `supplier "Y"`}
	yes, no := []string{"1", "yes", " TRUE "}, []string{"0", "No", "false"}
	rows := make([]unitRow, n)
	for i := range rows {
		v := rng.IntN(len(hostileValues))
		r := unitRow{value: hostileValues[v], group: groups[rng.IntN(2)]}
		if rng.Float64() < 0.05+0.1*float64(v)/float64(len(hostileValues)) {
			r.outcome = yes[rng.IntN(len(yes))]
		} else {
			r.outcome = no[rng.IntN(len(no))]
		}
		rows[i] = r
	}
	return rows
}

// countUnits is the independent count: a plain loop over the rows, keyed by
// value and group, with the outcome judged by its own spelling list.
func countUnits(rows []unitRow) (order []string, events, trials map[[2]string]int64) {
	events, trials = map[[2]string]int64{}, map[[2]string]int64{}
	seen := map[string]bool{}
	for _, r := range rows {
		if !seen[r.value] {
			seen[r.value] = true
			order = append(order, r.value)
		}
		k := [2]string{r.value, r.group}
		trials[k]++
		switch r.outcome {
		case "1", "yes", " TRUE ":
			events[k]++
		}
	}
	return order, events, trials
}

// checkAgainstCount compares a breakdown with the independent count.
func checkAgainstCount(t *testing.T, b Breakdown, rows []unitRow) {
	t.Helper()
	order, events, trials := countUnits(rows)
	if len(b.Rows) != len(order) {
		t.Fatalf("%d rows, want %d", len(b.Rows), len(order))
	}
	for i, r := range b.Rows {
		v := order[i]
		want := Counts{X1: events[[2]string{v, b.First}], N1: trials[[2]string{v, b.First}],
			X2: events[[2]string{v, b.Second}], N2: trials[[2]string{v, b.Second}]}
		if r.Value != strings.TrimSpace(v) || r.Counts != want {
			t.Errorf("row %d: %q %+v, want %q %+v", i, r.Value, r.Counts, v, want)
		}
	}
}

// writeCSV writes rows with encoding/csv (quoting as needed) and delimiter comma.
func writeCSV(t *testing.T, comma rune, header []string, rows [][]string) string {
	t.Helper()
	var buf bytes.Buffer
	w := csv.NewWriter(&buf)
	w.Comma = comma
	if err := w.Write(header); err != nil {
		t.Fatal(err)
	}
	if err := w.WriteAll(rows); err != nil {
		t.Fatal(err)
	}
	return buf.String()
}

// cellsOf sums the units into cells, split in two halves so that each
// value and group has two cells that must add up.
func cellsOf(rows []unitRow) [][]string {
	var out [][]string
	for half, part := range [][]unitRow{rows[:len(rows)/2], rows[len(rows)/2:]} {
		order, events, trials := countUnits(part)
		for _, v := range order {
			for _, g := range []string{"supplier <X>", `supplier "Y"`} {
				k := [2]string{v, g}
				if trials[k] > 0 {
					out = append(out, []string{fmt.Sprint(half), g, v, fmt.Sprint(events[k]), fmt.Sprint(trials[k])})
				}
			}
		}
	}
	return out
}

// TestReadBreakdownCSVMatchesCount reads generated units and their cells
// with hostile values and column names, in each delimiter, and checks the
// counts against the independent loop; the records and cells entry points
// must give the same breakdown.
func TestReadBreakdownCSVMatchesCount(t *testing.T) {
	rows := generateUnits(7, 5000)
	by, group, outcome := `plant "line"; shift`, "Méthode,<i>", "défaut"
	var unit [][]string
	var records []BreakdownRecord
	for i, r := range rows {
		unit = append(unit, []string{fmt.Sprint(i), r.outcome, r.group, r.value})
		records = append(records, BreakdownRecord{Value: r.value, Group: r.group, Outcome: r.outcome})
	}
	spec := BreakdownSpec{ByColumn: by, GroupColumn: group, OutcomeColumn: outcome}
	fromRecords, err := BreakdownFromRecords(records, spec)
	if err != nil {
		t.Fatal(err)
	}
	checkAgainstCount(t, fromRecords, rows)
	cells := cellsOf(rows)
	var cellStructs []BreakdownCell
	for _, c := range cells {
		var e, n int64
		fmt.Sscan(c[3], &e)
		fmt.Sscan(c[4], &n)
		cellStructs = append(cellStructs, BreakdownCell{Value: c[2], Group: c[1], Events: e, Trials: n})
	}
	cellSpec := BreakdownSpec{Layout: CellRows, ByColumn: by, GroupColumn: group, EventsColumn: "defects", TrialsColumn: "inspected"}
	fromCells, err := BreakdownFromCells(cellStructs, cellSpec)
	if err != nil {
		t.Fatal(err)
	}
	checkAgainstCount(t, fromCells, rows)
	// The delimiter is set: the group column's name holds an unquoted comma
	// in the other delimiters' files, which would make detection read ','.
	for _, comma := range []rune{',', ';', '\t'} {
		spec.Comma, cellSpec.Comma = comma, comma
		data := writeCSV(t, comma, []string{"id", outcome, group, by}, unit)
		b, err := ReadBreakdownCSV(strings.NewReader(data), spec)
		if err != nil {
			t.Fatalf("unit rows, delimiter %q: %v", comma, err)
		}
		checkAgainstCount(t, b, rows)
		if b.Event != outcome || b.By != by {
			t.Errorf("labels %q by %q, want %q by %q", b.Event, b.By, outcome, by)
		}
		data = writeCSV(t, comma, []string{"half", group, by, "defects", "inspected"}, cells)
		c, err := ReadBreakdownCSV(strings.NewReader(data), cellSpec)
		if err != nil {
			t.Fatalf("cell rows, delimiter %q: %v", comma, err)
		}
		checkAgainstCount(t, c, rows)
	}
}

// TestReadCSVDetectsDelimiter: the semicolon file reads without a
// delimiter set, tabs too; a header with both and no comma is an error.
func TestReadCSVDetectsDelimiter(t *testing.T) {
	for _, data := range []string{"group;outcome\na;1\nb;0\na;0\n", "group\toutcome\na\t1\nb\t0\na\t0\n", "\"x,y\";group;outcome\n1;a;1\n2;b;0\n3;a;0\n"} {
		c, err := ReadCSV(strings.NewReader(data), CSVSpec{})
		if err != nil || c.First != (Group{"a", 1, 2}) || c.Second != (Group{"b", 0, 1}) {
			t.Errorf("%q: %+v, %v; want a 1 of 2, b 0 of 1", data, c, err)
		}
	}
	_, err := ReadCSV(strings.NewReader("group;outcome\tx\na;1\tx\n"), CSVSpec{})
	if !errors.Is(err, ErrMalformedRow) || !strings.Contains(err.Error(), "Comma") {
		t.Errorf("mixed delimiters: %v, want ErrMalformedRow asking for Comma", err)
	}
}

// TestReadBreakdownCSVErrors: each bad input wraps its sentinel and says
// where and what.
func TestReadBreakdownCSVErrors(t *testing.T) {
	cells := BreakdownSpec{Layout: CellRows}
	for _, c := range []struct {
		name, data string
		spec       BreakdownSpec
		want       error
		inMessage  []string
	}{
		{"missing column", "stratum,grp,outcome\ns,a,1\n", BreakdownSpec{}, ErrMissingColumn, []string{`"group"`, `["stratum" "grp" "outcome"]`}},
		{"one group", "stratum,group,outcome\ns,a,1\nt,a,0\n", BreakdownSpec{}, ErrGroupCount, []string{`["a"]`}},
		{"three groups", "stratum,group,outcome\ns,a,1\nt,b,0\nt,c,1\n", BreakdownSpec{}, ErrGroupCount, []string{"line 4", `"a"`, `"b"`, `"c"`}},
		{"bad outcome", "stratum,group,outcome\ns,a,1\ns,b,maybe\n", BreakdownSpec{}, ErrOutcomeValue, []string{"line 3", `"maybe"`}},
		{"empty value", "stratum,group,outcome\ns,a,1\n ,b,0\n", BreakdownSpec{}, ErrMalformedRow, []string{"line 3", "stratum"}},
		{"duplicate column", "stratum,group,outcome,stratum\ns,a,1,x\n", BreakdownSpec{}, ErrMalformedRow, []string{`"stratum"`, "must occur once"}},
		{"events over trials", "stratum,group,events,trials\ns,a,1,2\ns,b,5,4\n", cells, ErrEventsExceedTrials, []string{"line 3", "5 events of 4 trials"}},
		{"negative", "stratum,group,events,trials\ns,a,-1,2\n", cells, ErrNegativeCount, []string{"line 2"}},
		{"not a number", "stratum,group,events,trials\ns,a,1.5,2\n", cells, ErrMalformedRow, []string{"line 2", `"events"`, `"1.5"`}},
		{"header only", "stratum,group,outcome\n", BreakdownSpec{}, ErrEmptyInput, nil},
		{"unknown first group", "stratum,group,outcome\ns,a,1\ns,b,0\n", BreakdownSpec{RecordSpec: RecordSpec{FirstGroup: "c"}}, ErrUnknownGroup, []string{`"c"`}},
		{"unknown layout", "stratum,group,outcome\ns,a,1\n", BreakdownSpec{Layout: 7}, ErrLayout, nil},
		{"too many trials", fmt.Sprintf("stratum,group,events,trials\ns,a,0,%d\ns,a,0,%d\n", MaxTrials, MaxTrials), cells, ErrTooLarge, []string{"line 3"}},
	} {
		_, err := ReadBreakdownCSV(strings.NewReader(c.data), c.spec)
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
}

// TestReadBreakdownCSVKeepsEmptyRows: a value where one group has no units
// is kept and flagged, and FirstGroup reorders the counts.
func TestReadBreakdownCSVKeepsEmptyRows(t *testing.T) {
	data := "stratum,group,outcome\ns,a,1\ns,b,0\nt,b,1\nt,b,0\n"
	b, err := ReadBreakdownCSV(strings.NewReader(data), BreakdownSpec{RecordSpec: RecordSpec{FirstGroup: "b"}})
	if err != nil {
		t.Fatal(err)
	}
	want := []BreakdownRow{{"s", Counts{0, 1, 1, 1}}, {"t", Counts{1, 2, 0, 0}}}
	if b.First != "b" || len(b.Rows) != 2 || b.Rows[0] != want[0] || b.Rows[1] != want[1] {
		t.Fatalf("got %+v, want rows %+v with b first", b, want)
	}
	if b.Rows[0].Empty() || !b.Rows[1].Empty() {
		t.Errorf("Empty flags: %v %v", b.Rows[0].Empty(), b.Rows[1].Empty())
	}
}

// TestReadBreakdownCSVCancel: a cancelled context stops the read.
func TestReadBreakdownCSVCancel(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	_, err := ReadBreakdownCSVContext(ctx, strings.NewReader("stratum,group,outcome\ns,a,1\ns,b,0\n"), BreakdownSpec{})
	if !errors.Is(err, context.Canceled) {
		t.Errorf("got %v, want context.Canceled", err)
	}
}

// FuzzReadBreakdownCSV: the reader never panics, and whatever it accepts is
// a valid breakdown whose trials add up to the data rows, in either layout
// (for cell rows, to the sum of the trials column as a plain parse finds it).
func FuzzReadBreakdownCSV(f *testing.F) {
	f.Add("stratum,group,outcome\ns,a,1\nt,b,0\n", false)
	f.Add("stratum;group;outcome\ns;a;yes\ns;b;no\n", false)
	f.Add("stratum,group,events,trials\ns,a,1,3\ns,b,0,2\ns,a,2,2\n", true)
	f.Add("stratum,group,events,trials\ns,a,-1,3\n", true)
	f.Add("\ufeff\"stratum\"\t\"group\"\t\"outcome\"\r\"a\nb\"\tx\t1\ry\tz\t0\r", false)
	f.Add("strAtum,group,events,triAls\n0,1,0,010\n0,0,0,0", true) // a count with a leading zero is decimal
	f.Fuzz(func(t *testing.T, data string, cells bool) {
		spec := BreakdownSpec{}
		if cells {
			spec.Layout = CellRows
		}
		b, err := ReadBreakdownCSV(strings.NewReader(data), spec)
		if err != nil {
			return
		}
		var total int64
		for _, r := range b.Rows {
			if err := validateRow(r.Counts); err != nil || r.Value == "" {
				t.Fatalf("accepted an invalid row %+v: %v", r, err)
			}
			total += r.Counts.N1 + r.Counts.N2
		}
		want := plainTotal(t, data, cells)
		if total != want {
			t.Errorf("trials add up to %d, the rows hold %d", total, want)
		}
	})
}

// plainTotal re-reads accepted data with encoding/csv and counts the rows
// (unit rows) or sums the last named column (cell rows).
func plainTotal(t *testing.T, data string, cells bool) int64 {
	ends := newLineEnds(strings.NewReader(data))
	comma, _ := detectComma(ends.peekLine())
	r := csv.NewReader(ends)
	r.Comma = comma
	rows, err := r.ReadAll()
	if err != nil {
		t.Fatalf("accepted data encoding/csv refuses: %v", err)
	}
	header := rows[0]
	trials := -1
	for i, h := range header {
		if strings.EqualFold(strings.TrimSpace(h), "trials") {
			trials = i
		}
	}
	var total int64
	for _, row := range rows[1:] {
		if !cells {
			total++
			continue
		}
		// base 10, as ParseCount reads counts: fmt.Sscan took "010" for
		// octal 8, a false alarm the fuzzer found
		n, _ := strconv.ParseInt(strings.TrimSpace(row[trials]), 10, 64)
		total += n
	}
	return total
}

// TestRepeatedColumnNamesSayWhere checks the error for a wanted column
// whose name occurs twice: a CSV's names its header line, while the same
// error reached through a SQL table or a Parquet file (FindColumns over
// their column names) said "line 1", which they do not have.
func TestRepeatedColumnNamesSayWhere(t *testing.T) {
	_, err := FindColumns([]string{"stratum", "group", "GROUP", "group"}, "stratum", "group")
	if !errors.Is(err, ErrMalformedRow) || strings.Contains(err.Error(), "line") {
		t.Errorf("FindColumns: error %v, want one wrapping ErrMalformedRow without a line", err)
	}
	_, err = ReadCSV(strings.NewReader("group,outcome,group\na,1,b\n"), CSVSpec{})
	if !errors.Is(err, ErrMalformedRow) || !strings.HasPrefix(err.Error(), "line 1") {
		t.Errorf("ReadCSV: error %v, want one wrapping ErrMalformedRow that names line 1", err)
	}
}

// TestUnusableDelimiterIsNamed checks that a delimiter encoding/csv cannot
// use (a quote, a line break, a negative rune) is refused by naming the
// delimiter and the allowed ones, where the reader's own error blamed the
// first row ("malformed row: csv: invalid field or comment delimiter").
func TestUnusableDelimiterIsNamed(t *testing.T) {
	for _, comma := range []rune{'"', '\n', '\r', -1, 0xFFFD} {
		_, err := ReadCSV(strings.NewReader("group,outcome\na,1\nb,0\n"), CSVSpec{Comma: comma})
		if !errors.Is(err, ErrMalformedRow) || !strings.Contains(err.Error(), "delimiter (Comma) must be") {
			t.Errorf("Comma %q: error %v, want one naming the delimiter and what is allowed", comma, err)
		}
		_, err = ReadBreakdownCSV(strings.NewReader("stratum,group,outcome\nx,a,1\n"), BreakdownSpec{Comma: comma})
		if !errors.Is(err, ErrMalformedRow) || !strings.Contains(err.Error(), "delimiter (Comma) must be") {
			t.Errorf("breakdown, Comma %q: error %v, want one naming the delimiter and what is allowed", comma, err)
		}
	}
	if _, err := ReadCSV(strings.NewReader("group|outcome\na|1\nb|0\n"), CSVSpec{Comma: '|'}); err != nil {
		t.Errorf("Comma '|': %v", err)
	}
}

// endlessRows is a CSV of one header and rows without end, as a pipe
// from a process that never stops would give.
type endlessRows struct{ header bool }

func (e *endlessRows) Read(p []byte) (int, error) {
	if !e.header {
		e.header = true
		return copy(p, "group,outcome\n"), nil
	}
	const row = "a,1\nb,0\n"
	n := 0
	for n+len(row) <= len(p) {
		n += copy(p[n:], row)
	}
	return n, nil
}

// TestReadCSVCancel checks that a cancel stops ReadCSVContext on a source
// without end, which ReadCSV (taking no context) read for ever: cancelled
// 30 ms in, it must return within canceltest.Bound.
func TestReadCSVCancel(t *testing.T) {
	canceltest.Check(t, 30*time.Millisecond, func(ctx context.Context) error {
		_, err := ReadCSVContext(ctx, &endlessRows{}, CSVSpec{})
		return err
	})
}

// TestSkipNeverCountsBelowZero checks that Tally.Skip with a negative
// number of rows leaves the count of skipped rows alone: it made
// Breakdown.SkippedRows negative (−5 rows left out), a count no source can
// have.
func TestSkipNeverCountsBelowZero(t *testing.T) {
	tl, err := NewTally(BreakdownSpec{})
	if err != nil {
		t.Fatal(err)
	}
	tl.Skip(2)
	tl.Skip(-5)
	tl.Skip(0)
	if err := errors.Join(tl.AddUnit("v", "a", "1"), tl.AddUnit("v", "b", "0")); err != nil {
		t.Fatal(err)
	}
	b, err := tl.Breakdown()
	if err != nil {
		t.Fatal(err)
	}
	if b.SkippedRows != 2 {
		t.Errorf("SkippedRows %d, want the 2 rows skipped", b.SkippedRows)
	}
}
