package proportions

// sharedWork keeps results that several registered tests of one analysis
// compute alike, so that the analysis computes them once: Fisher's test
// and its mid-p come from the same sums over the hypergeometric tables
// (see fisherLogPs), which at 10⁶ per group cost about as much as the rest
// of the analysis's tests together. Analyze gives its Hypothesis a fresh
// sharedWork; a nil *sharedWork (a Hypothesis built by a caller) computes
// every time. Entries are keyed by the table and the alternative, so a
// stale entry is never returned.
type sharedWork struct {
	fisherSet    bool
	fisherCounts Counts
	fisherAlt    Alternative
	fisherLogs   fisherPair
	fisherPX     float64
}

// fisher returns fisherLogPs(c, a), computed once per table and
// alternative when w is not nil.
func (w *sharedWork) fisher(c Counts, a Alternative) (fisherPair, float64) {
	if w == nil {
		return fisherLogPs(c, a)
	}
	if !w.fisherSet || w.fisherCounts != c || w.fisherAlt != a {
		w.fisherLogs, w.fisherPX = fisherLogPs(c, a)
		w.fisherSet, w.fisherCounts, w.fisherAlt = true, c, a
	}
	return w.fisherLogs, w.fisherPX
}
