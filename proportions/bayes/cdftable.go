package bayes

import "math"

// The tabulated distribution function. Every tail integral of an effect
// evaluates the inner posterior's distribution function at each node of
// the outer rule, and the incomplete beta function costs about 0.7 µs at
// tens of trials and 5 µs at 10⁶ (where gonum's continued fraction also
// stops at its iteration cap, about 10⁻⁹ short of full precision). So the
// inner posterior's distribution function is tabulated once per pair of
// posteriors, in the log-odds t, where the density exp(ℓ(t)) is smooth
// and log-concave at any shapes: its window (see Posterior.window) is cut
// into panels of two curvature widths, the density is interpolated on
// each panel at chebN Chebyshev points, and the interpolant is integrated
// exactly. A value is then the mass of the panels on its side plus the
// integrated interpolant up to it (about 0.1 µs), from the left for P(π ≤
// x) and from the right for P(π > x), so that each keeps its precision in
// its own tail.
//
// The density is evaluated relative to its value at the mode m = log(α/β)
// and the table is normalised by its total mass: ℓ(m + δ) − ℓ(m) =
// αδ − (α+β)·log1p(x_m·expm1(δ)), x_m = α/(α+β), loses only about √(α+β)
// ulps where ℓ itself (α·log x + β·log(1−x) − log B(α, β), terms of size
// α+β) loses α+β, and log B(α, β) (about 10⁻⁹ absolute at 10⁶ trials)
// drops out.
//
// Error estimate of a value: twice the magnitude of the last two
// Chebyshev coefficients of every panel (the neglected terms of a series
// that converges faster than geometrically, for this entire integrand),
// summed over the panels, plus rounding, plus the window's truncation
// bound. When the window needs more than maxTablePanels panels (shapes far
// below 1 with many trials on the other side) there is no table and the
// incomplete beta function is used.

const (
	chebN          = 20  // Chebyshev points per panel
	tablePanel     = 1.5 // panel width in curvature widths of the log-odds density at the mode
	maxTablePanels = 400
	// A panel whose error estimate exceeds splitTol of the density's mass
	// is halved, up to maxSplits times: away from the mode the log-odds
	// density of a skewed posterior bends faster than at the mode.
	splitTol  = 1e-14
	maxSplits = 8
)

// chebCos[j][k] = cos(π·j·(k + ½)/chebN), and chebX[k] the points.
var chebCos, chebX = func() (c [chebN][chebN]float64, x [chebN]float64) {
	for j := range chebN {
		for k := range chebN {
			c[j][k] = math.Cos(math.Pi * float64(j) * (float64(k) + 0.5) / chebN)
		}
	}
	for k := range chebN {
		x[k] = c[1][k]
	}
	return c, x
}()

type cdfPanel struct {
	start, h     float64            // the panel in log-odds
	below, above float64            // mass left of the panel (summed from the left) and right of it (from the right)
	mass         float64            // the panel's own mass
	anti         [chebN + 1]float64 // Chebyshev coefficients of the mass from the panel's start, 0 there
	deg          int                // the highest coefficient kept (see truncate)
}

// cdfTable is one posterior's distribution function tabulated in the
// log-odds (see above); the zero value has no table.
type cdfTable struct {
	lo, hi float64    // the window, in log-odds
	panels []cdfPanel // in order, covering the window
	err    float64    // error estimate of every value, truncation included
}

func newCDFTable(p Posterior) cdfTable {
	lo, hi, tail := p.window()
	a, b := p.EventShape, p.NonEventShape
	xm, ym := logistic(math.Log(a / b))
	sdT := 1 / math.Sqrt((a+b)*xm*ym)
	n := int(math.Ceil((hi - lo) / (tablePanel * sdT)))
	if n > maxTablePanels || !(hi > lo) {
		return cdfTable{}
	}
	n = max(n, 1)
	h := (hi - lo) / float64(n)
	t := cdfTable{panels: make([]cdfPanel, 0, 2*n)}
	// the density relative to its peak integrates to about 2.5·sdT, the
	// scale of the split tolerance
	tol := splitTol * sdT
	rel := p.relEllFunc()
	var errSum float64
	var add func(start, h float64, depth int) bool
	add = func(start, h float64, depth int) bool {
		var pn cdfPanel
		est, peak := pn.fit(rel, start, h)
		// split where the series has not converged; an estimate at the
		// rounding noise of the panel's values does not shrink by halving
		if est > tol && est > 256*0x1p-52*peak && depth < maxSplits {
			return add(start, h/2, depth+1) && add(start+h/2, h/2, depth+1)
		}
		if len(t.panels) == maxTablePanels {
			return false
		}
		pn.start, pn.h = start, h
		t.panels = append(t.panels, pn)
		errSum += est
		return true
	}
	for i := range n {
		if !add(lo+float64(i)*h, h, 0) {
			return cdfTable{}
		}
	}
	var total float64
	for i := range t.panels {
		total += t.panels[i].mass
	}
	if !(total > 0) || math.IsInf(total, 0) {
		return cdfTable{}
	}
	var cum, dropped float64
	for i := range t.panels {
		pn := &t.panels[i]
		pn.mass /= total
		for j := range pn.anti {
			pn.anti[j] /= total
		}
		dropped = math.Max(dropped, pn.truncate())
		pn.below = cum
		cum += pn.mass
	}
	cum = 0
	for i := len(t.panels) - 1; i >= 0; i-- {
		t.panels[i].above = cum
		cum += t.panels[i].mass
	}
	t.lo, t.hi = lo, hi
	// normalising by the window's mass instead of 1 moves a value by at
	// most the truncated mass
	t.err = errSum/total + float64(len(t.panels))*4*0x1p-52 + 2*tail + dropped
	return t
}

