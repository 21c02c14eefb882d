package planning

import (
	"fmt"
	"math"

	"github.com/propscope/propscope/internal/special"
	"github.com/propscope/propscope/proportions"
)

// This file holds the normal-approximation model behind SampleSize, Power,
// DetectableDifference and the asymptotic curves.
//
// Every plan reduces to one or two one-sided z tests of a contrast
// L = p̂1 − c·p̂2 − d, where (c, d) = (1, θ0) on the difference scale and
// (θ0, 0) on the ratio scale (Farrington & Manning 1990). With n1 units in
// group 1 and r·n1 in group 2, L is approximately normal with mean
// E = π1 − c·π2 − d and variance V1/n1, V1 = π1(1−π1) + c²·π2(1−π2)/r, while
// the test divides by the null standard error √(V0/n1), where V0 is V1 at
// the null rates (Pooled) or at the anticipated rates (Unpooled). A test
// that rejects for large L at level α' then has power
//
//	Φ((E·√n1 − z_{1−α'}·√V0) / √V1),
//
// which solves to n1 = ((z_{1−α'}·√V0 + z_{power}·√V1) / E)²
// (Fleiss, Levin & Paik 2003, ch. 4; Farrington & Manning 1990).

// zTest is one one-sided z test in the model.
type zTest struct {
	upper bool    // rejects for large L (alternative Greater)
	mean  float64 // E, the mean of L at the anticipated rates
	sd0   float64 // √V0
	sd1   float64 // √V1
	z     float64 // critical value z_{1−α'}
}

// distance is the mean of L measured in the direction of the alternative.
func (t zTest) distance() float64 {
	if t.upper {
		return t.mean
	}
	return -t.mean
}

// power at n1 units in group 1 (real-valued, the group ratio fixed).
func (t zTest) power(n1 float64) float64 {
	return normalCDF((t.distance()*math.Sqrt(n1) - t.z*t.sd0) / t.sd1)
}

// sizeFor returns the real n1 at which the test reaches the power.
func (t zTest) sizeFor(power float64) float64 {
	s := (t.z*t.sd0 + special.NormalQuantile(power)*t.sd1) / t.distance()
	return s * s
}

// model is a plan's asymptotic power as a function of n1.
type model struct {
	plan  Plan
	r     float64
	tests [2]zTest // the first count are in use (kept in an array: no allocation)
	count int
	// combine says how the tests make the decision: the two-sided test
	// rejects when either one-sided test at α/2 does; equivalence needs both.
	combine combineRule
	// ccA is a = (r+1)/(r·|π1 − π2|) of the continuity correction, 0 when off.
	ccA float64
	// nullRate1 and nullRate2 are the rates behind V0 for the first test.
	nullRate1, nullRate2 float64
}

type combineRule int

const (
	single combineRule = iota
	either
	both
)

func normalCDF(x float64) float64 { return 0.5 * math.Erfc(-x/math.Sqrt2) }

// critical returns the critical value of each one-sided z test of the
// plan: z_{1−α/2} for Equality, z_{1−α} otherwise.
func (d Plan) critical() float64 {
	if d.Goal == Equality {
		return special.NormalQuantile(1 - d.Alpha/2)
	}
	return special.NormalQuantile(1 - d.Alpha)
}

// newModel builds the model for rates p1, p2 and ratio r; the plan must
// have been validated.
func newModel(d Plan, p1, p2, r float64) model { return newModelZ(d, p1, p2, r, d.critical()) }

