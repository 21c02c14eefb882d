package notebookui

import (
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/planning"
)

// Redraw cost of the explorers: computing and rendering one frame, what a
// live explorer does after each change (the target is under 200 ms for up
// to 200 per group). Rate changes reuse the tables of limits; a change of
// n rebuilds them.

func benchmarkIntervalRateChange(b *testing.B, methods []string, method string) {
	e := IntervalExplorer{N1: 200, N2: 200, Rate1: 0.3, Rate2: 0.2, Methods: methods, Method: method}
	m, err := e.model()
	if err != nil {
		b.Fatal(err)
	}
	pos := startPositions(m)
	frameOf(m, pos) // build the tables once
	b.ResetTimer()
	for i := 0; b.Loop(); i++ {
		pos[3] = 10 + i%80 // move π1
		frameOf(m, pos)
	}
}

// BenchmarkIntervalExplorerRateChangeAll: every difference method, n = 200 per group.
func BenchmarkIntervalExplorerRateChangeAll(b *testing.B) {
	benchmarkIntervalRateChange(b, nil, "")
}

// BenchmarkIntervalExplorerRateChangeOne: one method, n = 200 per group.
func BenchmarkIntervalExplorerRateChangeOne(b *testing.B) {
	benchmarkIntervalRateChange(b, nil, "newcombe")
}

// BenchmarkIntervalExplorerHoldDifference: every difference method, the
// difference held, π1 moving.
func BenchmarkIntervalExplorerHoldDifference(b *testing.B) {
	e := IntervalExplorer{N1: 200, N2: 200, Rate1: 0.3, Difference: 0.1, HoldDifference: true}
	m, err := e.model()
	if err != nil {
		b.Fatal(err)
	}
	pos := startPositions(m)
	frameOf(m, pos)
	b.ResetTimer()
	for i := 0; b.Loop(); i++ {
		pos[3] = 10 + i%80
		frameOf(m, pos)
	}
}

func benchmarkIntervalSizeChange(b *testing.B, method string) {
	e := IntervalExplorer{N1: 200, N2: 200, Rate1: 0.3, Rate2: 0.2, Method: method}
	m, err := e.model()
	if err != nil {
		b.Fatal(err)
	}
	pos := startPositions(m)
	for i := 0; b.Loop(); i++ {
		pos[0] = 150 + i%51 // n1 from 150 to 200: new tables each time
		frameOf(m, pos)
	}
}

// BenchmarkIntervalExplorerSizeChangeNewcombe: a change of n1 near 200, one
// closed-form method.
func BenchmarkIntervalExplorerSizeChangeNewcombe(b *testing.B) {
	benchmarkIntervalSizeChange(b, "newcombe")
}

// BenchmarkIntervalExplorerSizeChangeMee: a change of n1 near 200 with a
// score method, whose limits are roots of a restricted-likelihood equation.
func BenchmarkIntervalExplorerSizeChangeMee(b *testing.B) { benchmarkIntervalSizeChange(b, "mee") }

// BenchmarkIntervalExplorerSizeChangeAll: a change of n1 near 200, every
// difference method.
func BenchmarkIntervalExplorerSizeChangeAll(b *testing.B) { benchmarkIntervalSizeChange(b, "") }

// BenchmarkPlanningExplorerRedraw: one plan change (sample size and power curve).
func BenchmarkPlanningExplorerRedraw(b *testing.B) {
	m := planningModel{PlanningExplorer{Plan: planning.NewPlan(planning.Equality, 0.3, 0.2)}}
	pos := startPositions(m)
	for i := 0; b.Loop(); i++ {
		pos[1] = 250 + i%100
		frameOf(m, pos)
	}
}

// BenchmarkWhatIfExplorerRedraw: one change of counts (the full default
// analysis and its card) at 200 per group.
func BenchmarkWhatIfExplorerRedraw(b *testing.B) {
	c, err := proportions.NewComparison(30, 200, 18, 200, proportions.Labels{})
	if err != nil {
		b.Fatal(err)
	}
	m := whatIfModel{e: WhatIfExplorer{Comparison: c}}
	pos := startPositions(m)
	for i := 0; b.Loop(); i++ {
		pos[0] = 20 + i%20
		frameOf(m, pos)
	}
}

// BenchmarkIntervalExplorerSizeChangeAllFirstFrame: the first (partial)
// frame a live explorer shows after a change of n1 near 200 with every
// difference method: the methods whose tables are ready within the
// budget, the others said to be computing.
func BenchmarkIntervalExplorerSizeChangeAllFirstFrame(b *testing.B) {
	e := IntervalExplorer{N1: 200, N2: 200, Rate1: 0.3, Rate2: 0.2}
	m, err := e.model()
	if err != nil {
		b.Fatal(err)
	}
	pos := startPositions(m)
	for i := 0; b.Loop(); i++ {
		pos[0] = 150 + i%51
		_, complete := frameWithin(m, pos, quickBudget)
		b.StopTimer()
		if complete != nil {
			complete() // let the tables finish outside the timing
		}
		b.StartTimer()
	}
}

// BenchmarkWhatIfExplorerFirstFrame: what a live what-if explorer shows
// first after a change of counts at 200 per group (the card without the
// exact methods when the full analysis is not ready within the budget).
func BenchmarkWhatIfExplorerFirstFrame(b *testing.B) {
	c, err := proportions.NewComparison(30, 200, 18, 200, proportions.Labels{})
	if err != nil {
		b.Fatal(err)
	}
	m := whatIfModel{e: WhatIfExplorer{Comparison: c}}
	pos := startPositions(m)
	for i := 0; b.Loop(); i++ {
		pos[0] = 20 + i%20
		_, complete := frameWithin(m, pos, quickBudget)
		b.StopTimer()
		if complete != nil {
			complete()
		}
		b.StartTimer()
	}
}
