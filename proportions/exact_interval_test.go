package proportions

import (
	"math"
	"testing"
)

// restrictedByLikelihood maximises the log-likelihood
// x1 log π1 + (n1−x1) log(1−π1) + x2 log π2 + (n2−x2) log(1−π2) along
// π1 = π2 + δ by golden-section search: an independent route to the
// restricted estimates (the likelihood is concave in π2).
func restrictedByLikelihood(c Counts, delta float64) (float64, float64) {
	ll := func(p2 float64) float64 {
		p1 := p2 + delta
		term := func(x, n int64, p float64) float64 {
			v := 0.0
			if x > 0 {
				v += float64(x) * math.Log(p)
			}
			if n-x > 0 {
				v += float64(n-x) * math.Log1p(-p)
			}
			return v
		}
		return term(c.X1, c.N1, p1) + term(c.X2, c.N2, p2)
	}
	a, b := max(0, -delta), min(1, 1-delta)
	const g = 0.6180339887498949
	for range 200 {
		m1, m2 := b-g*(b-a), a+g*(b-a)
		if ll(m1) < ll(m2) {
			a = m1
		} else {
			b = m2
		}
	}
	p2 := (a + b) / 2
	return p2 + delta, p2
}

// TestExactRestricted compares the closed-form restricted estimates with a
// direct maximisation of the likelihood and with the library's score-test
// solver (RestrictedMLE, a separate implementation).
func TestExactRestricted(t *testing.T) {
	for _, c := range []Counts{{3, 10, 5, 10}, {0, 7, 4, 9}, {7, 7, 0, 5}, {56, 70, 48, 80}, {1, 30, 0, 50}} {
		for _, d := range []float64{-0.9, -0.4, -0.1, 0.05, 0.3, 0.8} {
			q1, q2 := exactRestricted(c.P1(), float64(c.N1), c.P2(), float64(c.N2), d)
			w1, w2 := restrictedByLikelihood(c, d)
			if math.Abs(q1-w1) > 1e-6 || math.Abs(q2-w2) > 1e-6 {
				t.Errorf("%v δ=%v: (%.8f, %.8f), likelihood maximum at (%.8f, %.8f)", c, d, q1, q2, w1, w2)
			}
			r1, r2 := RestrictedMLE(c, d)
			if math.Abs(q1-r1) > 1e-9 || math.Abs(q2-r2) > 1e-9 {
				t.Errorf("%v δ=%v: (%.10f, %.10f), RestrictedMLE (%.10f, %.10f)", c, d, q1, q2, r1, r2)
			}
		}
	}
}

// bruteScoreZ returns the score statistic of each table of c's design at
// δ, with the restricted estimates found by likelihood maximisation (no
// closed form): the slow, independent definition the brute-force checks use.
func bruteScoreZ(c Counts, delta float64) func(x1, x2 int64) float64 {
	return func(x1, x2 int64) float64 {
		t := Counts{x1, c.N1, x2, c.N2}
		q1, q2 := restrictedByLikelihood(t, delta)
		return zRatio(t.P1()-t.P2()-delta, q1*(1-q1)/float64(c.N1)+q2*(1-q2)/float64(c.N2))
	}
}

// bruteScoreP is the exact unconditional score-test p-value at δ computed
// the slow way: restricted estimates by likelihood maximisation for every
// table, the tail summed table by table, the supremum over 1000 grid values
// of π2 plus golden refinement around the best.
func bruteScoreP(c Counts, delta float64, side regionSide) float64 {
	z := bruteScoreZ(c, delta)
	obs := z(c.X1, c.X2)
	in := make([][]bool, c.N1+1)
	for x1 := range in {
		in[x1] = make([]bool, c.N2+1)
		for x2 := range in[x1] {
			v := z(int64(x1), int64(x2))
			switch side {
			case sideGreater:
				in[x1][x2] = v >= obs-1e-7*math.Abs(obs)
			case sideLess:
				in[x1][x2] = v <= obs+1e-7*math.Abs(obs)
			default:
				in[x1][x2] = math.Abs(v) >= math.Abs(obs)*(1-1e-7)
			}
		}
	}
	tail := func(p2 float64) float64 {
		b1, b2 := binomTable(c.N1, min(max(p2+delta, 0), 1)), binomTable(c.N2, p2)
		s := 0.0
		for x1 := range in {
			for x2 := range in[x1] {
				if in[x1][x2] {
					s += b1[x1] * b2[x2]
				}
			}
		}
		return s
	}
	a, b := max(0, -delta), min(1, 1-delta)
	best, at := 0.0, a
	for i := 0; i <= 1000; i++ {
		p := a + (b-a)*float64(i)/1000
		if v := tail(p); v > best {
			best, at = v, p
		}
	}
	lo, hi := max(a, at-(b-a)/1000), min(b, at+(b-a)/1000)
	for range 60 {
		m1, m2 := hi-0.618*(hi-lo), lo+0.618*(hi-lo)
		if tail(m1) < tail(m2) {
			lo = m1
		} else {
			hi = m2
		}
	}
	return max(best, tail((lo+hi)/2))
}

