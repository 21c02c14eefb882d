package special

import (
	"math"
	"math/bits"
	"slices"
)

// The conditional distribution of a 2×2 table given its margins.
//
// With n1 and n2 trials in the groups and m events in all, the number of
// events X1 in the first group follows the hypergeometric distribution
//
//	P(X1 = k) = C(n1, k)·C(n2, m−k) / C(n1+n2, m),   max(0, m−n2) ≤ k ≤ min(n1, m),
//
// the null distribution of Fisher's exact test. Under an odds ratio ψ the
// weights become C(n1, k)·C(n2, m−k)·ψᵏ (Fisher's noncentral
// hypergeometric distribution); callers needing that add k·log ψ to
// LogHypergeomPMF and renormalise over HypergeomSupport.

// HypergeomSupport returns the smallest and largest possible X1 given the
// margins: n1, n2 trials and m events in all (0 ≤ m ≤ n1 + n2).
func HypergeomSupport(n1, n2, m int64) (lo, hi int64) {
	return max(0, m-n2), min(n1, m)
}

// HypergeomMode returns a most probable X1 given the margins,
// ⌊(m+1)(n1+1)/(n1+n2+2)⌋ clamped to the support.
func HypergeomMode(n1, n2, m int64) int64 {
	lo, hi := HypergeomSupport(n1, n2, m)
	mode := int64(math.Floor((float64(m) + 1) * (float64(n1) + 1) / (float64(n1+n2) + 2)))
	return min(max(mode, lo), hi)
}

// LogHypergeomPMF returns log P(X1 = k) under the central hypergeometric
// distribution with n1, n2 trials and m events in all; −Inf outside the
// support. It uses the binomial identity
//
//	P(X1 = k) = b(k; n1, p)·b(m−k; n2, p) / b(m; n1+n2, p),   p = m/(n1+n2),
//
// with the saddle-point binomial of logpmf.go, so it keeps nearly full
// relative precision for margins up to MaxTrials (where lgamma-based
// formulas lose absolute accuracy in the log). The three saddle-point
// forms are combined: with N = n1+n2 and the cells c1 = k, c2 = n1−k,
// c3 = m−k, c4 = n2−m+k,
//
//	log P = stirlerr(n1) + stirlerr(n2) + stirlerr(m) + stirlerr(N−m) − stirlerr(N)
//	        − Σ stirlerr(cᵢ) − Σ bd0(cᵢ, eᵢ)
//	        − ½·log(2π·c1c2c3c4·N / (n1·n2·m·(N−m))),
//
// where eᵢ are the expected cells n1·p, n1·(1−p), n2·p, n2·(1−p) (the
// deviances of the denominator vanish, since m = N·p). The four deviations
// cᵢ − eᵢ are ±(k·N − n1·m)/N, whose numerator is formed exactly in integer
// arithmetic: rounding eᵢ instead would cost about (cᵢ−eᵢ)/eᵢ times the
// rounding of eᵢ in the log, 10⁻¹³ at 10⁶ per group. A group with a zero
// cell contributes its two deviances only (b(0; n, p) = (1−p)ⁿ is
// −bd0(0, n·p) − bd0(n, n·(1−p)), with bd0(0, e) = e).
func LogHypergeomPMF(k, n1, n2, m int64) float64 {
	lo, hi := HypergeomSupport(n1, n2, m)
	if k < lo || k > hi {
		return math.Inf(-1)
	}
	if lo == hi {
		return 0
	}
	n := n1 + n2
	c1, c2, c3, c4 := k, n1-k, m-k, n2-m+k
	d := mulSub(k, n, n1, m) / float64(n) // c1 − e1 = c4 − e4 = −(c2 − e2) = −(c3 − e3)
	s := stirlerrInt(m) + stirlerrInt(n-m) - stirlerrInt(n)
	v := float64(n) / (2 * math.Pi * float64(m) * float64(n-m))
	if c1 > 0 && c2 > 0 {
		s += stirlerrInt(n1) - stirlerrInt(c1) - stirlerrInt(c2)
		v *= 2 * math.Pi * (float64(c1) / float64(n1) * float64(c2))
	}
	if c3 > 0 && c4 > 0 {
		s += stirlerrInt(n2) - stirlerrInt(c3) - stirlerrInt(c4)
		v *= 2 * math.Pi * (float64(c3) / float64(n2) * float64(c4))
	}
	fn, fn1, fn2 := float64(n), float64(n1), float64(n2)
	p, q := float64(m)/fn, float64(n-m)/fn
	dev := bd0Dev(float64(c1), d, fn1*p) + bd0Dev(float64(c2), -d, fn1*q) +
		bd0Dev(float64(c3), -d, fn2*p) + bd0Dev(float64(c4), d, fn2*q)
	return s - dev - 0.5*math.Log(v)
}

