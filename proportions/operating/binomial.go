package operating

// tailCut is the relative probability below which a binomial tail is
// skipped, on each side. Coverage, size and power are sums of binomial
// probabilities in [0, 1], so a skipped mass of at most 2·10⁻¹⁶ cannot
// change them at double precision.
const tailCut = 1e-16

// binomial holds the probabilities b(k; n, π) for k in [lo, hi], the range
// outside which each tail holds less than tailCut of the mass. p is indexed
// by k itself (p[k] for lo ≤ k ≤ hi; other entries are stale).
type binomial struct {
	n, lo, hi int
	p         []float64
}

// fill computes the probabilities of Bin(n, pi) into buf (length ≥ n+1).
//
// The weights start at 1 at the mode and follow the ratio
// b(k+1)/b(k) = (n−k)/(k+1) · π/(1−π) outwards; they are normalised by their
// sum, which avoids the rounding of log-gamma functions and any underflow.
// Beyond the mode the ratios decrease, so once the ratio r at the next term
// is below 1 the whole remaining tail is at most w/(1−r); the walk stops
// when that bound falls below tailCut times the sum so far.
func (b *binomial) fill(n int, pi float64, buf []float64) {
	b.n, b.p = n, buf[:n+1]
	switch {
	case pi <= 0:
		b.lo, b.hi, b.p[0] = 0, 0, 1
		return
	case pi >= 1:
		b.lo, b.hi, b.p[n] = n, n, 1
		return
	}
	odds := pi / (1 - pi)
	mode := int(float64(n+1) * pi)
	if mode > n {
		mode = n
	}
	p := b.p
	p[mode] = 1
	sum := 1.0
	hi := mode
	for w := 1.0; hi < n; {
		w *= float64(n-hi) / float64(hi+1) * odds // weight of hi+1
		hi++
		p[hi] = w
		sum += w
		if hi < n {
			if r := float64(n-hi) / float64(hi+1) * odds; r < 1 && w*r/(1-r) < tailCut*sum {
				break
			}
		}
	}
	lo := mode
	for w := 1.0; lo > 0; {
		w *= float64(lo) / float64(n-lo+1) / odds // weight of lo−1
		lo--
		p[lo] = w
		sum += w
		if lo > 0 {
			if r := float64(lo) / float64(n-lo+1) / odds; r < 1 && w*r/(1-r) < tailCut*sum {
				break
			}
		}
	}
	b.lo, b.hi = lo, hi
	inv := 1 / sum
	for k := lo; k <= hi; k++ {
		p[k] *= inv
	}
}

// prefix fills cum (length ≥ n+2) with cum[k] = Σ_{j<k} b(j), for every k
// in 0..n+1 (0 below the kept range, the kept total above it).
func (b *binomial) prefix(cum []float64) {
	for k := 0; k <= b.lo; k++ {
		cum[k] = 0
	}
	s := 0.0
	for k := b.lo; k <= b.hi; k++ {
		s += b.p[k]
		cum[k+1] = s
	}
	for k := b.hi + 2; k <= b.n+1; k++ {
		cum[k] = s
	}
}
