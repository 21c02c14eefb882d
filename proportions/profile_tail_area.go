package proportions

import (
	"context"
	"math"
	"math/bits"

	"github.com/propscope/propscope/internal/root"
	"github.com/propscope/propscope/internal/special"
)

// Tail areas of the difference of rates with the nuisance parameter at its
// restricted maximum-likelihood value, shared by ProfileExactTails and
// ProfileMidPTails (Newcombe 1998, methods 8 and 9).
//
// At a difference δ the two groups are taken as independent binomials at
// (π̃1, π̃2) = RestrictedMLE(c, δ), and the tables (i, j) are ordered by
// their difference i/n1 − j/n2 against the observed d = x1/n1 − x2/n2,
// compared exactly in integers (compareTables). The
// lower limit is the δ where P(D > d) + w·P(D = d) = α/2 and the upper
// limit the δ where P(D < d) + w·P(D = d) = α/2, with w = 1 ("exact") or
// ½ (mid-p). Both tails move monotonically with δ (π̃1 rises and π̃2 falls
// along the restricted fits), so each limit is one crossing, found by
// Brent's method to about 1e−11. A limit is −1 or 1 where the equation has
// no solution inside (the tail stays above α/2 up to the edge).
//
// Cost: each tail evaluation walks the tables whose probability is within
// about e^−45 of the largest in each group (the group's mean ± 10 standard
// deviations + 10 counts, a window of O(√n) terms, computed by the
// binomial recurrence from one saddle-point log-pmf), with the cumulative
// sum of group 2 merged along the ordering; the terms left out change a
// tail by less than 1e−18. An interval takes 20 to 40 evaluations.

// profileTailLimits returns the limits of the profile tail-area interval
// with tie weight w.
func profileTailLimits(c Counts, conf Confidence, w float64) (lower, upper float64) {
	return profileTailLimitsOf(nil, c, conf, w)
}

// profileTailLimitsContext is profileTailLimits with cancellation: each
// tail evaluation looks at ctx as it walks (see profileTails), so it
// returns ctx's error within milliseconds of ctx ending.
func profileTailLimitsContext(ctx context.Context, c Counts, conf Confidence, w float64) (lower, upper float64, err error) {
	lower, upper = profileTailLimitsOf(ctx, c, conf, w)
	if err := ctx.Err(); err != nil {
		return 0, 0, err
	}
	return lower, upper, nil
}

// profileTailCost estimates a profile tail-area interval: about 5000
// steps per standard deviation √(n·p·(1−p)) of each group at the observed
// rates, for the evaluations near the limits, and 260 per √n of each group
// for the few the root search makes far from them (measured: 4.7 ms at
// 10⁶ per group near one half, 0.5 s at 10¹⁰, 52 ms at 10¹⁰ with every
// trial an event).
func profileTailCost(c Counts, _ Confidence) Cost {
	sd := func(x, n int64) float64 {
		p := float64(x) / float64(n)
		return math.Sqrt(float64(n) * p * (1 - p))
	}
	return Cost{Steps: 5000*(sd(c.X1, c.N1)+sd(c.X2, c.N2)+1) + 260*(math.Sqrt(float64(c.N1))+math.Sqrt(float64(c.N2)))}
}

// profileTailLimitsOf computes the limits; a nil ctx never stops.
func profileTailLimitsOf(ctx context.Context, c Counts, conf Confidence, w float64) (lower, upper float64) {
	half := conf.Alpha() / 2
	// above(δ) − α/2 rises with δ; below(δ) − α/2 falls.
	fl := func(delta float64) float64 {
		a, t, _ := profileTails(ctx, c, delta)
		return a + w*t - half
	}
	fu := func(delta float64) float64 {
		_, t, b := profileTails(ctx, c, delta)
		return b + w*t - half
	}
	d := c.P1() - c.P2()
	lower = increasingCrossing(fl, d)
	upper = -increasingCrossing(func(m float64) float64 { return fu(-m) }, -d)
	return lower, upper
}

// increasingCrossing returns the δ in [−1, 1] where the nondecreasing f
// changes sign, starting from the bracket split at mid: −1 when f(−1) ≥ 0,
// 1 when f(1) < 0.
func increasingCrossing(f func(float64) float64, mid float64) float64 {
	fm := f(mid)
	if fm >= 0 {
		flo := f(-1)
		if flo >= 0 || mid == -1 {
			return -1
		}
		return polishedCrossing(f, -1, mid, flo, fm)
	}
	fhi := f(1)
	if fhi < 0 || mid == 1 {
		return 1
	}
	return polishedCrossing(f, mid, 1, fm, fhi)
}

