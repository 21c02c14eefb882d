package planning

import (
	"fmt"
	"math"
	"strings"

	"github.com/propscope/propscope/proportions"
)

// Caution is shown with every planning result.
const Caution = "A plan is only as good as the anticipated rates behind it; " +
	"significance is not importance, and where health or safety decisions follow, " +
	"the applicable regulations and a qualified statistician decide."

// Citations of the planning formulas.
const (
	citeFleissLevinPaik = "Fleiss JL, Levin B, Paik MC (2003). Statistical Methods for Rates and Proportions, 3rd ed. Wiley, chapter 4."
	citeFarringtonMan   = "Farrington CP, Manning G (1990). Test statistics and sample size formulae for comparative binomial trials with null hypothesis of non-zero risk difference or non-unity relative risk. Statistics in Medicine 9:1447–1454."
	citeContinuity      = "Casagrande JT, Pike MC, Smith PG (1978). An improved approximate formula for calculating sample sizes for comparing two binomial distributions. Biometrics 34:483–486; closed form of Fleiss JL, Tytun A, Ury HK (1980). A simple approximation for calculating sample sizes for comparing independent proportions. Biometrics 36:343–346."
	citeSchuirmann      = "Schuirmann DJ (1987). A comparison of the two one-sided tests procedure and the power approach for assessing the equivalence of average bioavailability. Journal of Pharmacokinetics and Biopharmaceutics 15:657–680."
)

// SampleSizeResult is the asymptotic sample size of a plan.
type SampleSizeResult struct {
	Plan Plan `json:"plan"`
	// Approximation names the formula; Citation its sources; Formula states it.
	Approximation string `json:"approximation"`
	Citation      string `json:"citation"`
	Formula       string `json:"formula"`
	// Unrounded is the formula's real-valued n1 before rounding up.
	Unrounded float64 `json:"n1_unrounded"`
	// N1 and N2 are the units per group with an outcome (after drop-out):
	// N1 is the smallest whole size from ⌈Unrounded⌉ up at which the power
	// reaches the target (one or a few units more than ⌈Unrounded⌉ where
	// rounding would leave it just short), N2 = ⌈r·N1⌉.
	N1    int64 `json:"n1"`
	N2    int64 `json:"n2"`
	Total int64 `json:"total"`
	// Enrolled1 and Enrolled2 are the units to enrol, ⌈N/(1 − Dropout)⌉.
	Enrolled1     int64 `json:"enrolled1"`
	Enrolled2     int64 `json:"enrolled2"`
	EnrolledTotal int64 `json:"enrolled_total"`
	// Power is the asymptotic power at N1 and N2 (at least Plan.Power).
	Power float64 `json:"power"`
	// NullRate1 and NullRate2 are the rates behind the null variance: the
	// pooled rate, the Farrington–Manning restricted MLEs (for equivalence,
	// those at the lower limit), or the anticipated rates when Unpooled.
	NullRate1 float64  `json:"null_rate1"`
	NullRate2 float64  `json:"null_rate2"`
	Notes     []string `json:"notes"`
	Caution   string   `json:"caution"`
}

