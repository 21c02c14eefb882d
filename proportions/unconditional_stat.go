package proportions

import (
	"context"
	"math"
)

// Ordering statistics of the unconditional tests and the regions they
// define.

// regionSide says which tables count as at least as extreme as the
// observed one.
type regionSide int

const (
	sideGreater regionSide = iota // evidence for π1 − π2 > δ0
	sideLess                      // evidence for π1 − π2 < δ0
	sideBoth                      // two-sided ordering
)

// statTieTolerance is the relative tolerance under which an ordering
// statistic counts as equal to the observed one: tables tied with the
// observed table in exact arithmetic (mirror tables, for example) come out
// of floating point a few ulps apart and must all join the region.
const statTieTolerance = 1e-9

// exactRestricted returns the maximum-likelihood estimates of (π1, π2)
// under the constraint π1 − π2 = delta, from the closed-form root of the
// likelihood cubic given by Farrington CP, Manning G (1990), "Test
// statistics and sample size formulae for comparative binomial trials with
// null hypothesis of non-zero risk difference or non-unity relative risk",
// Statistics in Medicine 9:1447–1454 (after Miettinen & Nurminen 1985).
func exactRestricted(p1, n1, p2, n2, delta float64) (q1, q2 float64) {
	if delta == 0 {
		pool := (p1*n1 + p2*n2) / (n1 + n2)
		return pool, pool
	}
	th := n2 / n1
	a := 1 + th
	b := -(1 + th + p1 + th*p2 + delta*(th+2))
	c := delta*delta + delta*(2*p1+th+1) + p1 + th*p2
	d := -p1 * delta * (1 + delta)
	v := b*b*b/(27*a*a*a) - b*c/(6*a*a) + d/(2*a)
	u := math.Sqrt(math.Max(b*b/(9*a*a)-c/(3*a), 0))
	if v < 0 {
		u = -u
	}
	var r1 float64
	if u == 0 {
		r1 = -b / (3 * a)
	} else {
		w := (math.Pi + math.Acos(math.Max(-1, math.Min(1, v/(u*u*u))))) / 3
		r1 = 2*u*math.Cos(w) - b/(3*a)
	}
	r1 = min(max(r1, max(0, delta)), min(1, 1+delta))
	return r1, min(max(r1-delta, 0), 1)
}

// zRatio returns num/√variance with the conventions of the unconditional
// tests: 0 when num is 0, ±Inf when only the variance is 0.
func zRatio(num, variance float64) float64 {
	switch {
	case num == 0:
		return 0
	case variance <= 0:
		return math.Copysign(math.Inf(1), num)
	}
	return num / math.Sqrt(variance)
}

// exactScoreZ is the score statistic for π1 − π2 = delta: (p1 − p2 − delta)
// over the standard error at the restricted estimates; with delta = 0 it is
// the pooled statistic (p1 − p2)/√(p̄(1−p̄)(1/n1 + 1/n2)) of Barnard's test.
func exactScoreZ(x1, n1, x2, n2, delta float64) float64 {
	p1, p2 := x1/n1, x2/n2
	q1, q2 := exactRestricted(p1, n1, p2, n2, delta)
	c1, c2 := restrictedComplements(q1, q2, delta)
	return zRatio(p1-p2-delta, q1*c1/n1+q2*c2/n2)
}

// restrictedComplements returns 1 − q1 and 1 − q2 for restricted estimates
// with q1 − q2 = delta. The complement of the larger estimate is taken as
// 1 − q and the other one as that plus |delta|, because the direct 1 − q of
// the other estimate can lose |delta| entirely. The case that matters is the
// table with every trial an event (x1 = n1, x2 = n2): its estimates lie on
// the edge of the null line, (1 + δ, 1) for δ < 0 or (1, 1 − δ) for δ > 0,
// so its variance is |δ|(1 − |δ|)/n and its z is about √(n|δ|), near 0.
// For |δ| below about 1e−16, 1 ± δ rounds to 1, both direct complements
// are 0, the variance is 0 and z comes out as ±∞: the table, whose
// probability tends to 1 as the nuisance tends to 1, then joined the
// rejection region and the p-value at such a δ was 1. The interval searches
// step from p1 − p2 by multiples of a rational step and can land there
// (60/200 vs 40/200 lands on −2e−17), which stopped a limit next to 0.
func restrictedComplements(q1, q2, delta float64) (c1, c2 float64) {
	if delta < 0 { // q2 is the larger estimate
		c2 = 1 - q2
		return c2 - delta, c2
	}
	c1 = 1 - q1
	return c1, c1 + delta
}

