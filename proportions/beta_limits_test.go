package proportions

import (
	"math"
	"testing"

	"github.com/propscope/propscope/internal/special"
)

// Clopper–Pearson and Jeffreys limits are beta quantiles (Clopper & Pearson
// 1934; Jeffreys' prior Beta(½, ½)): the methods must return exactly what the
// beta-quantile kernel gives for their shapes, whose accuracy the kernel's own
// tests check against gonum and mpmath.
func TestBetaLimitsAreQuantiles(t *testing.T) {
	for _, n := range []int64{1, 2, 5, 13, 50, 300, 1000, 100000, 1 << 40} {
		for _, x := range []int64{0, 1, n / 3, n / 2, n - 1, n} {
			if x < 0 || x > n {
				continue
			}
			for _, level := range []float64{0.5, 0.9, 0.95, 0.999999} {
				conf, err := NewConfidence(level)
				if err != nil {
					t.Fatal(err)
				}
				tl := special.NewBetaTail(conf.Alpha()/2, conf.Z)
				fx, fn := float64(x), float64(n)
				cpLo, cpHi := ClopperPearson.Limits(x, n, conf)
				jLo, jHi := Jeffreys.Limits(x, n, conf)
				want := func(a, b float64, upper bool, zero bool, edge float64) float64 {
					if zero {
						return edge
					}
					qx, qy := special.BetaLowerQuantile(a, b, &tl)
					if upper {
						return qy
					}
					return qx
				}
				checks := []struct {
					name      string
					got, want float64
				}{
					{"Clopper–Pearson lower", cpLo, want(fx, fn-fx+1, false, x == 0, 0)},
					{"Clopper–Pearson upper", cpHi, want(fn-fx, fx+1, true, x == n, 1)},
					{"Jeffreys lower", jLo, want(fx+0.5, fn-fx+0.5, false, x == 0, 0)},
					{"Jeffreys upper", jHi, want(fn-fx+0.5, fx+0.5, true, x == n, 1)},
				}
				for _, c := range checks {
					if c.got != c.want && !(math.IsNaN(c.got) && math.IsNaN(c.want)) {
						t.Errorf("%s %d/%d at %v: %v, quantile %v", c.name, x, n, level, c.got, c.want)
					}
				}
			}
		}
	}
}

func relErrBeta(a, b float64) float64 {
	if a == b {
		return 0
	}
	return math.Abs(a-b) / math.Max(math.Abs(a), math.Abs(b))
}

// A Confidence built without NewConfidence (Z = 0) still gives the same
// limits: z only chooses where the series branch starts.
func TestBetaQuantileIgnoresWrongZ(t *testing.T) {
	good, _ := NewConfidence(0.95)
	bad := Confidence{Level: 0.95}
	for _, xn := range [][2]int64{{0, 50}, {17, 50}, {500, 1000}, {3, 1000000}, {400000, 1000000}} {
		for _, m := range []RateMethod{ClopperPearson, Jeffreys} {
			l1, u1 := m.Limits(xn[0], xn[1], good)
			l2, u2 := m.Limits(xn[0], xn[1], bad)
			if relErrBeta(l2, l1) > 1e-15 && l1 != l2 || relErrBeta(u2, u1) > 1e-15 {
				t.Errorf("%s %d/%d: (%v, %v) with Z = 0, (%v, %v) with Z", m.Name, xn[0], xn[1], l2, u2, l1, u1)
			}
		}
	}
}
