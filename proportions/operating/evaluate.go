package operating

import (
	"context"
	"math"
	"slices"

	"github.com/propscope/propscope/proportions"
	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/floats"
)

// The evaluation of a Table at many points (π1, π2).
//
// The points are sorted by their truth θ and cut into chunks of
// consecutive truths, one chunk per task. A task keeps, for every piece
// [s, e) of every row x1, the run [a, b) of x2 whose interval covers θ: a is
// the first x2 of the piece with L ≤ θ and b the first with U < θ. Both
// limits are non-increasing inside a piece and L ≤ U, so the run is exact,
// and as θ grows both pointers only move down: over a whole chunk each
// pointer walks at most n2 + 1 steps. At each distinct truth the rows in use
// are brought up to date once; every point with that truth then costs one
// pass over the rows of its first binomial, two prefix-sum lookups per
// piece. The expected widths are a separate pass: for each distinct π2 the
// row sums Σ_x2 b(x2; n2, π2)·width(x1, x2), then a dot product per point.

// query is one point to evaluate.
type query struct {
	theta         float64
	first, second int32 // indices into the rates π1 and π2
	at            int32 // index of the point in the caller's list
}

// pair indexes a point into lists of rates π1 and π2.
type pair struct{ i, j int32 }

// evaluation holds the binomials of the distinct rates of a set of points.
type evaluation struct {
	t       *OutcomeLimits
	queries []query // points with a defined truth, by ascending θ
	pi1     []float64
	pi2     []float64
	firsts  []binomial  // first binomial per π1
	seconds []binomial  // second binomial per π2
	cums    [][]float64 // prefix sums of the second binomials
	// wsum[j][x1] = Σ_x2 b(x2; n2, π2_j)·width(x1, x2) (bounded intervals
	// only) and usum[j][x1] the same sum of 1{unbounded} (ratio scales).
	wsum, usum [][]float64
	rows       [][2]int // rows [lo, hi] whose sums are needed, per π2
	out        []result // by query
}

// result is the exact operating characteristics at one point.
type result struct {
	cov, below, above, width, unbounded float64
}

// evaluate computes the points (pi1[i], pi2[j]) for the given pairs, in
// parallel, and returns them in the order of pairs (undefined truths as
// undefinedPoint). Rates must be valid.
func (t *OutcomeLimits) evaluate(ctx context.Context, pi1, pi2 []float64, pairs []pair, cfg config) ([]Point, error) {
	ev := t.newEvaluation(pi1, pi2, pairs)
	err := parallel(ctx, cfg.workers, len(ev.seconds), func(j int) error {
		ev.widthSums(j)
		return nil
	})
	if err != nil {
		return nil, err
	}
	rep := newReporter(cfg.progress, len(ev.queries))
	chunks := ev.chunks(8 * max(cfg.workers, 2))
	err = parallel(ctx, cfg.workers, len(chunks)-1, func(c int) error {
		ev.run(chunks[c], chunks[c+1])
		rep.Add(chunks[c+1] - chunks[c])
		return nil
	})
	if err != nil {
		return nil, err
	}
	points := make([]Point, len(pairs))
	for k, p := range pairs {
		points[k] = undefinedPoint(pi1[p.i], pi2[p.j])
	}
	for k, q := range ev.queries {
		r := ev.out[k]
		points[q.at] = Point{Pi1: pi1[q.first], Pi2: pi2[q.second], Truth: q.theta, Defined: true,
			Coverage: r.cov, Below: r.below, Above: r.above, Width: r.width, Unbounded: r.unbounded}
	}
	return points, nil
}

// newEvaluation computes the binomials of the rates and sorts the points
// with a defined truth by truth.
func (t *OutcomeLimits) newEvaluation(pi1, pi2 []float64, pairs []pair) *evaluation {
	ev := &evaluation{t: t, pi1: pi1, pi2: pi2,
		firsts: make([]binomial, len(pi1)), seconds: make([]binomial, len(pi2)), cums: make([][]float64, len(pi2))}
	buf1 := make([]float64, len(pi1)*(t.n1+1))
	for i, p := range pi1 {
		ev.firsts[i].fill(t.n1, p, buf1[i*(t.n1+1):(i+1)*(t.n1+1)])
	}
	buf2 := make([]float64, len(pi2)*(2*t.n2+3))
	for j, p := range pi2 {
		b := buf2[j*(2*t.n2+3) : (j+1)*(2*t.n2+3)]
		ev.seconds[j].fill(t.n2, p, b[:t.n2+1])
		ev.cums[j] = b[t.n2+1:]
		ev.seconds[j].prefix(ev.cums[j])
	}
	ev.queries = make([]query, 0, len(pairs))
	for k, p := range pairs {
		if theta, ok := Truth(t.scale(), pi1[p.i], pi2[p.j]); ok {
			ev.queries = append(ev.queries, query{theta: theta, first: p.i, second: p.j, at: int32(k)})
		}
	}
	slices.SortFunc(ev.queries, func(a, b query) int { return cmpFloat(a.theta, b.theta) })
	ev.wsum = make([][]float64, len(pi2))
	ev.usum = make([][]float64, len(pi2))
	// The rows each second rate needs: the union of its points' first
	// binomials' ranges.
	ev.rows = make([][2]int, len(pi2))
	for j := range ev.rows {
		ev.rows[j] = [2]int{t.n1 + 1, -1}
	}
	for _, q := range ev.queries {
		b, r := &ev.firsts[q.first], &ev.rows[q.second]
		r[0], r[1] = min(r[0], b.lo), max(r[1], b.hi)
	}
	ev.out = make([]result, len(ev.queries))
	return ev
}

