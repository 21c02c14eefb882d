package proportions

import (
	"math"

	"github.com/propscope/propscope/internal/special"
)

// FisherTieTolerance is the relative tolerance under which two tables count
// as equally probable in the two-sided Fisher test: a table belongs to the
// two-sided tail when P(table) ≤ P(observed)·(1 + 10⁻⁷). Tables that are
// mathematically equally probable (mirror tables when n1 = n2, for example)
// come out of floating-point arithmetic a few ulps apart; the tolerance
// keeps them together without merging tables whose probabilities really
// differ (common practice; the log probabilities here are accurate to about
// 10⁻¹³ relative, far inside the tolerance).
const FisherTieTolerance = 1e-7

// FisherTest is Fisher's exact test of π1 = π2, conditional on both margins of
// the 2×2 table: given m = x1 + x2 events in all, X1 is hypergeometric,
// P(X1 = k) = C(n1, k)·C(n2, m−k)/C(n1+n2, m).
//
//   - Greater (π1 > π2): p = P(X1 ≥ x1).
//   - Less (π1 < π2): p = P(X1 ≤ x1).
//   - Two-sided: p = the total probability of the tables no more probable
//     than the observed one, P(X1 = k) ≤ P(X1 = x1)·(1 + FisherTieTolerance).
//
// Fisher RA (1935), "The logic of inductive inference", Journal of the Royal
// Statistical Society 98:39–82; the two-sided rule by probability ordering
// is the one used by Agresti A (1992), "A survey of exact inference for
// contingency tables", Statistical Science 7:131–153.
//
// The log probability of the observed table is evaluated once; every sum
// is then taken relative to it through the ratio of neighbouring tables
// (see fisherLogPs), so p-values far below 10⁻³⁰⁸ keep an accurate
// LogPValue, p-values near 1 keep theirs too, and the test takes
// O(√(n1+n2)) steps up to MaxTrials per group. A zero margin (no events,
// or only events) leaves a single possible table: p = 1. The statistic
// reported is the hypergeometric probability of the observed table (it
// may underflow to 0; its log is not kept since LogPValue carries the
// evidence).
var FisherTest = TestMethod{
	Key:        "fisher-test",
	Name:       "Fisher exact",
	Citation:   "Fisher RA (1935). The logic of inductive inference. Journal of the Royal Statistical Society 98:39–82. Two-sided by probability ordering: Agresti A (1992). A survey of exact inference for contingency tables. Statistical Science 7:131–153.",
	Definition: "Conditional on the margins X1 is hypergeometric; one-sided p = P(X1 ≥ x1) or P(X1 ≤ x1); two-sided p = total probability of the tables with P(table) ≤ P(observed)·(1+1e−7).",
	Scale:      Difference,
	Exact:      true,
	Run:        func(c Counts, h Hypothesis) TestResult { return fisherRun(c, h, "fisher-test", "Fisher exact", false) },
}

// FisherMidPTest is the mid-p version of Fisher's test: the probability of the
// tables more extreme than the observed one plus half the probability of
// the tables exactly as extreme (the observed table, and in the two-sided
// case any table tied with it within FisherTieTolerance):
//
//	one-sided: p = P(X1 > x1) + ½·P(X1 = x1)   (Greater; mirrored for Less),
//	two-sided: p = P(tables less probable) + ½·P(tables tied with the observed).
//
// Lancaster HO (1961), "Significance tests in discrete distributions",
// Journal of the American Statistical Association 56:223–234. It is not
// exact: its size can exceed α, though it usually stays close to it and is
// far less conservative than Fisher's test, so Exact is false.
var FisherMidPTest = TestMethod{
	Key:        "fisher-mid-p-test",
	Name:       "Fisher mid-p",
	Citation:   "Lancaster HO (1961). Significance tests in discrete distributions. Journal of the American Statistical Association 56:223–234.",
	Definition: "Fisher's conditional test with half the probability of the tables as extreme as the observed one: p = P(more extreme) + ½·P(as extreme).",
	Scale:      Difference,
	Exact:      false,
	Run: func(c Counts, h Hypothesis) TestResult {
		return fisherRun(c, h, "fisher-mid-p-test", "Fisher mid-p", true)
	},
}

