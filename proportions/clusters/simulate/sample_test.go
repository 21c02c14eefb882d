package simulate

import (
	"math"
	"strconv"
	"testing"
)

// moments returns the mean and the variance of xs, and the standard errors
// of both: σ/√N for the mean, √((m4 − s⁴)/N) for the variance (the
// large-sample variance of a sample variance, with m4 the sample's fourth
// central moment).
func moments(xs []float64) (mean, variance, seMean, seVar float64) {
	n := float64(len(xs))
	for _, x := range xs {
		mean += x
	}
	mean /= n
	var m2, m4 float64
	for _, x := range xs {
		d := (x - mean) * (x - mean)
		m2 += d
		m4 += d * d
	}
	variance = m2 / (n - 1)
	m4 /= n
	return mean, variance, math.Sqrt(variance / n), math.Sqrt(math.Max(m4-variance*variance, 0) / n)
}

// within4 fails when got is more than 4 standard errors from want.
func within4(t *testing.T, what string, got, want, se float64) {
	t.Helper()
	if math.Abs(got-want) > 4*se {
		t.Errorf("%s = %.6g, want %.6g within 4 × %.3g", what, got, want, se)
	}
}

// The beta-binomial sampler's mean and variance match nπ and
// nπ(1 − π)(1 + (n − 1)ρ), the beta-binomial moments with the beta's mean
// π and intraclass correlation ρ = 1/(α + β + 1) (Skellam 1948, J. R.
// Statist. Soc. B 10; the textbook formula), and the beta draws match
// mean π and variance π(1 − π)ρ. Fixed seeds; 4 Monte Carlo SEs.
func TestBetaBinomialMoments(t *testing.T) {
	for _, tc := range []struct {
		n       int64
		pi, icc float64
		draws   int
	}{
		{25, 0.3, 0.1, 200_000}, {25, 0.8, 0.05, 200_000}, {10, 0.05, 0.5, 200_000},
		{40, 0.97, 0.9, 200_000}, {3000, 0.4, 0.02, 50_000}, {25, 0.5, 0, 200_000},
	} {
		d := Design{Correlation: tc.icc}
		a, b, fixed := d.shapes(tc.pi)
		s := newSampler(42, 7, uint64(tc.n))
		rates := make([]float64, tc.draws)
		counts := make([]float64, tc.draws)
		for i := range counts {
			p := tc.pi
			if !fixed {
				p = s.beta(a, b)
			}
			rates[i] = p
			counts[i] = float64(s.binomial(tc.n, p))
		}
		n := float64(tc.n)
		m, v, sm, sv := moments(counts)
		within4(t, "beta-binomial mean", m, n*tc.pi, sm)
		within4(t, "beta-binomial variance", v, n*tc.pi*(1-tc.pi)*(1+(n-1)*tc.icc), sv)
		if !fixed {
			m, v, sm, sv := moments(rates)
			within4(t, "beta mean", m, tc.pi, sm)
			within4(t, "beta variance", v, tc.pi*(1-tc.pi)*tc.icc, sv)
		}
	}
}

// The binomial sampler, by inversion and by gonum's rejection for large
// clusters, matches the binomial probabilities computed independently from
// log-gamma functions: each cell's share within 4 standard errors.
func TestBinomialSamplerProbabilities(t *testing.T) {
	for _, tc := range []struct {
		n int64
		p float64
	}{{10, 0.3}, {10, 0.85}, {25, 0.02}, {2000, 0.5}} {
		const draws = 100_000
		s := newSampler(9, 1, uint64(tc.n))
		hist := map[int64]int{}
		for range draws {
			hist[s.binomial(tc.n, tc.p)]++
		}
		mode := int64(float64(tc.n) * tc.p)
		for x := max(0, mode-3); x <= min(tc.n, mode+3); x++ {
			lg := func(v float64) float64 { l, _ := math.Lgamma(v); return l }
			n, k := float64(tc.n), float64(x)
			pmf := math.Exp(lg(n+1) - lg(k+1) - lg(n-k+1) + k*math.Log(tc.p) + (n-k)*math.Log1p(-tc.p))
			got := float64(hist[x]) / draws
			within4(t, "share at "+itoa(x), got, pmf, math.Sqrt(pmf*(1-pmf)/draws))
		}
	}
}

func itoa(x int64) string { return strconv.FormatInt(x, 10) }