// mulSub returns a·b − c·d for nonnegative a, b, c, d, formed exactly in
// 128-bit arithmetic and rounded to float64.
func mulSub(a, b, c, d int64) float64 {
	h1, l1 := bits.Mul64(uint64(a), uint64(b))
	h2, l2 := bits.Mul64(uint64(c), uint64(d))
	neg := h1 < h2 || (h1 == h2 && l1 < l2)
	if neg {
		h1, l1, h2, l2 = h2, l2, h1, l1
	}
	l, borrow := bits.Sub64(l1, l2, 0)
	h, _ := bits.Sub64(h1, h2, borrow)
	f := float64(h)*0x1p64 + float64(l)
	if neg {
		return -f
	}
	return f
}

// stirlerrSmall holds stirlerr(n) for n = 0 … 31 (entry 0 unused), from
// the exact recurrence stirlerr(n) = stirlerr(n+1) + Σ_{j≥1} y^{2j}/(2j+1),
// y = 1/(2n+1), run down from n = 64, where the asymptotic series of
// stirlerr is exact to about 10⁻²³. (The identity is (n+½)·log((n+1)/n) − 1
// written as a series with positive terms, so nothing cancels.) Below 32
// the series itself would leave out up to 10⁻¹⁶ (at 16), and stirlerr's
// lgamma route below 16 loses a few 10⁻¹⁵.
var stirlerrSmall = func() (t [32]float64) {
	s := stirlerrSeries(64)
	for n := 63; n >= 1; n-- {
		y2 := 1 / float64((2*n+1)*(2*n+1))
		sum, term := 0.0, 1.0
		for j := 1; term > 1e-30; j++ {
			term *= y2
			sum += term / float64(2*j+1)
		}
		s += sum
		if n < len(t) {
			t[n] = s
		}
	}
	return t
}()

// stirlerrInt is stirlerr at a positive integer: the table below 32, the
// asymptotic series above.
func stirlerrInt(n int64) float64 {
	if n < int64(len(stirlerrSmall)) {
		return stirlerrSmall[n]
	}
	return stirlerrSeries(float64(n))
}

// stirlerrSeries is the asymptotic series of stirlerr (as in logpmf.go,
// with one division): 1/(12n) − 1/(360n³) + 1/(1260n⁵) − 1/(1680n⁷) +
// 1/(1188n⁹), which leaves out less than 10⁻¹⁹ from n = 32 on.
func stirlerrSeries(n float64) float64 {
	const (
		s0 = 1.0 / 12
		s1 = 1.0 / 360
		s2 = 1.0 / 1260
		s3 = 1.0 / 1680
		s4 = 1.0 / 1188
	)
	y := 1 / n
	y2 := y * y
	return y * (s0 - y2*(s1-y2*(s2-y2*(s3-y2*s4))))
}

