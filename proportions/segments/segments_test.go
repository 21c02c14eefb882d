package segments

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// randomBreakdown invents n segments of a quality check (defective items
// on a new line and an old one, per batch), with some sparse segments and
// every tenth-or-so segment empty in one group when empties is set.
func randomBreakdown(t testing.TB, r *rand.Rand, n int, empties bool) proportions.Breakdown {
	t.Helper()
	rows := make([]proportions.BreakdownRow, n)
	for i := range rows {
		n1, n2 := 1+r.Int64N(300), 1+r.Int64N(300)
		if i%7 == 0 {
			n1, n2 = 1+r.Int64N(8), 1+r.Int64N(8)
		}
		c := proportions.Counts{X1: r.Int64N(n1 + 1), N1: n1, X2: r.Int64N(n2 + 1), N2: n2}
		if empties && r.IntN(10) == 0 {
			c.X2, c.N2 = 0, 0
		}
		rows[i] = proportions.BreakdownRow{Value: fmt.Sprintf("batch %d", i+1), Counts: c}
	}
	b, err := proportions.NewBreakdown("batch", proportions.Labels{First: "new line", Second: "old line", Event: "defective"}, rows)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// Each segment's numbers are those of proportions.Analyze on the same
// table, under several settings.
func TestSegmentsEqualAnalyzeHeadline(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 11))
	b := randomBreakdown(t, r, 300, true)
	for _, opts := range [][]proportions.Option{
		nil,
		{proportions.WithLevel(0.9)},
		{proportions.WithAlternative(proportions.Greater), proportions.WithLevel(0.975)},
		{proportions.WithNull(-0.1), proportions.WithAlternative(proportions.Less)},
	} {
		res, err := Analyze(b, WithAnalysis(opts...))
		if err != nil {
			t.Fatal(err)
		}
		for i, s := range res.Segments {
			if s.Empty {
				continue
			}
			c, err := b.Comparison(i)
			if err != nil {
				t.Fatal(err)
			}
			a, err := proportions.Analyze(c, opts...)
			if err != nil {
				t.Fatal(err)
			}
			if s.Lower != a.Interval.Lower || s.Upper != a.Interval.Upper || s.PValue != a.Test.PValue ||
				s.Statistic != a.Test.Statistic || s.Reject != a.Test.Reject || s.Difference != a.Difference {
				t.Fatalf("segment %d: %+v, Analyze: interval %v, test %v", s.Number, s, a.Interval, a.Test)
			}
			if res.IntervalLevel != a.Interval.Level || res.Level != a.Level {
				t.Fatalf("levels %v, %v; Analyze %v, %v", res.IntervalLevel, res.Level, a.Interval.Level, a.Level)
			}
			small := false
			for _, w := range a.Warnings {
				small = small || w.Code == proportions.WarnSmallExpected
			}
			if small && !s.Sparse {
				t.Fatalf("segment %d: Analyze warns of small expected counts but the segment is not flagged sparse", s.Number)
			}
		}
	}
}

