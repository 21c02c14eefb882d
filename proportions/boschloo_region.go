package proportions

import (
	"context"
	"math"

	"github.com/propscope/propscope/internal/special"
)

// The region of Boschloo's test: tables whose Fisher p-value is at most the
// observed one. Fisher's p-value depends on a table only through its
// margin m = x1 + x2 and its place in that margin's hypergeometric
// distribution, so the region is built one margin ("slice") at a time:
//
//   - one-sided (Greater): Fisher's p P(X1 ≥ k | m) falls as k rises, so the
//     slice's tables in the region are k ≥ cut(m), found by summing the
//     hypergeometric tail down from the top until it exceeds the observed p;
//   - two-sided: Fisher's two-sided p orders a slice's tables by their
//     probability, so the region is the two outer tails of the slice, found
//     by merging from both ends, least probable table first, until the
//     running total exceeds the observed p.
//
// Each slice costs as many steps as it has tables in the region, plus one,
// so the whole region costs O(n1 + n2 + |region|) steps in log space
// (accurate however small the observed p-value).

// fisherSliceCuts returns, for every margin m = 0..n1+n2, the bounds
// (left[m], right[m]) of the slice's part of the region: tables with
// x1 ≤ left[m] or x1 ≥ right[m].
func fisherSliceCuts(n1, n2 int64, logThr float64, side regionSide) (left, right []int64) {
	n := n1 + n2
	left, right = make([]int64, n+1), make([]int64, n+1)
	for m := int64(0); m <= n; m++ {
		lo, hi := special.HypergeomSupport(n1, n2, m)
		switch side {
		case sideGreater:
			left[m], right[m] = lo-1, fisherUpperCut(n1, n2, m, logThr)
		case sideLess:
			left[m], right[m] = fisherLowerCut(n1, n2, m, logThr), hi+1
		default:
			left[m], right[m] = fisherTwoSidedCut(n1, n2, m, logThr)
		}
	}
	return left, right
}

// fisherUpperCut returns the smallest k with log P(X1 ≥ k | m) ≤ logThr
// (hi+1 when even the top table's tail exceeds it). The tail is summed from
// the top in linear scale relative to the top table's probability (terms
// grow toward the mode, so nothing underflows), rescaled before overflow.
func fisherUpperCut(n1, n2, m int64, logThr float64) int64 {
	lo, hi := special.HypergeomSupport(n1, n2, m)
	k, _ := fisherWalk(n1, n2, m, hi, lo, -1, logThr)
	return k
}

// fisherLowerCut returns the largest k with log P(X1 ≤ k | m) ≤ logThr
// (lo−1 when even the bottom table's tail exceeds it).
func fisherLowerCut(n1, n2, m int64, logThr float64) int64 {
	lo, hi := special.HypergeomSupport(n1, n2, m)
	k, _ := fisherWalk(n1, n2, m, lo, hi, 1, logThr)
	return k
}

// fisherWalk sums the hypergeometric probabilities from the end `from`
// toward `to` while the sum stays at most exp(logThr), and returns the last
// table included (one step outside `from` when none is); step is +1 when
// walking up, −1 when walking down.
func fisherWalk(n1, n2, m, from, to, step int64, logThr float64) (last int64, logSum float64) {
	const big = 1e280
	base := special.LogHypergeomPMF(from, n1, n2, m)
	if base > logThr {
		return from - step, math.Inf(-1)
	}
	limit := math.Exp(min(logThr-base, 700)) // sum ≤ limit, relative to exp(base)
	sum, term := 1.0, 1.0
	k := from
	for k != to {
		if step > 0 {
			term *= special.HypergeomRatio(k, n1, n2, m)
		} else {
			term /= special.HypergeomRatio(k-1, n1, n2, m)
		}
		if sum+term > limit {
			break
		}
		sum += term
		k += step
		if sum > big {
			sum, term, base = sum/big, term/big, base+math.Log(big)
			limit = math.Exp(min(logThr-base, 700))
		}
	}
	return k, base + math.Log(sum)
}

