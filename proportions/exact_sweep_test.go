package proportions

import (
	"math"
	"sort"
	"sync"
	"testing"
)

// The inversion sweep: on every table of several designs, each exact
// interval must exclude a null value exactly when the test it inverts
// rejects that value, and its limits must be monotone in x1 and in x2.
// The tests' p-values come from brute-force code written for this file
// (restricted estimates by bisection of the likelihood equation, binomial
// and hypergeometric terms from log-gamma, the supremum over a dense grid),
// which shares nothing with the library's tests but the definitions.
//
// What "exactly" can mean follows from each definition:
//
//   - Chan–Zhang: L = inf{δ : p≥(δ) > α/2} and U = sup{δ : p≤(δ) > α/2},
//     with p≥ and p≤ the one-sided exact score tests. So δ0 < L implies p≥(δ0)
//     ≤ α/2 and δ0 > U implies p≤(δ0) ≤ α/2, with no exception. Inside
//     [L, U] a one-sided test can still reject δ0 when its p-value is not
//     monotone in δ (the ordering of tables changes with δ): δ0 then lies
//     in a gap between accepted values, and the check is that the test
//     accepts a value just inside the limit on that side (the limit is the
//     edge of an accepted stretch, not of a bracket).
//   - Agresti–Min: the hull of {δ : p₂(δ) > α}, p₂ the two-sided test. The
//     same holds with p₂ on both sides; a gap is legitimate when the test
//     accepts values on both sides of δ0 (the estimate, where p₂ = 1, on
//     one side, and a value just inside the limit on the other).
//   - Cornfield exact and mid-p: each limit solves a tail equation whose
//     tail is strictly monotone in ψ (the noncentral hypergeometric family
//     has a monotone likelihood ratio), so there are no gaps: ψ0 < ψL
//     exactly when P(X1 ≥ x1; ψ0) (mid-p: P(X1 > x1) + ½P(X1 = x1)) is
//     ≤ α/2, and ψ0 > ψU exactly when the lower tail is.
//   - Baptista–Pike: the hull of {ψ : p(ψ) > α} for the probability-ordered
//     two-sided test: as for Agresti–Min.
//
// Monotonicity in x1 and x2 is required of every method except
// Baptista–Pike, whose definition does not imply it: at 60×60 the table
// 0/60 vs 8/60 accepts a stretch of ψ (0.5395 to 0.5540) beyond the upper
// limit 0.5369 of 0/60 vs 7/60, so the table with more events in group 2
// has the higher upper limit. There a violation passes only when the brute-
// force test confirms both limits as ends of accepted stretches.
//
// P-values within a relative 2e−3 of the level (beyond the brute-force
// supremum's accuracy; 1e−9 for the conditional tails, which are exact
// sums) are not judged; the tests log how many were skipped. Null values
// next to a limit need no allowance: a value outside is rejected by
// definition, and a rejected value inside must pass the gap check, which
// the limits, located to 1e−6 on the rejected side, do pass when they are
// right.
//
// Cost: since the intervals find their regions by walking the edge of the
// score statistic, every table of every design below takes about 6.5
// minutes of CPU (3.5 minutes on both cores; 78,141 comparisons at 60×60
// alone), so plain `go test` sweeps them all. -short keeps every table of
// 8×8 and the row x2 = ⌊n2/3⌋ of 15×15. The conditional intervals are cheap
// and always swept in full (about 2 s).

// sweepDesigns are the designs of the sweep. 8×8 and 20×25 are there
// because their search step ½√(¼/n1 + ¼/n2) is rational (1/8 and 3/40),
// so the limit searches step onto δ ≈ 0 from many tables.
var sweepDesigns = [][2]int64{{8, 8}, {15, 15}, {20, 25}, {30, 30}, {40, 35}, {60, 60}}

// sweepNulls are the null values δ0 checked; 0 is the value of the
// reported bug, the others test both sides at some distance.
var sweepNulls = []float64{-0.5, -0.25, -0.1, 0, 0.1, 0.25, 0.5}

