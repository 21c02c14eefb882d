package proportions

import (
	"math"
	"slices"
)

// A proven upper bound on the supremum over the nuisance parameter.
//
// The search of unconditional_sup.go finds the largest tail probability it
// can; proveSupremum then bounds the true supremum from above by branch and
// bound over the nuisance range, so every unconditional p-value comes with
// PValueBound, a number the true supremum cannot exceed.
//
// Notation. On the null line π1 = π2 + δ0, with π2 = π in [a, b] (a ≥
// max(0, −δ0), b ≤ min(1, 1 − δ0)), the tail is
//
//	P(π) = Σ_{(x1,x2) in R} b(x1; n1, π1) · b(x2; n2, π2),
//
// a polynomial in π. Write q = 1 − π, N = n1 + n2, and U the score of both
// groups, U = Σ_i (X_i − n_i π_i)/(π_i q_i) (dπ1/dπ = dπ2/dπ = 1), so that
//
//	P′(π) = E[1_R · U],   E[U] = 0,   E[U²] = I(π) = Σ_i n_i/(π_i q_i),
//	P″(π) = E[1_R · (U² + U′)],   U′ = −Σ_i [X_i/π_i² + (n_i − X_i)/q_i²] ≤ 0,   E[−U′] = I(π).
//
// Three bounds are used on a cell [πl, πr] of the nuisance range, each from
// the (upper-adjusted, see below) values at the cell's two ends; a cell's
// bound is the smallest of those that apply.
//
// (A) first order, on the angle scale. Cauchy–Schwarz on E[(1_R − P)·U]
// gives |P′| ≤ √(P(1 − P)·I(π)); with u = arcsin √P (so dP = 2√(P(1−P))·du)
// this is |du/dπ| ≤ ½√I(π). On the search's angle scale π = a + (b − a)·sin²θ,
// dπ/dθ = 2(b − a)·sinθ·cosθ, and every π_i q_i ≥ (b − a)²·sin²θ·cos²θ
// (π_i is at least π − a ≥ (b − a)sin²θ because a ≥ 0 and a + δ0 ≥ 0, and
// 1 − π_i is at least b − π = (b − a)cos²θ because b ≤ 1 and b + δ0 ≤ 1), so
// I ≤ N/((b − a)² sin²θ cos²θ) and
//
//	|du/dθ| ≤ √N   on the whole range, ends included.
//
// Over a cell of angle width Δ, u ≤ (u_l + u_r + √N·Δ)/2 (the meeting point
// of the two Lipschitz cones), and P ≤ sin² of that. This bound stays finite
// at π = 0 and π = 1, where I(π) is infinite; its gap shrinks only linearly
// with Δ, so it serves the cells near the ends.
//
// (B) second order, on the π scale. P″ ≥ E[1_R·U′] ≥ E[U′] = −I(π), and
// also P″ ≥ −P(π)·J(π) with J(π) = Σ_i n_i / min(π_i, q_i)², the largest
// value −U′ takes. Both I and J are convex in π (sums of convex
// functions: 1/(π q) and max(1/π², 1/q²)), so their largest value on a cell
// is at one of its ends. If g = P − (linear interpolation of the end
// values) then g″ ≥ −M and g = 0 at both ends, so g ≤ M·h²/8 with h the
// cell's width: with m the larger end value,
//
//	P ≤ m + I_max·h²/8,   and, with S the supremum on the cell,
//	S ≤ m + S·J_max·h²/8, so S ≤ m/(1 − J_max·h²/8) when J_max·h²/8 < 1.
//
// For tails near 1 the complement C = 1 − P (the tables outside R) gives
// the sharper one: P″ = −C″ = −E[1_{not R}·(U² + U′)] ≥ −C(π)·K(π) with
// K = (Σ_i n_i/min(π_i, q_i))² the largest value of U², again convex with
// its largest value at an end, and C on the cell at most its larger end
// value c plus N·h/2 (bound (D) below, applied to C), and also (|C′| ≤
// √(C·I) as in (A)) at most y² with y = β/2 + √(β²/4 + c), β = √I_max·h/2,
// so
//
//	P ≤ m + C_max·K_max·h²/8.
//
// The second form is relative, so it serves tails far below 1e−280 (the
// log-space path) as well. The gap of (B) shrinks with h², so a cell at
// distance d from the peak closes once h is a fixed fraction of d, and the
// refinement around the peak is geometric: tens of evaluations.
//
// (C′) monotone through the complement. Σ over all tables of term·G is
// the derivative of 1, zero, so P′ = −Σ_{not R} term·G: if G ≤ 0 at the
// cell's left end for every table outside R, P increases on the cell (and
// G ≥ 0 at its right end outside R makes P decrease). This closes the
// cells next to a supremum on the boundary of the nuisance range (a tail
// near 1, with the null line at π1 = 1), where I, J and K are infinite.
//
// (D) first order, on the π scale. For g with values in [0, 1],
// d/dp Σ_x b(x; n, p)·g(x) = n·Σ_y b(y; n − 1, p)·[g(y + 1) − g(y)] lies in
// [−n, n]; applied to each group, |P′(π)| ≤ n1 + n2 = N, so over a cell
// P ≤ (P_l + P_r + N·h)/2. Where the angle scale runs out of resolution
// (π2 within about 1e−16 of an end a > 0 or b < 1, whose angles differ by
// about 1e−8), this is the bound that closes the last cells.
//
// (C) monotone cells. d log[b1(x1) b2(x2)]/dπ = G(x; π) = x1/π1 −
// (n1 − x1)/q1 + x2/π2 − (n2 − x2)/q2 decreases in π and increases in x1
// and x2. If G ≥ 0 at the cell's right end for every table of R (checked
// row by row at the row's smallest x2), every term, hence P, increases on
// the cell and its supremum is the right end's value; likewise G ≤ 0 at
// the left end for every table gives the left end's value.
//
// Floating point. Each evaluated tail carries an allowance for its
// rounding error (tailWork.probErr: relative error 1e−13 + 4(n+2)·u of
// each binomial term, u = 2⁻⁵³, (n+3)·u of each prefix sum, counted on the
// magnitudes subtracted, the terms skipped below the cutoff, at most
// (n1 + n2 + 2)·cutoff, all doubled), and, for δ0 ≠ 0, for π1 = π2 + δ0
// being rounded (|∂ log P/∂π1| ≤ n1/min(π1, 1 − π1), or |∂P/∂π1| ≤ n1).
// The values used in (A)–(C) are the evaluated values plus their
// allowance; TestSupremumBoundBig checks the allowance against math/big.
// The bounds themselves are computed with relative slack 1e−12.
//
// Stopping rule: a cell whose bound is at most (1 + supBoundTolerance/2)
// times the best value found is closed; others are split at their middle
// angle (the new point may raise the best value, and then the reported
// p-value). The proven bound is the largest bound of the closed cells, so
// the relative gap (bound − p)/p is below supBoundTolerance; a cell that
// reaches the evaluation budget or an angle width of 1e−13 is closed with
// the bound it has, which is still proven, only wider.

