// Package workpool runs numbered jobs on several goroutines and gathers
// their progress: the one worker pool of the operating-characteristics
// engine and the simulation, so both stop the same way on the first error
// or a cancelled context.
package workpool

import (
	"context"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"
)

// Run runs job(i) for every i in [0, n) on up to workers goroutines
// (GOMAXPROCS when workers ≤ 0), handing out indices in increasing order.
// It returns the first error a job returned, or ctx's error; once one
// occurs the other goroutines stop before their next job.
func Run(ctx context.Context, workers, n int, job func(i int) error) error {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = max(1, min(workers, n))
	var next atomic.Int64
	var once sync.Once
	var first error
	var failed atomic.Bool
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for !failed.Load() {
				i := int(next.Add(1) - 1)
				if i >= n {
					return
				}
				err := ctx.Err()
				if err == nil {
					err = job(i)
				}
				if err != nil {
					failed.Store(true)
					once.Do(func() { first = err })
					return
				}
			}
		}()
	}
	wg.Wait()
	return first
}

// Reporter serialises progress reports from several goroutines: each Add
// calls f with the running total of work done and the fixed total.
type Reporter struct {
	mu          sync.Mutex
	f           func(done, total int)
	done, total int
}

// NewReporter returns a reporter calling f, or one that does nothing when
// f is nil.
func NewReporter(f func(done, total int), total int) *Reporter {
	return &Reporter{f: f, total: total}
}

// Add records k more units of work done and reports the total.
func (r *Reporter) Add(k int) {
	if r == nil || r.f == nil {
		return
	}
	r.mu.Lock()
	r.done += k
	r.f(r.done, r.total)
	r.mu.Unlock()
}

// sortChunk is the length of the pieces SortFloats sorts one at a time:
// about a millisecond of work each, so a cancel is seen within that.
const sortChunk = 1 << 15

// SortFloats sorts keys in increasing order like slices.Sort, on up to
// workers goroutines, checking ctx between pieces of about a millisecond
// of work (a plain sort of millions of keys runs for hundreds of
// milliseconds without a check). It returns ctx's error, with keys in an
// unspecified order, when ctx ends first. NaN keys are not allowed.
func SortFloats(ctx context.Context, workers int, keys []float64) error {
	n := len(keys)
	if n <= sortChunk {
		slices.Sort(keys)
		return ctx.Err()
	}
	pieces := (n + sortChunk - 1) / sortChunk
	err := Run(ctx, workers, pieces, func(i int) error {
		slices.Sort(keys[i*sortChunk : min((i+1)*sortChunk, n)])
		return nil
	})
	if err != nil {
		return err
	}
	// Merge runs of width w pairwise into buf, then swap, until one run.
	buf := make([]float64, n)
	src, dst := keys, buf
	for w := sortChunk; w < n; w *= 2 {
		pairs := (n + 2*w - 1) / (2 * w)
		err := Run(ctx, workers, pairs, func(i int) error {
			lo := i * 2 * w
			mid, hi := min(lo+w, n), min(lo+2*w, n)
			return mergeRuns(ctx, dst[lo:hi], src[lo:mid], src[mid:hi])
		})
		if err != nil {
			return err
		}
		src, dst = dst, src
	}
	if &src[0] != &keys[0] {
		copy(keys, src)
	}
	return ctx.Err()
}

// mergeRuns merges the sorted runs a and b into dst (len(a)+len(b)),
// checking ctx every sortChunk elements.
func mergeRuns(ctx context.Context, dst, a, b []float64) error {
	i, j := 0, 0
	for k := range dst {
		if k%sortChunk == 0 && ctx.Err() != nil {
			return ctx.Err()
		}
		if j >= len(b) || (i < len(a) && a[i] <= b[j]) {
			dst[k] = a[i]
			i++
		} else {
			dst[k] = b[j]
			j++
		}
	}
	return nil
}
