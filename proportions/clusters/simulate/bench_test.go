package simulate

import (
	"testing"
	"time"
)

// BenchmarkTarget times the target: 10⁵ simulated studies of 2 × 20
// clusters of 25 units with every registered difference interval and
// test, on all cores; the target is under 10 s on a 2-core machine.
func BenchmarkTarget(b *testing.B) {
	p := NewPlan(20, 25, 0.8, 0.7, 0.05)
	p.Studies = 100_000
	for b.Loop() {
		start := time.Now()
		r, err := Run(b.Context(), p)
		if err != nil {
			b.Fatal(err)
		}
		b.Logf("10⁵ studies, %d intervals and %d tests: %v (target under 10 s on 2 cores)", len(r.Intervals), len(r.Tests), time.Since(start).Round(time.Millisecond))
	}
}
