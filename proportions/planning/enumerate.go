package planning

import (
	"context"
	"math"
	"runtime"
	"sync"

	"github.com/propscope/propscope/proportions"
)

// tailCut is the probability below which a binomial tail is left out of an
// enumeration, on each side of each group: power is a sum of probabilities
// in [0, 1], so leaving out at most 4·10⁻¹⁶ cannot change it at double
// precision.
const tailCut = 1e-16

// binomialRange holds b(k; n, π) for lo ≤ k ≤ hi, the range outside which
// each tail holds less than tailCut; p[k−lo] = b(k).
type binomialRange struct {
	lo, hi int64
	p      []float64
}

// newBinomialRange computes the probabilities from the mode outwards with
// the ratio b(k+1)/b(k) = (n−k)/(k+1)·π/(1−π), normalised by their sum.
// Past the mode the ratios shrink, so once the next ratio r is below 1 the
// remaining tail is at most w·r/(1−r) and the walk stops when that is below
// tailCut of the sum.
func newBinomialRange(n int64, pi float64) binomialRange {
	switch {
	case pi <= 0:
		return binomialRange{0, 0, []float64{1}}
	case pi >= 1:
		return binomialRange{n, n, []float64{1}}
	}
	odds := pi / (1 - pi)
	mode := min(n, int64(float64(n+1)*pi))
	var up, down []float64 // weights above and below the mode
	sum := 1.0
	for k, w := mode, 1.0; k < n; k++ {
		r := float64(n-k) / float64(k+1) * odds
		w *= r
		up = append(up, w)
		sum += w
		if next := float64(n-k-1) / float64(k+2) * odds; next < 1 && w*next/(1-next) < tailCut*sum {
			break
		}
	}
	for k, w := mode, 1.0; k > 0; k-- {
		r := float64(k) / float64(n-k+1) / odds
		w *= r
		down = append(down, w)
		sum += w
		if next := float64(k-1) / float64(n-k+2) / odds; next < 1 && w*next/(1-next) < tailCut*sum {
			break
		}
	}
	b := binomialRange{lo: mode - int64(len(down)), hi: mode + int64(len(up))}
	b.p = make([]float64, 0, len(down)+1+len(up))
	for i := len(down) - 1; i >= 0; i-- {
		b.p = append(b.p, down[i]/sum)
	}
	b.p = append(b.p, 1/sum)
	for _, w := range up {
		b.p = append(b.p, w/sum)
	}
	return b
}

// decision is the design's rejection rule for one test.
type decision struct {
	test       proportions.TestMethod
	hypotheses []proportions.Hypothesis
}

func (dc decision) rejects(c proportions.Counts) bool {
	return proportions.Rejects(dc.test, dc.hypotheses, c)
}

// enumeratePower returns the exact power
//
//	Σ_{x1} Σ_{x2} b(x1; n1, π1)·b(x2; n2, π2)·1{the design rejects at (x1, x2)},
//
// running the test on every outcome whose probability is not negligible
// (tails below tailCut left out), with the rows x1 shared among the cores.
func enumeratePower(ctx context.Context, dc decision, n1, n2 int64, p1, p2 float64) (float64, error) {
	b1, b2 := newBinomialRange(n1, p1), newBinomialRange(n2, p2)
	rows := make([]float64, len(b1.p))
	err := forRows(ctx, len(b1.p), func(i int) {
		c := proportions.Counts{X1: b1.lo + int64(i), N1: n1, N2: n2}
		s := 0.0
		for j, q := range b2.p {
			c.X2 = b2.lo + int64(j)
			if dc.rejects(c) {
				s += q
			}
		}
		rows[i] = b1.p[i] * s
	})
	if err != nil {
		return 0, err
	}
	total := 0.0
	for _, r := range rows {
		total += r
	}
	return math.Min(1, total), nil
}

// forRows calls f(i) for i in [0, n) on every core, in interleaved order so
// that rows of similar cost spread evenly; it stops early when ctx is done
// and then returns its error.
func forRows(ctx context.Context, n int, f func(i int)) error {
	workers := min(runtime.GOMAXPROCS(0), max(n, 1))
	var wg sync.WaitGroup
	for w := range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := w; i < n; i += workers {
				if ctx.Err() != nil {
					return
				}
				f(i)
			}
		}()
	}
	wg.Wait()
	return ctx.Err()
}