// chunks cuts the queries into about n runs of whole groups of equal truth
// and returns the boundaries (first is 0, last is len(queries)).
func (ev *evaluation) chunks(n int) []int {
	q := ev.queries
	bounds := []int{0}
	size := max(1, (len(q)+n-1)/n)
	for k := size; k < len(q); {
		for k < len(q) && q[k].theta == q[k-1].theta {
			k++
		}
		if k < len(q) {
			bounds = append(bounds, k)
		}
		k += size
	}
	return append(bounds, len(q))
}

// widthSums fills wsum[j] (and usum[j]) for the second binomial j.
func (ev *evaluation) widthSums(j int) {
	t := ev.t
	b := &ev.seconds[j]
	lo, hi := b.lo, b.hi+1
	r0, r1 := ev.rows[j][0], ev.rows[j][1]+1
	w := make([]float64, t.n1+1)
	ev.wsum[j] = w
	var u []float64
	if t.scale() != proportions.Difference {
		u = make([]float64, t.n1+1)
		ev.usum[j] = u
	}
	if r0 >= r1 {
		return
	}
	// w[r0:r1] = W[r0:r1, lo:hi] · p[lo:hi], with W the table of widths.
	blas64.Gemv(blas.NoTrans, 1,
		blas64.General{Rows: r1 - r0, Cols: hi - lo, Stride: t.stride, Data: t.width[r0*t.stride+lo : (r1-1)*t.stride+hi]},
		blas64.Vector{N: hi - lo, Inc: 1, Data: b.p[lo:hi]}, 0, blas64.Vector{N: r1 - r0, Inc: 1, Data: w[r0:r1]})
	if t.scale() == proportions.Difference {
		return
	}
	for x1 := r0; x1 < r1; x1++ {
		base := x1 * t.stride
		for x2 := lo; x2 < hi; x2++ {
			if t.unbounded(base + x2) {
				u[x1] += b.p[x2]
			}
		}
	}
	ev.usum[j] = u
}

// pointers are a task's runs: a0/b0 for the first piece of each row
// (index x1), ax/bx for the other pieces (index into Table.cuts).
type pointers struct {
	a0, b0, ax, bx []int32
	ready          []bool
}

func (t *OutcomeLimits) newPointers() *pointers {
	return &pointers{
		a0: make([]int32, t.n1+1), b0: make([]int32, t.n1+1),
		ax: make([]int32, len(t.cuts)), bx: make([]int32, len(t.cuts)),
		ready: make([]bool, t.n1+1),
	}
}

// run evaluates queries [from, to), which have non-decreasing truths.
func (ev *evaluation) run(from, to int) {
	t := ev.t
	ps := t.newPointers()
	for g := from; g < to; {
		theta := ev.queries[g].theta
		end, lo, hi := g, t.n1, 0
		for ; end < to && ev.queries[end].theta == theta; end++ {
			b := &ev.firsts[ev.queries[end].first]
			lo, hi = min(lo, b.lo), max(hi, b.hi)
		}
		t.movePointers(lo, hi, theta, ps)
		for k := g; k < end; k++ {
			ev.out[k] = ev.point(&ev.queries[k], ps)
		}
		g = end
	}
}

// movePointers brings the runs of rows lo..hi to truth θ: by bisection
// for a row new to the task, else by walking down from the previous truth.
func (t *OutcomeLimits) movePointers(lo, hi int, theta float64, ps *pointers) {
	lower, upper := t.lower, t.upper
	a0, b0, ready := ps.a0, ps.b0, ps.ready
	for x1 := lo; x1 <= hi; x1++ {
		if !ready[x1] {
			t.startRow(x1, theta, ps)
			continue
		}
		// First pieces start at x2 = 0.
		base := x1 * t.stride
		a, b := base+int(a0[x1]), base+int(b0[x1])
		for a > base && lower[a-1] <= theta {
			a--
		}
		for b > base && upper[b-1] < theta {
			b--
		}
		a0[x1], b0[x1] = int32(a-base), int32(b-base)
	}
	for _, r := range t.multi {
		x1 := int(r)
		if x1 < lo || x1 > hi {
			continue
		}
		base := x1 * t.stride
		for k := t.rowCut[x1] + 1; k < t.rowCut[x1+1]-1; k++ {
			st := base + int(t.cuts[k])
			a, b := base+int(ps.ax[k]), base+int(ps.bx[k])
			for a > st && lower[a-1] <= theta {
				a--
			}
			for b > st && upper[b-1] < theta {
				b--
			}
			ps.ax[k], ps.bx[k] = int32(a-base), int32(b-base)
		}
	}
}