// supBoundTolerance is the relative gap between the proven bound and the
// p-value at which the branch and bound stops: 1e−9.
const supBoundTolerance = 1e-9

// supBoundBudget is the most tail evaluations the branch and bound spends
// beyond the search's own grid (it needs tens; the cap only stops a
// pathological case from running on, at the price of a wider bound).
const supBoundBudget = 4000

const unitRoundoff = 0x1p-53

// probErr returns the region's probability as prob does, with an
// allowance err such that the exact probability at (p1, p2) is within
// value ± err (see the floating-point notes above).
func (w *tailWork) probErr(r *region, p1, p2, cutoff float64) (value, err float64) {
	w.evals++
	l1, h1, l2, h2 := w.fill(r, p1, p2, cutoff)
	pre, suf := w.pre, w.suf
	total, mag := 0.0, 0.0
	runs := 0
	for x1 := l1; x1 <= h1; x1++ {
		row, rowMag := 0.0, 0.0
		rr := r.runs[r.rowStart[x1]:r.rowStart[x1+1]]
		runs = max(runs, len(rr))
		for _, run := range rr {
			a, b := max(int(run[0]), l2), min(int(run[1]), h2)
			if a > b {
				continue
			}
			if pre[b+1] < suf[a] {
				row += pre[b+1] - pre[a]
				rowMag += pre[b+1] + pre[a]
			} else {
				row += suf[a] - suf[b+1]
				rowMag += suf[a] + suf[b+1]
			}
		}
		total += w.b1[x1] * row
		mag += w.b1[x1] * rowMag
	}
	u := unitRoundoff
	e2 := 1e-13 + 4*float64(r.n2+2)*u + float64(r.n2+3)*u
	e1 := 1e-13 + 4*float64(r.n1+2)*u + float64(r.n1+runs+4)*u
	err = 2*(e2*mag+e1*total) + float64(r.n1+r.n2+2)*cutoff
	return total, err
}

