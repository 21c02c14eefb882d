package simulate

import (
	"syscall"
	"testing"
	"time"
)

// cpuTime is the process's user and system time so far.
func cpuTime() time.Duration {
	var u syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &u); err != nil {
		return 0
	}
	return time.Duration(u.Utime.Nano() + u.Stime.Nano())
}

// BenchmarkTarget times the target: 10⁵ simulated studies of 2 × 20
// clusters of 25 units with every registered difference interval and test
// (naive and adjusted), on all cores; the target is under 10 s on a 2-core
// machine. The CPU time is printed too: on a shared machine the wall time
// depends on the other jobs, while CPU time / 2 is what two idle cores take.
func BenchmarkTarget(b *testing.B) {
	p := NewPlan(20, 25, 0.8, 0.7, 0.05)
	p.Studies = 100_000
	for b.Loop() {
		start, cpu := time.Now(), cpuTime()
		r, err := Run(b.Context(), p)
		if err != nil {
			b.Fatal(err)
		}
		wall, used := time.Since(start), cpuTime()-cpu
		b.Logf("10⁵ studies, %d intervals and %d tests: %v wall, %v CPU (%v on 2 idle cores); target under 10 s on 2 cores",
			len(r.Intervals), len(r.Tests), wall.Round(time.Millisecond), used.Round(time.Millisecond), (used / 2).Round(time.Millisecond))
	}
}
