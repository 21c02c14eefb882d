package workpool

import (
	"context"
	"errors"
	"math/rand/v2"
	"slices"
	"sync/atomic"
	"testing"
)

// TestRunDoesEveryJobOnce counts how often each index runs, on several
// worker counts including more workers than jobs and none at all.
func TestRunDoesEveryJobOnce(t *testing.T) {
	for _, workers := range []int{0, 1, 3, 64} {
		const n = 1000
		var hits [n]atomic.Int32
		if err := Run(context.Background(), workers, n, func(i int) error { hits[i].Add(1); return nil }); err != nil {
			t.Fatal(err)
		}
		for i := range hits {
			if h := hits[i].Load(); h != 1 {
				t.Fatalf("workers %d: job %d ran %d times", workers, i, h)
			}
		}
	}
	if err := Run(context.Background(), 2, 0, func(int) error { t.Fatal("job ran"); return nil }); err != nil {
		t.Fatal(err)
	}
}

// TestRunStopsAtFirstError: an error stops the pool and is returned; a
// cancelled context stops it before any job runs.
func TestRunStopsAtFirstError(t *testing.T) {
	boom := errors.New("boom")
	var ran atomic.Int32
	err := Run(context.Background(), 1, 100, func(i int) error {
		ran.Add(1)
		if i == 5 {
			return boom
		}
		return nil
	})
	if !errors.Is(err, boom) || ran.Load() != 6 {
		t.Errorf("err %v after %d jobs, want boom after 6", err, ran.Load())
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if err := Run(ctx, 2, 10, func(int) error { t.Error("job ran after cancel"); return nil }); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: %v", err)
	}
}

// TestReporterTotals: the reports add up to the total, and a nil function
// or reporter does nothing.
func TestReporterTotals(t *testing.T) {
	var last [2]int
	r := NewReporter(func(d, n int) { last = [2]int{d, n} }, 10)
	_ = Run(context.Background(), 4, 10, func(int) error { r.Add(1); return nil })
	if last != [2]int{10, 10} {
		t.Errorf("last report %v, want [10 10]", last)
	}
	NewReporter(nil, 3).Add(1)
	var none *Reporter
	none.Add(1)
}

// TestSortFloatsSorts compares with slices.Sort on lengths around the piece
// size, with ties and negative values; a cancelled context is reported.
func TestSortFloatsSorts(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for _, n := range []int{0, 1, 7, sortChunk, sortChunk + 1, 3*sortChunk + 17, 9 * sortChunk} {
		keys := make([]float64, n)
		for i := range keys {
			keys[i] = float64(rng.IntN(1000)) - 500 + rng.Float64()*float64(i%2)
		}
		want := slices.Clone(keys)
		slices.Sort(want)
		if err := SortFloats(context.Background(), 3, keys); err != nil {
			t.Fatal(err)
		}
		if !slices.Equal(keys, want) {
			t.Fatalf("n = %d: not sorted like slices.Sort", n)
		}
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if err := SortFloats(ctx, 2, make([]float64, 4*sortChunk)); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled sort: %v", err)
	}
}
