package proportions

import "math"

// Haldane is Haldane's interval for π1 − π2 in the form Newcombe gives it:
// with θ̂ = p1 − p2, ψ = (p1 + p2)/2, u = (1/n1 + 1/n2)/4 and
// v = (1/n1 − 1/n2)/4, the limits are θ* ± w, where
//
//	θ* = (θ̂ + z²·v·(1 − 2ψ)) / (1 + z²·u),
//	w  = z/(1 + z²·u) · √( u·(4ψ(1−ψ) − θ̂²) + 2v·(1 − 2ψ)·θ̂
//	                        + 4z²·u²·ψ(1−ψ) + z²·v²·(1 − 2ψ)² ).
//
// Method 3 of Newcombe RG (1998), "Interval estimation for the difference
// between independent proportions: comparison of eleven methods",
// Statistics in Medicine 17:873–890 (after Haldane 1945). JeffreysPerks is
// the same formula with a different ψ.
//
// It needs no iteration and treats the groups, and events and non-events,
// alike (Symmetric). Zero cells: with x1 = x2 = 0 (or x1 = n1, x2 = n2) and
// n1 = n2 the interval collapses to the single point 0, as Wald's does;
// with unequal groups it is (0, 2θ*) there. Raw limits stay inside
// [−1, 1] (the formula gives exactly 1 at x1 = n1, x2 = 0). The square
// root's argument is p1(1−p1)/n1 + p2(1−p2)/n2 plus squares, never
// negative; it is floored at 0 against rounding, so the limits are never NaN.
var Haldane = IntervalMethod{
	Key:        "haldane",
	Name:       "Haldane",
	Scale:      Difference,
	Citation:   "Newcombe RG (1998). Interval estimation for the difference between independent proportions: comparison of eleven methods. Statistics in Medicine 17:873–890 (method 3, Haldane).",
	Definition: "θ* ± w with θ* = (θ̂ + z²v(1−2ψ))/(1+z²u), w = z/(1+z²u)·√(u(4ψ(1−ψ)−θ̂²) + 2v(1−2ψ)θ̂ + 4z²u²ψ(1−ψ) + z²v²(1−2ψ)²), θ̂ = p1 − p2, ψ = (p1+p2)/2, u = (1/n1+1/n2)/4, v = (1/n1−1/n2)/4",
	Symmetric:  true,
	Limits:     haldaneLimits,
}

func haldaneLimits(c Counts, conf Confidence) (lower, upper float64) {
	return haldaneForm(c, conf.Z, (c.P1()+c.P2())/2)
}

// haldaneForm evaluates the Haldane formula (see Haldane) for a given ψ.
func haldaneForm(c Counts, z, psi float64) (lower, upper float64) {
	theta := c.P1() - c.P2()
	r1, r2 := 1/float64(c.N1), 1/float64(c.N2)
	u, v := (r1+r2)/4, (r1-r2)/4
	zz := z * z
	s := 1 - 2*psi
	pq := psi * (1 - psi)
	den := 1 + zz*u
	centre := (theta + zz*v*s) / den
	arg := u*(4*pq-theta*theta) + 2*v*s*theta + 4*zz*u*u*pq + zz*v*v*s*s
	w := z / den * math.Sqrt(math.Max(0, arg))
	return centre - w, centre + w
}