// logProbAllowance is the relative error allowed for logProb (each term
// from LogBinomPMF, summed in log space), as a log: log(1 + ρ).
func logProbAllowance(n1, n2 int) float64 {
	return math.Log1p(2e-12 + 16*float64(n1+n2+4)*unitRoundoff)
}

// lineAllowance is the extra allowance for evaluating at the rounded
// π1 = fl(π2 + δ0) instead of the exact π2 + δ0: |Δπ1| ≤ u·π1, and
// |∂P/∂π1| ≤ P·n1/min(π1, 1 − π1) and ≤ n1.
func lineAllowance(v float64, n1 int, p1, delta float64) float64 {
	if delta == 0 {
		return 0
	}
	d := unitRoundoff * p1
	abs := float64(n1) * d
	if m := min(p1, 1-p1); m > 0 {
		return 2 * min(abs, v*float64(n1)*d/m)
	}
	return 2 * abs
}

// boundPoint is one evaluated nuisance value: its angle, π2, the computed
// value (the tail, or its log on the log scale) and its upper value (the
// value plus its allowance).
type boundPoint struct {
	theta, pi2 float64
	val, up    float64
}

// supProof is the outcome of proveSupremum. On the log scale, best and
// bound are logs.
type supProof struct {
	best, bound float64
	pi2         float64
	evals       int
}

// proveSupremum runs the branch and bound from the points the search
// evaluated (its grid and its best point) and returns the proven bound, on
// the search's scale (log when s.logScale), and the best value found with
// its π2. It needs the search to have run with s.prove set.
func (s *nuisanceSearch) proveSupremum() supProof {
	pts := slices.Clone(s.grid)
	pts = append(pts, s.bestPoint)
	slices.SortFunc(pts, func(x, y boundPoint) int {
		switch {
		case x.theta < y.theta:
			return -1
		case x.theta > y.theta:
			return 1
		}
		return 0
	})
	pts = slices.CompactFunc(pts, func(x, y boundPoint) bool { return x.theta == y.theta })
	best := s.bestPoint
	s.rowRange()
	closeAt := func() float64 {
		if s.logScale {
			return best.val + math.Log1p(supBoundTolerance/2)
		}
		return best.val * (1 + supBoundTolerance/2)
	}
	bound := math.Inf(-1)
	if !s.logScale {
		bound = 0
	}
	evals := 0
	type cell struct{ l, r boundPoint }
	stack := make([]cell, 0, len(pts)+64)
	for i := len(pts) - 1; i > 0; i-- {
		stack = append(stack, cell{pts[i-1], pts[i]})
	}
	if len(pts) == 1 {
		bound = pts[0].up
	}
	for len(stack) > 0 {
		c := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		ub := s.cellBound(c.l, c.r, closeAt())
		// A cell also closes when what is left of its bound is the ends'
		// rounding allowance, which splitting cannot shrink.
		if ub <= closeAt() || ub <= max(c.l.up, c.r.up)+(closeAt()-best.val)/2 || evals >= supBoundBudget || c.r.theta-c.l.theta <= 1e-13 {
			bound = max(bound, ub)
			continue
		}
		m := s.point(0.5 * (c.l.theta + c.r.theta))
		evals++
		if m.val > best.val {
			best = m
		}
		stack = append(stack, cell{m, c.r}, cell{c.l, m})
	}
	bound = max(bound, best.up)
	if s.logScale {
		bound = min(bound, 0)
	} else {
		bound = min(bound, 1)
	}
	return supProof{best: best.val, bound: bound, pi2: best.pi2, evals: evals}
}