// polishedCrossing is Brent's method (root.Brent, to about 1e−11) followed
// by regula falsi with the Illinois rule inside a bracket of ±2e−11 around
// its result, carried to a bracket of a few units in the last place, so
// that mirrored tables give mirrored limits to 1e−14. f(a) < 0 ≤ f(b) or
// the reverse signs; f is monotone between.
func polishedCrossing(f func(float64) float64, a, b, fa, fb float64) float64 {
	r := root.Brent(f, a, b, fa, fb)
	const near = 2e-11
	if lo := r - near; lo > a {
		if flo := f(lo); (flo < 0) == (fa < 0) {
			a, fa = lo, flo
		}
	}
	if hi := r + near; hi < b {
		if fhi := f(hi); (fhi < 0) == (fb < 0) {
			b, fb = hi, fhi
		}
	}
	side := 0
	for range 100 {
		if b-a <= 4e-16*math.Max(1, math.Abs(a)) {
			break
		}
		m := a + (b-a)/2
		if fa != fb && !math.IsInf(fa, 0) && !math.IsInf(fb, 0) {
			if s := (a*fb - b*fa) / (fb - fa); s > a && s < b {
				m = s
			}
		}
		if m == a || m == b {
			break
		}
		fm := f(m)
		switch {
		case fm == 0:
			return m
		case (fm < 0) == (fa < 0):
			a, fa = m, fm
			if side == -1 {
				fb /= 2 // Illinois: the end kept twice counts half
			}
			side = -1
		default:
			b, fb = m, fm
			if side == 1 {
				fa /= 2
			}
			side = 1
		}
	}
	return a + (b-a)/2
}

// profileTails returns P(D > d), P(D = d) and P(D < d) at the restricted
// fit of δ (see above). Once ctx (nil: never) has ended it stops within
// stopEvery counts and returns meaningless sums, which the caller
// discards.
func profileTails(ctx context.Context, c Counts, delta float64) (above, tie, below float64) {
	f := fitRestricted(c, delta)
	i0, i1, b1 := binomialWindow(c.N1, f.p1, f.q1)
	j0, j1, b2 := binomialWindow(c.N2, f.p2, f.q2)
	r1 := ratioOdds(f.p1, f.q1)
	r2 := ratioOdds(f.p2, f.q2)
	// For each i (ascending), cum is the sum of group 2's probabilities
	// over the j ≥ j0 with D(i, j) > d, the tables above d; that set of j
	// only grows with i, so j walks up once.
	j, bj := j0, b2 // next j to add and its probability
	cum, total1 := 0.0, 0.0
	for i := i0; i <= i1; i++ {
		if ctx != nil && (i-i0)%stopEvery == 0 && ctx.Err() != nil {
			break
		}
		for j <= j1 && compareTables(c, i, j) > 0 {
			cum += bj
			bj *= binomialStep(c.N2, j, r2)
			j++
		}
		above += b1 * cum
		if j <= j1 && compareTables(c, i, j) == 0 {
			tie += b1 * bj
		}
		total1 += b1
		b1 *= binomialStep(c.N1, i, r1)
	}
	if ctx != nil && ctx.Err() != nil {
		return above, tie, 0
	}
	// The window sums are 1 up to the terms left out; below is the rest.
	below = math.Max(0, total1*windowSum(j0, j1, b2, c.N2, r2)-above-tie)
	return above, tie, below
}

// ratioOdds is π/(1 − π), +Inf at π = 1.
func ratioOdds(p, q float64) float64 {
	if q == 0 {
		return math.Inf(1)
	}
	return p / q
}

// binomialStep is b(k+1)/b(k) = (n − k)/(k + 1) · π/(1 − π), 0 past n.
func binomialStep(n, k int64, odds float64) float64 {
	if k >= n {
		return 0
	}
	return float64(n-k) / float64(k+1) * odds
}

// compareTables compares the difference i/n1 − j/n2 of the table (i, j)
// with the observed x1/n1 − x2/n2: +1 above, 0 tied, −1 below. It compares
// i·n2 + x2·n1 with j·n1 + x1·n2 exactly in 128-bit integers (counts reach
// 2^50, their products 2^100).
func compareTables(c Counts, i, j int64) int {
	lh, ll := mulAdd(uint64(i), uint64(c.N2), uint64(c.X2), uint64(c.N1))
	rh, rl := mulAdd(uint64(j), uint64(c.N1), uint64(c.X1), uint64(c.N2))
	switch {
	case lh > rh || lh == rh && ll > rl:
		return 1
	case lh == rh && ll == rl:
		return 0
	}
	return -1
}

// mulAdd returns a·b + c·d as a 128-bit (high, low) pair.
func mulAdd(a, b, c, d uint64) (hi, lo uint64) {
	h1, l1 := bits.Mul64(a, b)
	h2, l2 := bits.Mul64(c, d)
	lo, carry := bits.Add64(l1, l2, 0)
	hi, _ = bits.Add64(h1, h2, carry)
	return hi, lo
}

// binomialWindow returns the counts k0..k1 outside which Binomial(n, π)
// has negligible probability (mean ± (10·sd + 10), clipped to 0..n) and
// the probability at k0. At π = 0 or 1 the window is the one certain count.
func binomialWindow(n int64, p, q float64) (k0, k1 int64, b0 float64) {
	switch {
	case p == 0:
		return 0, 0, 1
	case q == 0:
		return n, n, 1
	}
	fn := float64(n)
	mean := fn * p
	span := 10*math.Sqrt(fn*p*q) + 10
	k0 = int64(math.Max(0, math.Floor(mean-span)))
	k1 = int64(math.Min(fn, math.Ceil(mean+span)))
	b0 = math.Exp(special.LogBinomPMF(float64(k0), fn, p, q))
	return k0, k1, b0
}

// windowSum is the sum of the window's probabilities from b(k0) = b0.
func windowSum(k0, k1 int64, b0 float64, n int64, odds float64) float64 {
	s := 0.0
	for k := k0; k <= k1; k++ {
		s += b0
		b0 *= binomialStep(n, k, odds)
	}
	return s
}
