package notebookui

import (
	"fmt"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/segments"
)

// SegmentsForestChart draws the segments of a per-segment analysis with
// the smallest adjusted p-values (at most top of them, DefaultSegmentsShown
// when top is 0) as a forest chart: each segment's difference with its
// simultaneous interval, because segments picked for their small p-values
// would make their own intervals look surer than they are; the
// simultaneous intervals hold together whichever are picked. The
// subtitle states the number of segments, m and the adjustment; each row's
// note gives its adjusted p-value and flags a sparse segment. There is no
// summary diamond: the segments answer separate questions.
//
// Options read: WithHeight.
func SegmentsForestChart(r segments.Result, top int, options ...ChartOption) (*Chart, error) {
	if top <= 0 {
		top = DefaultSegmentsShown
	}
	s := r.Summary
	f := Forest{
		Title: fmt.Sprintf("Difference in share %s by %s: the smallest adjusted p-values", s.Event, s.By),
		Subtitle: fmt.Sprintf("%s − %s; %d segments, m = %d tested, adjusted by %s; simultaneous %s intervals (Bonferroni)",
			s.First, s.Second, s.SegmentCount, s.Tested, s.Adjustment.Name(), simultaneousLevelText(s.SimultaneousLevel)),
		Effect: fmt.Sprintf("difference in share %s, %s − %s", s.Event, s.First, s.Second),
		Scale:  proportions.Difference, // the level is in the subtitle: ForestChart's caption would round it to 100%
	}
	for _, i := range r.ByAdjustedP() {
		sg, a := r.Segments[i], r.Adjusted[i]
		if len(f.Rows) == top || sg.Empty { // the empty segments come last: nothing to draw
			break
		}
		note := "adjusted " + pClause(a.AdjustedPValue)
		if sg.Sparse {
			note += "; sparse: read with care"
		}
		f.Rows = append(f.Rows, ForestRow{Label: sg.Value, Estimate: sg.Difference, Lower: a.SimultaneousLower,
			Upper: a.SimultaneousUpper, Note: note})
	}
	if len(f.Rows) < s.Tested {
		f.Notes = append(f.Notes, fmt.Sprintf("The %d of %d tested segments with the smallest adjusted p-values; the others are in the result.",
			len(f.Rows), s.Tested))
	}
	if s.EmptyCount > 0 {
		what := "segments with a group without trials are"
		if s.EmptyCount == 1 {
			what = "segment with a group without trials is"
		}
		f.Notes = append(f.Notes, fmt.Sprintf("%d %s not drawn.", s.EmptyCount, what))
	}
	return ForestChart(f, options...)
}
