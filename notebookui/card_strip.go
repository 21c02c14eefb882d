package notebookui

import (
	"fmt"
	"math"
	"strconv"

	"github.com/propscope/propscope/proportions"
)

// strip is the small picture under the headline: the interval for the
// difference as a bar, the estimate as a dot and the null value as a
// dashed line, on one axis in percentage points. It repeats what the text
// says (its aria-label spells it out), so nothing rests on the picture or
// its colour.
type strip struct {
	Label string // accessible description
	// X1, X2, XEst and XNull are positions in percent of the strip's
	// width: the strip spans the card, and its text keeps its size in
	// pixels at any width (no viewBox scales it down on a phone).
	X1, X2, XEst, XNull            string
	LowerText, UpperText, NullText string
	// LowerAnchor and UpperAnchor keep limit labels apart when the
	// interval is narrow.
	LowerAnchor, UpperAnchor string
}

// stripLeft and stripRight are the ends of the axis, in percent of the
// strip's width, leaving room for the end labels.
const stripLeft, stripRight = 10.0, 90.0

// stripNarrow is the interval's length, in percent of the width, below
// which its two limit labels go outside its ends rather than centred on
// them, so that they never overlap even on a 218-pixel screen.
const stripNarrow = 30.0

func stripOf(a proportions.Analysis) *strip {
	lo, hi, est, null := a.Interval.Lower, a.Interval.Upper, a.Difference, a.Null
	if a.Interval.MethodName == "" || anyNaN(lo, hi, est, null) {
		return nil
	}
	min, max := math.Min(lo, null), math.Max(hi, null)
	pad := math.Max(0.08*(max-min), 0.01)
	min, max = min-pad, max+pad
	x := func(v float64) float64 { return stripLeft + (v-min)/(max-min)*(stripRight-stripLeft) }
	s := &strip{
		Label: fmt.Sprintf("Picture of the %s interval: from %s to %s percentage points, estimate %s, with the null value %s marked.",
			levelText(a.Interval.Level), points(lo, 1), points(hi, 1), points(est, 1), points(null, 1)),
		X1: coord(x(lo)), X2: coord(x(hi)), XEst: coord(x(est)), XNull: coord(x(null)),
		LowerText: points(lo, 1), UpperText: points(hi, 1), NullText: points(null, 1),
		LowerAnchor: "middle", UpperAnchor: "middle",
	}
	if x(hi)-x(lo) < stripNarrow {
		s.LowerAnchor, s.UpperAnchor = "end", "start"
	}
	return s
}

func coord(v float64) string { return strconv.FormatFloat(v, 'f', 2, 64) + "%" }

func anyNaN(vs ...float64) bool {
	for _, v := range vs {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return true
		}
	}
	return false
}