func fisherRun(c Counts, h Hypothesis, key, name string, mid bool) TestResult {
	logs, px := h.shared.fisher(c, h.Alternative)
	logp := logs.of(mid)
	r := TestResult{
		Method: key, MethodName: name, Scale: Difference,
		StatisticName: "P(observed table)",
		Statistic:     px,
		PValue:        math.Exp(logp), LogPValue: logp,
	}
	r.decide(h)
	return r
}

// fisherPair holds a log p-value of Fisher's test (index 0) and of its
// mid-p (index 1). Both come from the same sums, which differ only in the
// share w of the tables as extreme as the observed one that is left out
// of the p-value: w = 0 for Fisher's test, ½ for the mid-p.
type fisherPair [2]float64

// fisherShares are the shares w of the two members of a fisherPair.
var fisherShares = [2]float64{0, 0.5}

// of returns the mid-p's log when mid is set, else Fisher's.
func (l fisherPair) of(mid bool) float64 {
	if mid {
		return l[1]
	}
	return l[0]
}

// fisherLogP returns the log of Fisher's p-value (or mid-p) for the counts.
func fisherLogP(c Counts, a Alternative, mid bool) float64 {
	logs, _ := fisherLogPs(c, a)
	return logs.of(mid)
}

// fisherLogPs returns the logs of Fisher's p-value and of the mid-p, and
// the probability P(x) of the observed table.
//
// The table is first oriented so that the pmf does not increase from x
// upward: otherwise X2 = m − X1, hypergeometric with the groups swapped,
// takes its place (Greater and Less swap too). Then, with ρ_k = P(k)/P(x)
// and T = Σ_{k≥x} ρ_k (the tail from x, summed by special.HypergeomSumUp),
//
//	Greater: p = P(x)·(T − w),   Less: p = 1 − P(x)·(T − 1 + w),
//
// with w = ½ for the mid-p and 0 for Fisher's test; Less is then about ½
// or more (x is at or above the mode), so the subtraction is harmless. With equal groups P(k) = P(m−k),
// and the tables between x and its mirror image m−x, fewer than the tail
// when x is near the centre, give both: P(X1 ≥ x) = (1 − P(x)·H)/2,
// H = Σ_{m−x<k<x} ρ_k. The two-sided p-value is logTwoSided. log P(x) is
// the only log probability evaluated except when the far side of the
// two-sided set is found by Newton steps (lowerEnd).
func fisherLogPs(c Counts, a Alternative) (logs fisherPair, px float64) {
	n1, n2, m, x := c.N1, c.N2, c.X1+c.X2, c.X1
	lo, hi := special.HypergeomSupport(n1, n2, m)
	if lo == hi {
		return fisherPair{}, 1 // a single possible table: no evidence either way
	}
	lpx := special.LogHypergeomPMF(x, n1, n2, m)
	if x < hi && special.HypergeomRatio(x, n1, n2, m) > 1 {
		x, n1, n2 = m-x, n2, n1
		switch a {
		case Greater:
			a = Less
		case Less:
			a = Greater
		}
		lo, hi = special.HypergeomSupport(n1, n2, m)
	}
	f := fisherTables{n1: n1, n2: n2, m: m, x: x, lo: lo, hi: hi, lpx: lpx, px: math.Exp(lpx)}
	switch a {
	case Greater:
		logs = f.logUpper()
	case Less:
		logs = f.logLower()
	default:
		logs = f.logTwoSided()
	}
	return fisherPair{min(logs[0], 0), min(logs[1], 0)}, f.px
}

// fisherComplementFloor is the smallest remainder 1 − c for which a
// p-value is computed as one minus a sum c of central tables (tables not
// in the tail) instead of summing the tail. The subtraction multiplies
// the relative error of c by c/(1−c), at most 31 here; c, a sum of ratio
// products over up to 2.2 standard deviations, is accurate to a few 10⁻¹⁵
// at 10⁶ per group, so such p-values are accurate to about 10⁻¹³.
const fisherComplementFloor = 1.0 / 32

// fisherCentralReach is how far from the centre, in standard deviations,
// x may lie for the central tables to be summed in the hope of a p-value
// above fisherComplementFloor (a normal two-sided p-value of 1/32 lies at
// 2.15 standard deviations).
const fisherCentralReach = 2.2

// fisherTables holds the margins of a table oriented for the p-value
// computations (the pmf does not increase from x upward), its support
// lo … hi, and log P(x) and P(x).
type fisherTables struct {
	n1, n2, m, x, lo, hi int64
	lpx, px              float64
}

