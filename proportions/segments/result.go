package segments

import (
	"context"
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/propscope/propscope/internal/workpool"
	"github.com/propscope/propscope/proportions"
)

// Summary states what a per-segment analysis did: the labels, the
// headline settings, the number of segments, how many entered the
// adjustment (Tested, the m of the formulas) and which adjustment. Every
// output carries it: Result embeds it, Stream returns it.
type Summary struct {
	By     string `json:"by"`
	First  string `json:"first"`
	Second string `json:"second"`
	Event  string `json:"event"`
	// Level is the tests' level (α = 1 − Level); IntervalLevel that of the
	// headline intervals (1 − 2α for a one-sided alternative, as Analyze).
	Level         float64                 `json:"level"`
	IntervalLevel float64                 `json:"interval_level"`
	Null          float64                 `json:"null"`
	Alternative   proportions.Alternative `json:"alternative"`
	// IntervalMethod and TestMethod are the registry keys of the headline
	// pair.
	IntervalMethod string     `json:"interval_method"`
	TestMethod     string     `json:"test_method"`
	Adjustment     Adjustment `json:"adjustment"`
	// SegmentCount is every row read; Tested the rows with trials in both
	// groups, the m of the adjustment; EmptyCount the others.
	SegmentCount int `json:"segment_count"`
	Tested       int `json:"tested"`
	EmptyCount   int `json:"empty_count"`
	SparseCount  int `json:"sparse_count"`
	// Rejected counts the segments whose adjusted p-value is at most α.
	Rejected int `json:"rejected"`
	// SimultaneousLevel is the Bonferroni level 1 − (1 − IntervalLevel)/m
	// of the simultaneous intervals; NaN (null) when no segment was tested.
	SimultaneousLevel float64 `json:"simultaneous_level"`
	MinTrials         int64   `json:"min_trials"`
	// Notes say in words what was left out of the adjustment and why, and
	// what was flagged.
	Notes   []string `json:"notes"`
	Caution string   `json:"caution"`
}

// Result is a per-segment analysis held in memory: the summary, every
// segment in the breakdown's order and, in the same order, what the
// adjustment adds to each.
type Result struct {
	Summary
	Segments []Segment
	Adjusted []Adjusted
}

// Analyze analyses every row of the breakdown (see AnalyzeContext).
func Analyze(b proportions.Breakdown, opts ...Option) (Result, error) {
	return AnalyzeContext(context.Background(), b, opts...)
}

// AnalyzeContext runs the headline analysis of every segment of b on all
// cores, adjusts the p-values of the segments with trials in both groups
// and computes their simultaneous intervals. It stops with ctx's error
// when ctx ends (checked every few thousand segments). Options: see
// WithAdjustment, WithMinTrials and WithAnalysis. Errors wrap a sentinel
// of proportions (ErrLevel, ErrNull, ErrAlternative, ErrAdjustment,
// ErrNegativeCount, or a row's own error for a breakdown built by hand,
// ErrDuplicateValue for a value given twice).
func AnalyzeContext(ctx context.Context, b proportions.Breakdown, opts ...Option) (Result, error) {
	s, err := newSettings(opts)
	if err != nil {
		return Result{}, err
	}
	a, err := newAnalyzer(s)
	if err != nil {
		return Result{}, err
	}
	if len(b.Rows) == 0 {
		return Result{}, fmt.Errorf("segments: %w; the breakdown has no rows", proportions.ErrEmptyInput)
	}
	for i, r := range b.Rows { // a breakdown built by hand skipped NewBreakdown's checks
		if err := checkRow(i+1, r); err != nil {
			return Result{}, err
		}
	}
	if err := checkUnique(b.By, b.Rows); err != nil {
		return Result{}, err
	}
	res := Result{Summary: a.summary(b.By, b.Labels(), s), Segments: make([]Segment, len(b.Rows))}
	err = parallelChunks(ctx, len(b.Rows), func(lo, hi int) {
		for i := lo; i < hi; i++ {
			res.Segments[i] = a.segment(i+1, b.Rows[i])
		}
	})
	if err != nil {
		return Result{}, err
	}
	var t tally
	pairs := make([]pValue, 0, len(b.Rows))
	for _, sg := range res.Segments {
		t.add(sg)
		if !sg.Empty {
			pairs = append(pairs, pValue{sg.PValue, sg.Number - 1})
		}
	}
	adjusted, simConf, err := res.Summary.finish(t, pairs, len(b.Rows), a.alpha)
	if err != nil {
		return Result{}, err
	}
	res.Adjusted = make([]Adjusted, len(b.Rows))
	err = parallelChunks(ctx, len(b.Rows), func(lo, hi int) {
		for i := lo; i < hi; i++ {
			res.Adjusted[i] = a.adjusted(i+1, b.Rows[i], adjusted[i], simConf, res.Summary)
		}
	})
	if err != nil {
		return Result{}, err
	}
	return res, nil
}

// adjusted builds a segment's adjusted record from its adjusted p-value
// (NaN when empty).
func (a *analyzer) adjusted(number int, r proportions.BreakdownRow, p float64, conf proportions.Confidence, s Summary) Adjusted {
	lo, hi := a.simultaneous(r, conf)
	return Adjusted{Number: number, Value: strings.TrimSpace(r.Value), Adjustment: s.Adjustment, Tested: s.Tested, AdjustedPValue: p,
		SimultaneousLower: lo, SimultaneousUpper: hi, Reject: p <= a.alpha}
}