// TestExactIntervalBruteForce checks each limit of the Chan–Zhang and
// Agresti–Min intervals against the slow p-value: the reported limit is
// rejected (p ≤ α/2, or α) and a value within 1e−6 inside it is not.
func TestExactIntervalBruteForce(t *testing.T) {
	conf, _ := NewConfidence(0.95)
	for _, c := range []Counts{{3, 10, 5, 10}, {7, 9, 2, 8}, {0, 6, 3, 7}, {5, 5, 5, 6}} {
		for _, m := range []IntervalMethod{ChanZhang, AgrestiMin} {
			lo, hi := m.Limits(c, conf)
			side, alpha := sideGreater, 0.025
			if m.Key == AgrestiMin.Key {
				side, alpha = sideBoth, 0.05
			}
			check := func(which string, cc Counts, limit float64, sd regionSide) {
				if limit <= -1 {
					return
				}
				if p := bruteScoreP(cc, limit, sd); p > alpha*(1+1e-6) {
					t.Errorf("%s %v %s limit %.7f: brute-force p %.8g should be ≤ %v", m.Key, c, which, limit, p, alpha)
				}
				ok := false
				for k := 1; k <= 4 && !ok; k++ {
					ok = bruteScoreP(cc, limit+float64(k)*0.3e-6, sd) > alpha*(1-1e-6)
				}
				if !ok {
					t.Errorf("%s %v %s limit %.7f: no value within 1.2e-6 inside is accepted", m.Key, c, which, limit)
				}
			}
			check("lower", c, lo, side)
			check("upper", c.Swapped(), -hi, side)
			if d := c.P1() - c.P2(); !(lo <= d && d <= hi) {
				t.Errorf("%s %v: [%v, %v] misses the estimate %v", m.Key, c, lo, hi, d)
			}
		}
	}
}

// TestExactIntervalCoverage computes the exact coverage of both intervals
// at n1 = 7, n2 = 6 and n1 = n2 = 10 on a 39×39 grid of (π1, π2): by
// construction it is at least 95% everywhere (the defining property of an
// exact interval), which a wrong supremum or a wrong limit search breaks.
func TestExactIntervalCoverage(t *testing.T) {
	for _, d := range [][2]int64{{7, 6}, {10, 10}} {
		for _, m := range []IntervalMethod{ChanZhang, AgrestiMin} {
			exactCoverageAtLeast(t, m, d[0], d[1])
		}
	}
}

func exactCoverageAtLeast(t *testing.T, m IntervalMethod, n1, n2 int64) {
	conf, _ := NewConfidence(0.95)
	{
		lim := make([][][2]float64, n1+1)
		for x1 := int64(0); x1 <= n1; x1++ {
			lim[x1] = make([][2]float64, n2+1)
			for x2 := int64(0); x2 <= n2; x2++ {
				lo, hi := m.Limits(Counts{x1, n1, x2, n2}, conf)
				if math.IsNaN(lo) || math.IsNaN(hi) || lo > hi {
					t.Fatalf("%s (%d,%d): [%v, %v]", m.Key, x1, x2, lo, hi)
				}
				lim[x1][x2] = [2]float64{lo, hi}
			}
		}
		worst := 1.0
		for i := 1; i <= 39; i++ {
			for j := 1; j <= 39; j++ {
				p1, p2 := float64(i)/40, float64(j)/40
				cov := 0.0
				for x1 := int64(0); x1 <= n1; x1++ {
					for x2 := int64(0); x2 <= n2; x2++ {
						if l := lim[x1][x2]; l[0] <= p1-p2 && p1-p2 <= l[1] {
							cov += binomDirect(x1, n1, p1) * binomDirect(x2, n2, p2)
						}
					}
				}
				worst = min(worst, cov)
			}
		}
		if worst < 0.95-1e-9 {
			t.Errorf("%s n1=%d n2=%d: minimum exact coverage %.6f below 95%%", m.Key, n1, n2, worst)
		}
		t.Logf("%s n1=%d n2=%d: minimum exact coverage over the grid %.5f", m.Key, n1, n2, worst)
	}
}

// TestExactIntervalEdges: zero cells and full groups give finite, ordered
// limits inside [−1, 1] containing the estimate; swapping the groups
// negates the interval.
func TestExactIntervalEdges(t *testing.T) {
	for _, c := range []Counts{{0, 10, 0, 10}, {10, 10, 10, 10}, {0, 10, 10, 10}, {10, 10, 0, 10}, {0, 1, 1, 1}, {1, 1, 1, 1}} {
		for _, m := range []IntervalMethod{ChanZhang, AgrestiMin} {
			iv, err := m.Interval(c, 0.95)
			if err != nil {
				t.Fatal(err)
			}
			sw, _ := m.Interval(c.Swapped(), 0.95)
			d := c.P1() - c.P2()
			if math.IsNaN(iv.Lower) || math.IsNaN(iv.Upper) || iv.Lower < -1 || iv.Upper > 1 || iv.Lower > d || iv.Upper < d {
				t.Errorf("%s %v: %v", m.Key, c, iv)
			}
			if math.Abs(iv.Lower+sw.Upper) > 1e-12 || math.Abs(iv.Upper+sw.Lower) > 1e-12 {
				t.Errorf("%s %v: [%v, %v] but swapped [%v, %v]", m.Key, c, iv.Lower, iv.Upper, sw.Lower, sw.Upper)
			}
		}
	}
}
