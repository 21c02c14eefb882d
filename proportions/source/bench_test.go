package source

import (
	"database/sql"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"sync"
	"testing"
	"time"

	"github.com/parquet-go/parquet-go"

	"github.com/propscope/propscope/proportions"
)

// benchRows is how many unit rows the source benchmarks generate: 10⁶ by
// default so `make bench` stays short; BENCH_SOURCE_ROWS=10000000 (or
// 100000000 with the time and disk for it) measures more. The benchmarks
// report the seconds per 10⁸ rows extrapolated linearly, since the readers
// stream and their work grows with the rows.
func benchRows(b *testing.B) int {
	n := 1_000_000
	if s := os.Getenv("BENCH_SOURCE_ROWS"); s != "" {
		f, err := strconv.ParseFloat(s, 64)
		if err != nil || f < 1 {
			b.Fatalf("BENCH_SOURCE_ROWS=%q: want a row count", s)
		}
		n = int(f)
	}
	return n
}

// Targets, printed beside the measures: 10⁸ unit rows in under 60 s from
// Parquet and under 120 s from SQLite in CPU time on the project's machine
// (wall time on a shared machine adds the wait for a core).
const (
	parquetTarget = 60 * time.Second
	sqlTarget     = 120 * time.Second
)

// benchUnit is one generated row of the benchmarks' files: 432 segments
// (12 lines × 3 shifts × 12 plants), two methods, a yes/no defect.
type benchUnit struct {
	Segment string `parquet:"segment,dict"`
	Method  string `parquet:"method,dict"`
	Defect  string `parquet:"defect,dict"`
}

// benchSegments are the segment names, made once per benchmark.
func benchSegments() []string {
	var s []string
	for p := range 12 {
		for l := range 12 {
			for _, sh := range []string{"early", "late", "night"} {
				s = append(s, fmt.Sprintf("plant %d / line %d / %s", p+1, l+1, sh))
			}
		}
	}
	return s
}

// benchDefect is a cheap deterministic pseudo-random defect flag (about 6 %).
func benchDefect(i int) bool { return (uint64(i)*0x9E3779B97F4A7C15)>>58 < 4 }

// writeBenchParquet writes n rows in row groups of 2²⁰ rows.
func writeBenchParquet(b *testing.B, dir string, n int) string {
	segs := benchSegments()
	path := filepath.Join(dir, "bench.parquet")
	f, err := os.Create(path)
	if err != nil {
		b.Fatal(err)
	}
	w := parquet.NewGenericWriter[benchUnit](f, parquet.MaxRowsPerRowGroup(1<<20))
	buf := make([]benchUnit, 0, 1<<14)
	for i := range n {
		u := benchUnit{Segment: segs[i%len(segs)], Method: [2]string{"gauge", "camera"}[(i/len(segs))%2], Defect: "no"}
		if benchDefect(i) {
			u.Defect = "yes"
		}
		buf = append(buf, u)
		if len(buf) == cap(buf) || i == n-1 {
			if _, err := w.Write(buf); err != nil {
				b.Fatal(err)
			}
			buf = buf[:0]
		}
	}
	if err := w.Close(); err != nil {
		b.Fatal(err)
	}
	if err := f.Close(); err != nil {
		b.Fatal(err)
	}
	return path
}

// peakHeap samples the heap in use every 20 ms until stop is called and
// returns the largest sample, to show that memory stays flat in the rows.
func peakHeap() (stop func() uint64) {
	var peak uint64
	var wg sync.WaitGroup
	done := make(chan struct{})
	wg.Add(1)
	go func() {
		defer wg.Done()
		var m runtime.MemStats
		for {
			runtime.ReadMemStats(&m)
			peak = max(peak, m.HeapInuse)
			select {
			case <-done:
				return
			case <-time.After(20 * time.Millisecond):
			}
		}
	}()
	return func() uint64 { close(done); wg.Wait(); return peak }
}

