package planning_test

import (
	"context"
	"fmt"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/planning"
)

// An invented weed-control trial: a new treatment is expected to clear 70%
// of plots, the old one 20%. The analysis will use Fisher's exact test at
// two-sided 5%; how many plots per treatment give 85% power?
func ExampleExactSampleSize() {
	d := planning.NewPlan(planning.Equality, 0.70, 0.20)
	d.Power = 0.85
	res, err := planning.ExactSampleSize(context.Background(), d, proportions.FisherTest, planning.Search{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("normal approximation: %d per group\n", res.Asymptotic.N1)
	fmt.Printf("smallest size reaching 85%%: %d (power %.3f)\n", res.First.N1, res.First.Power)
	fmt.Printf("stays at or above 85%% from: %d (checked up to %d)\n", res.Stable.N1, res.Horizon)
	// Output:
	// normal approximation: 17 per group
	// smallest size reaching 85%: 19 (power 0.852)
	// stays at or above 85% from: 21 (checked up to 29)
}

// The exact power of the test that will be run, beside the normal
// approximation, for 40 plots per treatment.
func ExampleExactPower() {
	d := planning.NewPlan(planning.Equality, 0.45, 0.20)
	res, err := planning.ExactPower(context.Background(), d, proportions.FisherTest, 40, 40)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("exact %.3f, normal approximation %.3f\n", res.Power, res.Asymptotic)
	// Output:
	// exact 0.586, normal approximation 0.671
}

// The saw-tooth of exact power as data for a chart: Fisher's exact test,
// 70% against 20%, for 17 to 22 plots per treatment.
func ExampleExactPowerByTrials() {
	d := planning.NewPlan(planning.Equality, 0.70, 0.20)
	curve, err := planning.ExactPowerByTrials(context.Background(), d, proportions.FisherTest, 17, 22)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, p := range curve.Points {
		fmt.Printf("n = %d: %.4f\n", p.N1, p.Power)
	}
	// Output:
	// n = 17: 0.7919
	// n = 18: 0.8349
	// n = 19: 0.8517
	// n = 20: 0.8461
	// n = 21: 0.8628
	// n = 22: 0.8901
}