// ratioDown returns the parameters of special.RatioWalk and special.RatioSeries for
// stepping down from k (see the ratio series in hypergeom.go).
func (f *fisherTables) ratioDown(k int64) (a, b, c, d float64) {
	return float64(k), float64(f.n2 - f.m + k), float64(f.n1 - k + 1), float64(f.m - k + 1)
}

// spread returns how far x lies above the mean n1·m/N and the standard
// deviation √(n1·n2·m·(N−m)/(N²·(N−1))) of X1, N = n1+n2.
func (f *fisherTables) spread() (dist, sd float64) {
	n := float64(f.n1 + f.n2)
	dist = float64(f.x) - float64(f.n1)*float64(f.m)/n
	return dist, math.Sqrt(float64(f.n1) / n * float64(f.n2) / n * float64(f.m) * float64(f.n1+f.n2-f.m) / (n - 1))
}

// mirrored reports whether P(k) = P(m−k) (equal groups) with x at or above
// the centre m/2. (An oriented x can lie just below the centre, at the
// lower of two equal modes.)
func (f *fisherTables) mirrored(dist float64) bool { return f.n1 == f.n2 && dist >= 0 }

// centralMirrored returns H = Σ ρ_k over m−from < k < from for equal groups
// and from > m/2, given t = ρ_from, walking down from from: twice the sum
// over half+1 … from−1 (half = ⌊m/2⌋), plus the centre table m/2 when m is
// even.
func (f *fisherTables) centralMirrored(from int64, t float64) float64 {
	half := f.m / 2
	a, b, c, d := f.ratioDown(from)
	s, _, last, _ := special.RatioWalk(a, b, c, d, t, 0, from-half-1)
	s *= 2
	if f.m%2 == 0 {
		a, b, c, d = f.ratioDown(half + 1)
		s += last * (a * b) / (c * d)
	}
	return s
}

// logUpper returns log(P(X1 ≥ x) − w·P(x)) for both shares w.
func (f *fisherTables) logUpper() (logs fisherPair) {
	done := [2]bool{}
	if dist, sd := f.spread(); f.mirrored(dist) && dist <= fisherCentralReach*sd {
		if dist == 0 { // x = m/2: P(X1 ≥ x) = (1 + P(x))/2
			return fisherPair{math.Log1p(f.px) - math.Ln2, -math.Ln2}
		}
		// P(X1 ≥ x) − w·P(x) = (1 − c)/2.
		h := f.centralMirrored(f.x, 1)
		for i, w := range fisherShares {
			if c := f.px * (h + 2*w); 1-c >= fisherComplementFloor {
				logs[i], done[i] = math.Log1p(-c)-math.Ln2, true
			}
		}
		if done[0] && done[1] {
			return logs
		}
	}
	t := special.HypergeomSumUp(f.x, f.n1, f.n2, f.m)
	for i, w := range fisherShares {
		if !done[i] {
			logs[i] = f.lpx + math.Log(t-w)
		}
	}
	return logs
}

// logLower returns log(P(X1 ≤ x) − w·P(x)) for both shares w, about log ½
// or more here.
func (f *fisherTables) logLower() (logs fisherPair) {
	if dist, sd := f.spread(); f.mirrored(dist) && dist <= 5*sd {
		if dist == 0 {
			return fisherPair{math.Log1p(f.px) - math.Ln2, -math.Ln2}
		}
		// P(X1 ≤ x) − w·P(x) = 1 − P(X1 ≥ x) + (1−w)·P(x) = (1 + P(x)·(H + 2 − 2w))/2.
		h := f.centralMirrored(f.x, 1)
		for i, w := range fisherShares {
			logs[i] = math.Log1p(f.px*(h+2-2*w)) - math.Ln2
		}
		return logs
	}
	t := special.HypergeomSumUp(f.x, f.n1, f.n2, f.m)
	for i, w := range fisherShares {
		logs[i] = math.Log1p(-f.px * (t - 1 + w))
	}
	return logs
}

