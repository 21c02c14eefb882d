package proportions

// JeffreysPerks is the Jeffreys–Perks interval for π1 − π2: Haldane's
// formula (see Haldane) with ψ taken from each group's rate with ½ event
// and ½ non-event added,
//
//	ψ = ((x1 + ½)/(n1 + 1) + (x2 + ½)/(n2 + 1)) / 2,
//
// while θ̂ = p1 − p2, u and v are as in Haldane's method. Method 4 of
// Newcombe RG (1998), "Interval estimation for the difference between
// independent proportions: comparison of eleven methods", Statistics in
// Medicine 17:873–890.
//
// Closed form, Symmetric (ψ becomes 1 − ψ when events and non-events are
// exchanged). Zero cells: unlike Haldane's it never collapses to a point
// (with x1 = x2 = 0, ψ > 0); at x1 = n1, x2 = 0 its raw upper limit can
// exceed 1 (Newcombe's example (g): 1.0068), and the reported limit is
// clipped to 1 by the library's limit rule. The square root's argument is
// floored at 0, so the limits are never NaN.
var JeffreysPerks = IntervalMethod{
	Key:        "jeffreys-perks",
	Name:       "Jeffreys–Perks",
	Scale:      Difference,
	Citation:   "Newcombe RG (1998). Interval estimation for the difference between independent proportions: comparison of eleven methods. Statistics in Medicine 17:873–890 (method 4, Jeffreys–Perks).",
	Definition: "Haldane's θ* ± w (method 3) with ψ = ((x1+½)/(n1+1) + (x2+½)/(n2+1))/2",
	Symmetric:  true,
	Limits:     jeffreysPerksLimits,
}

func jeffreysPerksLimits(c Counts, conf Confidence) (lower, upper float64) {
	psi := ((float64(c.X1)+0.5)/(float64(c.N1)+1) + (float64(c.X2)+0.5)/(float64(c.N2)+1)) / 2
	return haldaneForm(c, conf.Z, psi)
}
