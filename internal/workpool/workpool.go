// Package workpool runs numbered jobs on several goroutines and gathers
// their progress: the one worker pool of the operating-characteristics
// engine and the simulation, so both stop the same way on the first error
// or a cancelled context.
package workpool

import (
	"context"
	"runtime"
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
