package proportions

import "errors"

// Sentinel errors. Every error returned by this package for bad input wraps
// exactly one of these, with a message that says what was wrong and what is
// allowed; test for them with errors.Is.
var (
	// ErrNegativeCount: a count of events or trials is below zero.
	ErrNegativeCount = errors.New("negative count")
	// ErrEventsExceedTrials: a group has more events than trials.
	ErrEventsExceedTrials = errors.New("events exceed trials")
	// ErrNoTrials: a group has zero trials, so its proportion is undefined.
	ErrNoTrials = errors.New("group has no trials")
	// ErrGroupCount: the data hold other than exactly two groups.
	ErrGroupCount = errors.New("need exactly two groups")
	// ErrUnknownGroup: a named group does not occur in the data.
	ErrUnknownGroup = errors.New("unknown group")
	// ErrOutcomeValue: an outcome value is neither the event nor a non-event.
	ErrOutcomeValue = errors.New("outcome is neither event nor non-event")
	// ErrEmptyInput: the input holds no data rows.
	ErrEmptyInput = errors.New("empty input")
	// ErrMissingColumn: a named column is not in the CSV header.
	ErrMissingColumn = errors.New("missing column")
	// ErrDuplicateValue: a value of a breakdown column (a stratum, a
	// segment, a cluster) appears in more than one row.
	ErrDuplicateValue = errors.New("value appears more than once")
	// ErrMalformedRow: a CSV row cannot be read (its line number is in the message).
	ErrMalformedRow = errors.New("malformed row")
	// ErrLevel: a confidence level is outside [MinLevel, MaxLevel], a
	// range inside (0, 1) where every method computes correct limits.
	ErrLevel = errors.New("level outside the allowed range")
	// ErrNull: a null value lies outside the allowed range for its scale:
	// (−1, 1) for a difference, (0, ∞) for a ratio or odds ratio.
	ErrNull = errors.New("null value outside the allowed range")
	// ErrMargin: a study plan's margin lies outside its scale's range or on
	// the wrong side of no effect for the plan's goal.
	ErrMargin = errors.New("margin outside the allowed range")
	// ErrBetter: an unknown direction of benefit (see Better).
	ErrBetter = errors.New("unknown direction of benefit")
	// ErrAlternative: an unknown alternative hypothesis.
	ErrAlternative = errors.New("unknown alternative")
	// ErrScope: an unknown method scope (see MethodScope).
	ErrScope = errors.New("unknown method scope")
	// ErrUnknownMethod: no registered method has the given key.
	ErrUnknownMethod = errors.New("unknown method")
	// ErrUnsupported: the method does not support the requested hypothesis
	// (for example a non-zero margin for a test defined only at zero).
	ErrUnsupported = errors.New("not supported by this method")
	// ErrTooLarge: a count is larger than the library handles, or a costly
	// method's estimated cost exceeds its guard (see Cost, MaxCost).
	ErrTooLarge = errors.New("count too large")
	// ErrPlan: a study-plan input (anticipated rate, α, power, allocation
	// ratio, drop-out share, group size, search bounds) lies outside its range.
	ErrPlan = errors.New("study plan input outside its allowed range")
	// ErrSimulation: a simulation input (number of clusters, cluster size,
	// true rate, ICC, number of simulated studies) lies outside its range.
	ErrSimulation = errors.New("simulation input outside its allowed range")
	// ErrTooFewClusters: a clustered analysis needs at least two clusters
	// in each group, since the variation between clusters is estimated
	// within the groups.
	ErrTooFewClusters = errors.New("too few clusters")
	// ErrUnreachable: no finite sample size reaches the requested power
	// (for example equal anticipated rates in a superiority design).
	ErrUnreachable = errors.New("target power cannot be reached")
)
