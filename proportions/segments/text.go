package segments

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/propscope/propscope/proportions"
)

// percent prints a level as "95%" or, for a simultaneous level, with the
// digits it needs ("99.99996%").
func percent(level float64) string {
	decimals := 1
	if miss := 100 * (1 - level); miss > 0 {
		decimals = max(decimals, int(math.Ceil(-math.Log10(miss)))+1)
	}
	return strings.TrimRight(strings.TrimRight(strconv.FormatFloat(100*level, 'f', decimals, 64), "0"), ".") + "%"
}

// Lines returns the summary as plain sentences: what was compared, the
// number of segments and m, the adjustment, the simultaneous level, the
// notes and the caution.
func (s Summary) Lines() []string {
	out := []string{
		fmt.Sprintf("Segments: %s, %s vs %s, by %s: %d segments, %d tested (m), %d empty, %d sparse.",
			s.Event, s.First, s.Second, s.By, s.SegmentCount, s.Tested, s.EmptyCount, s.SparseCount),
		fmt.Sprintf("Each segment: Mee's %s score interval and the Farrington–Manning score test (%s, null difference %s), at %s.",
			percent(s.IntervalLevel), s.Alternative, proportions.FormatValue(s.Null), strconv.FormatFloat(100*(1-s.Level), 'g', 6, 64)+"% significance"),
		fmt.Sprintf("Adjusted for multiplicity by %s (controls the %s) over m = %d segments: %d %s at %s after adjustment.",
			s.Adjustment.Name(), s.Adjustment.Controls(), s.Tested, s.Rejected, plural(s.Rejected, "rejects", "reject"),
			strconv.FormatFloat(100*(1-s.Level), 'g', 6, 64)+"%"),
	}
	if !math.IsNaN(s.SimultaneousLevel) {
		out = append(out, fmt.Sprintf("Simultaneous intervals at %s (Bonferroni: 1 − %s/%d), so that all %d hold together with at least %s.",
			percent(s.SimultaneousLevel), strconv.FormatFloat(1-s.IntervalLevel, 'g', 6, 64), s.Tested, s.Tested, percent(s.IntervalLevel)))
	}
	out = append(out, s.Notes...)
	return append(out, s.cautionLine())
}

func (s Summary) cautionLine() string { return "Before acting on this: " + s.Caution }

// String prints the summary's lines.
func (s Summary) String() string { return strings.Join(s.Lines(), "\n") }

// shownSegments is how many segments String lists.
const shownSegments = 20

// String prints the summary and the segments with the smallest adjusted
// p-values (at most 20), each with its estimate, headline interval,
// adjusted p-value and simultaneous interval.
func (r Result) String() string {
	var b strings.Builder
	lines := r.Summary.Lines()
	b.WriteString(strings.Join(lines[:len(lines)-1], "\n")) // the caution goes last
	order := r.ByAdjustedP()
	if len(order) > shownSegments {
		fmt.Fprintf(&b, "\nThe %d segments with the smallest adjusted p-values of %d:", shownSegments, len(order))
		order = order[:shownSegments]
	} else {
		b.WriteString("\nSegments by adjusted p-value:")
	}
	for _, i := range order {
		s, a := r.Segments[i], r.Adjusted[i]
		fmt.Fprintf(&b, "\n  %d %s: %s", s.Number, s.Value, segmentLine(s, a))
	}
	b.WriteString("\n" + r.Summary.cautionLine())
	return b.String()
}

func segmentLine(s Segment, a Adjusted) string {
	counts := fmt.Sprintf("%d/%d vs %d/%d", s.Counts.X1, s.Counts.N1, s.Counts.X2, s.Counts.N2)
	if s.Empty {
		return counts + ", empty: a group has no trials (not tested)"
	}
	line := fmt.Sprintf("%s, difference %s (%s to %s), %s, adjusted %s, simultaneous %s to %s",
		counts, proportions.FormatValue(s.Difference), proportions.FormatValue(s.Lower), proportions.FormatValue(s.Upper),
		proportions.PValueClause(s.PValue), proportions.PValueClause(a.AdjustedPValue),
		proportions.FormatValue(a.SimultaneousLower), proportions.FormatValue(a.SimultaneousUpper))
	if s.Sparse {
		line += ", sparse"
	}
	return line
}

// ByAdjustedP returns the positions of the segments ordered by adjusted
// p-value, smallest first, ties by the p-value before adjustment, the
// empty segments last (in their order). The tie-break matters: Holm's and
// Hochberg's adjusted values reach 1 for most segments of a large
// breakdown, and a list or chart of "the smallest adjusted p-values" would
// otherwise show those segments in row order rather than the closest
// calls first.
func (r Result) ByAdjustedP() []int {
	return r.order(func(i, j int) int {
		return cmp.Or(cmp.Compare(r.Adjusted[i].AdjustedPValue, r.Adjusted[j].AdjustedPValue), // NaN sorts first in cmp.Compare
			cmp.Compare(r.Segments[i].PValue, r.Segments[j].PValue))
	})
}

// ByEffect returns the positions of the segments ordered by the size of
// the difference |p1 − p2|, largest first, the empty segments last.
func (r Result) ByEffect() []int {
	return r.order(func(i, j int) int {
		return cmp.Compare(math.Abs(r.Segments[j].Difference), math.Abs(r.Segments[i].Difference))
	})
}

// BySize returns the positions of the segments ordered by their trials
// n1 + n2, largest first, the empty segments last.
func (r Result) BySize() []int {
	return r.order(func(i, j int) int {
		si, sj := r.Segments[i].Counts, r.Segments[j].Counts
		return cmp.Compare(sj.N1+sj.N2, si.N1+si.N2)
	})
}

// order sorts the tested segments' positions by less (ties by position)
// and puts the empty ones after them.
func (r Result) order(compare func(i, j int) int) []int {
	tested := make([]int, 0, len(r.Segments))
	var empty []int
	for i, s := range r.Segments {
		if s.Empty {
			empty = append(empty, i)
		} else {
			tested = append(tested, i)
		}
	}
	slices.SortStableFunc(tested, compare)
	return append(tested, empty...)
}
