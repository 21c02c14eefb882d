package proportions

import (
	"context"

	"github.com/propscope/propscope/internal/special"
)

// noncentralHypergeom is Fisher's noncentral hypergeometric distribution:
// the distribution of X1, the events in the first group, given both group
// sizes and the total number of events m = x1 + x2, when the odds ratio is
// ψ:
//
//	P(X1 = k) ∝ C(n1, k)·C(n2, m−k)·ψᵏ,   max(0, m−n2) ≤ k ≤ min(n1, m)
//
// (Cornfield J 1956, "A statistical problem arising from retrospective
// studies", Proc. Third Berkeley Symposium 4:135–148; Fisher's 1935 exact
// test is the case ψ = 1, see hypergeom.go). All the exact conditional
// odds-ratio methods work with it.
//
// Probabilities are computed relative to the most probable value: its weight
// is 1 and the others follow from the ratio recurrence
// P(k+1)/P(k) = ψ·(n1−k)(m−k)/((k+1)(n2−m+k+1)) walking outward. The
// distribution is log-concave, so the weights fall steadily away from the
// mode; the walk stops once a weight no longer changes the running sum at
// double precision. Nothing overflows or underflows whatever ψ (e^±300 is
// used) and no table of weights is stored, so a call does not allocate; the
// cost is proportional to the spread of the distribution, about 20 standard
// deviations of terms, a few hundred at n = 1000 per group.
type noncentralHypergeom struct {
	n1, n2, m int64
	lo, hi    int64
	// ctx, set by the cancellable interval methods (nil elsewhere), ends
	// the walks early once it is done: every walk then stops within
	// stopEvery terms, the root searches run out on meaningless sums in
	// microseconds, and the caller returns ctx's error instead of them.
	ctx context.Context
}

// stopEvery is how many terms a walk takes between looks at its context:
// about 40 µs of work, so a cancel is seen at once without slowing the walk.
const stopEvery = 4096

// stopped reports whether the walk's context has ended.
func (d noncentralHypergeom) stopped() bool { return d.ctx != nil && d.ctx.Err() != nil }

// stoppedAt is stopped, looked at only on every stopEvery-th step k.
func (d noncentralHypergeom) stoppedAt(k int64) bool {
	return d.ctx != nil && k%stopEvery == 0 && d.ctx.Err() != nil
}

// newNoncentralHypergeom returns the conditional distribution given the
// margins of the counts.
func newNoncentralHypergeom(c Counts) noncentralHypergeom {
	m := c.X1 + c.X2
	lo, hi := special.HypergeomSupport(c.N1, c.N2, m)
	return noncentralHypergeom{n1: c.N1, n2: c.N2, m: m, lo: lo, hi: hi}
}

// ratio returns P(k+1)/P(k) under ψ for lo ≤ k < hi.
func (d noncentralHypergeom) ratio(k int64, psi float64) float64 {
	return special.HypergeomRatio(k, d.n1, d.n2, d.m) * psi
}

// mode returns a most probable value under ψ: the smallest k whose ratio
// P(k+1)/P(k) is below 1 (the ratios decrease in k), found by bisection.
func (d noncentralHypergeom) mode(psi float64) int64 {
	lo, hi := d.lo, d.hi
	for lo < hi {
		mid := lo + (hi-lo)/2
		if d.ratio(mid, psi) < 1 {
			hi = mid
		} else {
			lo = mid + 1
		}
	}
	return lo
}

// conditionalSplit describes the distribution under ψ around a value x:
// the probabilities below, at and above x, and the mean.
type conditionalSplit struct {
	below, at, above, mean float64
}

// split returns P(X1 < x), P(X1 = x), P(X1 > x) and E[X1] under ψ.
func (d noncentralHypergeom) split(psi float64, x int64) conditionalSplit {
	mode := d.mode(psi)
	var below, at, above, moment float64 // moment = Σ (k − mode)·w
	total := d.walkFrom(mode, psi, func(k int64, w float64) {
		switch {
		case k < x:
			below += w
		case k == x:
			at += w
		default:
			above += w
		}
		moment += float64(k-mode) * w
	})
	return conditionalSplit{below / total, at / total, above / total, float64(mode) + moment/total}
}

// walk calls visit(k, w) for every value k that carries weight under ψ,
// with w its probability relative to the mode's, and returns the sum of
// the weights (the normalising constant relative to the mode).
func (d noncentralHypergeom) walk(psi float64, visit func(k int64, w float64)) float64 {
	return d.walkFrom(d.mode(psi), psi, visit)
}

func (d noncentralHypergeom) walkFrom(mode int64, psi float64, visit func(k int64, w float64)) float64 {
	visit(mode, 1)
	total, w := 1.0, 1.0
	for k := mode; k < d.hi; k++ {
		w *= d.ratio(k, psi)
		if w < total*1e-17 || d.stoppedAt(k-mode) {
			break
		}
		visit(k+1, w)
		total += w
	}
	w = 1.0
	for k := mode; k > d.lo; k-- {
		w /= d.ratio(k-1, psi)
		if w < total*1e-17 || d.stoppedAt(mode-k) {
			break
		}
		visit(k-1, w)
		total += w
	}
	return total
}
