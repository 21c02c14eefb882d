// Package operating computes the exact operating characteristics of the
// registered methods for a study design (group sizes n1, n2 and a level): the coverage and expected width of
// every interval method, and the size and power of every test, for the
// design's own sample sizes (n1, n2) and level, by full enumeration of the
// two binomial distributions. Nothing here is simulated.
//
// For an interval method the coverage at success rates (π1, π2) is
//
//	C(π1, π2) = Σ_{x1=0..n1} Σ_{x2=0..n2} b(x1; n1, π1) b(x2; n2, π2) · 1{L(x1,x2) ≤ θ ≤ U(x1,x2)},
//
// where θ is the true value of the method's parameter (π1 − π2, π1/π2 or
// the odds ratio) and b is the binomial probability. The part that is not
// covered is split into its two sides: the chance that the interval lies
// entirely below θ and the chance that it lies entirely above θ. Intervals
// are closed; the raw limits are compared (clipping to the parameter space
// does not change coverage of a truth inside it).
//
// # How it is fast
//
// An [OutcomeLimits] computes each interval once per outcome of the design (memory
// O(n1·n2)), on every core; for a method declared Symmetric in the
// registry it computes one outcome of each mirror set and copies the rest
// (a quarter of the outcomes when n1 = n2). Along a row x1, the limits of
// the usual methods fall as x2 grows, so the x2 whose interval covers θ
// form one run; it checks this row by row and cuts a row into
// several monotone pieces where it does not hold (near zero counts, for
// example), so the result is exact in every case. The points of a surface
// are visited in order of their truth, so each run moves a few steps from
// one point to the next, and with prefix sums of the second binomial's
// probabilities a piece costs two look-ups: a grid point costs O(n1 + n2).
// Binomial tails holding less than 1e-16 of the probability are skipped.
//
// # Which function to use
//
//   - [Coverage]: coverage, the two sides of non-coverage and the expected
//     width at one (π1, π2), without building a table.
//   - [NewOutcomeLimits], then [OutcomeLimits.Surface] (a grid, 101 × 101 by default),
//     [OutcomeLimits.AlongEffect] (a fixed true difference, ratio or odds ratio),
//     [OutcomeLimits.AlongFirst] (a fixed π2) and [OutcomeLimits.At]; [Surface.Summary] and
//     [Surface.RegionSummary] condense a surface.
//   - [Power] and [Decision.Power]: exact power of a test at one (π1, π2),
//     computed on the outcomes that matter there (what a sample-size search
//     calls); [NewRejectionRegion] builds a decision's rejection region once
//     to evaluate power at many points; [TypeIError]: the actual type I error
//     along the null line (π1 = π2, or the margin's line).
//   - [Recommend]: a ranking of the interval methods of a scale for a
//     design and level, by a documented [Criterion]; it depends on the
//     design only, never on data.
//
// Every method comes from the registry (proportions.EnumerableIntervalMethods,
// proportions.Tests), so methods registered later are covered without
// changes here. Long computations take a context.Context for cancellation
// and report progress through [WithProgress].
package operating
