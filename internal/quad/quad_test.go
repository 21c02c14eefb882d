package quad

import (
	"math"
	"testing"
)

// Integrals with closed forms (calculus): the estimate must cover the
// actual error, and the value must meet the tolerance.
func TestClosedForms(t *testing.T) {
	cases := []struct {
		name string
		f    func(float64) float64
		a, b float64
		want float64
	}{
		{"exp on [0,1]: e − 1", math.Exp, 0, 1, math.E - 1},
		{"sharp Gaussian bump on a window of ±20 widths: √π·0.001", func(x float64) float64 { return math.Exp(-((x - 0.3) / 0.001) * ((x - 0.3) / 0.001)) }, 0.28, 0.32, math.Sqrt(math.Pi) * 0.001},
		{"√x on [0,1]: 2/3 (singular derivative)", math.Sqrt, 0, 1, 2.0 / 3},
		{"1/(1+x²) on [−10,10]: 2·atan(10)", func(x float64) float64 { return 1 / (1 + x*x) }, -10, 10, 2 * math.Atan(10)},
	}
	for _, c := range cases {
		r := Integrate(c.f, c.a, c.b, nil, 1e-13, 1e-11)
		got := math.Abs(r.Value - c.want)
		if !r.Converged || got > 1e-10*math.Abs(c.want) || got > r.Err+1e-15 {
			t.Errorf("%s: %.16g (error %.2g, estimate %.2g, converged %v)", c.name, r.Value, got, r.Err, r.Converged)
		}
	}
}

// A step at a breakpoint is integrated exactly. (Without the breakpoint
// both rules can agree on a wrong value: the estimate needs an integrand
// that is smooth on each panel, which is why callers pass breakpoints and
// windows around the mass; see the package doc.)
func TestBreakpoints(t *testing.T) {
	step := func(x float64) float64 {
		if x < 0.37 {
			return 0
		}
		return 1
	}
	r := Integrate(step, 0, 1, []float64{0.37, 2}, 1e-14, 0)
	if math.Abs(r.Value-0.63) > 1e-14 {
		t.Errorf("with the break: %.16g, want 0.63", r.Value)
	}
}
