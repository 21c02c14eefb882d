package proportions

import (
	"math"
	"testing"
)

// Brute-force checks of the methods added from Newcombe's two 1998 papers:
// each limit is recomputed here from its defining equation by plain
// bisection, with the restricted fit from bruteRestrictedMLE (grid and
// golden sections, no code shared with RestrictedMLE) and probabilities
// from math.Lgamma, sharing nothing with the implementations.

// bruteBinomPMF is C(n, k)·π^k·(1−π)^(n−k) from lgamma.
func bruteBinomPMF(k, n int64, p float64) float64 {
	switch {
	case p <= 0:
		if k == 0 {
			return 1
		}
		return 0
	case p >= 1:
		if k == n {
			return 1
		}
		return 0
	}
	a, _ := math.Lgamma(float64(n + 1))
	b, _ := math.Lgamma(float64(k + 1))
	c, _ := math.Lgamma(float64(n - k + 1))
	return math.Exp(a - b - c + float64(k)*math.Log(p) + float64(n-k)*math.Log1p(-p))
}

// bruteBisect returns the point of [a, b] where the monotone f changes sign
// (f(a) and f(b) of opposite signs), to 1e−12.
func bruteBisect(f func(float64) float64, a, b float64) float64 {
	fa := f(a)
	for b-a > 1e-12 {
		m := (a + b) / 2
		if (f(m) > 0) == (fa > 0) {
			a = m
		} else {
			b = m
		}
	}
	return (a + b) / 2
}

var bruteTables = []Counts{{56, 70, 48, 80}, {9, 10, 3, 10}, {5, 56, 0, 29}, {0, 10, 0, 20}, {10, 10, 0, 20},
	{0, 10, 0, 10}, {1, 4, 1, 4}, {2, 3, 6, 8}, {3, 3, 1, 9}, {7, 11, 2, 8}, {0, 5, 5, 5}, {12, 40, 30, 35}}

// The profile-likelihood interval (Newcombe 1998b, method 7): each limit
// solves 2[ℓ(p1, p2) − ℓ(π̃(δ))] = z² on its side of p1 − p2.
func TestProfileLikelihoodBruteForce(t *testing.T) {
	conf, _ := NewConfidence(0.95)
	for _, c := range bruteTables {
		ll := func(a, b float64) float64 {
			return xlogy(c.X1, a) + xlogy(c.N1-c.X1, 1-a) + xlogy(c.X2, b) + xlogy(c.N2-c.X2, 1-b)
		}
		top := ll(c.P1(), c.P2())
		g := func(delta float64) float64 {
			a, b := bruteRestrictedMLE(c, delta)
			return 2*(top-ll(a, b)) - conf.Z*conf.Z
		}
		d := c.P1() - c.P2()
		wantLo, wantHi := -1.0, 1.0
		if d > -1 && g(-1+1e-13) > 0 {
			wantLo = bruteBisect(g, -1+1e-13, d)
		}
		if d < 1 && g(1-1e-13) > 0 {
			wantHi = bruteBisect(g, d, 1-1e-13)
		}
		lo, hi := ProfileLikelihood.Limits(c, conf)
		if math.Abs(lo-wantLo) > 1e-7 || math.Abs(hi-wantHi) > 1e-7 {
			t.Errorf("profile likelihood %v: (%.10f, %.10f), brute force (%.10f, %.10f)", c, lo, hi, wantLo, wantHi)
		}
	}
}

// The profile tail-area intervals (Newcombe 1998b, methods 8 and 9): each
// limit solves its tail equation with every table (i, j) enumerated, the
// ordering by i/n1 − j/n2 compared in floating point with a tie
// tolerance, at the brute-force restricted fit.
func TestProfileTailsBruteForce(t *testing.T) {
	conf, _ := NewConfidence(0.95)
	for _, c := range bruteTables {
		d := c.P1() - c.P2()
		tails := func(delta float64) (above, tie, below float64) {
			a, b := bruteRestrictedMLE(c, delta)
			for i := int64(0); i <= c.N1; i++ {
				pi := bruteBinomPMF(i, c.N1, a)
				for j := int64(0); j <= c.N2; j++ {
					pr := pi * bruteBinomPMF(j, c.N2, b)
					switch e := float64(i)/float64(c.N1) - float64(j)/float64(c.N2); {
					case e > d+1e-12:
						above += pr
					case e < d-1e-12:
						below += pr
					default:
						tie += pr
					}
				}
			}
			return above, tie, below
		}
		for _, m := range []struct {
			iv IntervalMethod
			w  float64
		}{{ProfileExactTails, 1}, {ProfileMidPTails, 0.5}} {
			fl := func(delta float64) float64 { a, e, _ := tails(delta); return a + m.w*e - conf.Alpha()/2 }
			fu := func(delta float64) float64 { _, e, b := tails(delta); return b + m.w*e - conf.Alpha()/2 }
			wantLo, wantHi := -1.0, 1.0
			if fl(-1) < 0 {
				wantLo = bruteBisect(fl, -1, 1)
			}
			if fu(1) < 0 {
				wantHi = bruteBisect(fu, -1, 1)
			}
			lo, hi := m.iv.Limits(c, conf)
			if math.Abs(lo-wantLo) > 1e-7 || math.Abs(hi-wantHi) > 1e-7 {
				t.Errorf("%s %v: (%.10f, %.10f), brute force (%.10f, %.10f)", m.iv.Name, c, lo, hi, wantLo, wantHi)
			}
		}
	}
}

