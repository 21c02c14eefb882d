package proportions

import (
	"math"
	"testing"
)

// bruteNoncentral computes P(X1 < x), P(X1 = x), P(X1 > x) and E[X1] under
// odds ratio ψ directly from C(n1,k)·C(n2,m−k)·ψᵏ with log-gamma, summing
// every value of the support: an independent check of the mode-centred walk.
func bruteNoncentral(c Counts, psi float64, x int64) conditionalSplit {
	m := c.X1 + c.X2
	lo, hi := max(0, m-c.N2), min(c.N1, m)
	logw := func(k int64) float64 {
		return logBinomialCoefficient(float64(c.N1), float64(k)) + logBinomialCoefficient(float64(c.N2), float64(m-k)) + float64(k)*math.Log(psi)
	}
	top := math.Inf(-1)
	for k := lo; k <= hi; k++ {
		top = math.Max(top, logw(k))
	}
	var s conditionalSplit
	total := 0.0
	for k := lo; k <= hi; k++ {
		w := math.Exp(logw(k) - top)
		total += w
		s.mean += float64(k) * w
		switch {
		case k < x:
			s.below += w
		case k == x:
			s.at += w
		default:
			s.above += w
		}
	}
	return conditionalSplit{s.below / total, s.at / total, s.above / total, s.mean / total}
}

func TestNoncentralHypergeomAgainstBruteForce(t *testing.T) {
	cases := []Counts{{3, 10, 7, 12}, {0, 5, 5, 5}, {56, 70, 48, 80}, {500, 1000, 430, 1000}, {2, 1000, 9, 1000}, {189, 11034, 104, 11037}}
	for _, c := range cases {
		d := newNoncentralHypergeom(c)
		for _, psi := range []float64{1e-6, 0.05, 0.5, 1, 1.7, 20, 1e5} {
			got := d.split(psi, c.X1)
			want := bruteNoncentral(c, psi, c.X1)
			for _, pair := range [][2]float64{{got.below, want.below}, {got.at, want.at}, {got.above, want.above}} {
				if math.Abs(pair[0]-pair[1]) > 1e-12+1e-9*pair[1] {
					t.Errorf("%v ψ=%v: got %+v, brute force %+v", c, psi, got, want)
					break
				}
			}
			if math.Abs(got.mean-want.mean) > 1e-9*math.Max(1, want.mean) {
				t.Errorf("%v ψ=%v: mean %v, brute force %v", c, psi, got.mean, want.mean)
			}
		}
	}
}

// TestConditionalLimitsSolveTheirEquations checks the exact and mid-p
// limits against their defining tail equations, with tails from the
// brute-force distribution, at n = 1000 per group and at small n.
func TestConditionalLimitsSolveTheirEquations(t *testing.T) {
	conf, _ := NewConfidence(0.95)
	for _, c := range []Counts{{500, 1000, 430, 1000}, {2, 1000, 9, 1000}, {4, 9, 1, 11}} {
		for _, w := range []float64{1, 0.5} {
			lo, hi := conditionalTailLimits(c, conf, w)
			s := bruteNoncentral(c, lo, c.X1)
			if got := s.above + w*s.at; math.Abs(got-0.025) > 1e-9 {
				t.Errorf("%v w=%v lower %v: upper tail %v, want 0.025", c, w, lo, got)
			}
			s = bruteNoncentral(c, hi, c.X1)
			if got := s.below + w*s.at; math.Abs(got-0.025) > 1e-9 {
				t.Errorf("%v w=%v upper %v: lower tail %v, want 0.025", c, w, hi, got)
			}
		}
	}
}

// logBinomialCoefficient returns log C(n, k) from log-gamma.
func logBinomialCoefficient(n, k float64) float64 {
	a, _ := math.Lgamma(n + 1)
	b, _ := math.Lgamma(k + 1)
	c, _ := math.Lgamma(n - k + 1)
	return a - b - c
}

// bruteSterneP returns Σ f_ψ(k) over tables with f_ψ(k) ≤ f_ψ(x1), from the
// brute-force log-gamma distribution.
func bruteSterneP(c Counts, psi float64) float64 {
	m := c.X1 + c.X2
	lo, hi := max(0, m-c.N2), min(c.N1, m)
	logw := func(k int64) float64 {
		return logBinomialCoefficient(float64(c.N1), float64(k)) + logBinomialCoefficient(float64(c.N2), float64(m-k)) + float64(k)*math.Log(psi)
	}
	lx := logw(c.X1)
	var in, total float64
	for k := lo; k <= hi; k++ {
		w := math.Exp(logw(k) - lx)
		total += w
		if w <= 1+1e-7 {
			in += w
		}
	}
	return in / total
}

// TestBaptistaPikeDefinition checks the Baptista–Pike limits against their
// definition on a dense grid of odds ratios, with p(ψ) from the brute-force
// distribution: no ψ outside [lower, upper] is accepted (p > α), and ψ just
// inside each finite limit is.
func TestBaptistaPikeDefinition(t *testing.T) {
	const alpha = 0.05
	conf, _ := NewConfidence(1 - alpha)
	for _, c := range []Counts{{2, 5, 3, 6}, {4, 9, 1, 11}, {6, 12, 1, 15}, {12, 40, 5, 38}, {0, 8, 5, 9}, {8, 8, 3, 9}, {30, 200, 12, 180}} {
		lo, hi := BaptistaPike.Limits(c, conf)
		for t0 := -12.0; t0 <= 12; t0 += 0.001 {
			psi := math.Exp(t0)
			if (psi < lo*(1-1e-7) || psi > hi*(1+1e-7)) && bruteSterneP(c, psi) > alpha {
				t.Errorf("%v: ψ = %v outside (%v, %v) has p = %v > α", c, psi, lo, hi, bruteSterneP(c, psi))
				break
			}
		}
		if lo > 0 && bruteSterneP(c, lo*(1+1e-6)) <= alpha {
			t.Errorf("%v: just above the lower limit %v p = %v ≤ α", c, lo, bruteSterneP(c, lo*(1+1e-6)))
		}
		if !math.IsInf(hi, 1) && bruteSterneP(c, hi*(1-1e-6)) <= alpha {
			t.Errorf("%v: just below the upper limit %v p = %v ≤ α", c, hi, bruteSterneP(c, hi*(1-1e-6)))
		}
	}
}