// point evaluates the tail at an angle with its upper value.
func (s *nuisanceSearch) point(theta float64) boundPoint {
	v := s.at(theta)
	return boundPoint{theta: theta, pi2: s.pi2(theta), val: v, up: s.upper(v)}
}

// upper returns the upper value of the last evaluation, whose result is v.
func (s *nuisanceSearch) upper(v float64) float64 {
	if s.logScale {
		return v + logProbAllowance(s.reg.n1, s.reg.n2)
	}
	return v + s.lastErr
}

// rowRange fills the smallest and largest x2 of each row of the region
// and of its complement (−1 for none), used by the monotone-cell checks.
func (s *nuisanceSearch) rowRange() {
	r := s.reg
	s.rowMin, s.rowMax = make([]int32, r.n1+1), make([]int32, r.n1+1)
	s.outMin, s.outMax = make([]int32, r.n1+1), make([]int32, r.n1+1)
	for x1 := 0; x1 <= r.n1; x1++ {
		runs := r.runs[r.rowStart[x1]:r.rowStart[x1+1]]
		s.rowMin[x1], s.rowMax[x1], s.outMin[x1], s.outMax[x1] = -1, -1, -1, -1
		if len(runs) > 0 {
			s.rowMin[x1], s.rowMax[x1] = runs[0][0], runs[len(runs)-1][1]
		}
		// The complement's smallest x2 is 0 unless a run starts there, then
		// the first gap; its largest is n2 unless a run ends there.
		lo := int32(0)
		for _, run := range runs {
			if run[0] > lo {
				break
			}
			lo = run[1] + 1
		}
		hi := int32(r.n2)
		for i := len(runs) - 1; i >= 0; i-- {
			if runs[i][1] < hi {
				break
			}
			hi = runs[i][0] - 1
		}
		if lo <= int32(r.n2) && hi >= 0 && lo <= hi {
			s.outMin[x1], s.outMax[x1] = lo, hi
		}
	}
}

// curvature returns I(π) and J(π) at π2 (+Inf where a rate is 0 or 1).
func (s *nuisanceSearch) curvature(p2 float64) (i, j float64) {
	p1 := min(max(p2+s.delta, 0), 1)
	n1, n2 := float64(s.reg.n1), float64(s.reg.n2)
	i = n1/(p1*(1-p1)) + n2/(p2*(1-p2))
	m1, m2 := min(p1, 1-p1), min(p2, 1-p2)
	j = n1/(m1*m1) + n2/(m2*m2)
	if math.IsNaN(i) || math.IsNaN(j) {
		return math.Inf(1), math.Inf(1)
	}
	return i * (1 + 1e-12), j * (1 + 1e-12)
}

