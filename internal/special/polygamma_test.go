package special

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/mathext"
)

// Closed forms (facts of analysis): ψ′(1) = π²/6, ψ′(½) = π²/2,
// ψ″(1) = −2ζ(3), ψ″(½) = −14ζ(3), with Apéry's constant
// ζ(3) = 1.2020569031595942 (its digits recalled from memory: the two
// cases that use it agree with each other through the recurrence, and
// TestPolygammaAgainstDigamma checks ψ″ independently of it); and
// ψ′(n+1) = π²/6 − Σ_{k≤n} 1/k².
func TestPolygammaClosedForms(t *testing.T) {
	const zeta3 = 1.2020569031595942
	cases := []struct {
		name      string
		got, want float64
	}{
		{"ψ′(1)", Trigamma(1), math.Pi * math.Pi / 6},
		{"ψ′(½)", Trigamma(0.5), math.Pi * math.Pi / 2},
		{"ψ″(1)", Tetragamma(1), -2 * zeta3},
		{"ψ″(½)", Tetragamma(0.5), -14 * zeta3},
		{"ψ′(4)", Trigamma(4), math.Pi*math.Pi/6 - 1 - 0.25 - 1.0/9},
		{"ψ″(3)", Tetragamma(3), -2*zeta3 + 2*(1+1.0/8)},
	}
	for _, c := range cases {
		if math.Abs(c.got-c.want) > 1e-14*math.Abs(c.want) {
			t.Errorf("%s = %.17g, want %.17g", c.name, c.got, c.want)
		}
	}
}

// Against gonum's digamma: central differences of mathext.Digamma (ψ′) and
// of Trigamma checked above (ψ″), from 10⁻² to 10⁶.
func TestPolygammaAgainstDigamma(t *testing.T) {
	for _, x := range []float64{0.01, 0.3, 1.7, 9.99, 10, 10.01, 37.5, 1e3, 1e6} {
		h := 1e-5 * x
		d1 := (mathext.Digamma(x+h) - mathext.Digamma(x-h)) / (2 * h)
		if got := Trigamma(x); math.Abs(got-d1) > 1e-6*math.Abs(d1) {
			t.Errorf("ψ′(%v) = %.12g, difference of gonum's digamma %.12g", x, got, d1)
		}
		d2 := (Trigamma(x+h) - Trigamma(x-h)) / (2 * h)
		if got := Tetragamma(x); math.Abs(got-d2) > 1e-6*math.Abs(d2) {
			t.Errorf("ψ″(%v) = %.12g, difference of ψ′ %.12g", x, got, d2)
		}
	}
	for _, x := range []float64{0, -1, math.NaN()} {
		if !math.IsNaN(Trigamma(x)) || !math.IsNaN(Tetragamma(x)) {
			t.Errorf("polygamma at %v: want NaN", x)
		}
	}
}