// sweepOddsNulls are the null odds ratios ψ0 checked.
var sweepOddsNulls = []float64{0.1, 0.3, 0.6, 1, 1.7, 3.5, 10}

// sweepPick returns which tables of design (n1, n2) the unconditional
// sweep computes (see Cost above; 20×25 holds the reported 10/20 vs 5/25),
// and a description for the log.
func sweepPick(n1, n2 int64) (func(x1, x2 int64) bool, string) {
	every := func(x1, x2 int64) bool { return true }
	row := func(x1, x2 int64) bool { return x2 == n2/3 }
	switch {
	case !testing.Short(), n1 <= 8 && n2 <= 8:
		return every, "every table"
	case n1 <= 15 && n2 <= 15:
		return row, "the row x2 = n2/3"
	}
	return nil, ""
}

// sweepLimits holds the limits of one method for the tables computed.
type sweepLimits struct {
	n1, n2 int64
	lo, hi [][]float64
	have   [][]bool
}

func newSweepLimits(n1, n2 int64) *sweepLimits {
	s := &sweepLimits{n1: n1, n2: n2}
	for x1 := int64(0); x1 <= n1; x1++ {
		s.lo = append(s.lo, make([]float64, n2+1))
		s.hi = append(s.hi, make([]float64, n2+1))
		s.have = append(s.have, make([]bool, n2+1))
	}
	return s
}

// computeSweepLimits fills the limits of m on the chosen tables, on all
// cores (each table is independent).
func computeSweepLimits(m IntervalMethod, n1, n2 int64, pick func(x1, x2 int64) bool) *sweepLimits {
	s := newSweepLimits(n1, n2)
	conf, _ := NewConfidence(0.95)
	var jobs [][2]int64
	for x1 := int64(0); x1 <= n1; x1++ {
		for x2 := int64(0); x2 <= n2; x2++ {
			if pick(x1, x2) {
				jobs = append(jobs, [2]int64{x1, x2})
			}
		}
	}
	var wg sync.WaitGroup
	next := make(chan [2]int64)
	for range 2 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for j := range next {
				lo, hi := m.Limits(Counts{j[0], n1, j[1], n2}, conf)
				s.lo[j[0]][j[1]], s.hi[j[0]][j[1]], s.have[j[0]][j[1]] = lo, hi, true
			}
		}()
	}
	for _, j := range jobs {
		next <- j
	}
	close(next)
	wg.Wait()
	return s
}

// checkMonotone checks that both limits are nondecreasing in x1 and
// nonincreasing in x2 (more events in group 1 never lower a limit, more in
// group 2 never raise one), up to tol·max(1, |limit|), comparing each
// computed table with the next computed one along its row and column.
// For a method defined as the hull of an accepted set that is not always
// an interval, monotonicity does not follow from the definition: an
// accepted stretch beyond the neighbour's limit widens one interval and
// not the other. genuine, when not nil, then excuses a pair whose two
// limits it confirms as true ends of accepted stretches; the count of
// excused pairs is returned.
func checkMonotone(t *testing.T, name string, s *sweepLimits, tol float64, genuine func(c Counts, limit float64, lower bool) bool) (excused int) {
	t.Helper()
	bad := 0
	check := func(a, b [2]int64, lower bool) {
		la := s.lo
		if !lower {
			la = s.hi
		}
		va, vb := la[a[0]][a[1]], la[b[0]][b[1]]
		// b has more evidence for a larger difference than a.
		if vb >= va-tol*math.Max(1, math.Abs(va)) || math.IsInf(va, 1) {
			return
		}
		if genuine != nil && genuine(Counts{a[0], s.n1, a[1], s.n2}, va, lower) && genuine(Counts{b[0], s.n1, b[1], s.n2}, vb, lower) {
			excused++
			return
		}
		if bad++; bad <= 10 {
			which := map[bool]string{true: "lower", false: "upper"}[lower]
			t.Errorf("%s: %s limit %.9g at (x1, x2) = %v falls to %.9g at %v (n1 = %d, n2 = %d)", name, which, va, a, vb, b, s.n1, s.n2)
		}
	}
	for x1 := int64(0); x1 <= s.n1; x1++ {
		for x2 := int64(0); x2 <= s.n2; x2++ {
			if !s.have[x1][x2] {
				continue
			}
			next1, next2 := x1+1, x2-1
			for next1 <= s.n1 && !s.have[next1][x2] {
				next1++
			}
			for next2 >= 0 && !s.have[x1][next2] {
				next2--
			}
			for _, lower := range []bool{true, false} {
				if next1 <= s.n1 {
					check([2]int64{x1, x2}, [2]int64{next1, x2}, lower)
				}
				if next2 >= 0 {
					check([2]int64{x1, x2}, [2]int64{x1, next2}, lower)
				}
			}
		}
	}
	return excused
}