// spread returns K(π) = (Σ_i n_i/min(π_i, q_i))², the largest value U²
// takes, at π2 (+Inf where a rate is 0 or 1), with slack.
func (s *nuisanceSearch) spread(p2 float64) float64 {
	p1 := min(max(p2+s.delta, 0), 1)
	m1, m2 := min(p1, 1-p1), min(p2, 1-p2)
	if !(m1 > 0 && m2 > 0) {
		return math.Inf(1)
	}
	k := float64(s.reg.n1)/m1 + float64(s.reg.n2)/m2
	return k * k * (1 + 1e-12)
}

// exactAngle is the angle whose exact image is π2 (the cells' ends are the
// evaluated π2 values, so the first-order bound measures their angles).
func (s *nuisanceSearch) exactAngle(p2 float64) float64 {
	return math.Atan2(math.Sqrt(max(p2-s.a, 0)), math.Sqrt(max(s.b-p2, 0)))
}

// Bounds of one cell, in the order of the notes above; +Inf where a bound
// does not apply (tests check each one on its own).
const (
	boundAngle      = iota // (A)
	boundCurvature         // (B), absolute, with I
	boundRelative          // (B), relative, with J (the only one on the log scale)
	boundComplement        // (B), through the complement, with K
	boundSlope             // (D)
	boundMonotone          // (C) and (C′)
	cellBoundKinds
)

// cellBound returns an upper bound on the tail over the cell [l, r] (a log
// on the log scale): the smallest of the bounds that apply. Once one is at
// most target the cell closes, so the costlier monotone checks are skipped.
func (s *nuisanceSearch) cellBound(l, r boundPoint, target float64) float64 {
	var parts [cellBoundKinds]float64
	s.cellBounds(l, r, &parts, target)
	return min(parts[0], parts[1], parts[2], parts[3], parts[4], parts[5])
}

// cellBounds fills every bound of the cell; the monotone one only when the
// others are above target.
func (s *nuisanceSearch) cellBounds(l, r boundPoint, parts *[cellBoundKinds]float64, target float64) {
	inf := math.Inf(1)
	for i := range parts {
		parts[i] = inf
	}
	m := max(l.up, r.up)
	h := r.pi2 - l.pi2
	if h <= 0 {
		parts[boundSlope] = m
		return
	}
	il, jl := s.curvature(l.pi2)
	ir, jr := s.curvature(r.pi2)
	iMax, jMax := max(il, ir), max(jl, jr)
	k := jMax * h * h / 8 * (1 + 1e-12)
	if s.logScale {
		if k < 1 {
			parts[boundRelative] = m - math.Log1p(-k)*(1+1e-12)
		}
	} else {
		if k < 1 {
			parts[boundRelative] = m / (1 - k) * (1 + 1e-12)
		}
		if !math.IsInf(iMax, 1) {
			parts[boundCurvature] = (m + iMax*h*h/8) * (1 + 1e-12)
		}
		// (B) through the complement: C = 1 − P is at most its larger end
		// value plus N·h/2 on the cell (bound (D) applied to C).
		nh := float64(s.reg.n1+s.reg.n2) * h
		cEnd := max(1-(2*l.val-l.up), 1-(2*r.val-r.up))
		cMax := min(1, cEnd+nh/2)
		if !math.IsInf(iMax, 1) {
			// |C′| ≤ √(C·I) (Cauchy–Schwarz as in (A)), so the supremum S of
			// C on the cell has √S ≤ β/2 + √(β²/4 + cEnd), β = √I_max·h/2.
			beta := math.Sqrt(iMax) * h / 2
			y := beta/2 + math.Sqrt(beta*beta/4+cEnd)
			cMax = min(cMax, y*y*(1+1e-12))
		}
		if kl, kr := s.spread(l.pi2), s.spread(r.pi2); !math.IsInf(max(kl, kr), 1) {
			parts[boundComplement] = (m + cMax*max(kl, kr)*h*h/8) * (1 + 1e-12)
		}
		ul, ur := math.Asin(math.Sqrt(min(l.up, 1))), math.Asin(math.Sqrt(min(r.up, 1)))
		dt := math.Abs(s.exactAngle(r.pi2)-s.exactAngle(l.pi2))*(1+1e-12) + 1e-15
		uStar := max(0.5*(ul+ur+math.Sqrt(float64(s.reg.n1+s.reg.n2))*dt), ul, ur)
		parts[boundAngle] = 1
		if uStar < math.Pi/2 {
			sn := math.Sin(uStar)
			parts[boundAngle] = min(sn*sn*(1+1e-12), 1)
		}
		// (D): |P′(π)| ≤ N on the π scale.
		parts[boundSlope] = max(0.5*(l.up+r.up+nh), m) * (1 + 1e-12)
	}
	if min(parts[0], parts[1], parts[2], parts[3], parts[4]) <= target {
		return
	}
	if s.increasing(r.pi2, s.rowMin, s.rowMax) || s.decreasing(l.pi2, s.outMin, s.outMax) {
		parts[boundMonotone] = r.up
	} else if s.decreasing(l.pi2, s.rowMin, s.rowMax) || s.increasing(r.pi2, s.outMin, s.outMax) {
		parts[boundMonotone] = l.up
	}
}

