// Package bigref computes exact reference values with math/big for the
// tests of the numerical kernels and the exact methods: nothing in the
// library itself calls it.
package bigref

import (
	"math"
	"math/big"
)

// HypergeomWeights returns W(k) = C(n1,k)·C(n2,m−k) for k = lo … hi as
// exact integers (P(X1 = k) = W(k)/C(n1+n2, m)), by the exact recurrence
// W(k+1) = W(k)·(n1−k)(m−k)/((k+1)(n2−m+k+1)). For n1+n2 below 3·10⁹.
func HypergeomWeights(n1, n2, m int64) (lo int64, w []*big.Int) {
	lo, hi := max(0, m-n2), min(n1, m)
	w = make([]*big.Int, hi-lo+1)
	w[0] = new(big.Int).Mul(new(big.Int).Binomial(n1, lo), new(big.Int).Binomial(n2, m-lo))
	for k := lo; k < hi; k++ {
		v := new(big.Int).Mul(w[k-lo], big.NewInt((n1-k)*(m-k)))
		w[k-lo+1] = v.Quo(v, big.NewInt((k+1)*(n2-m+k+1)))
	}
	return lo, w
}

// RatLog returns the log of a positive rational through its float64
// mantissa and binary exponent, so far below the float64 range too (error
// about one ulp of the result).
func RatLog(r *big.Rat) float64 {
	f := new(big.Float).SetPrec(128).SetRat(r)
	mant := new(big.Float)
	e := f.MantExp(mant)
	mf, _ := mant.Float64()
	return math.Log(mf) + float64(e)*math.Ln2
}