// Empty segments are kept, flagged and left out of the adjustment; the m
// used is stated; the adjusted p-values are those of Adjust over the
// tested segments alone; the simultaneous intervals are Mee's at
// 1 − (1 − level)/m.
func TestEmptySegmentsAndAdjustment(t *testing.T) {
	r := rand.New(rand.NewPCG(2, 2))
	b := randomBreakdown(t, r, 200, true)
	for _, adj := range Adjustments() {
		res, err := Analyze(b, WithAdjustment(adj))
		if err != nil {
			t.Fatal(err)
		}
		var ps []float64
		empty := 0
		for i, s := range res.Segments {
			if s.Number != i+1 || s.Value != b.Rows[i].Value || s.Counts != b.Rows[i].Counts {
				t.Fatalf("segment %d does not match row %d", s.Number, i+1)
			}
			if s.Empty != b.Rows[i].Empty() {
				t.Fatalf("segment %d: empty %v", s.Number, s.Empty)
			}
			if s.Empty {
				empty++
				if !math.IsNaN(s.PValue) || !math.IsNaN(res.Adjusted[i].AdjustedPValue) || res.Adjusted[i].Reject {
					t.Fatalf("empty segment %d has numbers: %+v %+v", s.Number, s, res.Adjusted[i])
				}
				continue
			}
			ps = append(ps, s.PValue)
		}
		if empty == 0 || res.EmptyCount != empty || res.Tested != len(ps) || res.SegmentCount != len(b.Rows) {
			t.Fatalf("counts: %d empty, %d tested of %d; summary %+v", empty, len(ps), len(b.Rows), res.Summary)
		}
		if res.Adjustment != adj || !strings.Contains(res.String(), adj.Name()) ||
			!strings.Contains(res.String(), fmt.Sprintf("m = %d", len(ps))) {
			t.Fatalf("the text does not state the adjustment and m:\n%s", res)
		}
		if !strings.Contains(strings.Join(res.Notes, " "), fmt.Sprintf("m = %d", len(ps))) {
			t.Fatalf("no note states the m used: %v", res.Notes)
		}
		want, _ := Adjust(ps, adj)
		simLevel := 1 - 0.05/float64(len(ps))
		k := 0
		for i, s := range res.Segments {
			if s.Empty {
				continue
			}
			a := res.Adjusted[i]
			if a.Tested != len(ps) || a.Adjustment != adj {
				t.Fatalf("segment %d: the record says m = %d by %s; want %d by %s", s.Number, a.Tested, a.Adjustment, len(ps), adj)
			}
			if a.AdjustedPValue != want[k] || a.Reject != (want[k] <= 0.05) {
				t.Fatalf("segment %d: adjusted %v, Adjust gives %v", s.Number, a.AdjustedPValue, want[k])
			}
			k++
			if i%20 == 1 {
				iv, err := proportions.Mee.Interval(s.Counts, simLevel)
				if err != nil {
					t.Fatal(err)
				}
				if iv.Lower != a.SimultaneousLower || iv.Upper != a.SimultaneousUpper {
					t.Fatalf("segment %d: simultaneous %v to %v, Mee at %v: %v", s.Number, a.SimultaneousLower, a.SimultaneousUpper, simLevel, iv)
				}
				if a.SimultaneousLower > s.Lower || a.SimultaneousUpper < s.Upper {
					t.Fatalf("segment %d: the simultaneous interval is narrower than the headline", s.Number)
				}
			}
		}
		if math.Abs(res.SimultaneousLevel-simLevel) > 1e-15 {
			t.Fatalf("simultaneous level %v, want %v", res.SimultaneousLevel, simLevel)
		}
	}
}

func TestSparseSegmentsFlagged(t *testing.T) {
	rows := []proportions.BreakdownRow{
		{Value: "big", Counts: proportions.Counts{X1: 40, N1: 100, X2: 30, N2: 100}},
		{Value: "rare event", Counts: proportions.Counts{X1: 1, N1: 200, X2: 3, N2: 200}}, // expected 2 < 5
		{Value: "few units", Counts: proportions.Counts{X1: 4, N1: 8, X2: 50, N2: 100}},   // 8 trials < 10, expected ≥ 5? 8·54/108 = 4
		{Value: "nine", Counts: proportions.Counts{X1: 100, N1: 200, X2: 5, N2: 9}},       // 9 trials; expected 4.4
	}
	b, err := proportions.NewBreakdown("shift", proportions.Labels{}, rows)
	if err != nil {
		t.Fatal(err)
	}
	res, err := Analyze(b)
	if err != nil {
		t.Fatal(err)
	}
	want := []bool{false, true, true, true}
	for i, s := range res.Segments {
		if s.Sparse != want[i] {
			t.Errorf("%s: sparse %v, want %v (smallest expected %v)", s.Value, s.Sparse, want[i], s.SmallestExpected)
		}
	}
	if res.SparseCount != 3 || !strings.Contains(strings.Join(res.Notes, " "), "3 segments are sparse") {
		t.Errorf("sparse count %d, notes %v", res.SparseCount, res.Notes)
	}
	// The trials rule alone: 60 of 120 vs 4 of 9 has expected counts above 4 …
	rows = []proportions.BreakdownRow{{Value: "a", Counts: proportions.Counts{X1: 60, N1: 120, X2: 5, N2: 12}}}
	b, _ = proportions.NewBreakdown("", proportions.Labels{}, rows)
	for _, k := range []struct {
		min  int64
		want bool
	}{{0, false}, {12, false}, {13, true}} {
		res, err := Analyze(b, WithMinTrials(k.min))
		if err != nil {
			t.Fatal(err)
		}
		if res.Segments[0].Sparse != k.want || res.MinTrials != k.min {
			t.Errorf("min trials %d: sparse %v, want %v", k.min, res.Segments[0].Sparse, k.want)
		}
	}
	if _, err := Analyze(b, WithMinTrials(-1)); !errors.Is(err, proportions.ErrNegativeCount) {
		t.Errorf("negative minimum: %v", err)
	}
}