// slope returns the coefficients of G(x; π) = c1·x1 + c2·x2 − d1 − d2 at π2
// (see (C)); ok is false where a rate is 0 or 1.
func (s *nuisanceSearch) slope(p2 float64) (c1, c2, d1, d2 float64, ok bool) {
	p1 := p2 + s.delta
	if !(p1 > 0 && p1 < 1 && p2 > 0 && p2 < 1) {
		return 0, 0, 0, 0, false
	}
	n1, n2 := float64(s.reg.n1), float64(s.reg.n2)
	return 1/p1 + 1/(1-p1), 1/p2 + 1/(1-p2), n1 / (1 - p1), n2 / (1 - p2), true
}

// increasing reports whether every term of a set of tables increases up
// to π2: G(x; π2) > 0 (with relative slack) at every table; rowMin and
// rowMax give each row's smallest and largest x2 in the set (−1: none).
func (s *nuisanceSearch) increasing(p2 float64, rowMin, rowMax []int32) bool {
	c1, c2, d1, d2, ok := s.slope(p2)
	if !ok {
		return false
	}
	for x1, lo := range rowMin {
		if lo < 0 {
			continue
		}
		pos := c1*float64(x1) + c2*float64(lo)
		if pos-d1-d2 <= 1e-12*(pos+d1+d2) {
			return false
		}
	}
	return true
}

// decreasing reports whether every term of a set of tables decreases from
// π2 on.
func (s *nuisanceSearch) decreasing(p2 float64, rowMin, rowMax []int32) bool {
	c1, c2, d1, d2, ok := s.slope(p2)
	if !ok {
		return false
	}
	for x1, hi := range rowMax {
		if hi < 0 {
			continue
		}
		pos := c1*float64(x1) + c2*float64(hi)
		if pos-d1-d2 >= -1e-12*(pos+d1+d2) {
			return false
		}
	}
	return true
}

// provenSupremum runs the search with rounding allowances and then the
// branch and bound: it returns the log of the largest tail found, the π2
// where it was found, and the log of the proven upper bound on the
// supremum (at least logValue, at most 0).
func (s *nuisanceSearch) provenSupremum() (logValue, pi2, logBound float64) {
	s.prove = true
	logValue, pi2 = s.supremum()
	if s.err != nil { // cancelled or refused: the caller reports s.err
		return logValue, pi2, 0
	}
	if s.reg.full() || !s.hasBest {
		return logValue, pi2, 0
	}
	p := s.proveSupremum()
	if s.logScale {
		return min(max(p.best, logValue), 0), p.pi2, max(p.bound, logValue)
	}
	logValue = math.Log(min(max(p.best, math.Exp(logValue)), 1))
	return logValue, p.pi2, max(math.Log(p.bound), logValue)
}
