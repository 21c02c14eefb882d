package segments

import (
	"context"
	"fmt"
	"iter"
	"math/rand/v2"
	"runtime"
	"runtime/metrics"
	"strconv"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	"github.com/propscope/propscope/proportions"
)

// The targets (see the package's design notes in Stream):
//   - 10⁶ segments through Stream, both passes, JSON Lines and CSV, in
//     under 5 s on a shared 2-core machine (every core used);
//   - peak heap under 200 MB at 10⁶ segments;
//   - the adjustment O(m log m): its time per m·log₂m stays flat from 10⁴
//     to 10⁶.
// Run: go test -run '^$' -bench 'Stream|AnalyzeMillion' -benchtime 1x ./proportions/segments/
// and go test -run '^$' -bench Adjust ./proportions/segments/

const (
	targetSeconds  = 5.0
	targetHeapMB   = 200.0
	benchSegments  = 1_000_000
	benchRowSource = "generated on the fly, 20 to 2,000 units per group"
)

// generated is a Source of n invented segments (a retailer's regions and
// stores, conversion on two page designs) made from the row number, so
// that the source itself holds nothing and can be read twice.
func generated(n int) Source {
	return Source{By: "store", Labels: proportions.Labels{First: "new page", Second: "old page", Event: "converted"},
		Rows: func() iter.Seq2[proportions.BreakdownRow, error] {
			return func(yield func(proportions.BreakdownRow, error) bool) {
				r := rand.New(rand.NewPCG(1, 2))
				for i := range n {
					n1, n2 := 20+r.Int64N(1981), 20+r.Int64N(1981)
					row := proportions.BreakdownRow{Value: "store " + strconv.Itoa(i+1),
						Counts: proportions.Counts{X1: r.Int64N(n1/4 + 1), N1: n1, X2: r.Int64N(n2/4 + 1), N2: n2}}
					if i%1000 == 999 {
						row.Counts.X2, row.Counts.N2 = 0, 0 // a store that showed only the new page
					}
					if !yield(row, nil) {
						return
					}
				}
			}
		}}
}

// heapPeak samples the heap every few milliseconds until stopped: the
// bytes of heap objects, reachable or not yet swept, so an upper bound of
// the live heap. It reads runtime/metrics, which does not stop the world
// (runtime.ReadMemStats would, and slow what it measures).
type heapPeak struct {
	peak atomic.Uint64
	stop chan struct{}
	wg   sync.WaitGroup
}

func watchHeap() *heapPeak {
	runtime.GC()
	h := &heapPeak{stop: make(chan struct{})}
	h.wg.Add(1)
	go func() {
		defer h.wg.Done()
		sample := []metrics.Sample{{Name: "/memory/classes/heap/objects:bytes"}}
		for {
			metrics.Read(sample)
			if v := sample[0].Value.Uint64(); v > h.peak.Load() {
				h.peak.Store(v)
			}
			select {
			case <-h.stop:
				return
			case <-time.After(5 * time.Millisecond):
			}
		}
	}()
	return h
}

func (h *heapPeak) done() float64 {
	close(h.stop)
	h.wg.Wait()
	return float64(h.peak.Load()) / 1e6
}

// countingWriter counts bytes and throws them away.
type countingWriter struct{ n int64 }

func (w *countingWriter) Write(b []byte) (int, error) { w.n += int64(len(b)); return len(b), nil }

// BenchmarkStream streams 10⁵ and 10⁶ segments (Holm): the heap at the
// two sizes shows what grows with the segments (the 24 bytes per segment
// of the adjustment, and the garbage the collector has not yet reclaimed)
// and what stays flat (the batches in flight).
func BenchmarkStream(b *testing.B) {
	for _, n := range []int{benchSegments / 10, benchSegments} {
		b.Run(fmt.Sprintf("segments=%d", n), func(b *testing.B) {
			src := generated(n)
			var secs, cpu, heap float64
			var written int64
			for range b.N {
				var w [4]countingWriter
				h := watchHeap()
				start, cpu0 := time.Now(), cpuSeconds()
				sum, err := Stream(context.Background(), src, Outputs{SegmentsJSON: &w[0], SegmentsCSV: &w[1], AdjustedJSON: &w[2], AdjustedCSV: &w[3]})
				secs, cpu = time.Since(start).Seconds(), cpuSeconds()-cpu0
				heap = h.done()
				if err != nil {
					b.Fatal(err)
				}
				if sum.SegmentCount != n {
					b.Fatalf("%d segments", sum.SegmentCount)
				}
				written = w[0].n + w[1].n + w[2].n + w[3].n
			}
			cores := float64(runtime.GOMAXPROCS(0))
			b.ReportMetric(secs, "s/stream")
			b.ReportMetric(cpu, "cpu-s/stream")
			b.ReportMetric(heap, "peak-heap-MB")
			b.ReportMetric(float64(written)/1e6, "MB-written")
			target := ""
			if n == benchSegments {
				target = fmt.Sprintf(" (target at 10⁶: < %.0f s; peak heap < %.0f MB)", targetSeconds, targetHeapMB)
			}
			b.Logf("%d segments (%s) on %.0f cores: %.2f s wall, %.2f s of CPU, so %.2f s on %.0f idle cores; peak heap %.0f MB; %.0f MB written%s",
				n, benchRowSource, cores, secs, cpu, cpu/cores, cores, heap, float64(written)/1e6, target)
		})
	}
}

// BenchmarkAnalyzeMillion is the in-memory path at the same size, for
// comparison: it holds every record, so its heap grows with the segments
// (the 200 MB target is the stream's).
func BenchmarkAnalyzeMillion(b *testing.B) {
	var rows []proportions.BreakdownRow
	for r := range generated(benchSegments).Rows() {
		rows = append(rows, r)
	}
	bd := proportions.Breakdown{By: "store", First: "new page", Second: "old page", Event: "converted", Rows: rows}
	var secs, cpu float64
	for range b.N {
		start, cpu0 := time.Now(), cpuSeconds()
		if _, err := Analyze(bd); err != nil {
			b.Fatal(err)
		}
		secs, cpu = time.Since(start).Seconds(), cpuSeconds()-cpu0
	}
	b.ReportMetric(secs, "s/analysis")
	b.ReportMetric(cpu, "cpu-s/analysis")
	b.Logf("%d segments in memory: %.2f s wall, %.2f s of CPU (the stream's target < %.0f s)", benchSegments, secs, cpu, targetSeconds)
}

// BenchmarkAdjust times the adjustment alone (sort and pass) at growing m:
// ns per m·log₂m should stay flat if the step is O(m log m).
func BenchmarkAdjust(b *testing.B) {
	for _, m := range []int{10_000, 100_000, 1_000_000} {
		b.Run(fmt.Sprintf("m=%d", m), func(b *testing.B) {
			r := rand.New(rand.NewPCG(3, 3))
			p := make([]float64, m)
			for i := range p {
				p[i] = r.Float64()
			}
			b.ResetTimer()
			for range b.N {
				if _, err := Adjust(p, BenjaminiHochberg); err != nil {
					b.Fatal(err)
				}
			}
			perOp := float64(b.Elapsed().Nanoseconds()) / float64(b.N)
			b.ReportMetric(perOp/(float64(m)*log2(m)), "ns/(m·log₂m)")
		})
	}
}

func log2(m int) float64 {
	n := 0.0
	for x := m; x > 1; x >>= 1 {
		n++
	}
	return n
}