func TestAnalyzeRejectsBadInput(t *testing.T) {
	b := proportions.Breakdown{By: "plot", Rows: []proportions.BreakdownRow{{Value: "p1", Counts: proportions.Counts{X1: 5, N1: 3, X2: 1, N2: 4}}}}
	if _, err := Analyze(b); !errors.Is(err, proportions.ErrEventsExceedTrials) || !strings.Contains(err.Error(), "p1") {
		t.Errorf("a row built by hand with 5 of 3: %v", err)
	}
	good, _ := proportions.NewBreakdown("plot", proportions.Labels{}, []proportions.BreakdownRow{{Value: "p1", Counts: proportions.Counts{X1: 1, N1: 3, X2: 1, N2: 4}}})
	for _, k := range []struct {
		opt  Option
		want error
	}{
		{WithAdjustment(Adjustment(-1)), proportions.ErrAdjustment},
		{WithAnalysis(proportions.WithLevel(1.5)), proportions.ErrLevel},
		{WithAnalysis(proportions.WithNull(1)), proportions.ErrNull},
		{WithAnalysis(proportions.WithAlternative(7)), proportions.ErrAlternative},
		{WithAnalysis(proportions.WithLevel(0.4), proportions.WithAlternative(proportions.Greater)), proportions.ErrLevel},
	} {
		if _, err := Analyze(good, k.opt); !errors.Is(err, k.want) {
			t.Errorf("want %v, got %v", k.want, err)
		}
	}
	if _, err := Analyze(proportions.Breakdown{By: "plot"}); !errors.Is(err, proportions.ErrEmptyInput) {
		t.Errorf("no rows: %v", err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := AnalyzeContext(ctx, good); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: %v", err)
	}
}

// TestAnalyzeRejectsRepeatedValues: a breakdown built by hand that gives
// one value twice is refused as NewBreakdown refuses it, naming the first
// repetition (rows 2 and 4, not 4 and 5 or 1 and 3), with surrounding
// spaces ignored as NewBreakdown ignores them; it was analysed with the
// segment counted twice in the adjustment.
func TestAnalyzeRejectsRepeatedValues(t *testing.T) {
	row := func(v string) proportions.BreakdownRow {
		return proportions.BreakdownRow{Value: v, Counts: proportions.Counts{X1: 3, N1: 10, X2: 2, N2: 10}}
	}
	b := proportions.Breakdown{By: "plot", Rows: []proportions.BreakdownRow{row("p1"), row("p2"), row("p3"), row("p2 "), row("p2"), row("p1")}}
	_, err := Analyze(b)
	if !errors.Is(err, proportions.ErrDuplicateValue) || !strings.Contains(err.Error(), `segments 2 and 4: "p2"`) {
		t.Errorf("a value given twice: %v, want ErrDuplicateValue naming segments 2 and 4", err)
	}
	b.Rows = []proportions.BreakdownRow{row("p1"), row("p2"), row("p3")}
	if _, err := Analyze(b); err != nil {
		t.Errorf("distinct values: %v", err)
	}
}

// A breakdown with no tested segment says so and has no simultaneous
// level (null in JSON).
func TestAllSegmentsEmpty(t *testing.T) {
	b, _ := proportions.NewBreakdown("plot", proportions.Labels{}, []proportions.BreakdownRow{
		{Value: "p1", Counts: proportions.Counts{X1: 1, N1: 3}}, {Value: "p2", Counts: proportions.Counts{X2: 2, N2: 3}}})
	res, err := Analyze(b)
	if err != nil {
		t.Fatal(err)
	}
	if res.Tested != 0 || res.EmptyCount != 2 || !math.IsNaN(res.SimultaneousLevel) || !strings.Contains(res.String(), "nothing was tested") {
		t.Errorf("%+v\n%s", res.Summary, res)
	}
	raw, err := json.Marshal(res)
	if err != nil || !strings.Contains(string(raw), `"simultaneous_level":null`) {
		t.Errorf("%s %v", raw, err)
	}
	var back Summary
	if err := json.Unmarshal(raw, &back); err != nil || !math.IsNaN(back.SimultaneousLevel) || back.EmptyCount != 2 || len(back.Notes) != 2 {
		t.Errorf("the summary reads back as %+v (%v)", back, err)
	}
}

func TestAdjustmentNames(t *testing.T) {
	for _, a := range Adjustments() {
		raw, err := json.Marshal(a)
		if err != nil {
			t.Fatal(err)
		}
		var back Adjustment
		if err := json.Unmarshal(raw, &back); err != nil || back != a {
			t.Errorf("%s: round trip %s → %v (%v)", a, raw, back, err)
		}
		if a.Name() == "" || a.Controls() == "" {
			t.Errorf("%s: no name or error rate", a)
		}
	}
	var a Adjustment
	if err := json.Unmarshal([]byte(`"bh"`), &a); !errors.Is(err, proportions.ErrAdjustment) {
		t.Errorf("unknown key: %v", err)
	}
}

// Among segments whose adjusted p-values tie (Holm's reach 1 for most
// segments), the order by adjusted p-value lists the smaller p-value before
// adjustment first, not the earlier row. The rows are built so that row
// order and p-value order disagree: the later rows differ more.
func TestByAdjustedPBreaksTiesByPValue(t *testing.T) {
	var rows []proportions.BreakdownRow
	for k := range 6 {
		rows = append(rows, proportions.BreakdownRow{Value: fmt.Sprintf("row %d", k+1),
			Counts: proportions.Counts{X1: int64(20 + k), N1: 100, X2: 20, N2: 100}})
	}
	b, err := proportions.NewBreakdown("row", proportions.Labels{}, rows)
	if err != nil {
		t.Fatal(err)
	}
	res, err := Analyze(b, WithAdjustment(Holm))
	if err != nil {
		t.Fatal(err)
	}
	order := res.ByAdjustedP()
	for j := 1; j < len(order); j++ {
		prev, cur := order[j-1], order[j]
		if res.Adjusted[prev].AdjustedPValue == res.Adjusted[cur].AdjustedPValue && res.Segments[prev].PValue > res.Segments[cur].PValue {
			t.Errorf("tied at adjusted p %v: %s (p %v) before %s (p %v)", res.Adjusted[cur].AdjustedPValue,
				res.Segments[prev].Value, res.Segments[prev].PValue, res.Segments[cur].Value, res.Segments[cur].PValue)
		}
	}
	if res.Adjusted[order[0]].AdjustedPValue != 1 || res.Adjusted[order[len(order)-1]].AdjustedPValue != 1 {
		t.Fatalf("the rows were meant to tie at an adjusted p-value of 1: %v", res.Adjusted)
	}
}

// The orders the card offers sort what they say.
func TestOrders(t *testing.T) {
	r := rand.New(rand.NewPCG(9, 9))
	res, err := Analyze(randomBreakdown(t, r, 120, true))
	if err != nil {
		t.Fatal(err)
	}
	for name, k := range map[string]struct {
		order []int
		key   func(i int) float64
	}{
		"adjusted p": {res.ByAdjustedP(), func(i int) float64 { return res.Adjusted[i].AdjustedPValue }},
		"effect":     {res.ByEffect(), func(i int) float64 { return -math.Abs(res.Segments[i].Difference) }},
		"size":       {res.BySize(), func(i int) float64 { c := res.Segments[i].Counts; return -float64(c.N1 + c.N2) }},
	} {
		if len(k.order) != len(res.Segments) {
			t.Fatalf("%s: %d positions", name, len(k.order))
		}
		seenEmpty := false
		for j, i := range k.order {
			if res.Segments[i].Empty {
				seenEmpty = true
				continue
			}
			if seenEmpty {
				t.Fatalf("%s: a tested segment after an empty one", name)
			}
			if j > 0 && k.key(k.order[j-1]) > k.key(i) {
				t.Fatalf("%s: not sorted at %d", name, j)
			}
		}
	}
}
