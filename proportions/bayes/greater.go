package bayes

import (
	"math"

	"github.com/propscope/propscope/proportions"
)

// ProbabilityFirstHigher returns P(π1 > π2) and P(π1 < π2) for independent
// beta posteriors (ties have probability 0), each computed directly, with
// an error estimate, and whether the exact finite sum was used.
//
// Exact finite sum. When one posterior, say π1 ~ Beta(α1, β1), has
// whole-number shapes, π1 is distributed as the α1-th smallest of
// N = α1 + β1 − 1 independent uniform variables, so P(π1 ≤ y) =
// P(Binomial(N, y) ≥ α1) and, averaging over π2 ~ Beta(α2, β2),
//
//	P(π1 ≤ π2) = Σ_{k=α1}^{N} C(N, k)·B(α2 + k, β2 + N − k)/B(α2, β2),
//
// a tail of the beta-binomial distribution (N, α2, β2). The sum runs in
// log space from its first term, through the ratio of neighbouring terms
// (N−k)(α2+k)/((k+1)(β2+N−k−1)), over the tail that does not hold the
// beta-binomial's peak; the other probability is one minus it. For
// α2, β2 ≥ 1 the terms are log-concave, so the walk stops when the rest is
// bounded below 10⁻¹⁸ of the sum by a geometric series. Otherwise the
// whole tail is summed. The error estimate covers that bound, rounding,
// and the log-gamma evaluations of the first term.
//
// Otherwise the bounded integral of the difference's posterior (see
// Effect) for the smaller of the two probabilities, the side the posterior
// means point away from, and the larger as one minus it. Identical posteriors give exactly ½ by symmetry.
func ProbabilityFirstHigher(first, second Posterior) (higher, lower, err float64, exact bool) {
	return probabilityFirstHigher(first, second, nil)
}

// probabilityFirstHigher is ProbabilityFirstHigher integrating on diff,
// the posterior of the difference of the same two rates, when the caller
// has it (nil: it is made here).
func probabilityFirstHigher(first, second Posterior, diff *Effect) (higher, lower, err float64, exact bool) {
	if first.EventShape == second.EventShape && first.NonEventShape == second.NonEventShape {
		return 0.5, 0.5, 0, isWhole(first)
	}
	if isWhole(first) {
		le, gt, er := wholeShapeSum(first, second) // P(π1 ≤ π2), P(π1 > π2)
		return gt, le, er, true
	}
	if isWhole(second) {
		le, gt, er := wholeShapeSum(second, first) // P(π2 ≤ π1), P(π2 > π1)
		return le, gt, er, true
	}
	// the integral of the smaller probability (the side the posterior
	// means point away from), the other as one minus it: the smaller keeps
	// its relative precision, the larger its absolute precision
	e := diff
	if e == nil {
		e = newEffect(proportions.Difference, first, second)
	}
	if first.Mean() >= second.Mean() {
		below, er := e.tail1(0, false)
		return clamp01(1 - below), below, er, false
	}
	above, er := e.tail1(0, true)
	return above, clamp01(1 - above), er, false
}

// wholeShapeWalkLimit is the longest beta-binomial tail summed term by
// term (above it the integral is used).
const wholeShapeWalkLimit = 1 << 24

func isWhole(p Posterior) bool {
	a, b := p.EventShape, p.NonEventShape
	return a >= 1 && b >= 1 && a == math.Trunc(a) && b == math.Trunc(b) && a+b <= wholeShapeWalkLimit
}

// wholeShapeSum returns P(X ≤ Y) and P(X > Y) for X ~ p (whole shapes) and
// Y ~ q, by the beta-binomial tail sum.
func wholeShapeSum(p, q Posterior) (le, gt, err float64) {
	a1 := p.EventShape
	n := a1 + p.NonEventShape - 1
	a, b := q.EventShape, q.NonEventShape
	logTerm := func(k float64) float64 {
		lc, _ := math.Lgamma(n + 1)
		l1, _ := math.Lgamma(k + 1)
		l2, _ := math.Lgamma(n - k + 1)
		return lc - l1 - l2 + lbeta(a+k, b+n-k) - q.lbeta
	}
	// ratio of term k+1 to term k
	ratio := func(k float64) float64 { return (n - k) * (a + k) / ((k + 1) * (b + n - k - 1)) }
	logConcave := a >= 1 && b >= 1
	// Sum the tail away from the peak: if the terms still rise at a1 − 1
	// → a1, the peak is at or above a1, so sum k ≤ a1 − 1 downwards.
	up := !(a1 >= 1 && ratio(a1-1) > 1)
	var start float64
	if up {
		start = a1
	} else {
		start = a1 - 1
	}
	l0 := logTerm(start)
	sum, term := 1.0, 1.0 // relative to the first term
	steps := 0.0
	var rest float64
	for k := start; ; {
		var r float64
		if up {
			if k >= n {
				rest = 0 // the whole tail is summed
				break
			}
			r = ratio(k)
			k++
		} else {
			if k <= 0 {
				rest = 0 // the whole tail is summed
				break
			}
			r = 1 / ratio(k-1)
			k--
		}
		term *= r
		sum += term
		steps++
		if logConcave && r < 1 {
			if rest = term * r / (1 - r); rest < 1e-18*sum {
				break
			}
		}
		if term == 0 {
			break
		}
	}
	tail := math.Exp(l0 + math.Log(sum))
	// log-gamma of arguments near n carries an absolute error of about
	// 2⁻⁵² times its size; rounding adds about one ulp per step
	lgErr := 4 * 0x1p-52 * (math.Abs(l0) + 3*(n+a+b)*math.Log(n+a+b+2))
	err = tail*(lgErr+steps*0x1p-52+rest/sum) + 0x1p-53
	if up {
		return clamp01(tail), clamp01(1 - tail), err
	}
	return clamp01(1 - tail), clamp01(tail), err
}

func lbeta(a, b float64) float64 {
	la, _ := math.Lgamma(a)
	lb, _ := math.Lgamma(b)
	lab, _ := math.Lgamma(a + b)
	return la + lb - lab
}