// truncTol is the total size of the trailing coefficients a panel may
// drop, as a share of the posterior's mass: below the rounding of any
// value (the table's error estimate is at least a few times 2⁻⁵²), and it
// is added to that estimate. Near the mode a panel keeps about 14 of its 21
// coefficients, in the tails fewer: the evaluation, most of the cost of a
// tail integral, shortens with them.
const truncTol = 1e-15

// truncate keeps the coefficients up to the last one after which the
// absolute values sum to at most truncTol, and returns that sum (a bound on
// the change of any value, since |Tⱼ| ≤ 1).
func (pn *cdfPanel) truncate() float64 {
	var tail float64
	pn.deg = chebN
	for pn.deg > 1 && tail+math.Abs(pn.anti[pn.deg]) <= truncTol {
		tail += math.Abs(pn.anti[pn.deg])
		pn.anti[pn.deg] = 0
		pn.deg--
	}
	return tail
}

// fit interpolates the density on [start, start+h] and integrates the
// interpolant; it returns the panel's error estimate.
// (rel is the log-density up to a constant: Posterior.relEll).
// It returns the error estimate and the largest value sampled.
func (pn *cdfPanel) fit(rel func(float64) float64, start, h float64) (est, peak float64) {
	var f [chebN]float64
	for k := range chebN {
		f[k] = h / 2 * math.Exp(rel(start+h/2*(chebX[k]+1))) // dt = h/2 dx
		peak = math.Max(peak, f[k])
	}
	var c [chebN + 2]float64
	for j := range chebN {
		var s float64
		for k := range chebN {
			s += f[k] * chebCos[j][k]
		}
		c[j] = 2 * s / chebN
	}
	c[0] /= 2
	// ∫T₀ = T₁, ∫T₁ = T₂/4, ∫Tⱼ = T_{j+1}/(2(j+1)) − T_{j−1}/(2(j−1))
	pn.anti[1] = c[0] - c[2]/2
	for j := 2; j <= chebN; j++ {
		pn.anti[j] = (c[j-1] - c[j+1]) / (2 * float64(j))
	}
	var atStart, atEnd float64 // the antiderivative at x = −1 and x = 1
	for j := 1; j <= chebN; j++ {
		atEnd += pn.anti[j]
		if j%2 == 0 {
			atStart += pn.anti[j]
		} else {
			atStart -= pn.anti[j]
		}
	}
	pn.anti[0] = -atStart
	pn.mass = atEnd - atStart
	return 2*(math.Abs(c[chebN-1])+math.Abs(c[chebN-2])) + 0x1p-52*float64(chebN)*pn.mass, peak
}

// ok reports whether the table exists.
func (t *cdfTable) ok() bool { return t.panels != nil }

// tails returns P(π ≤ x) and P(π > x) given x and 1 − x.
func (t *cdfTable) tails(x, y float64) (below, above float64) {
	switch {
	case x <= 0:
		return 0, 1
	case y <= 0:
		return 1, 0
	}
	return t.tailsAt(math.Log(x) - math.Log(y))
}

// tailsAt is tails at the log-odds s.
func (t *cdfTable) tailsAt(s float64) (below, above float64) {
	switch {
	case s < t.lo:
		return 0, 1
	case s >= t.hi:
		return 1, 0
	}
	// the last panel starting at or before s
	i, j := 0, len(t.panels)
	for j-i > 1 {
		if m := (i + j) / 2; t.panels[m].start <= s {
			i = m
		} else {
			j = m
		}
	}
	pn := &t.panels[i]
	u := math.Min(1, 2*(s-pn.start)/pn.h-1)
	m := clenshaw(pn.anti[:pn.deg+1], u)
	return pn.below + m, pn.above + (pn.mass - m)
}

// clenshaw evaluates Σ cⱼTⱼ(u).
func clenshaw(c []float64, u float64) float64 {
	var b1, b2 float64
	for j := len(c) - 1; j >= 1; j-- {
		b1, b2 = 2*u*b1-b2+c[j], b1
	}
	return u*b1 - b2 + c[0]
}
