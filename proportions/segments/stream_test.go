package segments

import (
	"bufio"
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"iter"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
)

type buffers struct{ segJSON, segCSV, adjJSON, adjCSV bytes.Buffer }

func (b *buffers) outputs() Outputs {
	return Outputs{SegmentsJSON: &b.segJSON, SegmentsCSV: &b.segCSV, AdjustedJSON: &b.adjJSON, AdjustedCSV: &b.adjCSV}
}

func lines(t *testing.T, b *bytes.Buffer) []string {
	t.Helper()
	var out []string
	sc := bufio.NewScanner(bytes.NewReader(b.Bytes()))
	sc.Buffer(nil, 1<<20)
	for sc.Scan() {
		out = append(out, sc.Text())
	}
	return out
}

// The stream writes what Analyze returns: the same summary, each JSON
// line the segment's (and adjusted record's) JSON, each CSV record the
// same numbers read back by encoding/csv.
func TestStreamEqualsInMemory(t *testing.T) {
	r := rand.New(rand.NewPCG(4, 4))
	// More rows than one batch, so that batches finish out of order.
	b := randomBreakdown(t, r, 3*chunk+17, true)
	b.Rows[5].Value = "=HYPERLINK(\"x\")"
	b.Rows[6].Value = "a, \"b\"\nc <d> & é \u2028 end"
	for _, adj := range []Adjustment{Holm, BenjaminiYekutieli} {
		opts := []Option{WithAdjustment(adj), WithAnalysis(proportions.WithLevel(0.9))}
		want, err := Analyze(b, opts...)
		if err != nil {
			t.Fatal(err)
		}
		var out buffers
		var summaryLine bytes.Buffer
		o := out.outputs()
		o.SummaryJSON = &summaryLine
		sum, err := Stream(context.Background(), BreakdownSource(b), o, opts...)
		if err != nil {
			t.Fatal(err)
		}
		gotSum, _ := json.Marshal(sum)
		wantSum, _ := json.Marshal(want.Summary)
		if !bytes.Equal(gotSum, wantSum) || summaryLine.String() != string(wantSum)+"\n" {
			t.Fatalf("summaries differ:\nstream %s\nwritten %s\nmemory %s", gotSum, summaryLine.String(), wantSum)
		}
		var back Summary
		if err := json.Unmarshal(summaryLine.Bytes(), &back); err != nil {
			t.Fatal(err)
		}
		if again, _ := json.Marshal(back); !bytes.Equal(again, wantSum) {
			t.Fatalf("the summary reads back as %s", again)
		}
		segLines, adjLines := lines(t, &out.segJSON), lines(t, &out.adjJSON)
		if len(segLines) != len(b.Rows) || len(adjLines) != len(b.Rows) {
			t.Fatalf("%d and %d lines for %d rows", len(segLines), len(adjLines), len(b.Rows))
		}
		for i := range b.Rows {
			ws, _ := json.Marshal(want.Segments[i])
			wa, _ := json.Marshal(want.Adjusted[i])
			if segLines[i] != string(ws) || adjLines[i] != string(wa) {
				t.Fatalf("row %d:\nstream %s\n       %s\nmemory %s\n       %s", i+1, segLines[i], adjLines[i], ws, wa)
			}
			var back Segment
			if err := json.Unmarshal([]byte(segLines[i]), &back); err != nil || !sameSegment(back, want.Segments[i]) {
				t.Fatalf("row %d reads back as %+v (%v), want %+v", i+1, back, err, want.Segments[i])
			}
			var backAdj Adjusted
			if err := json.Unmarshal([]byte(adjLines[i]), &backAdj); err != nil || !sameAdjusted(backAdj, want.Adjusted[i]) {
				t.Fatalf("row %d's adjusted line reads back as %+v (%v), want %+v", i+1, backAdj, err, want.Adjusted[i])
			}
		}
		checkCSV(t, &out.segCSV, segmentColumns, want, func(i int, rec []string) error {
			s := want.Segments[i]
			return sameCells(rec, []string{strconv.Itoa(s.Number), cellText(s.Value)},
				[]float64{float64(s.Counts.X1), float64(s.Counts.N1), float64(s.Counts.X2), float64(s.Counts.N2)},
				[]bool{s.Empty, s.Sparse},
				[]float64{s.SmallestExpected, s.Rate1, s.Rate2, s.Difference, s.Lower, s.Upper, s.Statistic, s.PValue}, s.Reject)
		})
		checkCSV(t, &out.adjCSV, adjustedColumns, want, func(i int, rec []string) error {
			a := want.Adjusted[i]
			return sameCells(rec, []string{strconv.Itoa(a.Number), cellText(a.Value), adj.String(), strconv.Itoa(want.Tested)}, nil, nil,
				[]float64{a.AdjustedPValue, a.SimultaneousLower, a.SimultaneousUpper}, a.Reject)
		})
	}
}