// SampleSize returns the number of units per group a plan needs by the
// normal approximation, rounded up, with the enrolment inflated for
// drop-out.
//
// Formulas (r = n2/n1, z_p the standard normal p-quantile, power 1 − β):
//   - Equality, pooled (Fleiss, Levin & Paik 2003, ch. 4):
//     n1 = [z_{1−α/2}·√(p̄q̄(1 + 1/r)) + z_{1−β}·√(p1q1 + p2q2/r)]² / (p1 − p2)²
//     with p̄ = (p1 + r·p2)/(1 + r), q = 1 − p; Unpooled puts p1q1 + p2q2/r
//     under both roots.
//   - Superiority and non-inferiority against δ on the difference scale
//     (Farrington & Manning 1990): n1 = [z_{1−α}·√(p̃1q̃1 + p̃2q̃2/r) +
//     z_{1−β}·√(p1q1 + p2q2/r)]² / (p1 − p2 − δ)², p̃ the restricted MLEs
//     under π1 − π2 = δ; on the ratio scale with margin ρ the contrast is
//     p1 − ρ·p2 and p2q2 is multiplied by ρ².
//   - Equivalence: two one-sided tests at α (Schuirmann 1987), whose joint
//     power Φ(a_L) + Φ(a_U) − 1 (a_L, a_U the arguments of the one-sided
//     powers) is solved for n1 by bisection. On the difference scale both
//     tests use the same estimate, so this is exact under the normal model.
//   - Continuity correction (zero margin only): n1 = n'/4·(1 + √(1 +
//     2(r+1)/(n'·r·|p1 − p2|)))², n' the uncorrected size (Casagrande, Pike
//     & Smith 1978; Fleiss, Tytun & Ury 1980).
//
// It reads every field of the plan. Errors wrap ErrPlan (rates, α,
// power, allocation, drop-out), ErrMargin (margin out of range or of the
// wrong sign), ErrAlternative, ErrUnsupported, or ErrUnreachable when no
// finite sample size exists (equal rates in a test of equality or
// superiority, a true effect on the wrong side of the margin).
func SampleSize(d Plan) (SampleSizeResult, error) {
	m, err := checkedModel(d, reads{rate1: true, power: true})
	if err != nil {
		return SampleSizeResult{}, err
	}
	if err := m.reachable(); err != nil {
		return SampleSizeResult{}, err
	}
	n := m.sizeFor(d.Power)
	if n > float64(proportions.MaxTrials) || math.IsNaN(n) {
		return SampleSizeResult{}, fmt.Errorf("sample size %.3g per group: %w; the plan needs more than %d units per group", n, proportions.ErrTooLarge, proportions.MaxTrials)
	}
	n1 := reachTarget(d, m.r, ceilSize(n))
	if n1 > proportions.MaxTrials {
		return SampleSizeResult{}, fmt.Errorf("sample size %d per group: %w; the plan needs more than %d units per group", n1, proportions.ErrTooLarge, proportions.MaxTrials)
	}
	if err := checkGroupTwo(n1, m.r); err != nil {
		return SampleSizeResult{}, err
	}
	n2 := groupTwoSize(n1, m.r)
	e1, err := enrolledUnits(n1, d.Dropout)
	if err != nil {
		return SampleSizeResult{}, err
	}
	e2, err := enrolledUnits(n2, d.Dropout)
	if err != nil {
		return SampleSizeResult{}, err
	}
	res := SampleSizeResult{
		Plan: d, Unrounded: n, N1: n1, N2: n2, Total: n1 + n2,
		Enrolled1: e1, Enrolled2: e2,
		NullRate1: m.nullRate1, NullRate2: m.nullRate2, Caution: Caution,
	}
	res.EnrolledTotal = res.Enrolled1 + res.Enrolled2
	res.Approximation, res.Citation, res.Formula = describeMethod(d)
	res.Power = powerAtSizes(d, n1, n2)
	res.Notes = planNotes(d, n1, n2)
	return res, nil
}