// exactWaldZ is the unpooled (Wald) statistic (p1 − p2 − delta)/√(p1(1−p1)/n1 + p2(1−p2)/n2).
func exactWaldZ(x1, n1, x2, n2, delta float64) float64 {
	p1, p2 := x1/n1, x2/n2
	return zRatio(p1-p2-delta, p1*(1-p1)/n1+p2*(1-p2)/n2)
}

// zInRegion reports whether statistic z is at least as extreme as zobs.
func zInRegion(z, zobs float64, side regionSide) bool {
	slack := 0.0
	if !math.IsInf(zobs, 0) {
		slack = statTieTolerance * math.Abs(zobs)
	}
	switch side {
	case sideGreater:
		return z >= zobs-slack
	case sideLess:
		return z <= zobs+slack
	}
	return math.Abs(z) >= math.Abs(zobs)-slack
}

// zRegion builds the region of a z statistic (score when pooled, else
// Wald) for the counts and null difference delta; it returns the region
// and the observed statistic.
func zRegion(c Counts, delta float64, pooled bool, side regionSide) (region, float64) {
	return zRegionContext(context.Background(), c, delta, pooled, side)
}

// zRegionContext is zRegion stopping early when ctx ends (the region is
// then incomplete; callers check ctx.Err()).
func zRegionContext(ctx context.Context, c Counts, delta float64, pooled bool, side regionSide) (region, float64) {
	zobs := zObserved(c, delta, pooled)
	return zRegionAt(ctx, c.N1, c.N2, zobs, delta, pooled, side), zobs
}

// zObserved is the observed z statistic (score when pooled, else Wald).
func zObserved(c Counts, delta float64, pooled bool) float64 {
	stat := exactWaldZ
	if pooled {
		stat = exactScoreZ
	}
	return stat(float64(c.X1), float64(c.N1), float64(c.X2), float64(c.N2), delta)
}

// zRegionAt builds the region of the tables at least as extreme as an
// observed statistic zobs: it depends on the outcome only through zobs
// (through |zobs| for the two-sided side), which lets one region serve
// every outcome with that statistic (unconditional_window.go).
func zRegionAt(ctx context.Context, n1i, n2i int64, zobs, delta float64, pooled bool, side regionSide) region {
	n1, n2 := float64(n1i), float64(n2i)
	if pooled && delta == 0 {
		return pooledRegion(ctx, n1i, n2i, zobs, side)
	}
	stat := exactWaldZ
	if pooled {
		stat = exactScoreZ
	}
	return buildRegion(ctx, int(n1i), int(n2i), func(x1, from int, part []bool) {
		for j := range part {
			part[j] = zInRegion(stat(float64(x1), n1, float64(from+j), n2, delta), zobs, side)
		}
	})
}

// pooledRegion is zRegion for Barnard's pooled statistic at δ0 = 0, the
// common case, without a square root or division per table: with
// d = p1 − p2 and V the pooled variance, z = d/√V, so each comparison
// z ≥ t becomes a comparison of d² with t²·V and the signs (V = 0 only
// when d = 0 here, where z := 0).
func pooledRegion(ctx context.Context, n1i, n2i int64, zobs float64, side regionSide) region {
	n1, n2 := float64(n1i), float64(n2i)
	inv, invN, invN2 := 1/n1+1/n2, 1/(n1+n2), 1/n2
	slack := statTieTolerance * math.Abs(zobs)
	t := zobs - slack // Greater: z ≥ t
	if side == sideLess {
		t = zobs + slack // Less: z ≤ t
	}
	if side == sideBoth {
		t = math.Abs(zobs) - slack // two-sided: |z| ≥ t
	}
	t2 := t * t
	return buildRegion(ctx, int(n1i), int(n2i), func(x1, from int, part []bool) {
		p1 := float64(x1) / n1
		for j := range part {
			x2 := from + j
			pool := (float64(x1) + float64(x2)) * invN
			v := pool * (1 - pool) * inv
			d := p1 - float64(x2)*invN2
			if float64(x2)*n1 == float64(x1)*n2 {
				d = 0 // exact tie p1 = p2 (the float difference may not be 0)
			}
			far := d*d >= t2*v // |z| ≥ |t|
			near := d*d <= t2*v
			switch side {
			case sideGreater:
				part[j] = (t <= 0 && (d >= 0 || near)) || (t > 0 && d > 0 && far)
			case sideLess:
				part[j] = (t >= 0 && (d <= 0 || near)) || (t < 0 && d < 0 && far)
			default:
				part[j] = t <= 0 || (d != 0 && far)
			}
		}
	})
}