// same reports whether two numbers are equal, NaN equal to NaN.
func same(a, b float64) bool { return a == b || (math.IsNaN(a) && math.IsNaN(b)) }

func sameSegment(a, b Segment) bool {
	return a.Number == b.Number && a.Value == b.Value && a.Counts == b.Counts && a.Empty == b.Empty && a.Sparse == b.Sparse &&
		same(a.SmallestExpected, b.SmallestExpected) && same(a.Rate1, b.Rate1) && same(a.Rate2, b.Rate2) &&
		same(a.Difference, b.Difference) && same(a.Lower, b.Lower) && same(a.Upper, b.Upper) &&
		same(a.Statistic, b.Statistic) && same(a.PValue, b.PValue) && a.Reject == b.Reject
}

func sameAdjusted(a, b Adjusted) bool {
	return a.Number == b.Number && a.Value == b.Value && a.Adjustment == b.Adjustment && a.Tested == b.Tested &&
		same(a.AdjustedPValue, b.AdjustedPValue) && same(a.SimultaneousLower, b.SimultaneousLower) &&
		same(a.SimultaneousUpper, b.SimultaneousUpper) && a.Reject == b.Reject
}

// cellText is what a CSV cell must hold for a value: the value, with an
// apostrophe before a leading formula character.
func cellText(v string) string {
	if v != "" && strings.ContainsRune("=+-@\t\r", rune(v[0])) {
		return "'" + v
	}
	return v
}

func checkCSV(t *testing.T, b *bytes.Buffer, header []string, want Result, row func(i int, rec []string) error) {
	t.Helper()
	recs, err := csv.NewReader(bytes.NewReader(b.Bytes())).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if strings.Join(recs[0], ",") != strings.Join(header, ",") || len(recs) != len(want.Segments)+1 {
		t.Fatalf("CSV header %v and %d records", recs[0], len(recs))
	}
	for i, rec := range recs[1:] {
		if err := row(i, rec); err != nil {
			t.Fatalf("CSV record %d: %v: %q", i+1, err, rec)
		}
	}
}

// sameCells compares a CSV record with the expected texts, counts, flags,
// numbers (empty for NaN, read back exactly) and decision, in that order.
func sameCells(rec, texts []string, counts []float64, flags []bool, nums []float64, reject bool) error {
	k := 0
	next := func() string { k++; return rec[k-1] }
	for _, s := range texts {
		if got := next(); got != s {
			return fmt.Errorf("cell %d: %q, want %q", k, got, s)
		}
	}
	for _, v := range append(counts, nums...) {
		c := next()
		if math.IsNaN(v) {
			if c != "" {
				return fmt.Errorf("cell %d: %q for a missing number", k, c)
			}
			continue
		}
		got, err := strconv.ParseFloat(c, 64)
		if err != nil || got != v {
			return fmt.Errorf("cell %d: %q, want %v", k, c, v)
		}
		if k == len(texts)+len(counts) {
			for _, f := range flags {
				if next() != strconv.FormatBool(f) {
					return fmt.Errorf("cell %d: flag", k)
				}
			}
		}
	}
	if next() != strconv.FormatBool(reject) || k != len(rec) {
		return fmt.Errorf("decision or record length")
	}
	return nil
}

// A value that a spreadsheet would read as a formula stays text: encoding/csv
// reads the cell back with a leading apostrophe; other values come back
// exactly, quoted where they must be.
func TestCSVValuesAreNotFormulas(t *testing.T) {
	values := []string{"=1+2", "+A1", "-2+3", "@SUM(A1:A2)", "\t=x", "=cmd|' /C calc'!A0", "plain", "a,b", `say "hi"`,
		"two\nlines", " padded ", "-", "é=ok"}
	rows := make([]proportions.BreakdownRow, len(values))
	for i, v := range values {
		rows[i] = proportions.BreakdownRow{Value: v, Counts: proportions.Counts{X1: 3, N1: 10, X2: 5, N2: 10}}
	}
	// NewBreakdown trims spaces; build by hand to keep " padded " and "\t=x".
	b := proportions.Breakdown{By: "region", First: "a", Second: "b", Event: "e", Rows: rows}
	var out buffers
	if _, err := Stream(context.Background(), BreakdownSource(b), out.outputs()); err != nil {
		t.Fatal(err)
	}
	for _, buf := range []*bytes.Buffer{&out.segCSV, &out.adjCSV} {
		recs, err := csv.NewReader(bytes.NewReader(buf.Bytes())).ReadAll()
		if err != nil {
			t.Fatal(err)
		}
		for i, v := range values {
			cell := recs[i+1][1]
			v = strings.TrimSpace(v) // the segment's value, as NewBreakdown would keep it
			switch {
			case strings.ContainsAny(v[:1], "=+-@\t"):
				if cell != "'"+v {
					t.Errorf("value %q: cell %q, want an apostrophe before it", v, cell)
				}
			case cell != v:
				t.Errorf("value %q: cell %q", v, cell)
			}
			if strings.ContainsAny(cell[:1], "=+-@\t\r") {
				t.Errorf("cell %q starts as a formula", cell)
			}
		}
	}
}