// Haldane's and Jeffreys–Perks' formula (Newcombe 1998b, methods 3 and 4)
// transcribed separately here, on every table up to 6 per group and a few
// larger and zero-cell ones; and the published values come from
// TestDifferenceMethodsNewcombeTableII.
func TestHaldaneFormula(t *testing.T) {
	conf, _ := NewConfidence(0.9)
	z := conf.Z
	tables := append([]Counts{}, bruteTables...)
	for n1 := int64(1); n1 <= 6; n1++ {
		for n2 := int64(1); n2 <= 6; n2++ {
			for x1 := int64(0); x1 <= n1; x1++ {
				for x2 := int64(0); x2 <= n2; x2++ {
					tables = append(tables, Counts{x1, n1, x2, n2})
				}
			}
		}
	}
	for _, c := range tables {
		p1, p2 := float64(c.X1)/float64(c.N1), float64(c.X2)/float64(c.N2)
		for _, m := range []struct {
			iv  IntervalMethod
			psi float64
		}{
			{Haldane, (p1 + p2) / 2},
			{JeffreysPerks, ((float64(c.X1)+0.5)/float64(c.N1+1) + (float64(c.X2)+0.5)/float64(c.N2+1)) / 2},
		} {
			th, psi := p1-p2, m.psi
			u := (1/float64(c.N1) + 1/float64(c.N2)) / 4
			v := (1/float64(c.N1) - 1/float64(c.N2)) / 4
			centre := (th + z*z*v*(1-2*psi)) / (1 + z*z*u)
			w := z / (1 + z*z*u) * math.Sqrt(u*(4*psi*(1-psi)-th*th)+2*v*(1-2*psi)*th+4*z*z*u*u*(1-psi)*psi+z*z*v*v*(1-2*psi)*(1-2*psi))
			lo, hi := m.iv.Limits(c, conf)
			if !nearly(lo, centre-w, 1e-13) || !nearly(hi, centre+w, 1e-13) {
				t.Errorf("%s %v: (%v, %v), formula (%v, %v)", m.iv.Name, c, lo, hi, centre-w, centre+w)
			}
		}
	}
}

// The mid-p (Newcombe 1998a, method 6) and likelihood-based (method 7)
// intervals for one rate: their limits solve P(X > x) + ½P(X = x) = α/2
// (and its mirror) and 2[x log(p/π) + (n−x) log((1−p)/(1−π))] = z², here
// by bisection with the binomial sums written out.
func TestRateMethodsBruteForce(t *testing.T) {
	for _, level := range []float64{0.9, 0.95, 0.99} {
		conf, _ := NewConfidence(level)
		half := conf.Alpha() / 2
		for _, c := range [][2]int64{{81, 263}, {15, 148}, {0, 20}, {1, 29}, {29, 29}, {3, 7}, {1, 1}, {0, 1}, {50, 100}, {1, 1000}, {999, 1000}} {
			x, n := c[0], c[1]
			midTail := func(p float64, upper bool) float64 {
				s := 0.0
				for k := int64(0); k <= n; k++ {
					switch b := bruteBinomPMF(k, n, p); {
					case k == x:
						s += b / 2
					case (k > x) != upper:
						s += b
					}
				}
				return s - half
			}
			wantLo, wantHi := 0.0, 1.0
			if x > 0 {
				wantLo = bruteBisect(func(p float64) float64 { return midTail(p, false) }, 0, 1)
			}
			if x < n {
				wantHi = bruteBisect(func(p float64) float64 { return midTail(p, true) }, 0, 1)
			}
			lo, hi := MidPRate.Limits(x, n, conf)
			if math.Abs(lo-wantLo) > 1e-9 || math.Abs(hi-wantHi) > 1e-9 {
				t.Errorf("mid-p %d/%d at %v: (%.12f, %.12f), brute force (%.12f, %.12f)", x, n, level, lo, hi, wantLo, wantHi)
			}
			p := float64(x) / float64(n)
			dev := func(pi float64) float64 {
				return 2*(xlogy(x, p)-xlogy(x, pi)+xlogy(n-x, 1-p)-xlogy(n-x, 1-pi)) - conf.Z*conf.Z
			}
			wantLo, wantHi = 0, 1
			if x > 0 {
				wantLo = bruteBisect(dev, 1e-300, p)
			}
			if x < n {
				wantHi = bruteBisect(dev, p, 1-1e-16)
			}
			lo, hi = LikelihoodRate.Limits(x, n, conf)
			if math.Abs(lo-wantLo) > 1e-9 || math.Abs(hi-wantHi) > 1e-9 {
				t.Errorf("likelihood %d/%d at %v: (%.12f, %.12f), brute force (%.12f, %.12f)", x, n, level, lo, hi, wantLo, wantHi)
			}
		}
	}
}