// summary fills what is known before any row is read.
func (a *analyzer) summary(by string, labels proportions.Labels, s settings) Summary {
	if strings.TrimSpace(by) == "" {
		by = proportions.DefaultBreakdownColumn
	}
	l := labels
	for _, f := range []*string{&l.First, &l.Second, &l.Event} {
		*f = strings.TrimSpace(*f)
	}
	if l.First == "" {
		l.First = proportions.DefaultFirstLabel
	}
	if l.Second == "" {
		l.Second = proportions.DefaultSecondLabel
	}
	if l.Event == "" {
		l.Event = proportions.DefaultEventName
	}
	return Summary{By: by, First: l.First, Second: l.Second, Event: l.Event,
		Level: a.hyp.Conf.Level, IntervalLevel: a.ivConf.Level, Null: a.hyp.Null, Alternative: a.hyp.Alternative,
		IntervalMethod: a.interval.Key, TestMethod: a.test.Key, Adjustment: s.adjustment, MinTrials: s.minTrials,
		SimultaneousLevel: math.NaN(), Caution: proportions.Caution}
}

// tally counts segments as they are analysed, and keeps the first few
// numbers of the empty and sparse ones for the notes (bounded, so a
// stream stays flat).
type tally struct {
	total, empty, sparse  int
	emptyNums, sparseNums []int
}

const notedNumbers = 10

func (t *tally) add(s Segment) {
	t.total++
	switch {
	case s.Empty:
		t.empty++
		if len(t.emptyNums) < notedNumbers {
			t.emptyNums = append(t.emptyNums, s.Number)
		}
	case s.Sparse:
		t.sparse++
		if len(t.sparseNums) < notedNumbers {
			t.sparseNums = append(t.sparseNums, s.Number)
		}
	}
}

// finish adjusts the p-values (pairs of the tested segments, any order;
// reused and sorted in place), records the counts and notes, and returns
// the adjusted p-values by row position (NaN for the empty rows) with the
// confidence of the simultaneous intervals.
func (s *Summary) finish(t tally, pairs []pValue, total int, alpha float64) ([]float64, proportions.Confidence, error) {
	s.SegmentCount, s.Tested, s.EmptyCount, s.SparseCount = t.total, len(pairs), t.empty, t.sparse
	s.Notes = notes(t, s.By, s.MinTrials)
	adjustPairs(pairs, s.Adjustment)
	adjusted := make([]float64, total)
	for i := range adjusted {
		adjusted[i] = math.NaN()
	}
	s.Rejected = 0
	for _, q := range pairs {
		adjusted[q.index] = q.p
		if q.p <= alpha {
			s.Rejected++
		}
	}
	if len(pairs) == 0 {
		s.Notes = append(s.Notes, "No segment has trials in both groups: nothing was tested or adjusted.")
		return adjusted, proportions.Confidence{}, nil
	}
	s.SimultaneousLevel = 1 - (1-s.IntervalLevel)/float64(len(pairs))
	conf, err := proportions.NewConfidence(s.SimultaneousLevel)
	if err != nil {
		return nil, conf, fmt.Errorf("simultaneous intervals over %d segments: %w", len(pairs), err)
	}
	return adjusted, conf, nil
}

// notes says what was left out of the adjustment and what was flagged.
func notes(t tally, by string, minTrials int64) []string {
	out := make([]string, 0, 2)
	if t.empty > 0 {
		out = append(out, fmt.Sprintf("%d of %d segments %s a group with no trials (%s %s): kept and flagged, "+
			"not analysed, and left out of the adjustment, which counts m = %d segments.",
			t.empty, t.total, plural(t.empty, "has", "have"), by, listNumbers(t.emptyNums, t.empty), t.total-t.empty))
	}
	if t.sparse > 0 {
		out = append(out, fmt.Sprintf("%d %s sparse (%s %s): a smallest expected count below 5 or fewer than %d "+
			"trials in a group, where the score interval and test may mislead; read %s with care.",
			t.sparse, plural(t.sparse, "segment is", "segments are"), by, listNumbers(t.sparseNums, t.sparse), minTrials,
			plural(t.sparse, "it", "them")))
	}
	return out
}

func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

func listNumbers(nums []int, count int) string {
	parts := make([]string, len(nums))
	for i, n := range nums {
		parts[i] = strconv.Itoa(n)
	}
	s := "number " + strings.Join(parts, ", ")
	if count > 1 {
		s = "numbers " + strings.Join(parts, ", ")
	}
	if count > len(nums) {
		s += fmt.Sprintf(" and %d more", count-len(nums))
	}
	return s
}

// chunk is how many segments a worker takes at a time: large enough that
// handing out work costs nothing, small enough that a cancel is seen
// within milliseconds (a segment costs about a microsecond).
const chunk = 4096

// parallelChunks calls work on [lo, hi) chunks of [0, n) on every core
// and returns ctx's error if ctx ended before every chunk was done.
func parallelChunks(ctx context.Context, n int, work func(lo, hi int)) error {
	chunks := (n + chunk - 1) / chunk
	if err := workpool.Run(ctx, 0, chunks, func(i int) error {
		work(i*chunk, min((i+1)*chunk, n))
		return nil
	}); err != nil {
		return err
	}
	return ctx.Err()
}