// bd0Dev returns bd0(x, e) of logpmf.go, x·log(x/e) + e − x, given x, the
// expected value e > 0 and the deviation d = x − e, each to full relative
// precision (so bd0(0, e) = e). With v = d/(x+e),
//
//	bd0 = d·v + 2x·v³·Σ_{j≥0} v^{2j}/(2j+3),
//
// whose terms fall by v² each; for |v| < ¼ a fixed-length Horner scheme,
// its length chosen from v², leaves out less than 10⁻¹⁸ of the sum. Only
// beyond ¼ is the closed form used, where its cancellation costs at most
// a factor of about four (bd0 switches at 0.1, where the factor is ten).
func bd0Dev(x, d, e float64) float64 {
	if x == 0 {
		return e
	}
	if math.Abs(d) >= 0.25*(x+e) {
		return x*math.Log(x/e) - d
	}
	v := d / (x + e)
	v2 := v * v
	n := len(bd0Series) // v² < 1/16: the last term is below 10⁻¹⁸
	switch {
	case v2 < 1e-8:
		n = 3
	case v2 < 1e-4:
		n = 5
	case v2 < 1e-2:
		n = 9
	}
	s := 0.0
	for _, c := range slices.Backward(bd0Series[:n]) {
		s = s*v2 + c
	}
	return d*v + 2*x*v*v2*s
}

// bd0Series holds 1/(2j+3), j = 0 … 14.
var bd0Series = [...]float64{1.0 / 3, 1.0 / 5, 1.0 / 7, 1.0 / 9, 1.0 / 11, 1.0 / 13, 1.0 / 15,
	1.0 / 17, 1.0 / 19, 1.0 / 21, 1.0 / 23, 1.0 / 25, 1.0 / 27, 1.0 / 29, 1.0 / 31}

// HypergeomRatio returns P(X1 = k+1)/P(X1 = k) for lo ≤ k < hi:
// (n1−k)(m−k) / ((k+1)(n2−m+k+1)).
func HypergeomRatio(k, n1, n2, m int64) float64 {
	return (float64(n1-k) * float64(m-k)) / (float64(k+1) * float64(n2-m+k+1))
}

// HypergeomSumUp returns Σ_{j ≥ k} P(X1 = j) / P(X1 = k), for k in the
// support where the pmf does not increase from k upward (P(k+1) ≤ P(k)).
func HypergeomSumUp(k, n1, n2, m int64) float64 {
	_, hi := HypergeomSupport(n1, n2, m)
	return RatioSeries(float64(n1-k), float64(m-k), float64(k+1), float64(n2-m+k+1), hi-k)
}

// HypergeomSumDown returns Σ_{j ≤ k} P(X1 = j) / P(X1 = k), for k in the
// support where the pmf does not increase from k downward.
func HypergeomSumDown(k, n1, n2, m int64) float64 {
	lo, _ := HypergeomSupport(n1, n2, m)
	return RatioSeries(float64(k), float64(n2-m+k), float64(n1-k+1), float64(m-k+1), k-lo)
}

// The ratio series. Stepping away from k, successive hypergeometric
// probabilities have the ratios
//
//	upward:   P(k+i+1)/P(k+i) = (a−i)(b−i) / ((c+i)(d+i)),  a = n1−k, b = m−k, c = k+1, d = n2−m+k+1,
//	downward: P(k−i−1)/P(k−i) = (a−i)(b−i) / ((c+i)(d+i)),  a = k, b = n2−m+k, c = n1−k+1, d = m−k+1,
//
// so one loop serves both directions. The numerators and denominators are
// quadratics in i; while they stay below 2⁵³ they are updated by exact
// integer differences (n_{i+1} = n_i − (a+b−2i−1), d_{i+1} = d_i + (c+d+2i+1))
// instead of two products, and two terms are taken per iteration so the
// running product does not wait on itself.

// exactBelow is 2⁵³: integers below it are exact in float64.
const exactBelow = 1 << 53

