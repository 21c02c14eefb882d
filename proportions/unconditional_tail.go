package proportions

import (
	"math"

	"github.com/propscope/propscope/internal/special"
)

// tailWork holds the scratch arrays for evaluating a region's probability
// under two independent binomials, reused across nuisance values.
type tailWork struct {
	b1, b2   []float64 // binomial probabilities of the two groups
	pre, suf []float64 // prefix and suffix sums of b2 over its window
	lb1, lb2 []float64 // log probabilities, for the log-space slow path
	recip    []float64 // recip[k] = 1/k, k ≥ 1, so the recurrences need no division
	evals    int       // number of evaluations (for tests and cost notes)
}

func newTailWork(n1, n2 int) *tailWork {
	recip := make([]float64, max(n1, n2)+2)
	for k := 1; k < len(recip); k++ {
		recip[k] = 1 / float64(k)
	}
	return &tailWork{
		b1: make([]float64, n1+1), b2: make([]float64, n2+1),
		pre: make([]float64, n2+2), suf: make([]float64, n2+2),
		recip: recip,
	}
}

// fillBinomial writes the Binomial(n, p) probabilities into b from the mode
// outward by the ratio recurrence, stopping where they fall below cutoff,
// and returns the window [lo, hi] that was written (entries outside it are
// stale and must not be read). The mode's value comes from the saddle-point
// log pmf, so no step multiplies more than a ratio; the recurrence keeps
// ~1e−13 relative accuracy over the window.
// recip[k] must hold 1/k for 1 ≤ k ≤ n.
func fillBinomial(b []float64, n int, p, cutoff float64, recip []float64) (lo, hi int) {
	q := 1 - p
	switch {
	case p <= 0:
		b[0] = 1
		return 0, 0
	case q <= 0:
		b[n] = 1
		return n, n
	}
	mode := min(int(float64(n+1)*p), n)
	b[mode] = math.Exp(special.LogBinomPMF(float64(mode), float64(n), p, q))
	odds := p / q
	hi = mode
	for k := mode; k < n; k++ {
		v := b[k] * float64(n-k) * recip[k+1] * odds
		if v < cutoff || v == 0 {
			break
		}
		b[k+1] = v
		hi = k + 1
	}
	lo = mode
	inv := q / p
	for k := mode; k > 0; k-- {
		v := b[k] * float64(k) * recip[n-k+1] * inv
		if v < cutoff || v == 0 {
			break
		}
		b[k-1] = v
		lo = k - 1
	}
	return lo, hi
}

// fill computes both groups' binomial terms at (p1, p2) above cutoff
// and the second group's prefix and suffix sums over its window, for prob
// and probErr; it returns the two windows.
func (w *tailWork) fill(r *region, p1, p2, cutoff float64) (l1, h1, l2, h2 int) {
	l1, h1 = fillBinomial(w.b1, r.n1, p1, cutoff, w.recip)
	l2, h2 = fillBinomial(w.b2, r.n2, p2, cutoff, w.recip)
	pre, suf, b2 := w.pre, w.suf, w.b2
	pre[l2] = 0
	for j := l2; j <= h2; j++ {
		pre[j+1] = pre[j] + b2[j]
	}
	suf[h2+1] = 0
	for j := h2; j >= l2; j-- {
		suf[j] = suf[j+1] + b2[j]
	}
	return l1, h1, l2, h2
}

// prob returns the probability of the region when X1 ~ Binomial(n1, p1) and
// X2 ~ Binomial(n2, p2) independently:
//
//	Σ_x1 b1(x1) · Σ_runs [B2(hi) − B2(lo−1)],
//
// with B2 the distribution function of X2. Each run's mass is taken as a
// difference of prefix sums or of suffix sums, whichever subtracts the
// smaller numbers, so tail runs keep their relative accuracy. Binomial
// terms below cutoff are skipped: with cutoff = ε·T/(n1+n2+2) the result is
// low by at most about ε·T, where T is the probability sought, so callers
// set ε relative to the p-value (not to 1) and tiny p-values stay accurate.
func (w *tailWork) prob(r *region, p1, p2, cutoff float64) float64 {
	w.evals++
	l1, h1, l2, h2 := w.fill(r, p1, p2, cutoff)
	pre, suf := w.pre, w.suf
	total := 0.0
	for x1 := l1; x1 <= h1; x1++ {
		row := 0.0
		for _, run := range r.runs[r.rowStart[x1]:r.rowStart[x1+1]] {
			a, b := max(int(run[0]), l2), min(int(run[1]), h2)
			if a > b {
				continue
			}
			if pre[b+1] < suf[a] {
				row += pre[b+1] - pre[a]
			} else {
				row += suf[a] - suf[b+1]
			}
		}
		total += w.b1[x1] * row
	}
	return total
}

// logProb returns the log of the region's probability, term by term in log
// space: the slow path for regions whose probability is below the float64
// range at every nuisance value (O(number of tables in the region)).
func (w *tailWork) logProb(r *region, p1, p2 float64) float64 {
	w.evals++
	if len(w.lb1) == 0 {
		w.lb1, w.lb2 = make([]float64, r.n1+1), make([]float64, r.n2+1)
	}
	for k := range w.lb1 {
		w.lb1[k] = special.LogBinomPMF(float64(k), float64(r.n1), p1, 1-p1)
	}
	for k := range w.lb2 {
		w.lb2[k] = special.LogBinomPMF(float64(k), float64(r.n2), p2, 1-p2)
	}
	total := math.Inf(-1)
	for x1 := 0; x1 <= r.n1; x1++ {
		if math.IsInf(w.lb1[x1], -1) {
			continue
		}
		runs := r.runs[r.rowStart[x1]:r.rowStart[x1+1]]
		top := math.Inf(-1)
		for _, run := range runs {
			for x2 := run[0]; x2 <= run[1]; x2++ {
				top = max(top, w.lb2[x2])
			}
		}
		if math.IsInf(top, -1) {
			continue
		}
		sum := 0.0
		for _, run := range runs {
			for x2 := run[0]; x2 <= run[1]; x2++ {
				sum += math.Exp(w.lb2[x2] - top)
			}
		}
		total = special.LogAddExp(total, w.lb1[x1]+top+math.Log(sum))
	}
	return total
}