// newModelZ is newModel with the critical value z = d.critical() given, for
// callers that build many models of one plan.
func newModelZ(d Plan, p1, p2, r, z float64) model {
	m := model{plan: d, r: r}
	switch d.Goal {
	case Equality:
		up := m.zTest(p1, p2, d.Scale.NoEffect(), true, z)
		down := up
		down.upper = false
		m.tests, m.count, m.combine = [2]zTest{up, down}, 2, either
	case Superiority, NonInferiority:
		m.tests[0], m.count, m.combine = m.zTest(p1, p2, d.Margin, d.Better == proportions.HigherIsBetter, z), 1, single
	case Equivalence:
		lo, hi := d.equivalenceBounds()
		m.tests = [2]zTest{m.zTest(p1, p2, lo, true, z), m.zTest(p1, p2, hi, false, z)}
		m.count, m.combine = 2, both
	}
	if d.ContinuityCorrection {
		m.ccA = (r + 1) / (r * math.Abs(p1-p2))
	}
	return m
}

// zTest sets up the test of θ against null; it records the null rates.
func (m *model) zTest(p1, p2, null float64, upper bool, z float64) zTest {
	c, dd := 1.0, null
	if m.plan.Scale == proportions.Ratio {
		c, dd = null, 0
	}
	v := func(a, b float64) float64 { return a*(1-a) + c*c*b*(1-b)/m.r }
	q1, q2 := p1, p2
	if m.plan.Variance == Pooled {
		q1, q2 = nullRates(m.plan.Scale, p1, p2, m.r, null)
	}
	if m.nullRate1 == 0 && m.nullRate2 == 0 {
		m.nullRate1, m.nullRate2 = q1, q2
	}
	return zTest{upper: upper, mean: p1 - c*p2 - dd, sd0: math.Sqrt(v(q1, q2)), sd1: math.Sqrt(v(p1, p2)), z: z}
}

// power returns the asymptotic power at n1 (real) units in group 1.
func (m model) power(n1 float64) float64 {
	if m.ccA > 0 {
		// Continuity correction: the corrected test at n1 behaves like the
		// uncorrected one at n' = (n1 − a/2)²/n1, the inverse of
		// n1 = n'/4·(1 + √(1 + 2a/n'))² (Fleiss, Tytun & Ury 1980).
		if n1 <= m.ccA/2 {
			n1 = 0
		} else {
			n1 = (n1 - m.ccA/2) * (n1 - m.ccA/2) / n1
		}
	}
	switch m.combine {
	case either:
		return math.Min(1, m.tests[0].power(n1)+m.tests[1].power(n1))
	case both:
		return math.Max(0, m.tests[0].power(n1)+m.tests[1].power(n1)-1)
	}
	return m.tests[0].power(n1)
}

// reachable reports whether the power grows to 1 with n1; if not, the
// error says why no finite sample size exists.
func (m model) reachable() error {
	d := m.plan
	if m.combine == either {
		if m.tests[0].distance() != 0 {
			return nil
		}
		return fmt.Errorf("anticipated rates are equal (%v and %v): %w; a test of equality has power α = %v at every sample size, so no finite n exists; plan for the smallest difference worth detecting",
			d.Rate1, d.Rate2, proportions.ErrUnreachable, d.Alpha)
	}
	for _, t := range m.tests[:m.count] {
		if t.distance() > 0 {
			continue
		}
		theta := effectOf(d.Scale, d.Rate1, d.Rate2)
		if d.Goal == Equivalence {
			lo, hi := d.equivalenceBounds()
			return fmt.Errorf("anticipated %s %.4g is not strictly inside the equivalence range (%.4g, %.4g): %w; no finite sample size shows equivalence with power above α",
				d.Scale, theta, lo, hi, proportions.ErrUnreachable)
		}
		return fmt.Errorf("anticipated %s %.4g does not lie beyond the margin %v on the side where %s rates are better: %w; power stays at or below α = %v at every sample size, so no finite n exists",
			d.Scale, theta, d.Margin, d.Better, proportions.ErrUnreachable, d.Alpha)
	}
	return nil
}

