package planning

import (
	"encoding/json"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// planningSentinels are the errors a planning function may return for bad
// or impossible input.
var planningSentinels = []error{proportions.ErrPlan, proportions.ErrMargin, proportions.ErrAlternative, proportions.ErrBetter, proportions.ErrUnsupported, proportions.ErrUnreachable, proportions.ErrTooLarge}

func wrapsPlanningSentinel(err error) bool {
	for _, s := range planningSentinels {
		if errors.Is(err, s) {
			return true
		}
	}
	return false
}

// TestPlanningEdgeInputs are the reproducers of issue 20: a drop-out share
// near 1 (enrolment overflowed to 2 for n1 = 1377), a rate of 5e−324 (an
// infinite ratio that did not marshal), and PowerByDifference echoing an
// unvalidated first rate.
func TestPlanningEdgeInputs(t *testing.T) {
	d := NewPlan(Equality, 0.30, 0.35)
	for _, drop := range []float64{0.9999999999999999, 0.999999999999} {
		d.Dropout = drop
		_, err := SampleSize(d)
		if !errors.Is(err, proportions.ErrTooLarge) {
			t.Errorf("drop-out %v: got %v, want ErrTooLarge", drop, err)
		}
	}
	// A drop-out share that still fits: enrolment is at least the sample
	// and ⌈n/(1 − share)⌉ (arithmetic).
	d.Dropout = 0.5
	r, err := SampleSize(d)
	if err != nil {
		t.Fatal(err)
	}
	if r.Enrolled1 != 2*r.N1 || r.Enrolled2 != 2*r.N2 {
		t.Errorf("drop-out 0.5: enrolled %d and %d for %d and %d", r.Enrolled1, r.Enrolled2, r.N1, r.N2)
	}
	if _, err := (Plan{Dropout: 0.9999999999999999}).EnrolledUnits(1377); !errors.Is(err, proportions.ErrTooLarge) {
		t.Errorf("EnrolledUnits: %v", err)
	}
	if got := (Plan{Dropout: 0.9999999999999999}).Enrolled(1377); got < 1377 {
		t.Errorf("Enrolled = %d, below the 1377 analysed", got)
	}

	tiny := NewPlan(Equality, 0.30, 5e-324)
	if _, err := PowerByTrials(tiny, 10, 20); !errors.Is(err, proportions.ErrPlan) {
		t.Errorf("rate 5e-324 in PowerByTrials: %v", err)
	}
	if _, err := DetectableDifference(tiny, 100, 100); !errors.Is(err, proportions.ErrPlan) {
		t.Errorf("rate 5e-324 in DetectableDifference: %v", err)
	}
	nan := NewPlan(Equality, math.NaN(), 0.35)
	if _, err := PowerByDifference(nan, 100, 100, 0.1, 0.9, 5); !errors.Is(err, proportions.ErrPlan) {
		t.Errorf("NaN first rate in PowerByDifference: %v", err)
	}
	// Rate1 left at 0 is fine where it is not used.
	unset := NewPlan(Equality, 0, 0.35)
	if _, err := PowerByDifference(unset, 100, 100, 0.1, 0.9, 5); err != nil {
		t.Errorf("unset first rate in PowerByDifference: %v", err)
	}
}

// TestPlanErrorsSayWhetherTheFieldIsUsed checks the wording of the errors
// for a bad first rate and a bad power: a function that reads the field
// must not call it unused (SampleSize said "the field is not used here"
// of the very rate it needs), and one that only echoes it must say that
// 0 is allowed.
func TestPlanErrorsSayWhetherTheFieldIsUsed(t *testing.T) {
	const unused = "not used here"
	badRate := NewPlan(Equality, 5e-324, 0.35)
	badPower := NewPlan(Equality, 0.30, 0.35)
	badPower.Power = 1.5
	for _, c := range []struct {
		name   string
		err    func() error
		echoed bool
	}{
		{"SampleSize, first rate", func() error { _, err := SampleSize(badRate); return err }, false},
		{"Power, first rate", func() error { _, err := Power(badRate, 100, 100); return err }, false},
		{"PowerByTrials, first rate", func() error { _, err := PowerByTrials(badRate, 10, 20); return err }, false},
		{"Validate, first rate", badRate.Validate, false},
		{"SampleSize, power", func() error { _, err := SampleSize(badPower); return err }, false},
		{"DetectableDifference, power", func() error { _, err := DetectableDifference(badPower, 100, 100); return err }, false},
		{"PowerByDifference, first rate", func() error { _, err := PowerByDifference(badRate, 100, 100, 0.1, 0.9, 5); return err }, true},
		{"DetectableDifference, first rate", func() error {
			d := badRate
			d.Power = 0.8
			_, err := DetectableDifference(d, 100, 100)
			return err
		}, true},
		{"Power, power", func() error { _, err := Power(badPower, 100, 100); return err }, true},
	} {
		err := c.err()
		if !errors.Is(err, proportions.ErrPlan) {
			t.Errorf("%s: %v, want an error wrapping ErrPlan", c.name, err)
			continue
		}
		if got := strings.Contains(err.Error(), unused); got != c.echoed {
			t.Errorf("%s: %q; says the field is unused: %v, want %v", c.name, err, got, c.echoed)
		}
	}
}

// FuzzPlanDesign builds arbitrary designs and asks every asymptotic
// planning question of them. Each answer is an error wrapping a planning
// sentinel, or a result that marshals (so holds no NaN or infinity) with
// sound sizes: groups of 1 to MaxTrials units, enrolment at least the
// analysed size and at most MaxTrials, powers in [0, 1].
func FuzzPlanDesign(f *testing.F) {
	f.Add(uint8(0), uint8(0), uint8(0), 0.30, 0.35, 0.0, 0.05, 0.8, 1.0, 0.9999999999999999, uint8(0), false, int64(100), int64(100))
	f.Add(uint8(0), uint8(0), uint8(0), 0.30, 0.35, 0.0, 0.05, 0.8, 1.0, 0.999999999999, uint8(0), false, int64(100), int64(100))
	f.Add(uint8(0), uint8(0), uint8(0), 0.30, 5e-324, 0.0, 0.05, 0.8, 1.0, 0.0, uint8(0), false, int64(100), int64(100))
	f.Add(uint8(0), uint8(0), uint8(0), math.NaN(), 0.35, 0.0, 0.05, 0.8, 1.0, 0.0, uint8(0), false, int64(100), int64(100))
	f.Add(uint8(2), uint8(0), uint8(1), 0.85, 0.85, -0.1, 0.025, 0.9, 2.0, 0.1, uint8(1), false, int64(50), int64(100))
	f.Add(uint8(3), uint8(1), uint8(0), 0.2, 0.2, 1.25, 0.05, 0.8, 0.5, 0.2, uint8(0), false, int64(400), int64(200))
	f.Add(uint8(1), uint8(1), uint8(2), 0.1, 0.2, 0.9, 0.025, 0.8, 1.0, 0.0, uint8(0), true, int64(1), int64(1))
	f.Add(uint8(0), uint8(0), uint8(0), 1e-12, 1-1e-12, 0.0, 1e-12, 1-1e-12, 100.0, 0.99, uint8(1), true, int64(1)<<50, int64(1)<<50)
	f.Add(uint8(3), uint8(1), uint8(0), 0.5, 0.5, 5e-324, 0.05, 0.8, 1.0, 0.0, uint8(0), false, int64(10), int64(10))
	f.Add(uint8(1), uint8(1), uint8(1), 0.5, 0.5, 1e300, 0.05, 0.8, 1.0, 0.0, uint8(0), false, int64(10), int64(10))
	f.Fuzz(func(t *testing.T, goal, scale, alt uint8, rate1, rate2, margin, alpha, power, alloc, dropout float64,
		variance uint8, cc bool, n1, n2 int64) {
		// Odd goal bytes take the numbers as given (edges, NaN, infinities);
		// even ones fold them into their ranges, so that about half the
		// designs are valid and reach the formulas.
		if goal%2 == 0 {
			frac := func(x float64) float64 {
				if math.IsNaN(x) || math.IsInf(x, 0) {
					return 0.5
				}
				return math.Abs(x) - math.Floor(math.Abs(x))
			}
			rate1, rate2, dropout = frac(rate1), frac(rate2), frac(dropout)
			alpha = 0.5 * frac(alpha)
			power = alpha + (1-alpha)*frac(power)
			alloc = 0.01 + 99.99*frac(alloc)
			switch {
			case scale%3 == 1 && margin != 0:
				margin = math.Exp(20 * (frac(margin) - 0.5))
			default:
				margin = 2*frac(margin) - 1
			}
			if n1 < 0 {
				n1 = -n1
			}
			if n2 < 0 {
				n2 = -n2
			}
			n1, n2 = 1+n1%100000, 1+n2%100000
		}
		d := Plan{Goal: Goal(goal % 5), Scale: []proportions.Scale{proportions.Difference, proportions.Ratio, proportions.OddsRatio}[scale%3],
			Better: proportions.Better(alt % 3), Rate1: rate1, Rate2: rate2, Margin: margin, Alpha: alpha, Power: power,
			Allocation: alloc, Dropout: dropout, Variance: VarianceRule(variance % 3), ContinuityCorrection: cc}
		check := func(what string, v any, err error) {
			t.Helper()
			if err != nil {
				if !wrapsPlanningSentinel(err) {
					t.Fatalf("%s of %+v: error %q wraps no planning sentinel", what, d, err)
				}
				return
			}
			if _, err := json.Marshal(v); err != nil {
				t.Fatalf("%s of %+v: result does not marshal: %v", what, d, err)
			}
		}
		okPower := func(what string, p float64) {
			t.Helper()
			if !(p >= 0 && p <= 1) {
				t.Fatalf("%s of %+v: power %v", what, d, p)
			}
		}
		okSizes := func(what string, n, e int64) {
			t.Helper()
			if n < 1 || n > proportions.MaxTrials || e < n || e > proportions.MaxTrials {
				t.Fatalf("%s of %+v: %d analysed, %d enrolled", what, d, n, e)
			}
		}
		check("Validate", nil, d.Validate())
		ss, err := SampleSize(d)
		check("SampleSize", ss, err)
		if err == nil {
			okSizes("SampleSize group 1", ss.N1, ss.Enrolled1)
			okSizes("SampleSize group 2", ss.N2, ss.Enrolled2)
			okPower("SampleSize", ss.Power)
			if ss.Total != ss.N1+ss.N2 || ss.EnrolledTotal != ss.Enrolled1+ss.Enrolled2 {
				t.Fatalf("SampleSize of %+v: totals %+v", d, ss)
			}
		}
		pa, err := Power(d, n1, n2)
		check("Power", pa, err)
		if err == nil {
			okPower("Power", pa.Power)
		}
		from := 1 + (n1&0xffff)%1000
		curve, err := PowerByTrials(d, from, from+n2&0xff)
		check("PowerByTrials", curve, err)
		if err == nil {
			for _, p := range curve.Points {
				okPower("PowerByTrials", p.Power)
			}
		}
		lo := math.Abs(margin) - math.Floor(math.Abs(margin))
		byDiff, err := PowerByDifference(d, n1, n2, lo, math.Min(1, lo+0.5), 7)
		check("PowerByDifference", byDiff, err)
		if err == nil {
			for _, p := range byDiff.Points {
				okPower("PowerByDifference", p.Power)
			}
		}
		dd, err := DetectableDifference(d, n1, n2)
		check("DetectableDifference", dd, err)
		if e, err := d.EnrolledUnits(n1); err == nil && n1 >= 1 && n1 <= proportions.MaxTrials && (d.Dropout >= 0 && d.Dropout < 1) {
			okSizes("EnrolledUnits", n1, e)
		}
	})
}
