// Package exact computes the exact operating characteristics of the
// registered methods for a study design: the coverage and expected width of
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
// A [Table] computes each interval once per outcome of the design (memory
// O(n1·n2)), on every core. Along a row x1, the limits of the usual methods
// fall as x2 grows, so the x2 whose interval covers θ form one run; the
// table checks this row by row and splits a row into several monotone
// pieces where it does not hold (near zero counts, for example), so the
// result is exact in every case. With prefix sums of the second binomial's
// probabilities each piece costs O(1), and a grid point costs O(n1 + n2).
// Binomial tails whose total probability is below 1e-16 are skipped.
//
// # Which function to use
//
//   - [Coverage]: coverage, the two sides of non-coverage and the expected
//     width at one (π1, π2).
//   - [NewTable] then [Table.Surface], [Table.AlongEffect], [Table.AlongFirst]:
//     coverage maps and slices, with [Surface.Summary] and
//     [Surface.RegionSummary].
//   - [Power]: exact power of a test at one (π1, π2) (what sample-size
//     planning calls); [NewRejectionRegion] builds a test's rejection region
//     once for evaluating power at many points; [Size]: actual type I error
//     along the null line.
//   - [Recommend]: a ranking of the interval methods for a design and level.
//
// Long computations take a context.Context for cancellation and report
// progress through [WithProgress].
package exact