// The JSON strings are those encoding/json writes, for any text.
func TestJSONStringsLikeEncodingJSON(t *testing.T) {
	r := rand.New(rand.NewPCG(8, 8))
	texts := []string{"", "plain", "<script>alert(1)</script>", "a\"b\\c", "\x00\x1f\x7f", "bad \xff\xfe utf-8", "\u2028\u2029", "é 日本"}
	for range 2000 {
		n := r.IntN(12)
		var b []byte
		for range n {
			b = append(b, byte(r.IntN(256)))
		}
		texts = append(texts, string(b))
	}
	for _, s := range texts {
		want, _ := json.Marshal(s)
		if got := appendJSONString(nil, s); !bytes.Equal(got, want) {
			t.Fatalf("%q: %s, encoding/json %s", s, got, want)
		}
	}
}

func TestStreamErrors(t *testing.T) {
	good := []proportions.BreakdownRow{{Value: "a", Counts: proportions.Counts{X1: 1, N1: 5, X2: 2, N2: 5}}}
	seq := func(rows []proportions.BreakdownRow, err error) func() iter.Seq2[proportions.BreakdownRow, error] {
		return func() iter.Seq2[proportions.BreakdownRow, error] {
			return func(yield func(proportions.BreakdownRow, error) bool) {
				for _, r := range rows {
					if !yield(r, nil) {
						return
					}
				}
				if err != nil {
					yield(proportions.BreakdownRow{}, err)
				}
			}
		}
	}
	ctx := context.Background()
	bad := append(append([]proportions.BreakdownRow{}, good...), proportions.BreakdownRow{Value: "b", Counts: proportions.Counts{X1: 9, N1: 5, X2: 0, N2: 5}})
	readFail := errors.New("disk gone")
	calls := 0
	changing := func() iter.Seq2[proportions.BreakdownRow, error] {
		calls++
		rows := append([]proportions.BreakdownRow{}, good...)
		if calls > 1 {
			rows[0].Counts.X1 = 2
		}
		return seq(rows, nil)()
	}
	for _, k := range []struct {
		name string
		src  Source
		want error
	}{
		{"a row with more events than trials", Source{Rows: seq(bad, nil)}, proportions.ErrEventsExceedTrials},
		{"a blank value", Source{Rows: seq([]proportions.BreakdownRow{{Value: " ", Counts: good[0].Counts}}, nil)}, proportions.ErrEmptyInput},
		{"no rows", Source{Rows: seq(nil, nil)}, proportions.ErrEmptyInput},
		{"no source", Source{}, proportions.ErrEmptyInput},
		{"a failing reader", Source{Rows: seq(good, readFail)}, readFail},
		{"rows that change", Source{Rows: changing}, proportions.ErrRowsChanged},
	} {
		var out buffers
		_, err := Stream(ctx, k.src, out.outputs())
		if !errors.Is(err, k.want) {
			t.Errorf("%s: %v, want %v", k.name, err, k.want)
		}
	}
	_, err := Stream(ctx, Source{Rows: seq(good, nil)}, Outputs{SegmentsCSV: failingWriter{}})
	if err == nil || !strings.Contains(err.Error(), "CSV") {
		t.Errorf("a failing writer: %v", err)
	}
	cctx, cancel := context.WithCancel(ctx)
	cancel()
	if _, err := Stream(cctx, Source{Rows: seq(good, nil)}, Outputs{}); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: %v", err)
	}
}

type failingWriter struct{}

func (failingWriter) Write([]byte) (int, error) { return 0, io.ErrShortWrite }

// The stream stops soon after its context is cancelled, in the middle of
// a long source.
func TestStreamCancelsMidway(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	read := 0
	src := Source{Rows: func() iter.Seq2[proportions.BreakdownRow, error] {
		return func(yield func(proportions.BreakdownRow, error) bool) {
			for i := 0; ; i++ {
				read++
				if i == 20*chunk {
					cancel()
				}
				if !yield(proportions.BreakdownRow{Value: strconv.Itoa(i), Counts: proportions.Counts{X1: 3, N1: 9, X2: 4, N2: 9}}, nil) {
					return
				}
			}
		}
	}}
	if _, err := Stream(ctx, src, Outputs{SegmentsJSON: io.Discard}); !errors.Is(err, context.Canceled) {
		t.Fatalf("%v", err)
	}
	if read > 22*chunk+1 {
		t.Errorf("read %d rows after the cancel at %d", read, 20*chunk)
	}
}