// report prints the measures and the target; cpu is the CPU time the
// timed loop used (the sampler's share is a few per mille).
func report(b *testing.B, rows int, peak uint64, cpu time.Duration, target time.Duration) {
	perRow := b.Elapsed().Seconds() / float64(b.N) / float64(rows)
	cpuPerRow := cpu.Seconds() / float64(b.N) / float64(rows)
	b.ReportMetric(cpuPerRow*1e8, "cpu-s/1e8rows")
	b.ReportMetric(float64(rows)/(b.Elapsed().Seconds()/float64(b.N))/1e6, "Mrows/s")
	b.ReportMetric(perRow*1e8, "s/1e8rows")
	b.ReportMetric(float64(peak)/(1<<20), "peak-heap-MiB")
	b.Logf("%d rows: %.1f s (%.1f s of CPU) per 10⁸ rows extrapolated (target under %v), peak heap %.1f MiB",
		rows, perRow*1e8, cpuPerRow*1e8, target, float64(peak)/(1<<20))
}

// BenchmarkParquetUnits aggregates the generated unit rows from Parquet.
func BenchmarkParquetUnits(b *testing.B) {
	n := benchRows(b)
	path := writeBenchParquet(b, b.TempDir(), n)
	f, size := openForTest(b, path)
	spec := proportions.BreakdownSpec{ByColumn: "segment", GroupColumn: "method", OutcomeColumn: "defect"}
	runtime.GC()
	stop := peakHeap()
	b.ResetTimer()
	cpu0 := cpuTime()
	for b.Loop() {
		bd, err := ReadParquet(f, size, spec)
		if err != nil {
			b.Fatal(err)
		}
		checkTotal(b, bd, n)
	}
	b.StopTimer()
	report(b, n, stop(), cpuTime()-cpu0, parquetTarget)
}

// BenchmarkSQLUnits aggregates the generated unit rows from an embedded
// SQLite database (filled inside SQLite by a recursive query, the same rows
// as the Parquet file).
func BenchmarkSQLUnits(b *testing.B) {
	n := benchRows(b)
	db := openDB(b, b.TempDir())
	fillBenchTable(b, db, n)
	spec := SQLSpec{Table: "units", BreakdownSpec: proportions.BreakdownSpec{ByColumn: "segment", GroupColumn: "method", OutcomeColumn: "defect"}}
	runtime.GC()
	stop := peakHeap()
	b.ResetTimer()
	cpu0 := cpuTime()
	for b.Loop() {
		bd, err := QuerySQL(db, spec)
		if err != nil {
			b.Fatal(err)
		}
		checkTotal(b, bd, n)
	}
	b.StopTimer()
	report(b, n, stop(), cpuTime()-cpu0, sqlTarget)
}

// fillBenchTable makes the units table with n rows inside SQLite: segment
// i mod 432, method alternating every 432 rows, defect where a hash of i
// falls under 6 % (a different flag from the Parquet file's; the totals
// are what the benchmark checks).
func fillBenchTable(b testing.TB, db *sql.DB, n int) {
	segs := benchSegments()
	if _, err := db.Exec(`CREATE TABLE seg (k INTEGER PRIMARY KEY, name TEXT)`); err != nil {
		b.Fatal(err)
	}
	for k, s := range segs {
		if _, err := db.Exec(`INSERT INTO seg VALUES (?, ?)`, k, s); err != nil {
			b.Fatal(err)
		}
	}
	_, err := db.Exec(`CREATE TABLE units (segment TEXT, method TEXT, defect TEXT);
		WITH RECURSIVE i(v) AS (SELECT 0 UNION ALL SELECT v + 1 FROM i WHERE v + 1 < ?)
		INSERT INTO units SELECT (SELECT name FROM seg WHERE k = v % ?),
			CASE WHEN (v / ?) % 2 = 0 THEN 'gauge' ELSE 'camera' END,
			CASE WHEN ((v * 2654435761) % 1000) < 60 THEN 'yes' ELSE 'no' END FROM i`, n, len(segs), len(segs))
	if err != nil {
		b.Fatal(err)
	}
}

// checkTotal fails the benchmark unless every row was counted.
func checkTotal(b *testing.B, bd proportions.Breakdown, n int) {
	var total int64
	for _, r := range bd.Rows {
		total += r.Counts.N1 + r.Counts.N2
	}
	if total != int64(n) || len(bd.Rows) != 432 {
		b.Fatalf("counted %d rows in %d segments, want %d in 432", total, len(bd.Rows), n)
	}
}
