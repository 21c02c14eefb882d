package special

import (
	"math"
	"math/big"
	"testing"
)

// bigLogAddExp returns log(eᵃ + eᵇ) with both exponentials and the sum
// formed in 300-bit arithmetic (bigExp of bigref_normal_test.go), so no
// rescaling trick of the code under test is shared. It needs |a|, |b| up
// to about 10⁶ only (math/big's exponent range).
func bigLogAddExp(a, b float64) float64 {
	exp := func(x float64) *big.Float {
		e := bigExp(new(big.Float).SetFloat64(math.Abs(x)), 300)
		if x < 0 {
			e.Quo(big.NewFloat(1).SetPrec(300), e)
		}
		return e
	}
	return logOfBig(new(big.Float).SetPrec(300).Add(exp(a), exp(b)))
}

// TestLogAddExp checks LogAddExp on finite pairs against bigLogAddExp, to
// 2 ulps of max(|result|, 1) (the result is max(a, b) plus a rounded
// log1p); that it is symmetric bit for bit; and the edge cases its callers
// meet when they fold log-probabilities: −Inf (a zero probability) is the
// identity, +Inf absorbs everything finite or −Inf, NaN propagates, and
// huge differences or magnitudes neither overflow nor lose the larger
// term.
func TestLogAddExp(t *testing.T) {
	for _, c := range [][2]float64{
		{0, 0}, {1, 2}, {-3, 5}, {-745, -745}, {-745.1, -746}, {700, 700}, {1000, 1000}, {1000, 999},
		{-1e4, -1e4 - 1e-9}, {0, -36}, {0, -37}, {0, -40}, {0, -745}, {0, -1000}, {-1e5, 3},
		{1e-300, -1e-300}, {0.5, math.Log(0.5)}, {-2.5e5, -2.5e5 + 30},
	} {
		a, b := c[0], c[1]
		want := bigLogAddExp(a, b)
		got := LogAddExp(a, b)
		if d := math.Abs(got - want); !(d <= 2*ulp(math.Max(math.Abs(want), 1))) {
			t.Errorf("LogAddExp(%v, %v) = %.17g, want %.17g", a, b, got, want)
		}
		if rev := LogAddExp(b, a); math.Float64bits(rev) != math.Float64bits(got) {
			t.Errorf("LogAddExp(%v, %v) = %v but LogAddExp(%v, %v) = %v", a, b, got, b, a, rev)
		}
	}
	inf, nan := math.Inf(1), math.NaN()
	for _, c := range []struct {
		name       string
		a, b, want float64
	}{
		{"−Inf is the identity", math.Inf(-1), -3.5, -3.5},
		{"−Inf is the identity (second)", 7.25, math.Inf(-1), 7.25},
		{"both −Inf", math.Inf(-1), math.Inf(-1), math.Inf(-1)},
		{"+Inf absorbs a finite value", inf, -3, inf},
		{"+Inf absorbs a finite value (second)", 1e300, inf, inf},
		{"+Inf and −Inf", inf, math.Inf(-1), inf},
		{"−Inf and +Inf", math.Inf(-1), inf, inf},
		{"huge gap", 1e308, -1e308, 1e308},
		{"huge equal values do not overflow", math.MaxFloat64, math.MaxFloat64, math.MaxFloat64},
		{"huge negative equal values", -math.MaxFloat64, -math.MaxFloat64, -math.MaxFloat64},
		{"gap beyond exp's range", 0, -1e6, 0},
		{"NaN first", nan, 1, nan},
		{"NaN second", 1, nan, nan},
		{"NaN with −Inf", nan, math.Inf(-1), nan},
		{"−Inf with NaN", math.Inf(-1), nan, nan},
	} {
		got := LogAddExp(c.a, c.b)
		if !(got == c.want || math.IsNaN(got) && math.IsNaN(c.want)) {
			t.Errorf("%s: LogAddExp(%v, %v) = %v, want %v", c.name, c.a, c.b, got, c.want)
		}
	}
}

// TestLogAddExpBothPlusInf: with a = b = +Inf the difference b − a is NaN;
// log(e^a + e^b) is +Inf. (Today's callers add log-probabilities, never
// +Inf, so this guards the kernel's own contract.)
func TestLogAddExpBothPlusInf(t *testing.T) {
	if got := LogAddExp(math.Inf(1), math.Inf(1)); !math.IsInf(got, 1) {
		t.Errorf("LogAddExp(+Inf, +Inf) = %v, want +Inf", got)
	}
}

// TestLogAddExpFold folds LogAddExp over the binomial log-pmf of
// Binomial(n, p) for a few n and p: the probabilities sum to 1, so the fold
// must give 0 (to 1e−13, the pmf's own accuracy summed over the support).
// Adding in order from k = 0 includes terms that underflow as
// probabilities (down to e^−2000 for n = 4000), which the log form keeps.
func TestLogAddExpFold(t *testing.T) {
	for _, c := range []struct{ n, p float64 }{{10, 0.5}, {100, 0.03}, {4000, 0.7}, {4000, 1e-3}} {
		acc := math.Inf(-1)
		for k := 0.0; k <= c.n; k++ {
			acc = LogAddExp(acc, LogBinomPMF(k, c.n, c.p, 1-c.p))
		}
		if math.Abs(acc) > 1e-13 {
			t.Errorf("Binomial(%v, %v): log of the total probability = %.3g, want 0", c.n, c.p, acc)
		}
	}
}