// ---- Brute-force exact unconditional score tests ----

// sweepRestricted returns the restricted maximum-likelihood estimates
// under π1 − π2 = delta by bisection of the derivative of the
// log-likelihood along the null line (it decreases, the log-likelihood
// being concave), for δ ≠ 0 of moderate size.
func sweepRestricted(x1, n1, x2, n2 int64, delta float64) (q1, q2 float64) {
	a, b := math.Max(0, -delta), math.Min(1, 1-delta)
	slope := func(p2 float64) float64 {
		p1 := p2 + delta
		s := 0.0
		if x1 > 0 {
			s += float64(x1) / p1
		}
		if n1-x1 > 0 {
			s -= float64(n1-x1) / (1 - p1)
		}
		if x2 > 0 {
			s += float64(x2) / p2
		}
		if n2-x2 > 0 {
			s -= float64(n2-x2) / (1 - p2)
		}
		return s
	}
	lo, hi := a, b
	for range 200 {
		mid := lo + (hi-lo)/2
		if mid <= lo || mid >= hi {
			break
		}
		if slope(mid) > 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	p2 := lo + (hi-lo)/2
	return p2 + delta, p2
}

// sweepScoreZ is the score statistic for π1 − π2 = delta: the pooled z
// of Barnard's test when delta = 0 (the restricted estimate is then the
// pooled proportion), otherwise (p1 − p2 − δ) over the standard error at
// the restricted estimates. Zero numerator gives 0, zero variance ±Inf.
func sweepScoreZ(x1, n1, x2, n2 int64, delta float64) float64 {
	p1, p2 := float64(x1)/float64(n1), float64(x2)/float64(n2)
	num := p1 - p2 - delta
	var v float64
	if delta == 0 {
		pool := float64(x1+x2) / float64(n1+n2)
		v = pool * (1 - pool) * (1/float64(n1) + 1/float64(n2))
		if x1*n2 == x2*n1 {
			num = 0
		}
	} else {
		q1, q2 := sweepRestricted(x1, n1, x2, n2, delta)
		v = q1*(1-q1)/float64(n1) + q2*(1-q2)/float64(n2)
	}
	switch {
	case num == 0:
		return 0
	case v <= 0:
		return math.Copysign(math.Inf(1), num)
	}
	return num / math.Sqrt(v)
}

// sweepLogChoose returns log C(n, k) for k = 0..n from log-gamma.
func sweepLogChoose(n int64) []float64 {
	out := make([]float64, n+1)
	ln, _ := math.Lgamma(float64(n + 1))
	for k := range out {
		lk, _ := math.Lgamma(float64(k + 1))
		lr, _ := math.Lgamma(float64(n - int64(k) + 1))
		out[k] = ln - lk - lr
	}
	return out
}

// sweepBinomial writes the Binomial(n, p) probabilities into out, with
// lc = sweepLogChoose(n).
func sweepBinomial(n int64, p float64, lc, out []float64) {
	for k := int64(0); k <= n; k++ {
		switch {
		case p <= 0:
			out[k] = b2f(k == 0)
		case p >= 1:
			out[k] = b2f(k == n)
		default:
			out[k] = math.Exp(lc[k] + float64(k)*math.Log(p) + float64(n-k)*math.Log1p(-p))
		}
	}
}

func b2f(b bool) float64 {
	if b {
		return 1
	}
	return 0
}

// sweepGrid is the number of nuisance values of the brute-force supremum,
// equally spaced in angle (π2 = a + (b − a)·sin²θ). On these designs the
// tail's peaks are at least 0.02 rad wide, so the grid's miss at a peak is
// below about 1e−4 relative, well inside the 2e−3 the comparisons leave.
const sweepGrid = 4000

// sweepJudgeMargin is the relative distance from the level under which a
// brute-force p-value is not judged.
const sweepJudgeMargin = 2e-3

// bruteScorePAll returns the exact unconditional score-test p-value at
// delta on the given side for every table of the design at once: the
// tables are sorted by how extreme they are, each table's region is a
// prefix of that order (ties within 1e−9 relative count as equally
// extreme, as in common practice for floating-point ties), and for each
// grid value of the nuisance one running sum gives every region's
// probability.
func bruteScorePAll(n1, n2 int64, delta float64, side regionSide) [][]float64 {
	w := n2 + 1
	size := (n1 + 1) * w
	key := make([]float64, size)
	for x1 := int64(0); x1 <= n1; x1++ {
		for x2 := int64(0); x2 <= n2; x2++ {
			z := sweepScoreZ(x1, n1, x2, n2, delta)
			switch side {
			case sideGreater:
				key[x1*w+x2] = z
			case sideLess:
				key[x1*w+x2] = -z
			default:
				key[x1*w+x2] = math.Abs(z)
			}
		}
	}
	order := make([]int, size)
	for i := range order {
		order[i] = i
	}
	sort.Slice(order, func(i, j int) bool { return key[order[i]] > key[order[j]] })
	sorted := make([]float64, size)
	for i, o := range order {
		sorted[i] = key[o]
	}
	prefix := make([]int, size) // region size of each table
	for i := range prefix {
		k := key[i]
		thr := k
		if !math.IsInf(k, 0) {
			thr = k - 1e-9*math.Abs(k)
		}
		prefix[i] = sort.Search(int(size), func(j int) bool { return sorted[j] < thr })
	}
	a, b := math.Max(0, -delta), math.Min(1, 1-delta)
	best := make([]float64, size)
	cum := make([]float64, size+1)
	b1, b2 := make([]float64, n1+1), make([]float64, n2+1)
	lc1, lc2 := sweepLogChoose(n1), sweepLogChoose(n2)
	for g := 0; g <= sweepGrid; g++ {
		sn := math.Sin(float64(g) / sweepGrid * math.Pi / 2)
		p2 := math.Min(math.Max(a+(b-a)*sn*sn, a), b)
		sweepBinomial(n1, math.Min(math.Max(p2+delta, 0), 1), lc1, b1)
		sweepBinomial(n2, p2, lc2, b2)
		for i, o := range order {
			cum[i+1] = cum[i] + b1[int64(o)/w]*b2[int64(o)%w]
		}
		for i := range best {
			best[i] = math.Max(best[i], cum[prefix[i]])
		}
	}
	out := make([][]float64, n1+1)
	for x1 := range out {
		out[x1] = best[int64(x1)*w : int64(x1+1)*w]
	}
	return out
}

// bruteScorePOne is the same p-value for one table (for the checks just
// inside a limit).
func bruteScorePOne(c Counts, delta float64, side regionSide) float64 {
	return bruteScorePAll(c.N1, c.N2, delta, side)[c.X1][c.X2]
}

// judged reports whether p-value p is farther than margin (relative) from
// level and, if so, whether it rejects.
func judged(p, level, margin float64) (rejects, ok bool) {
	if math.Abs(p/level-1) < margin {
		return false, false
	}
	return p <= level, true
}

// acceptedJustInside reports whether the brute-force test accepts one of
// a few values within 1.2e−6 inside the limit (toward the estimate): the
// limit searches stop within 1e−6 on the rejected side of a crossing.
func acceptedJustInside(c Counts, limit, dir float64, side regionSide, level float64) bool {
	for k := 1; k <= 4; k++ {
		if bruteScorePOne(c, limit+dir*float64(k)*0.3e-6, side) > level*(1-sweepJudgeMargin) {
			return true
		}
	}
	return false
}

// TestExactDifferenceIntervalsInvertTheirTests runs the sweep for
// Chan–Zhang and Agresti–Min.
func TestExactDifferenceIntervalsInvertTheirTests(t *testing.T) {
	for _, d := range sweepDesigns {
		n1, n2 := d[0], d[1]
		pick, scope := sweepPick(n1, n2)
		if pick == nil {
			continue
		}
		cz := computeSweepLimits(ChanZhang, n1, n2, pick)
		am := computeSweepLimits(AgrestiMin, n1, n2, pick)
		checkMonotone(t, "Chan–Zhang", cz, 2e-6, nil)
		checkMonotone(t, "Agresti–Min", am, 2e-6, nil)
		skipped, gaps, checked := 0, 0, 0
		for _, d0 := range sweepNulls {
			pg := bruteScorePAll(n1, n2, d0, sideGreater)
			pl := bruteScorePAll(n1, n2, d0, sideLess)
			p2 := bruteScorePAll(n1, n2, d0, sideBoth)
			for x1 := int64(0); x1 <= n1; x1++ {
				for x2 := int64(0); x2 <= n2; x2++ {
					if !cz.have[x1][x2] {
						continue
					}
					c := Counts{x1, n1, x2, n2}
					est := c.P1() - c.P2()
					// Chan–Zhang: each side against its one-sided test at α/2.
					s, g := sweepOneSided(t, "Chan–Zhang", c, d0, cz.lo[x1][x2], est, pg[x1][x2], 0.025, sideGreater)
					skipped, gaps, checked = skipped+s, gaps+g, checked+1
					s, g = sweepOneSided(t, "Chan–Zhang", c, d0, cz.hi[x1][x2], est, pl[x1][x2], 0.025, sideLess)
					skipped, gaps, checked = skipped+s, gaps+g, checked+1
					// Agresti–Min: both sides against the two-sided test at α.
					lim := am.lo[x1][x2]
					sd := sideGreater
					if d0 > est {
						lim, sd = am.hi[x1][x2], sideLess
					}
					s, g = sweepOneSided(t, "Agresti–Min", c, d0, lim, est, p2[x1][x2], 0.05, sd|sideBothFlag)
					skipped, gaps, checked = skipped+s, gaps+g, checked+1
				}
			}
		}
		t.Logf("n1 = %d, n2 = %d (%s): %d comparisons, %d not judged (p at the level), %d accepted gaps verified", n1, n2, scope, checked, skipped, gaps)
	}
}

// sideBothFlag marks, for sweepOneSided, that the p-value is the two-sided
// one while side says which limit (Greater: the lower one) is checked.
const sideBothFlag regionSide = 8

// sweepOneSided compares one limit with the test: side Greater checks the
// lower limit (δ0 < limit must be rejected), Less the upper limit. It
// returns whether the comparison was skipped and whether δ0 fell in a
// verified gap.
func sweepOneSided(t *testing.T, name string, c Counts, d0, limit, est, p, level float64, side regionSide) (skipped, gap int) {
	t.Helper()
	both := side&sideBothFlag != 0
	side &^= sideBothFlag
	dir := 1.0 // from the limit toward the estimate
	if side == sideLess {
		dir = -1
	}
	excluded := (d0-limit)*dir < 0
	rejects, ok := judged(p, level, sweepJudgeMargin)
	if !ok {
		return 1, 0
	}
	switch {
	case excluded && !rejects:
		t.Errorf("%s %v: δ0 = %v is outside the limit %.9g but the test accepts it (p = %.6g > %v)", name, c, d0, limit, p, level)
	case !excluded && rejects && (d0-est)*dir <= 0:
		// δ0 on this limit's side of the estimate, inside, rejected: a gap
		// only if the test accepts values between the limit and δ0.
		testSide := side
		if both {
			testSide = sideBoth
		}
		if !acceptedJustInside(c, limit, dir, testSide, level) {
			t.Errorf("%s %v: δ0 = %v is inside the limit %.9g, the test rejects it (p = %.6g ≤ %v) and rejects the values just inside the limit too: the limit is not at a crossing", name, c, d0, limit, p, level)
			return 0, 0
		}
		return 0, 1
	}
	return 0, 0
}

// ---- Conditional odds-ratio intervals ----

// bruteConditional returns, for table c at odds ratio psi, the upper and
// lower tails P(X1 ≥ x1), P(X1 ≤ x1), the mid-p tails P(X1 > x1) +
// ½P(X1 = x1) and P(X1 < x1) + ½P(X1 = x1), and the probability-ordered
// two-sided p-value Σ f(k) over f(k) ≤ f(x1)·(1 + 1e−7) (the tie allowance
// of common practice for Fisher's test), all from log-gamma terms of
// Fisher's noncentral hypergeometric distribution.
func bruteConditional(c Counts, psi float64) (upper, lower, midUpper, midLower, twoSided float64) {
	m := c.X1 + c.X2
	lo, hi := max(0, m-c.N2), min(c.N1, m)
	lg := func(v int64) float64 { r, _ := math.Lgamma(float64(v + 1)); return r }
	logw := func(k int64) float64 {
		return lg(c.N1) - lg(k) - lg(c.N1-k) + lg(c.N2) - lg(m-k) - lg(c.N2-m+k) + float64(k)*math.Log(psi)
	}
	top := math.Inf(-1)
	for k := lo; k <= hi; k++ {
		top = math.Max(top, logw(k))
	}
	f := make([]float64, hi-lo+1)
	total := 0.0
	for k := lo; k <= hi; k++ {
		f[k-lo] = math.Exp(logw(k) - top)
		total += f[k-lo]
	}
	fx := f[c.X1-lo]
	for k := lo; k <= hi; k++ {
		v := f[k-lo] / total
		if k >= c.X1 {
			upper += v
		}
		if k <= c.X1 {
			lower += v
		}
		if f[k-lo] <= fx*(1+1e-7) {
			twoSided += v
		}
	}
	at := fx / total
	return upper, lower, upper - at/2, lower - at/2, twoSided
}

// TestConditionalOddsRatioIntervalsInvertTheirTests runs the sweep for the
// Cornfield exact and mid-p intervals (strict agreement, each limit
// against its one-sided tail at α/2) and the Baptista–Pike interval (the
// hull of the accepted set of its two-sided test at α), on every table of
// every design, and checks monotonicity in x1 and x2.
func TestConditionalOddsRatioIntervalsInvertTheirTests(t *testing.T) {
	conf, _ := NewConfidence(0.95)
	type method struct {
		m     IntervalMethod
		tails func(upper, lower, midUpper, midLower, two float64) (lowerSide, upperSide float64)
		level float64
		hull  bool
	}
	methods := []method{
		{CornfieldExact, func(u, l, mu, ml, two float64) (float64, float64) { return u, l }, 0.025, false},
		{CornfieldMidP, func(u, l, mu, ml, two float64) (float64, float64) { return mu, ml }, 0.025, false},
		{BaptistaPike, func(u, l, mu, ml, two float64) (float64, float64) { return two, two }, 0.05, true},
	}
	for _, d := range sweepDesigns {
		n1, n2 := d[0], d[1]
		for _, mt := range methods {
			s := newSweepLimits(n1, n2)
			for x1 := int64(0); x1 <= n1; x1++ {
				for x2 := int64(0); x2 <= n2; x2++ {
					lo, hi := mt.m.Limits(Counts{x1, n1, x2, n2}, conf)
					s.lo[x1][x2], s.hi[x1][x2], s.have[x1][x2] = lo, hi, true
				}
			}
			var genuine func(Counts, float64, bool) bool
			if mt.hull {
				genuine = func(c Counts, limit float64, lower bool) bool {
					return bruteAcceptedInsideOdds(c, limit, lower, mt.level)
				}
			}
			excused := checkMonotone(t, mt.m.Name, s, 1e-9, genuine)
			skipped, gaps := 0, 0
			for x1 := int64(0); x1 <= n1; x1++ {
				for x2 := int64(0); x2 <= n2; x2++ {
					c := Counts{x1, n1, x2, n2}
					m := x1 + x2
					if m == 0 || m == n1+n2 {
						continue // one possible table: [0, ∞], nothing to test
					}
					mle := conditionalMLE(c)
					lo, hi := s.lo[x1][x2], s.hi[x1][x2]
					for _, psi := range sweepOddsNulls {
						up, low, mu, ml, two := bruteConditional(c, psi)
						pLowSide, pHighSide := mt.tails(up, low, mu, ml, two)
						// Below the estimate the lower limit decides, above it the upper.
						limit, p, below := lo, pLowSide, psi < mle
						if !below {
							limit, p = hi, pHighSide
						}
						excluded := (below && psi < limit) || (!below && psi > limit)
						// The conditional tails are sums of a few dozen
						// exact terms: only rounding separates them from α.
						rejects, ok := judged(p, mt.level, 1e-9)
						if !ok {
							skipped++
							continue
						}
						switch {
						case excluded && !rejects:
							t.Errorf("%s %v: ψ0 = %v is outside the limit %.9g but the test accepts it (p = %.6g > %v)", mt.m.Name, c, psi, limit, p, mt.level)
						case !excluded && rejects && !mt.hull:
							t.Errorf("%s %v: ψ0 = %v is inside [%.9g, %.9g] but its tail %.6g ≤ %v: the tails are monotone in ψ, so the interval must exclude it", mt.m.Name, c, psi, lo, hi, p, mt.level)
						case !excluded && rejects:
							// A gap of the hull: the test must accept values
							// just inside the limit.
							if !bruteAcceptedInsideOdds(c, limit, below, mt.level) {
								t.Errorf("%s %v: ψ0 = %v is inside [%.9g, %.9g], rejected (p = %.6g), and so are the values just inside the limit", mt.m.Name, c, psi, lo, hi, p)
							}
							gaps++
						}
					}
				}
			}
			t.Logf("%s n1 = %d, n2 = %d: every table, %d not judged, %d accepted gaps verified, %d non-monotone neighbours verified", mt.m.Name, n1, n2, skipped, gaps, excused)
		}
	}
}

// bruteAcceptedInsideOdds reports whether the brute-force probability-
// ordered test accepts, at level, an odds ratio just inside the limit
// (toward the estimate): the limit is then the end of an accepted stretch.
// Limits 0 and ∞ (zero cells) count as genuine.
func bruteAcceptedInsideOdds(c Counts, limit float64, lower bool, level float64) bool {
	if limit == 0 || math.IsInf(limit, 1) {
		return true
	}
	for _, eps := range []float64{1e-9, 1e-8, 1e-7, 1e-6} {
		v := limit * (1 + eps)
		if !lower {
			v = limit * (1 - eps)
		}
		if _, _, _, _, tw := bruteConditional(c, v); tw > level {
			return true
		}
	}
	return false
}
