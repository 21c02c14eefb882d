// Package planning plans a two-group study: the sample size it needs and the
// power it has, for the test the user will run.
//
// A [Plan] is the record written before the data exist: the goal (equality,
// superiority, non-inferiority, equivalence), the anticipated rates, the
// margin, α, the target power, the allocation and the expected drop-out;
// [NewPlan] fills the defaults. Every function takes a Plan:
//
//   - by the normal approximation (pooled or unpooled variance,
//     Farrington–Manning restricted-MLE variance for margins, continuity
//     correction): [SampleSize], [Power], [DetectableDifference],
//     [PowerByTrials] and [PowerByDifference];
//   - exactly, for a registered proportions.TestMethod, by enumerating every
//     outcome of the two binomial distributions through the
//     operating-characteristics engine (package operating): [ExactPower],
//     [ExactSampleSize], [ExactPowerByTrials] and [ExactPowerByDifference].
//
// Exact power is
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
// cancelled, and use every core. ExactSampleSize, ExactPowerByTrials and
// ExactPowerByDifference also take the engine's options and report
// progress through operating.WithProgress, in thousandths of their
// estimated work ([ProgressTotal]); before they start, ExactPower,
// ExactSampleSize and ExactPowerByTrials estimate their cost and refuse
// one above [ExactSearchCost] with an error wrapping proportions.ErrTooLarge.
package planning
