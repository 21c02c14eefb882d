package proportions

import "math"

// The cost model of the unconditional tests and intervals, from what the
// code does (unconditional.go, unconditional_sup.go, unconditional_tail.go):
//
//   - the region: every table (x1, x2) of the design has its ordering
//     statistic computed once, (n1+1)·(n2+1) tables at a weight per table
//     that depends on the statistic (the pooled score at δ0 = 0 and the Wald
//     statistic are a few arithmetic operations, the score at δ0 ≠ 0 solves
//     the restricted-likelihood cubic, Fisher's ordering walks each margin's
//     hypergeometric distribution);
//   - the nuisance search: supGridPoints(n1, n2) grid values plus about a
//     hundred for the refinement of the peaks, each summing the binomial
//     terms of both groups inside their windows (the terms above the
//     search's cutoff: at most 37 standard deviations either side of the
//     mode, the whole range for small n) and one prefix-sum difference per
//     run of the region in each row of the window;
//   - when the largest tail probability is below 1e−280 the search is
//     repeated in log space, one log-pmf per outcome of each group and one
//     exponential per table of the region at every nuisance value. Whether
//     that happens is known only after the linear search, so its cost is
//     estimated and guarded then, before it starts.
//
// Memory: the region's runs (two per row at most for these statistics) and
// one row of flags, the binomial terms, prefix and suffix sums and the
// reciprocals of the nuisance search, and for Fisher's ordering the cuts of
// every margin.

// Step weights, measured with the benchmarks of the tests on one core.
const (
	costPooledTable = 5   // pooled score at δ0 = 0 (pooledRegion)
	costWaldTable   = 15  // unpooled Wald statistic
	costScoreTable  = 100 // score at δ0 ≠ 0: the restricted MLE's cubic
	costFisherTable = 5   // Fisher ordering: the cut per margin and the scan
	costTerm        = 5   // one binomial term: its recurrence, prefix and suffix sums
	costRun         = 3   // one run of the region in one row
	costLogPMF      = 40  // one log-pmf in the log-space path
	costLogTerm     = 20  // one exponential and sum per table in the log-space path
	costRefinement  = 100 // evaluations refining the grid's peaks (Brent)
)

// binomialWindowWidth is the largest number of binomial terms of Binomial(n, π)
// the nuisance search keeps at any π: 37 standard deviations of at most
// √n/2 either side of the mode, the whole range for small n.
func binomialWindowWidth(n int64) float64 {
	return min(float64(n+1), 37*math.Sqrt(float64(n))+1)
}

// supEvaluations is the number of tail evaluations of one nuisance search.
func supEvaluations(n1, n2 int64) float64 {
	return float64(supGridPoints(int(n1), int(n2))) + costRefinement
}

// unconditionalSideCost is the cost of one region and its nuisance search
// in linear scale (see the top of this file).
func unconditionalSideCost(c Counts, delta float64, stat OrderingStatistic) Cost {
	tables := float64(c.N1+1) * float64(c.N2+1)
	per := float64(costPooledTable)
	switch {
	case stat == FisherPValue:
		per = costFisherTable
	case stat == UnpooledWald:
		per = costWaldTable
	case delta != 0:
		per = costScoreTable
	}
	w1, w2 := binomialWindowWidth(c.N1), binomialWindowWidth(c.N2)
	eval := costTerm*(w1+w2) + costRun*2*w1
	steps := tables*per + supEvaluations(c.N1, c.N2)*eval
	n1, n2 := float64(c.N1), float64(c.N2)
	bytes := 4*(n1+2) + 16*(n1+1)*2 + (n2 + 1) + // region: row starts, runs, one row of flags
		8*((n1+1)+3*(n2+2)+max(n1, n2)+2) // search: terms, prefix and suffix sums, reciprocals
	if stat == FisherPValue {
		bytes += 16 * (n1 + n2 + 1)
	}
	return Cost{Steps: steps, Bytes: bytes}
}

// unconditionalLogCost is the cost of repeating a nuisance search in log
// space for a region of the given number of tables.
func unconditionalLogCost(n1, n2 int, tables int64) Cost {
	eval := costLogPMF*float64(n1+n2+2) + costLogTerm*float64(tables)
	return Cost{Steps: supEvaluations(int64(n1), int64(n2)) * eval, Bytes: 8 * float64(n1+n2+2)}
}

// unconditionalCost is the cost of a variant's test of h on c: one region
// and search, two for a doubled two-sided p-value.
func unconditionalCost(c Counts, h Hypothesis, d UnconditionalVariant) Cost {
	one := unconditionalSideCost(c, h.Null, d.Statistic)
	if h.Alternative == TwoSided && d.TwoSided == TwoSidedDoubled {
		return one.Scale(2)
	}
	return one
}

// exactIntervalTests is the number of exact score tests one limit of an
// exact unconditional interval takes, about 30 (see
// exact_difference_interval.go), taken as 40 for the estimate.
const exactIntervalTests = 40

// exactIntervalCost is the cost of an exact unconditional interval: two
// limits of exactIntervalTests score tests each, at a non-zero δ, each
// region built by the staircase walk (staircaseRegion: the statistic of
// at most n1 + n2 + 2 tables per part, two parts for a two-sided region)
// rather than from every table.
func exactIntervalCost(c Counts) Cost {
	search := unconditionalSideCost(c, 0.5, PooledScore)
	tables := float64(c.N1+1) * float64(c.N2+1)
	search.Steps -= tables * costScoreTable // no table-by-table region
	walk := 2 * float64(c.N1+c.N2+2) * costScoreTable
	search.Steps += walk + costRun*tables/float64(c.N2+1)*2
	return search.Scale(2 * exactIntervalTests)
}