// The two-sided set. With tol = FisherTieTolerance, the pmf being
// unimodal, the tables with ρ ≤ 1+tol (Fisher's set) are two runs
// [lo, a] ∪ [b, hi] or the whole support, and those with ρ < 1−tol (the
// strictly less probable ones) are [lo, a′] ∪ [b′, hi], a′ ≤ a, b′ ≥ b.
// Between them lie the ties (ρ within the tolerance). So
//
//	Fisher: p = P(x)·(tail + ties)   = 1 − P(x)·central,
//	mid-p:  p = P(x)·(tail + ½·ties) = 1 − P(x)·(central + ½·ties),
//
// with tail = Σ ρ over [lo, a′] ∪ [b′, hi] and central = Σ ρ over (a, b).
// b′ and b come from ratio steps up and down from x (x is at or above the
// mode, and b′ = x+1, b = x but for near ties). The lower run is the
// mirror image of the upper one when n1 = n2; otherwise its inner end a
// is reached by walking down through the central tables when x is within
// fisherCentralReach standard deviations of the mean or 128 tables of it,
// and else is found by Newton steps on the log pmf (lowerEnd). When the
// central tables were summed and the remainder is at least
// fisherComplementFloor, p is one minus them; else the tails are summed.

// logTwoSided returns the log two-sided p-values of both shares w.
func (f *fisherTables) logTwoSided() fisherPair {
	const tolHi, tolLo = 1 + FisherTieTolerance, 1 - FisherTieTolerance
	n1, n2, m, lo, hi := f.n1, f.n2, f.m, f.lo, f.hi
	// Ties from x up, and b′ with its ρ (b′ = hi+1: none).
	ties, rho := 1.0, 1.0
	bex, rbex := hi+1, 0.0
	for k := f.x; k < hi; k++ {
		rho *= special.HypergeomRatio(k, n1, n2, m)
		if rho < tolLo {
			bex, rbex = k+1, rho
			break
		}
		ties += rho
	}
	// Ties below x, and b with its ρ. Reaching the mode inside the
	// tolerance means that no table is more probable than x beyond it.
	bin, rbin := f.x, 1.0
	for {
		if bin == lo {
			return f.logAll(ties, bin, rbin)
		}
		r := special.HypergeomRatio(bin-1, n1, n2, m) // P(bin)/P(bin−1)
		next := rbin / r
		if next > tolHi {
			break
		}
		if r > 1 {
			return f.logAll(ties, bin, rbin)
		}
		ties += next
		bin, rbin = bin-1, next
	}
	upper := func() float64 { // Σ ρ over [b′, hi]
		if bex > hi {
			return 0
		}
		return rbex * special.HypergeomSumUp(bex, n1, n2, m)
	}
	dist, sd := f.spread()
	if f.mirrored(dist) {
		ties *= 2 // the mirror images of the ties, below the centre
		if dist <= fisherCentralReach*sd {
			c := f.centralMirrored(bin, rbin)
			if 1-f.px*(c+ties) >= fisherComplementFloor {
				return f.centralPair(c, ties)
			}
		}
		return f.tailPair(2*upper(), ties)
	}
	if dist <= fisherCentralReach*sd || dist <= 128 {
		a, b, c, d := f.ratioDown(bin)
		central, j, ra, ok := special.RatioWalk(a, b, c, d, rbin, tolHi, bin-lo)
		if ok {
			aex, rex, lties := f.lowerTies(bin-j, ra)
			ties += lties
			if 1-f.px*(central+ties) >= fisherComplementFloor {
				return f.centralPair(central, ties)
			}
			return f.tailPair(upper()+f.lowerTail(aex, rex), ties)
		}
	}
	aex, rex, lties := f.lowerTies(f.lowerEnd(bin))
	return f.tailPair(upper()+f.lowerTail(aex, rex), ties+lties)
}

// centralPair is the two-sided pair from the central tables' Σρ and the
// ties' Σρ: p = 1 − P(x)·(central + w·ties).
func (f *fisherTables) centralPair(central, ties float64) (logs fisherPair) {
	for i, w := range fisherShares {
		logs[i] = math.Log1p(-f.px * (central + w*ties))
	}
	return logs
}

// tailPair is the two-sided pair from the tails' Σρ and the ties' Σρ:
// p = P(x)·(tail + (1−w)·ties).
func (f *fisherTables) tailPair(tail, ties float64) (logs fisherPair) {
	for i, w := range fisherShares {
		logs[i] = f.lpx + math.Log(tail+(1-w)*ties)
	}
	return logs
}

