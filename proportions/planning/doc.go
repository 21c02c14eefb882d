// Package planning is the exact side of study planning: the exact power of
// the test the user will actually run, and the sample size it needs.
//
// The asymptotic formulas (normal approximation with pooled or unpooled
// variance, Farrington–Manning restricted-MLE variance for margins,
// continuity correction) live in package proportions with the Plan type
// (SampleSize, Power, DetectableDifference, PowerByTrials,
// PowerByDifference). This package takes the same Plan and a registered
// proportions.TestMethod and, through the operating-characteristics engine
// (package operating), enumerates every outcome of the two binomial
// distributions:
//
//	power = Σ_{x1} Σ_{x2} b(x1; n1, π1)·b(x2; n2, π2)·1{the test rejects at (x1, x2)}.
//
// Exact power is saw-toothed in n, because the attainable p-values are
// discrete: it can reach the target at some size and fall below it at the
// next. ExactSampleSize therefore reports two answers: the smallest size
// that reaches the target, and the smallest size from which every size up
// to a stated horizon reaches it.
//
// Functions that enumerate take a context.Context, stop when it is
// cancelled, and use every core.
package planning
