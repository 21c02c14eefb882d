package proportions

import (
	"math"
	"math/big"
	"testing"
)

// TestLogHypergeomPMF compares the saddle-point log pmf with exact rational
// arithmetic, C(n1,k)C(n2,m−k)/C(n1+n2,m), over whole supports.
func TestLogHypergeomPMF(t *testing.T) {
	for _, d := range [][3]int64{{5, 7, 6}, {40, 60, 30}, {300, 200, 251}, {1, 1, 1}} {
		n1, n2, m := d[0], d[1], d[2]
		lo, hi := hypergeomSupport(n1, n2, m)
		total := new(big.Int).Binomial(n1+n2, m)
		sum := 0.0
		for k := lo; k <= hi; k++ {
			num := new(big.Int).Mul(new(big.Int).Binomial(n1, k), new(big.Int).Binomial(n2, m-k))
			want, _ := new(big.Rat).SetFrac(num, total).Float64()
			got := logHypergeomPMF(k, n1, n2, m)
			if math.Abs(got-math.Log(want)) > 1e-12*math.Max(1, math.Abs(math.Log(want))) {
				t.Errorf("n1=%d n2=%d m=%d k=%d: log pmf %.15g, want %.15g", n1, n2, m, k, got, math.Log(want))
			}
			sum += math.Exp(got)
		}
		if math.Abs(sum-1) > 1e-12 {
			t.Errorf("n1=%d n2=%d m=%d: pmf sums to %v", n1, n2, m, sum)
		}
		if !math.IsInf(logHypergeomPMF(lo-1, n1, n2, m), -1) || !math.IsInf(logHypergeomPMF(hi+1, n1, n2, m), -1) {
			t.Errorf("outside the support the log pmf must be -Inf")
		}
	}
}

// TestLogBinomPMF compares the saddle-point binomial log pmf with exact
// rational arithmetic C(n,k) pᵏ (1−p)ⁿ⁻ᵏ for a dyadic p.
func TestLogBinomPMF(t *testing.T) {
	for _, n := range []int64{1, 2, 15, 16, 17, 60, 121} {
		for _, pr := range []*big.Rat{big.NewRat(1, 1024), big.NewRat(3, 8), big.NewRat(1, 2), big.NewRat(1023, 1024)} {
			p, _ := pr.Float64()
			q := 1 - p
			for k := int64(0); k <= n; k++ {
				exact := new(big.Rat).SetInt(new(big.Int).Binomial(n, k))
				for range k {
					exact.Mul(exact, pr)
				}
				qr := new(big.Rat).Sub(big.NewRat(1, 1), pr)
				for range n - k {
					exact.Mul(exact, qr)
				}
				// log of a Rat via its float mantissa/exponent.
				f := new(big.Float).SetPrec(200).SetRat(exact)
				mant := new(big.Float)
				e := f.MantExp(mant)
				mf, _ := mant.Float64()
				want := math.Log(mf) + float64(e)*math.Ln2
				got := logBinomPMF(float64(k), float64(n), p, q)
				if math.Abs(got-want) > 1e-12*math.Max(1, math.Abs(want)) {
					t.Errorf("n=%d k=%d p=%v: %.15g, want %.15g", n, k, p, got, want)
				}
			}
		}
	}
}
