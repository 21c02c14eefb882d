package special

import "math"

// Trigamma returns ψ′(x) = d²/dx² log Γ(x) for x > 0 (NaN otherwise): the
// recurrence ψ′(x) = ψ′(x+1) + 1/x² up to x ≥ 10, then the asymptotic
// series ψ′(x) ~ 1/x + 1/(2x²) + Σ B₂ₖ/x^(2k+1) (Abramowitz M, Stegun IA
// (1964), Handbook of Mathematical Functions, NBS, formula 6.4.12; the
// formula number recalled from memory), to about 1e-15 relative.
func Trigamma(x float64) float64 {
	if v, edge := polygammaEdge(x); edge {
		return v
	}
	var s float64
	for ; x < 10; x++ {
		s += 1 / (x * x)
	}
	r := 1 / (x * x)
	// B₂ = 1/6, B₄ = −1/30, B₆ = 1/42, B₈ = −1/30, B₁₀ = 5/66,
	// B₁₂ = −691/2730, B₁₄ = 7/6
	series := 1/x + r/2 + r/x*(1.0/6+r*(-1.0/30+r*(1.0/42+r*(-1.0/30+r*(5.0/66+r*(-691.0/2730+r*7.0/6))))))
	return s + series
}

// Tetragamma returns ψ″(x) = d³/dx³ log Γ(x) for x > 0 (NaN otherwise):
// the recurrence ψ″(x) = ψ″(x+1) − 2/x³ up to x ≥ 10, then the asymptotic
// series ψ″(x) ~ −1/x² − 1/x³ − Σ (2k+1)·B₂ₖ/x^(2k+2) (Abramowitz and
// Stegun 6.4.13), to about 1e-15 relative.
func Tetragamma(x float64) float64 {
	if v, edge := polygammaEdge(x); edge {
		return v
	}
	var s float64
	for ; x < 10; x++ {
		s -= 2 / (x * x * x)
	}
	r := 1 / (x * x)
	series := -r - r/x - r*r*(3.0/6+r*(-5.0/30+r*(7.0/42+r*(-9.0/30+r*(11*5.0/66+r*(-13*691.0/2730+r*15*7.0/6))))))
	return s + series
}

// polygammaEdge returns the value of ψ′ and ψ″ outside (0, ∞): 0 at +∞ and
// NaN at or below 0 and for NaN; edge is false for an x the series serve.
func polygammaEdge(x float64) (v float64, edge bool) {
	switch {
	case math.IsInf(x, 1):
		return 0, true
	case !(x > 0):
		return math.NaN(), true
	}
	return 0, false
}