// logAll is the two-sided result when no table is more probable than x
// beyond the tolerance: Fisher's p is 1, and the mid-p is 1 − ½·P(band),
// the band being the tables with ρ ≥ 1 − tol around the mode. ties holds
// the band from above x down to k (where ρ is rho); the rest lies below k.
func (f *fisherTables) logAll(ties float64, k int64, rho float64) fisherPair {
	for ; k > f.lo; k-- {
		rho /= special.HypergeomRatio(k-1, f.n1, f.n2, f.m)
		if rho < 1-FisherTieTolerance {
			break
		}
		ties += rho
	}
	return fisherPair{0, math.Log1p(-fisherShares[1] * f.px * ties)}
}

// lowerTies takes the inner end a of the lower run (a < lo: none) and its
// ρ, and returns a′ (the first table from a down with ρ < 1 − tol; lo − 1
// if none), its ρ, and the sum of ρ over the ties from a down to a′+1.
func (f *fisherTables) lowerTies(a int64, rho float64) (int64, float64, float64) {
	ties := 0.0
	for a >= f.lo && rho >= 1-FisherTieTolerance {
		ties += rho
		if a > f.lo {
			rho /= special.HypergeomRatio(a-1, f.n1, f.n2, f.m)
		}
		a--
	}
	return a, rho, ties
}

// lowerTail returns Σ ρ over [lo, a], given a and ρ_a (0 when a < lo).
func (f *fisherTables) lowerTail(a int64, rho float64) float64 {
	if a < f.lo {
		return 0
	}
	return rho * special.HypergeomSumDown(a, f.n1, f.n2, f.m)
}

// lowerEnd returns the inner end a of the lower run, the largest k below
// b (the inner end of the upper run) with ρ_k ≤ 1 + tol, and ρ_a; a = lo−1
// when there is none. It takes Newton steps on
//
//	g(k) = log P(k) − log P(x) − log(1 + tol),
//
// which is concave and increasing up to the mode, with the slopes taken
// exactly as the log ratios of neighbouring tables: from the left of the
// root a step of ⌊−g(k)/(g(k+1)−g(k))⌋ never passes it, and from the right
// a step of ⌈g(k)/(g(k)−g(k−1))⌉ lands left of it. The first guess is the
// mirror image of x about the mean; once a step would be shorter than 8
// tables the rest is walked by ratios. Each step costs one log pmf.
func (f *fisherTables) lowerEnd(b int64) (int64, float64) {
	const tolHi = 1 + FisherTieTolerance
	n1, n2, m, lo := f.n1, f.n2, f.m, f.lo
	lt := math.Log1p(FisherTieTolerance)
	top := min(special.HypergeomMode(n1, n2, m), b-1) // g(top) > 0: top is more probable than x
	g := func(k int64) float64 { return special.LogHypergeomPMF(k, n1, n2, m) - f.lpx - lt }
	k := int64(math.Round(2*float64(n1)*float64(m)/float64(n1+n2) - float64(f.x)))
	k = min(max(k, lo), top)
	gk := g(k)
	for gk > 0 {
		if k == lo {
			return lo - 1, 0
		}
		step := 1.0
		if s := math.Log(special.HypergeomRatio(k-1, n1, n2, m)); s > 0 {
			step = max(1, math.Ceil(gk/s))
		}
		if step >= float64(k-lo) {
			k = lo
		} else {
			k -= int64(step)
		}
		gk = g(k)
	}
	for range 64 {
		step := 0.0
		if s := math.Log(special.HypergeomRatio(k, n1, n2, m)); s > 0 {
			step = math.Floor(-gk / s)
		}
		if step < 8 || float64(k)+step >= float64(top) {
			break
		}
		k += int64(step)
		if gk = g(k); gk > 0 {
			// Rounding put k just past the root: step back by ratios.
			rho := math.Exp(gk + lt)
			for k > lo && rho > tolHi {
				rho /= special.HypergeomRatio(k-1, n1, n2, m)
				k--
			}
			if rho > tolHi {
				return lo - 1, 0
			}
			return k, rho
		}
	}
	rho := math.Exp(gk + lt) // ρ_k; walk up while ρ stays within 1 + tol
	for k < top {
		next := rho * special.HypergeomRatio(k, n1, n2, m)
		if next > tolHi {
			break
		}
		k, rho = k+1, next
	}
	return k, rho
}