// RatioSeries returns 1 + Σ_{j=1}^{n} t_j, t_j = Π_{i<j} (a−i)(b−i)/((c+i)(d+i)),
// stopping early once the rest cannot change the sum in double precision.
// The ratios must not increase with i (the hypergeometric pmf is
// log-concave, so they fall on either side of the mode); then after a term
// t with next ratio at most r < 1 the rest is at most t·r/(1−r), and the
// loop stops when that is below 2⁻⁵⁴ of the sum.
func RatioSeries(a, b, c, d float64, n int64) float64 {
	const eps = 0x1p-54
	s, t := 1.0, 1.0
	if fn := float64(n); a*b >= exactBelow || (c+fn)*(d+fn) >= exactBelow {
		for ; n > 0; n-- {
			r := (a * b) / (c * d)
			t *= r
			s += t
			if t*r <= (1-r)*s*eps {
				break
			}
			a, b, c, d = a-1, b-1, c+1, d+1
		}
		return s
	}
	nu, de := a*b, c*d
	en, ed := a+b-1, c+d+1
	for ; n >= 2; n -= 2 {
		nu1, de1 := nu-en, de+ed
		r0, r1 := nu/de, nu1/de1
		nu, de = nu1-(en-2), de1+(ed+2)
		en, ed = en-4, ed+4
		t1 := t * r0
		t *= r0 * r1
		s += t1 + t
		if t*r1 <= (1-r1)*s*eps {
			return s
		}
	}
	if n == 1 {
		s += t * (nu / de)
	}
	return s
}

// RatioWalk follows t_j = t_{j−1}·(a−j+1)(b−j+1)/((c+j−1)(d+j−1)) from
// t_0 = t for j = 1, …, n and stops at the first j with t_j ≤ lim. It
// returns the sum of t_1 … t_{j−1}, that j and t_j; when no term up to t_n
// is at most lim, it returns the sum of t_1 … t_n, j = n+1 and tj = t_n
// (t_0 when n = 0). ok is false when a term passed 2⁹⁶⁰ (the walk then
// gives up; its caller takes another route).
func RatioWalk(a, b, c, d, t, lim float64, n int64) (sum float64, j int64, tj float64, ok bool) {
	const huge = 0x1p960
	if fn := float64(n); a*b >= exactBelow || (c+fn)*(d+fn) >= exactBelow {
		for j = 1; j <= n; j++ {
			t *= (a * b) / (c * d)
			if t <= lim {
				return sum, j, t, true
			}
			if t > huge {
				return sum, j, t, false
			}
			sum += t
			a, b, c, d = a-1, b-1, c+1, d+1
		}
		return sum, j, t, true
	}
	nu, de := a*b, c*d
	en, ed := a+b-1, c+d+1
	for j = 1; j < n; j += 2 {
		nu1, de1 := nu-en, de+ed
		r0, r1 := nu/de, nu1/de1
		nu, de = nu1-(en-2), de1+(ed+2)
		en, ed = en-4, ed+4
		t1 := t * r0
		t2 := t * (r0 * r1)
		if t1 <= lim {
			return sum, j, t1, true
		}
		if t2 <= lim {
			return sum + t1, j + 1, t2, true
		}
		if t2 > huge {
			return sum, j, t, false
		}
		sum += t1 + t2
		t = t2
	}
	if j == n {
		t *= nu / de
		if t <= lim {
			return sum, j, t, true
		}
		sum += t
		j++
	}
	return sum, j, t, true
}

// LogAddExp returns log(eᵃ + eᵇ) without overflow.
func LogAddExp(a, b float64) float64 {
	if math.IsInf(a, -1) {
		return b
	}
	if math.IsInf(b, -1) {
		return a
	}
	if a < b {
		a, b = b, a
	}
	if math.IsInf(a, 1) {
		return a // e^a + e^b is +Inf; a − b would be Inf − Inf
	}
	return a + math.Log1p(math.Exp(b-a))
}