// fisherTwoSidedCut returns the slice's two-sided region bounds: the
// tables are taken from both ends, least probable first, a group of tables
// tied within FisherTieTolerance at a time (they share one two-sided
// p-value), while the running total stays at most exp(logThr).
//
// The merge runs in linear scale relative to the larger end probability.
// Tables at an end more than e⁻⁷⁰⁰ below it are skipped by bisection (they
// are in the region, and their mass is nil at double precision) unless the
// threshold itself is that small, in which case the merge runs in log space.
func fisherTwoSidedCut(n1, n2, m int64, logThr float64) (left, right int64) {
	lo, hi := special.HypergeomSupport(n1, n2, m)
	ref := max(special.LogHypergeomPMF(lo, n1, n2, m), special.LogHypergeomPMF(hi, n1, n2, m))
	if logThr-ref < -600 {
		return fisherTwoSidedCutLog(n1, n2, m, logThr)
	}
	const floor, big = -700.0, 1e280
	mode := special.HypergeomMode(n1, n2, m)
	i, j := lo, hi
	if special.LogHypergeomPMF(lo, n1, n2, m)-ref < floor {
		i = firstAbove(lo, mode, func(k int64) bool { return special.LogHypergeomPMF(k, n1, n2, m)-ref >= floor })
	}
	if special.LogHypergeomPMF(hi, n1, n2, m)-ref < floor {
		j = -firstAbove(-hi, -mode, func(k int64) bool { return special.LogHypergeomPMF(-k, n1, n2, m)-ref >= floor })
	}
	vi, vj := math.Exp(special.LogHypergeomPMF(i, n1, n2, m)-ref), math.Exp(special.LogHypergeomPMF(j, n1, n2, m)-ref)
	limit, cum := math.Exp(min(logThr-ref, 700)), 0.0
	tie := 1 + FisherTieTolerance
	for i <= j {
		t := min(vi, vj) * tie
		group := 0.0
		ni, nj, nvi, nvj := i, j, vi, vj
		for ni <= nj && nvi <= t {
			group += nvi
			ni++
			if ni <= hi {
				nvi *= special.HypergeomRatio(ni-1, n1, n2, m)
			}
		}
		for nj >= ni && nvj <= t {
			group += nvj
			nj--
			if nj >= lo {
				nvj /= special.HypergeomRatio(nj, n1, n2, m)
			}
		}
		if cum+group > limit {
			break
		}
		cum, i, j, vi, vj = cum+group, ni, nj, nvi, nvj
		if cum > big {
			cum, vi, vj, ref = cum/big, vi/big, vj/big, ref+math.Log(big)
			limit = math.Exp(min(logThr-ref, 700))
		}
	}
	return i - 1, j + 1
}

// firstAbove returns the smallest k in [a, b] with ok(k) true, for ok
// monotone (false then true) on [a, b] and ok(b) true.
func firstAbove(a, b int64, ok func(int64) bool) int64 {
	for a < b {
		mid := a + (b-a)/2
		if ok(mid) {
			b = mid
		} else {
			a = mid + 1
		}
	}
	return a
}

// fisherTwoSidedCutLog is fisherTwoSidedCut in log space, for thresholds
// far below the slice's largest end probability.
func fisherTwoSidedCutLog(n1, n2, m int64, logThr float64) (left, right int64) {
	lo, hi := special.HypergeomSupport(n1, n2, m)
	tieTol := math.Log1p(FisherTieTolerance)
	i, j := lo, hi
	li, lj := special.LogHypergeomPMF(lo, n1, n2, m), special.LogHypergeomPMF(hi, n1, n2, m)
	cum := math.Inf(-1)
	for i <= j {
		tie := min(li, lj) + tieTol
		group := math.Inf(-1)
		ni, nj, nli, nlj := i, j, li, lj
		for ni <= nj && nli <= tie {
			group = special.LogAddExp(group, nli)
			ni++
			if ni <= hi {
				nli += math.Log(special.HypergeomRatio(ni-1, n1, n2, m))
			}
		}
		for nj >= ni && nlj <= tie {
			group = special.LogAddExp(group, nlj)
			nj--
			if nj >= lo {
				nlj -= math.Log(special.HypergeomRatio(nj, n1, n2, m))
			}
		}
		next := special.LogAddExp(cum, group)
		if next > logThr {
			break
		}
		cum, i, j, li, lj = next, ni, nj, nli, nlj
	}
	return i - 1, j + 1
}

// fisherRegion builds Boschloo's region for the counts and returns it with
// the log of the observed Fisher p-value (one-sided for sideGreater and
// sideLess, two-sided for sideBoth).
func fisherRegion(c Counts, side regionSide) (region, float64) {
	return fisherRegionContext(context.Background(), c, side)
}

// fisherRegionContext is fisherRegion stopping early when ctx ends (the
// region is then incomplete; callers check ctx.Err()).
func fisherRegionContext(ctx context.Context, c Counts, side regionSide) (region, float64) {
	logp := fisherObserved(c, side)
	return fisherRegionAt(ctx, c.N1, c.N2, logp, side), logp
}

// fisherObserved is the log of the observed Fisher p-value of a side.
func fisherObserved(c Counts, side regionSide) float64 {
	alt := TwoSided
	switch side {
	case sideGreater:
		alt = Greater
	case sideLess:
		alt = Less
	}
	return fisherLogP(c, alt, false)
}

// fisherRegionAt builds Boschloo's region for an observed log Fisher
// p-value: it depends on the outcome only through logp, which lets one
// region serve every outcome with that p-value (unconditional_window.go).
func fisherRegionAt(ctx context.Context, n1, n2 int64, logp float64, side regionSide) region {
	left, right := fisherSliceCuts(n1, n2, logp+statTieTolerance, side)
	return buildRegion(ctx, int(n1), int(n2), func(x1, from int, part []bool) {
		for j := range part {
			m := x1 + from + j
			part[j] = int64(x1) <= left[m] || int64(x1) >= right[m]
		}
	})
}
