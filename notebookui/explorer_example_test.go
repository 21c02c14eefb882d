package notebookui_test

import (
	"fmt"
	"strings"

	"github.com/propscope/propscope/notebookui"
	"github.com/propscope/propscope/proportions/planning"
)

// The numbers behind the interval explorer's starting view: the exact
// coverage of the Wald interval with 20 units per group, along π1 with π2
// held at 30%.
func ExampleIntervalExplorer_Slice() {
	e := notebookui.IntervalExplorer{N1: 20, N2: 20, Rate1: 0.3, Rate2: 0.3, Method: "wald"}
	slices, err := e.Slice()
	if err != nil {
		fmt.Println(err)
		return
	}
	s := slices[0]
	fmt.Printf("%s at π1 = %.2f, π2 = %.2f: coverage %.4f\n", s.MethodName, s.At.Pi1, s.At.Pi2, s.At.Coverage)
	fmt.Printf("lowest along the slice %.4f at π1 = %.2f; mean %.4f\n", s.Min, s.MinPi1, s.Mean)
	// Output:
	// Wald at π1 = 0.30, π2 = 0.30: coverage 0.9314
	// lowest along the slice 0.8883 at π1 = 0.99; mean 0.9310
}

// The planning explorer at 60% against 40%, power 90%, two-sided α = 5%:
// the Fleiss, Levin & Paik formula gives n1 = [1.96·√(2·0.5·0.5) +
// 1.2816·√(0.24 + 0.24)]² / 0.2² = 129.25, so 130 per group (worked by
// hand). Outside a notebook an explorer prints the text of its starting view; in
// a notebook run headless it displays it; in a live notebook it runs until
// the reader presses Done. Frame gives the view for any settings.
func ExamplePlanningExplorer_Frame() {
	start := planning.NewPlan(planning.Equality, 0.6, 0.4)
	e := notebookui.PlanningExplorer{Plan: start}
	d := start
	d.Power = 0.9
	f, err := e.Frame(d)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, s := range f.Settings {
		fmt.Printf("%s: %s\n", s.Label, s.Value)
	}
	for _, line := range strings.Split(f.Text(), "\n") {
		if strings.Contains(line, "units with an outcome") {
			fmt.Println(strings.TrimSpace(line))
		}
	}
	// Output:
	// goal: equality
	// anticipated rate π1: 60%
	// anticipated rate π2: 40%
	// margin δ (π1 − π2): 0 pp (not used)
	// target power: 90%
	// 130 + 130 = 260 units with an outcome (formula gives n1 = 129.25); power 0.9017
}