// reachTarget returns the smallest n1 from n1 up at which the power at
// the whole sizes n1 and ⌈r·n1⌉ reaches the plan's target, so that the
// result keeps its promise of at least that power. The formula's n1
// rounded up can fall short: the bisection of equivalence stops within
// 10⁻¹⁰ of n1, and at rates near 0 or 1 the null rates carry few digits,
// so the power is noisy from one size to the next. It gallops up from n1
// and bisects back, a few dozen power evaluations at most; above
// MaxTrials it returns a size the caller refuses.
func reachTarget(d Plan, r float64, n1 int64) int64 {
	reaches := func(n int64) bool { return powerAtSizes(d, n, groupTwoSize(n, r)) >= d.Power }
	if reaches(n1) {
		return n1
	}
	lo, hi := n1, n1+1 // the power at lo falls short; hi is to be checked
	for step := int64(1); !reaches(hi); step *= 2 {
		if hi > proportions.MaxTrials {
			return hi
		}
		lo, hi = hi, n1+2*step
	}
	for hi-lo > 1 {
		mid := lo + (hi-lo)/2
		if reaches(mid) {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi
}

// checkedModel validates the plan for a function that reads the fields r
// names (the first rate always: the model needs it) and builds its model.
func checkedModel(d Plan, r reads) (model, error) {
	r.rate1 = true
	if err := d.validate(r); err != nil {
		return model{}, err
	}
	return newModel(d, d.Rate1, d.Rate2, d.allocation()), nil
}

// powerAtSizes is the asymptotic power at integer group sizes.
func powerAtSizes(d Plan, n1, n2 int64) float64 {
	return newModel(d, d.Rate1, d.Rate2, float64(n2)/float64(n1)).power(float64(n1))
}

// enrolled inflates a group size for drop-out: ⌈n/(1 − share)⌉, at least
// n; above MaxTrials (where enrolledUnits returns an error) it returns
// math.MaxInt64 rather than a number that overflowed.
func enrolled(n int64, share float64) int64 {
	e, err := enrolledUnits(n, share)
	if err != nil {
		return math.MaxInt64
	}
	return e
}

// PowerResult is the power of a plan at given group sizes.
type PowerResult struct {
	Plan          Plan     `json:"plan"`
	Approximation string   `json:"approximation"`
	Citation      string   `json:"citation"`
	N1            int64    `json:"n1"`
	N2            int64    `json:"n2"`
	Power         float64  `json:"power"`
	Notes         []string `json:"notes"`
	Caution       string   `json:"caution"`
}

// Power returns the asymptotic power of the plan with n1 and n2 units
// with an outcome in the groups (the plan's Allocation, Dropout and Power
// are not used). The model is the one SampleSize solves; for a test of
// equality both rejection regions count. Errors are those of SampleSize
// (except ErrUnreachable: a plan that cannot reach any power simply has
// power at most α) and ErrPlan for group sizes below 1 or above MaxTrials.
func Power(d Plan, n1, n2 int64) (PowerResult, error) {
	if _, err := checkedModel(d, reads{}); err != nil {
		return PowerResult{}, err
	}
	if err := validateSizes(n1, n2); err != nil {
		return PowerResult{}, err
	}
	method, cite, _ := describeMethod(d)
	return PowerResult{Plan: d, Approximation: method, Citation: cite, N1: n1, N2: n2,
		Power: powerAtSizes(d, n1, n2), Notes: planNotes(d, n1, n2), Caution: Caution}, nil
}

func validateSizes(n1, n2 int64) error {
	for i, n := range []int64{n1, n2} {
		if n < 1 || n > proportions.MaxTrials {
			return fmt.Errorf("group %d size %d: %w; a group needs between 1 and %d units", i+1, n, proportions.ErrPlan, proportions.MaxTrials)
		}
	}
	return nil
}

// describeMethod names the asymptotic method of a plan, its sources and
// its formula.
func describeMethod(d Plan) (method, citation, formula string) {
	variance := "pooled null variance"
	cites := []string{citeFleissLevinPaik}
	if d.Variance == Unpooled {
		variance = "unpooled variance"
	} else if d.nullValue() != d.Scale.NoEffect() {
		variance = "restricted-MLE null variance (Farrington–Manning)"
	}
	if d.nullValue() != d.Scale.NoEffect() {
		cites = []string{citeFarringtonMan}
	}
	method = "normal approximation, " + variance
	contrast, v, v0 := "p1 − p2 − δ", "p1q1 + p2q2/r", "p̃1q̃1 + p̃2q̃2/r"
	if d.Scale == proportions.Ratio && d.Goal != Equality {
		contrast, v, v0 = "p1 − ρ·p2", "p1q1 + ρ²·p2q2/r", "p̃1q̃1 + ρ²·p̃2q̃2/r"
	}
	if d.Variance == Unpooled {
		v0 = v
	}
	switch d.Goal {
	case Equality:
		contrast = "p1 − p2"
		if d.Variance == Pooled {
			v0 = "p̄q̄(1 + 1/r)"
		}
		formula = fmt.Sprintf("n1 = [z(1−α/2)·√(%s) + z(power)·√(%s)]² / (%s)²", v0, v, contrast)
	case Equivalence:
		method = "two one-sided tests, " + method
		cites = append(cites, citeSchuirmann)
		formula = fmt.Sprintf("smallest n1 with Φ(a_L) + Φ(a_U) − 1 ≥ power, a = (|%s|·√n1 − z(1−α)·√(%s)) / √(%s) at each limit", contrast, v0, v)
	default:
		formula = fmt.Sprintf("n1 = [z(1−α)·√(%s) + z(power)·√(%s)]² / (%s)²", v0, v, contrast)
	}
	if d.ContinuityCorrection {
		method += ", continuity correction"
		cites = append(cites, citeContinuity)
		formula += "; corrected n1 = n'/4·(1 + √(1 + 2(r+1)/(n'·r·|p1 − p2|)))²"
	}
	formula += "; n2 = ⌈r·n1⌉"
	return method, strings.Join(cites, " "), formula
}

// planNotes returns cautions about the asymptotic answer at these sizes.
func planNotes(d Plan, n1, n2 int64) []string {
	notes := []string{}
	lo := math.Min(math.Min(float64(n1)*d.Rate1, float64(n1)*(1-d.Rate1)),
		math.Min(float64(n2)*d.Rate2, float64(n2)*(1-d.Rate2)))
	if lo < 5 {
		notes = append(notes, fmt.Sprintf("an expected count is %.1f, below 5: the normal approximation is rough here; check the exact power of the test you will run (ExactPower)", lo))
	}
	if d.Dropout > 0 {
		notes = append(notes, fmt.Sprintf("enrolment is inflated for an expected drop-out share of %v; drop-out that depends on the outcome can bias the comparison", d.Dropout))
	}
	return notes
}

// String prints the sample size in a few lines.
func (r SampleSizeResult) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "Sample size for %s\n", r.Plan)
	fmt.Fprintf(&b, "  %d + %d = %d units with an outcome (formula gives n1 = %.2f); power %.4f\n", r.N1, r.N2, r.Total, r.Unrounded, r.Power)
	if r.Plan.Dropout > 0 {
		fmt.Fprintf(&b, "  enrol %d + %d = %d\n", r.Enrolled1, r.Enrolled2, r.EnrolledTotal)
	}
	fmt.Fprintf(&b, "  approximation: %s\n  formula: %s\n", r.Approximation, r.Formula)
	writeNotes(&b, r.Notes, r.Caution)
	return b.String()
}

// String prints the power in a few lines.
func (r PowerResult) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "Power %.4f with %d + %d units for %s\n  approximation: %s\n", r.Power, r.N1, r.N2, r.Plan, r.Approximation)
	writeNotes(&b, r.Notes, r.Caution)
	return b.String()
}

func writeNotes(b *strings.Builder, notes []string, caution string) {
	for _, n := range notes {
		fmt.Fprintf(b, "  note: %s\n", n)
	}
	fmt.Fprintf(b, "  %s\n", caution)
}
