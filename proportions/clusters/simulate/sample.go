package simulate

import (
	"math"
	"math/rand/v2"

	"gonum.org/v1/gonum/stat/distuv"
)

// sampler draws the random variates of one chunk of simulated studies from
// its own PCG stream, without allocating.
type sampler struct {
	src *rand.PCG
	r   *rand.Rand
}

// newSampler seeds a sampler for one chunk. The chunk's seeds are derived
// from the main seed and the chunk index by SplitMix64 (Steele, Lea and
// Flood 2014, "Fast splittable pseudorandom number generators", OOPSLA),
// so that neighbouring chunks start from unrelated PCG states and the
// numbers of a chunk do not depend on which worker draws them.
func newSampler(seed uint64, stream, chunk uint64) *sampler {
	a := splitMix(seed ^ splitMix(stream+0x9e3779b97f4a7c15*chunk))
	b := splitMix(a ^ splitMix(chunk+1))
	src := rand.NewPCG(a, b)
	return &sampler{src: src, r: rand.New(src)}
}

// splitMix is the finaliser of SplitMix64: a bijective mix of 64 bits.
func splitMix(z uint64) uint64 {
	z += 0x9e3779b97f4a7c15
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}

// logGamma draws the logarithm of a Gamma(a, 1) variate, a > 0, by
// Marsaglia and Tsang's squeeze method (Marsaglia and Tsang 2000, "A simple
// method for generating gamma variables", ACM Transactions on Mathematical
// Software 26(3)); for a < 1 it draws Gamma(a + 1) and multiplies by
// U^(1/a), the boost given in the same paper. Working with the logarithm
// keeps tiny shapes (a high intracluster correlation at a rate near 0 or
// 1) from underflowing to 0, which would make the beta draw 0/0.
func (s *sampler) logGamma(a float64) float64 {
	boost := 0.0
	if a < 1 {
		boost = math.Log(s.r.Float64()) / a // log U^(1/a); U = 0 gives -Inf, a rate of exactly 0 or 1
		a++
	}
	d := a - 1.0/3
	c := 1 / math.Sqrt(9*d)
	for {
		x := s.r.NormFloat64()
		v := 1 + c*x
		if v <= 0 {
			continue
		}
		v = v * v * v
		u := s.r.Float64()
		x2 := x * x
		if u < 1-0.0331*x2*x2 || math.Log(u) < 0.5*x2+d*(1-v+math.Log(v)) {
			return math.Log(d*v) + boost
		}
	}
}

// beta draws a Beta(a, b) variate as G_a / (G_a + G_b) for independent
// gamma variates (the standard construction, e.g. Devroye 1986,
// "Non-Uniform Random Variate Generation", Springer, section IX.4), from
// their logarithms: 1 / (1 + exp(log G_b − log G_a)).
func (s *sampler) beta(a, b float64) float64 {
	la, lb := s.logGamma(a), s.logGamma(b)
	switch {
	case math.IsInf(la, -1) && math.IsInf(lb, -1):
		// Both underflowed: vanishingly rare; choose the end by the means.
		if s.r.Float64() < a/(a+b) {
			return 1
		}
		return 0
	case math.IsInf(la, -1):
		return 0
	case math.IsInf(lb, -1):
		return 1
	}
	return 1 / (1 + math.Exp(lb-la))
}

// inversionLimit bounds n·(−log q) for the inversion sampler, so that
// P(X = 0) = qⁿ stays far above the smallest float64 and the search takes
// at most a few hundred steps.
const inversionLimit = 600

// binomial draws a Binomial(n, p) variate. For the sizes of clusters
// (tens to hundreds of units) it inverts the distribution function by
// sequential search from 0, the BINV algorithm of Kachitvichyanukul and
// Schmeiser (1988, "Binomial random variate generation", Communications of
// the ACM 31(2)): f(0) = qⁿ and f(x) = f(x − 1)·((n + 1)·p/q / x − p/q),
// applied to min(p, 1 − p) so the search is short. Larger clusters go to
// gonum's rejection sampler on the same stream.
func (s *sampler) binomial(n int64, p float64) int64 {
	switch {
	case p <= 0 || n == 0:
		return 0
	case p >= 1:
		return n
	}
	flip := p > 0.5
	if flip {
		p = 1 - p
	}
	q := 1 - p
	var x int64
	if float64(n)*-math.Log1p(-p) < inversionLimit {
		x = s.invert(n, p, q)
	} else {
		x = int64(distuv.Binomial{N: float64(n), P: p, Src: s.src}.Rand())
	}
	if flip {
		return n - x
	}
	return x
}

// invert is BINV's search: subtract f(0), f(1), ... from one uniform.
func (s *sampler) invert(n int64, p, q float64) int64 {
	ratio := p / q
	a := float64(n+1) * ratio
	f := math.Pow(q, float64(n))
	u := s.r.Float64()
	var x int64
	for u > f && x < n {
		u -= f
		x++
		f *= a/float64(x) - ratio
	}
	return x
}
