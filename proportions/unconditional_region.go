package proportions

import "context"

// A rejection region of an unconditional exact test: the set of tables
// (x1, x2), 0 ≤ x1 ≤ n1, 0 ≤ x2 ≤ n2, at least as extreme as the observed
// one under the test's ordering statistic. It is stored row by row as runs
// of consecutive x2, so that its probability under independent binomials
// costs one prefix-sum difference per run instead of one term per table.
//
// The runs are found by scanning every table once (O(n1·n2) work, done once
// per test, not once per nuisance value): the code does not assume how many
// runs a row has. For the statistics used here a row is one run, or two runs
// touching the ends 0 and n2 (two-sided tests); tests check this property
// on many designs, but correctness never depends on it.
type region struct {
	n1, n2 int
	// Runs of row x1 are runs[rowStart[x1]:rowStart[x1+1]], each [lo, hi]
	// inclusive.
	rowStart []int32
	runs     [][2]int32
	// tables counts the tables in the region.
	tables int64
}

// regionChunk is the number of tables buildRegion fills between two
// looks at its context: a few milliseconds of work at most.
const regionChunk = 1 << 15

// buildRegion scans the rows: fill(x1, from, part) must set part[j] for
// every j to whether table (x1, from + j) belongs to the region. It fills
// each row in parts of regionChunk tables and stops early, with an
// incomplete region, when ctx ends (callers check ctx.Err()).
func buildRegion(ctx context.Context, n1, n2 int, fill func(x1, from int, part []bool)) region {
	r := region{n1: n1, n2: n2, rowStart: make([]int32, n1+2)}
	row := make([]bool, n2+1)
	for x1 := 0; x1 <= n1; x1++ {
		r.rowStart[x1] = int32(len(r.runs))
		for from := 0; from <= n2; from += regionChunk {
			if ctx.Err() != nil {
				for k := x1 + 1; k <= n1+1; k++ {
					r.rowStart[k] = int32(len(r.runs))
				}
				return r
			}
			fill(x1, from, row[from:min(from+regionChunk, n2+1)])
		}
		for x2 := 0; x2 <= n2; {
			if !row[x2] {
				x2++
				continue
			}
			start := x2
			for x2 <= n2 && row[x2] {
				x2++
			}
			r.runs = append(r.runs, [2]int32{int32(start), int32(x2 - 1)})
			r.tables += int64(x2 - start)
		}
	}
	r.rowStart[n1+1] = int32(len(r.runs))
	return r
}

// maxRunsPerRow returns the largest number of runs in one row.
func (r region) maxRunsPerRow() int {
	most := 0
	for x1 := 0; x1 <= r.n1; x1++ {
		most = max(most, int(r.rowStart[x1+1]-r.rowStart[x1]))
	}
	return most
}

// full reports whether every table is in the region (then its probability
// is 1 whatever the nuisance value).
func (r region) full() bool { return r.tables == int64(r.n1+1)*int64(r.n2+1) }

// mirrored reports whether the region is unchanged by exchanging events and
// non-events, (x1, x2) → (n1 − x1, n2 − x2). Two-sided orderings have this
// symmetry; then the tail at π equals the tail at 1 − π when π1 = π2 = π,
// and the nuisance search can stop at π = ½.
func (r region) mirrored() bool {
	for x1 := 0; x1 <= r.n1; x1++ {
		a := r.runs[r.rowStart[x1]:r.rowStart[x1+1]]
		b := r.runs[r.rowStart[r.n1-x1]:r.rowStart[r.n1-x1+1]]
		if len(a) != len(b) {
			return false
		}
		for i, run := range a {
			m := b[len(b)-1-i]
			if int(run[0]) != r.n2-int(m[1]) || int(run[1]) != r.n2-int(m[0]) {
				return false
			}
		}
	}
	return true
}