// startRow places the runs of row x1 for θ by bisection.
func (t *OutcomeLimits) startRow(x1 int, theta float64, ps *pointers) {
	ps.ready[x1] = true
	base := x1 * t.stride
	lower, upper := t.lower[base:base+t.stride], t.upper[base:base+t.stride]
	k0, last := t.rowCut[x1], t.rowCut[x1+1]-1
	e := t.cuts[k0+1]
	ps.a0[x1] = firstAtMost(lower, 0, e, theta)
	ps.b0[x1] = firstBelow(upper, 0, e, theta)
	for k := k0 + 1; k < last; k++ {
		st, e := t.cuts[k], t.cuts[k+1]
		// Walked below in movePointers for rows already started, so set
		// them for θ here and let that walk find nothing to do.
		ps.ax[k] = firstAtMost(lower, st, e, theta)
		ps.bx[k] = firstBelow(upper, st, e, theta)
	}
}

// point sums one query over the rows of its first binomial: per row, the
// probability of the covered run and of the outcomes above the truth.
func (ev *evaluation) point(q *query, ps *pointers) result {
	t := ev.t
	b1 := &ev.firsts[q.first]
	cum := ev.cums[q.second]
	lo, hi := b1.lo, b1.hi+1
	p, a0, b0 := b1.p[lo:hi], ps.a0[lo:hi], ps.b0[lo:hi]
	b0 = b0[:len(p)]
	a0 = a0[:len(p)]
	// First pieces (they start at x2 = 0, where cum is 0), with two
	// accumulators each to shorten the chains of additions.
	var c0, c1, u0, u1 float64
	i := 0
	for ; i+2 <= len(p); i += 2 {
		ca, cb := cum[a0[i]], cum[b0[i]]
		da, db := cum[a0[i+1]], cum[b0[i+1]]
		c0 += p[i] * (cb - ca)
		u0 += p[i] * ca
		c1 += p[i+1] * (db - da)
		u1 += p[i+1] * da
	}
	if i < len(p) {
		ca, cb := cum[a0[i]], cum[b0[i]]
		c0 += p[i] * (cb - ca)
		u0 += p[i] * ca
	}
	r := result{cov: c0 + c1, above: u0 + u1}
	// Rows cut into several pieces.
	for _, x1 := range t.multi {
		if int(x1) < lo || int(x1) >= hi {
			continue
		}
		var cov, above float64
		for k := t.rowCut[x1] + 1; k < t.rowCut[x1+1]-1; k++ {
			ca := cum[ps.ax[k]]
			above += ca - cum[t.cuts[k]]
			cov += cum[ps.bx[k]] - ca
		}
		r.cov += b1.p[x1] * cov
		r.above += b1.p[x1] * above
	}
	// Each row's mass splits into above, covered and below, and both
	// binomials are normalised over their kept ranges.
	r.below = max(0, 1-r.cov-r.above)
	r.width = floats.Dot(b1.p[lo:hi], ev.wsum[q.second][lo:hi])
	if t.scale() != proportions.Difference {
		r.unbounded = floats.Dot(b1.p[lo:hi], ev.usum[q.second][lo:hi])
		r.width = amongBounded(r.width, r.unbounded)
	}
	return r
}

func (t *OutcomeLimits) scale() proportions.Scale { return t.method.Scale }

// amongBounded turns Σ P(x)·width(x) over bounded intervals into the
// expected width among bounded intervals; +Inf when (up to rounding) every
// interval is unbounded.
func amongBounded(sum, unbounded float64) float64 {
	if bounded := 1 - unbounded; bounded > 1e-15 {
		return sum / bounded
	}
	return math.Inf(1)
}

// firstAtMost returns the first i in [st, e) with v[i] ≤ x, or e; v is
// non-increasing on [st, e).
func firstAtMost(v []float64, st, e int32, x float64) int32 {
	lo, hi := st, e
	for lo < hi {
		mid := int32(uint32(lo+hi) >> 1)
		if v[mid] <= x {
			hi = mid
		} else {
			lo = mid + 1
		}
	}
	return lo
}

// firstBelow returns the first i in [st, e) with v[i] < x, or e.
func firstBelow(v []float64, st, e int32, x float64) int32 {
	lo, hi := st, e
	for lo < hi {
		mid := int32(uint32(lo+hi) >> 1)
		if v[mid] < x {
			hi = mid
		} else {
			lo = mid + 1
		}
	}
	return lo
}
