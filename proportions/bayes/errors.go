package bayes

import "errors"

// Sentinel errors of the Bayesian analysis. Bad counts, levels and margins
// return the sentinels of package proportions (ErrNegativeCount, ErrLevel,
// ErrMargin, ErrBetter, ...); these cover what only this package takes.
var (
	// ErrPrior: a prior's shapes are not finite and above 0, or its mean
	// is not strictly between 0 and 1, or its strength is not above 0.
	ErrPrior = errors.New("prior outside its allowed range")
	// ErrRegion: an equivalence region is not an interval lower < upper
	// inside (−1, 1).
	ErrRegion = errors.New("equivalence region outside its allowed range")
	// ErrBatch: a future batch size is not between 1 and MaxBatch.
	ErrBatch = errors.New("batch size outside its allowed range")
)