// sizeFor returns the real n1 at which the plan reaches its power:
// the published closed forms for one test (the two-sided test uses the side
// the anticipated difference points to and neglects the other, as the
// published formula does), bisection for equivalence.
func (m model) sizeFor(power float64) float64 {
	var n float64
	switch m.combine {
	case either:
		t := m.tests[0]
		if t.distance() < 0 {
			t = m.tests[1]
		}
		n = t.sizeFor(power)
	case single:
		n = m.tests[0].sizeFor(power)
	case both:
		return m.bisectSize(power)
	}
	if m.ccA > 0 {
		// Casagrande, Pike & Smith (1978) in the closed form of Fleiss,
		// Tytun & Ury (1980): n = n'/4·(1 + √(1 + 2(r+1)/(n'·r·|π1−π2|)))².
		s := 1 + math.Sqrt(1+2*m.ccA/n)
		n = n / 4 * s * s
	}
	return n
}

// bisectSize finds the real n1 where the (increasing) power reaches the
// target. Each one-sided test at power (1+target)/2 bounds it from above,
// since then the joint power is at least target.
func (m model) bisectSize(power float64) float64 {
	hi := 0.0
	for _, t := range m.tests[:m.count] {
		hi = math.Max(hi, t.sizeFor((1+power)/2))
	}
	return findRoot(func(n float64) float64 { return m.power(n) - power }, 0, hi, 1e-10*hi)
}

// findRoot returns x in [a, b] with g(x) = 0 to within tol in x (or
// |g(x)| ≤ 1e−15, all a power can resolve), for g continuous with g(a),
// g(b) of opposite signs, by regula falsi with the Illinois modification
// (Dowell & Jarratt 1971), which converges superlinearly and never leaves
// the bracket. If the signs do not differ it returns b.
func findRoot(g func(float64) float64, a, b, tol float64) float64 {
	return findRootFrom(g, a, b, g(a), g(b), tol)
}

// findRootFrom is findRoot when g(a) = ga and g(b) = gb are already known,
// which saves two evaluations of g.
func findRootFrom(g func(float64) float64, a, b, ga, gb, tol float64) float64 {
	if ga == 0 {
		return a
	}
	if gb == 0 || (ga > 0) == (gb > 0) {
		return b
	}
	side := 0
	for range 200 {
		x := (a*gb - b*ga) / (gb - ga)
		if !(x > math.Min(a, b) && x < math.Max(a, b)) {
			// The interpolation rounds onto an end: that end is the root
			// to within rounding.
			if math.Abs(ga) < math.Abs(gb) {
				return a
			}
			return b
		}
		gx := g(x)
		switch {
		case math.Abs(gx) <= 1e-15:
			return x
		case (gx > 0) == (gb > 0):
			b, gb = x, gx
			if side == -1 {
				ga /= 2
			}
			side = -1
		default:
			a, ga = x, gx
			if side == 1 {
				gb /= 2
			}
			side = 1
		}
		if math.Abs(b-a) <= tol {
			break
		}
	}
	return (a + b) / 2
}

// effectOf returns θ for rates p1, p2 on the scale.
func effectOf(f proportions.Scale, p1, p2 float64) float64 {
	if f == proportions.Ratio {
		return p1 / p2
	}
	return p1 - p2
}

// ceilSize rounds a real group size up, forgiving rounding noise so that
// an exact integer solution stays that integer; at least 1. The noise
// forgiven is 10⁻⁹ of x but never more than 10⁻⁶ of a unit: a share of x
// alone forgave whole units above 10⁹ (group 2 came out 2·10⁵ units short
// of ⌈r·n1⌉ at n1 ≈ 2·10¹⁴).
func ceilSize(x float64) int64 {
	n := int64(math.Ceil(x - math.Min(1e-9*math.Max(1, x), 1e-6)))
	return max(n, 1)
}

// groupTwoSize returns ⌈r·n1⌉, the size of group 2 for n1 in group 1.
func groupTwoSize(n1 int64, r float64) int64 { return ceilSize(r * float64(n1)) }
