package planning_test

import (
	"fmt"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/planning"
)

// An invented seed trial: coated seed is expected to germinate at 75%,
// bare seed at 60%. How many seeds per treatment does a two-sided test at
// 5% need for 80% power, if one tray in ten may be lost?
func ExampleSampleSize() {
	d := planning.NewPlan(planning.Equality, 0.75, 0.60)
	d.Dropout = 0.10
	plan, err := planning.SampleSize(d)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%d + %d seeds with an outcome (power %.3f); sow %d + %d\n",
		plan.N1, plan.N2, plan.Power, plan.Enrolled1, plan.Enrolled2)
	// Output:
	// 152 + 152 seeds with an outcome (power 0.800); sow 169 + 169
}

// An invented production line: a new supplier's parts should not raise the
// defect rate of 4% by 2 points or more. Lower rates are better, so the
// alternative is Less and the margin positive.
func ExampleSampleSize_nonInferiority() {
	d := planning.NewPlan(planning.NonInferiority, 0.04, 0.04)
	d.Better, d.Margin = proportions.LowerIsBetter, 0.02
	plan, err := planning.SampleSize(d)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(plan)
	// Output:
	// Sample size for non-inferiority on the difference, π1 = 0.04 vs π2 = 0.04, margin 0.02 (lower is better), one-sided α = 0.025, power 0.8, n2/n1 = 1
	//   1562 + 1562 = 3124 units with an outcome (formula gives n1 = 1561.16); power 0.8002
	//   approximation: normal approximation, restricted-MLE null variance (Farrington–Manning)
	//   formula: n1 = [z(1−α)·√(p̃1q̃1 + p̃2q̃2/r) + z(power)·√(p1q1 + p2q2/r)]² / (p1 − p2 − δ)²; n2 = ⌈r·n1⌉
	//   A plan is only as good as the anticipated rates behind it; significance is not importance, and where health or safety decisions follow, the applicable regulations and a qualified statistician decide.
}

// The power of a smaller seed trial, 100 seeds per treatment.
func ExamplePower() {
	d := planning.NewPlan(planning.Equality, 0.75, 0.60)
	p, err := planning.Power(d, 100, 100)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("power %.3f\n", p.Power)
	// Output:
	// power 0.621
}

// What germination rate of coated seed can 120 seeds per treatment detect
// against bare seed at 60%, with 80% power?
func ExampleDetectableDifference() {
	d := planning.NewPlan(planning.Equality, 0, 0.60)
	res, err := planning.DetectableDifference(d, 120, 120)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("above: %.3f (difference %+.3f)\nbelow: %.3f (difference %+.3f)\n",
		res.Above.Rate1, res.Above.Difference, res.Below.Rate1, res.Below.Difference)
	// Output:
	// above: 0.767 (difference +0.167)
	// below: 0.420 (difference -0.180)
}

// Power against the number of seeds per treatment, as data for a chart.
func ExamplePowerByTrials() {
	d := planning.NewPlan(planning.Equality, 0.75, 0.60)
	curve, err := planning.PowerByTrials(d, 50, 250)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, p := range curve.Points {
		if p.N1%50 == 0 {
			fmt.Printf("n = %d: power %.3f\n", p.N1, p.Power)
		}
	}
	// Output:
	// n = 50: power 0.358
	// n = 100: power 0.621
	// n = 150: power 0.795
	// n = 200: power 0.896
	// n = 250: power 0.950
}
