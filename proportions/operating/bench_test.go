package operating

import (
	"context"
	"runtime"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// BenchmarkWaldSurface500 is the speed target of the engine: the exact
// coverage surface of the 95% Wald interval for n1 = n2 = 500 on the
// default 101×101 grid, including the 251,001 interval computations
// (target < 10 ms on 2 cores; scripts/bench-coverage.sh runs the
// vectorised NumPy enumeration beside it and prints the ratio). It reports
// the grid mean so the script can check that both computed the same thing.
func BenchmarkWaldSurface500(b *testing.B) {
	benchSurface(b, proportions.Wald, 500)
}

// BenchmarkMiettinenNurminenSurface500 is the second speed target: the
// Miettinen–Nurminen coverage surface at n1 = n2 = 500 including all
// 251,001 interval computations (target < 0.25 s on 2 cores).
func BenchmarkMiettinenNurminenSurface500(b *testing.B) {
	m, err := proportions.LookupInterval("miettinen-nurminen")
	if err != nil {
		b.Skip("Miettinen–Nurminen interval not registered")
	}
	benchSurface(b, m, 500)
}

func benchSurface(b *testing.B, m proportions.IntervalMethod, n int) {
	d := Design{N1: n, N2: n, Level: 0.95}
	b.ReportAllocs()
	var s *Surface
	for b.Loop() {
		t, err := NewOutcomeLimits(context.Background(), m, d)
		if err != nil {
			b.Fatal(err)
		}
		if s, err = t.Surface(context.Background()); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(s.Summary().Mean, "mean-coverage")
}

// BenchmarkWaldTable500 times the interval computations alone.
func BenchmarkWaldTable500(b *testing.B) {
	d := Design{N1: 500, N2: 500, Level: 0.95}
	for b.Loop() {
		if _, err := NewOutcomeLimits(context.Background(), proportions.Wald, d); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkMemory1000 reports the heap in use while a table and its
// surface for 1000 per group are alive (target < 100 MB).
func BenchmarkMemory1000(b *testing.B) {
	d := Design{N1: 1000, N2: 1000, Level: 0.95}
	var peak uint64
	for b.Loop() {
		runtime.GC()
		var before runtime.MemStats
		runtime.ReadMemStats(&before)
		t, err := NewOutcomeLimits(context.Background(), proportions.Wald, d)
		if err != nil {
			b.Fatal(err)
		}
		s, err := t.Surface(context.Background())
		if err != nil {
			b.Fatal(err)
		}
		var after runtime.MemStats
		runtime.ReadMemStats(&after)
		peak = max(peak, after.HeapInuse-min(before.HeapInuse, after.HeapInuse))
		runtime.KeepAlive(t)
		runtime.KeepAlive(s)
	}
	b.ReportMetric(float64(peak)/1e6, "MB-heap")
}

// BenchmarkPower300 times one exact power evaluation of Fisher's test at
// 300 per group, the unit of a sample-size search.
func BenchmarkPower300(b *testing.B) {
	fisher, err := proportions.LookupTest("fisher-test")
	if err != nil {
		b.Skip("Fisher's test not registered")
	}
	s, _ := proportions.NewSettings()
	h, _ := fisher.Hypothesis(s)
	for b.Loop() {
		if _, err := Power(fisher, 300, 300, h, 0.3, 0.4); err != nil {
			b.Fatal(err)
		}
	}
}
