package proportions

import (
	"math"
	"testing"
)

// binomialPMF returns C(n, k) pᵏ (1−p)ⁿ⁻ᵏ from log-gamma.
func binomialPMF(k, n int64, p float64) float64 {
	return math.Exp(logBinomialCoefficient(float64(n), float64(k)) + binomialLogLik(float64(k), float64(n), p))
}

// TestExactOddsRatioCoverage: the Cornfield and Baptista–Pike intervals
// guarantee conditional coverage of at least the nominal level for every
// set of margins, hence unconditional coverage too (Cornfield 1956; Baptista
// and Pike 1977). Their exact coverage, summed over every outcome of a
// design, must therefore never fall below 0.95. The mid-p interval carries
// no such guarantee and is not checked here.
func TestExactOddsRatioCoverage(t *testing.T) {
	conf, _ := NewConfidence(0.95)
	designs := [][2]int64{{12, 12}, {8, 15}}
	rates := [][2]float64{{0.1, 0.1}, {0.3, 0.5}, {0.5, 0.5}, {0.8, 0.4}, {0.05, 0.6}, {0.9, 0.97}}
	for _, m := range []IntervalMethod{CornfieldExact, BaptistaPike} {
		for _, d := range designs {
			for _, r := range rates {
				truth := r[0] * (1 - r[1]) / (r[1] * (1 - r[0]))
				cover := 0.0
				for x1 := int64(0); x1 <= d[0]; x1++ {
					for x2 := int64(0); x2 <= d[1]; x2++ {
						lo, hi := m.Limits(Counts{x1, d[0], x2, d[1]}, conf)
						if lo <= truth && truth <= hi {
							cover += binomialPMF(x1, d[0], r[0]) * binomialPMF(x2, d[1], r[1])
						}
					}
				}
				if cover < 0.95-1e-12 {
					t.Errorf("%s n=%v π=%v: exact coverage %.6f below 0.95", m.Key, d, r, cover)
				}
			}
		}
	}
}
