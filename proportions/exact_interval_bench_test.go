//go:build unix

package proportions

import (
	"fmt"
	"syscall"
	"testing"
	"time"
)

// Speed targets of the exact unconditional intervals (issue 15): Chan–Zhang
// at 500 per group under 0.5 s and at 1000 per group under 2 s (it took
// 70 ms at 100 and 0.4 s at 300 when every region scanned every table).
// Each size runs the interval and a plain yardstick in alternating rounds
// and reports the ratio: the yardstick is what a direct implementation
// does (yardstickLimits: every table's statistic at each δ, the largest
// tail over 101 evenly spaced nuisance values, bisection on δ), with
// neither the proven search of the nuisance nor the search for accepted
// stretches between grid values, so the interval does more than it.
// Times are CPU time of the process (getrusage), less disturbed than wall
// time on a shared machine.
func BenchmarkExactIntervalTargets(b *testing.B) {
	targets := map[int64]string{100: "-", 300: "-", 500: "0.5 s", 1000: "2 s"}
	for _, n := range []int64{100, 300, 500, 1000} {
		b.Run(fmt.Sprintf("n%d", n), func(b *testing.B) {
			c := Counts{X1: (3*n + 5) / 10, N1: n, X2: (45*n + 50) / 100, N2: n}
			var ours, plain time.Duration
			for b.Loop() {
				t0 := cpuTime()
				lo, hi, err := exactScoreLimits(b.Context(), c, 0.025, sideGreater)
				if err != nil {
					b.Fatal(err)
				}
				t1 := cpuTime()
				ylo, yhi := yardstickLimits(c, 0.025)
				ours, plain = ours+t1-t0, plain+cpuTime()-t1
				sinkLimits = [4]float64{lo, hi, ylo, yhi}
			}
			k := float64(b.N)
			b.ReportMetric(ours.Seconds()/k, "cpu_s/interval")
			b.ReportMetric(plain.Seconds()/k, "cpu_s/yardstick")
			b.ReportMetric(ours.Seconds()/plain.Seconds(), "ratio_to_yardstick")
			b.Logf("n = %d per group: %.3f s of CPU per interval (target %s), yardstick %.3f s, ratio %.2f",
				n, ours.Seconds()/k, targets[n], plain.Seconds()/k, ours.Seconds()/plain.Seconds())
		})
	}
}

var sinkLimits [4]float64

// yardstickLimits is the plain Chan–Zhang interval of the benchmark: each
// limit by 20 bisection steps on δ between p1 − p2 and the end of the
// range, each step one p-value from the table-by-table region and the
// largest tail over 101 evenly spaced nuisance values.
func yardstickLimits(c Counts, alpha float64) (lo, hi float64) {
	w := newTailWork(int(c.N1), int(c.N2))
	cutoff := 1e-16 / float64(c.N1+c.N2+2)
	p := func(delta float64, side regionSide) float64 {
		reg, _ := zRegion(c, delta, true, side)
		a, b := max(0, -delta), min(1, 1-delta)
		best := 0.0
		for i := range 101 {
			p2 := a + (b-a)*float64(i)/100
			best = max(best, w.prob(&reg, min(max(p2+delta, 0), 1), p2, cutoff))
		}
		return best
	}
	limit := func(end float64, side regionSide) float64 {
		in, out := c.P1()-c.P2(), end
		for range 20 {
			mid := (in + out) / 2
			if p(mid, side) > alpha {
				in = mid
			} else {
				out = mid
			}
		}
		return in
	}
	return limit(-1, sideGreater), limit(1, sideLess)
}

// cpuTime is the CPU time this process has used.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}
