package notebookui

import (
	"context"
	"fmt"
	"math"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/operating"
)

// IntervalExplorer shows how interval methods behave for a design: the
// exact coverage along a slice of true rates through a chosen point
// (π1, π2), computed by the exact engine (package proportions/operating), and
// a table of the coverage at the point, the lowest and the mean coverage
// along the slice and the expected widths. Sliders move n1, n2, the level,
// π1 and either π2 or the difference π1 − π2 held along the slice; a
// drop-down picks one method or all of them.
//
// The slice runs over π1 in steps of one percentage point: with π2 held,
// π1 from 0 to 100%; with the difference held, over every π1 whose π2 =
// π1 − difference is a rate. Each method's table of limits is computed
// once per design (n1, n2, level) and kept while the reader moves the
// rates, so a change of π1, π2 or the difference costs a slice, not a
// table. In a live notebook a new position cancels the tables still being
// computed for the settings the reader moved away from.
//
// Build it as a literal; zero fields take the defaults noted.
type IntervalExplorer struct {
	// N1 and N2 are the starting group sizes (required, at least 1).
	N1, N2 int
	// Level is the starting two-sided level (0 means 0.95); the slider
	// moves in steps of half a percentage point from 80% to 99.5%.
	Level float64
	// Rate1 is the starting π1; Rate2 the starting π2; Difference the
	// starting π1 − π2 held along the slice when HoldDifference is set.
	// The sliders move in steps of one percentage point.
	Rate1, Rate2, Difference float64
	// HoldDifference starts the explorer with the slice at a fixed
	// difference rather than at a fixed π2.
	HoldDifference bool
	// Methods are the keys of the interval methods for the difference
	// offered (default: every registered one). The drop-down offers each,
	// and all of them together.
	Methods []string
	// Method is the key of the method shown first; "" shows all.
	Method string
	// SliderMaxTrials is where the group-size sliders end (0 means 200, or
	// the larger starting size if that is more); at most
	// MaxExplorerTrials.
	SliderMaxTrials int
}

// MaxExplorerTrials is the largest group size the interval explorer
// offers: its tables of limits take 24·(n1+1)·(n2+1) bytes per method and
// a redraw after a change of n recomputes them.
const MaxExplorerTrials = 1000

// allMethods is the drop-down entry that shows every offered method.
const allMethods = "all methods"

func (e IntervalExplorer) level() float64 {
	if e.Level == 0 {
		return 0.95
	}
	return e.Level
}

func (e IntervalExplorer) maxN() int {
	if e.SliderMaxTrials != 0 {
		return e.SliderMaxTrials
	}
	return max(200, e.N1, e.N2)
}

// methods resolves the offered methods.
func (e IntervalExplorer) methods() ([]proportions.IntervalMethod, error) {
	if len(e.Methods) == 0 {
		return proportions.EnumerableIntervalMethods(proportions.Difference), nil
	}
	out := make([]proportions.IntervalMethod, 0, len(e.Methods))
	for _, k := range e.Methods {
		m, err := proportions.LookupInterval(k)
		if err != nil {
			return nil, fmt.Errorf("interval explorer: %w", err)
		}
		if m.Scale != proportions.Difference {
			return nil, fmt.Errorf("interval explorer: %s is a method for the %s: %w; the explorer compares methods for the difference π1 − π2 (draw the others with CoverageSliceChart or CoverageMapChart)",
				m.Name, m.Scale, proportions.ErrUnsupported)
		}
		out = append(out, m)
	}
	return out, nil
}

func (e IntervalExplorer) validate() error {
	ms, err := e.methods()
	if err != nil {
		return err
	}
	if e.Method != "" && e.Method != allMethods {
		found := false
		for _, m := range ms {
			found = found || m.Key == e.Method
		}
		if !found {
			return fmt.Errorf("interval explorer: method %q: %w; it is not among the offered methods", e.Method, proportions.ErrUnknownMethod)
		}
	}
	if top := e.maxN(); top < 1 || top > MaxExplorerTrials {
		return fmt.Errorf("interval explorer: group sizes up to %d: %w; the sliders can reach at most %d", top, proportions.ErrTooLarge, MaxExplorerTrials)
	}
	if _, err := operating.NewDesign(e.N1, e.N2, e.level()); err != nil {
		return fmt.Errorf("interval explorer: %w", err)
	}
	if e.N1 > e.maxN() || e.N2 > e.maxN() {
		return fmt.Errorf("interval explorer: starting sizes %d and %d beyond the sliders' end %d: %w; raise MaxGroupSize", e.N1, e.N2, e.maxN(), proportions.ErrTooLarge)
	}
	if !(e.level() >= 0.8 && e.level() <= 0.995) {
		return fmt.Errorf("interval explorer: level %v: %w; the slider runs from 0.80 to 0.995", e.Level, proportions.ErrLevel)
	}
	for _, r := range []float64{e.Rate1, e.Rate2} {
		if !(r >= 0 && r <= 1) {
			return fmt.Errorf("interval explorer: rate %v: %w; a rate lies between 0 and 1", r, proportions.ErrPlan)
		}
	}
	if !(e.Difference >= -1 && e.Difference <= 1) {
		return fmt.Errorf("interval explorer: difference %v: %w; π1 − π2 lies between −1 and 1", e.Difference, proportions.ErrPlan)
	}
	return nil
}

// Run shows the explorer: live in a notebook with a front end, the
// starting settings as a static view under nbconvert or outside a notebook
// (see WhatIfExplorer.Run for the modes).
func (e IntervalExplorer) Run(opts ...LiveOption) error {
	m, err := e.model()
	if err != nil {
		return err
	}
	m.latest = &latestRun{}
	return run(m, opts)
}

// Frame returns what the explorer shows at its starting settings, as the
// live explorer would draw it.
func (e IntervalExplorer) Frame() (Frame, error) {
	m, err := e.model()
	if err != nil {
		return Frame{}, err
	}
	return frameOf(m, startPositions(m)), nil
}

// Slice computes the exact coverage along the explorer's starting slice,
// one result per shown method: the numbers behind Frame.
func (e IntervalExplorer) Slice() ([]CoverageSlice, error) {
	m, err := e.model()
	if err != nil {
		return nil, err
	}
	return m.slices(context.Background(), m.settings(startPositions(m)))
}

func (e IntervalExplorer) model() (*intervalModel, error) {
	if err := e.validate(); err != nil {
		return nil, err
	}
	ms, _ := e.methods()
	return &intervalModel{e: e, methods: ms, tables: newTableCache(3 * len(ms))}, nil
}

// CoverageSlice is the exact coverage of one interval method along a
// slice of true rates (as computed by the exact engine), with its summary.
type CoverageSlice struct {
	// Slice holds the points: along π1 at a fixed π2, or along π2 at a
	// fixed difference.
	Slice      *operating.Slice `json:"slice"`
	Method     string           `json:"method"`
	MethodName string           `json:"method_name"`
	// At is the point the reader chose, when it lies on the slice.
	At      operating.Point `json:"at"`
	AtValid bool            `json:"at_valid"`
	// Min is the lowest coverage along the slice, at (MinPi1, MinPi2)
	// (the first such point along the slice); Mean is the average
	// coverage and MeanWidth the average expected width over the points
	// with a defined truth.
	Min       float64 `json:"min"`
	MinPi1    float64 `json:"min_pi1"`
	MinPi2    float64 `json:"min_pi2"`
	Mean      float64 `json:"mean"`
	MeanWidth float64 `json:"mean_width"`
}

// sliceSettings is what the positions stand for.
type sliceSettings struct {
	n1, n2       int
	level        float64
	pi1, pi2     float64 // the chosen point (pi2 may fall outside [0, 1])
	difference   float64
	holdDiff     bool
	methodChoice int // index into the drop-down
}

type intervalModel struct {
	e       IntervalExplorer
	methods []proportions.IntervalMethod
	tables  *tableCache
	// latest, in a live explorer, cancels the tables and slices of
	// settings the reader has already moved away from, so that slider
	// moves never queue up seconds of exact computation (new tables after
	// a change of n or of the level); nil in a static frame.
	latest *latestRun
}

func (*intervalModel) name() string { return "interval" }
func (*intervalModel) title() string {
	return "Interval explorer: how the methods behave for this design"
}

// choices lists the drop-down: each method, then all of them.
func (m *intervalModel) choices() []string {
	out := make([]string, 0, len(m.methods)+1)
	for _, me := range m.methods {
		out = append(out, me.Name)
	}
	if len(m.methods) > 1 {
		out = append(out, allMethods)
	}
	return out
}

func (m *intervalModel) controls() []control {
	e := m.e
	pct := func(p int) string { return strconv.Itoa(p) + "%" }
	choices := m.choices()
	start := len(choices) - 1
	for i, me := range m.methods {
		if me.Key == e.Method {
			start = i
		}
	}
	mode := 0
	if e.HoldDifference {
		mode = 1
	}
	return []control{
		{key: "n1", label: "group 1 size n1", min: 1, max: e.maxN(), value: e.N1, show: strconv.Itoa},
		{key: "n2", label: "group 2 size n2", min: 1, max: e.maxN(), value: e.N2, show: strconv.Itoa},
		{key: "level", label: "confidence level", min: 160, max: 199, value: int(math.Round(200 * e.level())),
			show: func(p int) string { return strconv.FormatFloat(float64(p)/2, 'f', -1, 64) + "%" }},
		{key: "pi1", label: "true rate π1", min: 0, max: 100, value: int(math.Round(100 * e.Rate1)), show: pct},
		{key: "hold", label: "along the slice, hold", options: []string{"π2 fixed", "difference π1 − π2 fixed"}, value: mode},
		{key: "pi2", label: "true rate π2", min: 0, max: 100, value: int(math.Round(100 * e.Rate2)), show: pct},
		{key: "diff", label: "difference π1 − π2", min: -99, max: 99, value: int(math.Round(100 * e.Difference)),
			show: func(p int) string { return signedPP(float64(p) / 100) }},
		{key: "method", label: "method", options: choices, value: start},
	}
}

// unused marks the rate slider that the slice does not read: π2 when the
// difference is held, the difference when π2 is.
func (m *intervalModel) unused(pos []int, i int) bool {
	return (i == 5 && pos[4] == 1) || (i == 6 && pos[4] == 0)
}

func (m *intervalModel) settings(pos []int) sliceSettings {
	s := sliceSettings{n1: pos[0], n2: pos[1], level: float64(pos[2]) / 200,
		pi1: float64(pos[3]) / 100, holdDiff: pos[4] == 1, methodChoice: pos[7]}
	s.difference = float64(pos[6]) / 100
	s.pi2 = float64(pos[5]) / 100
	if s.holdDiff {
		// Whole percentage points, so the point lies on the slice's grid.
		s.pi2 = float64(pos[3]-pos[6]) / 100
	}
	return s
}

// shown returns the methods the drop-down selects.
func (m *intervalModel) shown(s sliceSettings) []proportions.IntervalMethod {
	if s.methodChoice >= len(m.methods) {
		return m.methods
	}
	return m.methods[s.methodChoice : s.methodChoice+1]
}

// slices computes every shown method's slice, the methods in parallel;
// it stops with ctx's error when ctx is cancelled.
func (m *intervalModel) slices(ctx context.Context, s sliceSettings) ([]CoverageSlice, error) {
	r, err := m.start(ctx, s)
	if err != nil {
		return nil, err
	}
	<-r.all
	return r.results()
}

// running is the computation of the shown methods' slices, one goroutine
// per method.
type running struct {
	shown []proportions.IntervalMethod
	out   []CoverageSlice
	errs  []error
	ready []atomic.Bool
	all   chan struct{} // closed when every method is done
}

func (m *intervalModel) start(ctx context.Context, s sliceSettings) (*running, error) {
	d, err := operating.NewDesign(s.n1, s.n2, s.level)
	if err != nil {
		return nil, err
	}
	shown := m.shown(s)
	r := &running{shown: shown, out: make([]CoverageSlice, len(shown)), errs: make([]error, len(shown)),
		ready: make([]atomic.Bool, len(shown)), all: make(chan struct{})}
	var wg sync.WaitGroup
	for i, me := range shown {
		wg.Add(1)
		go func() {
			defer wg.Done()
			r.out[i], r.errs[i] = m.slice(ctx, me, d, s)
			r.ready[i].Store(true)
		}()
	}
	go func() { wg.Wait(); close(r.all) }()
	return r, nil
}

// results returns every slice once all are done, or the first error.
func (r *running) results() ([]CoverageSlice, error) {
	for _, err := range r.errs {
		if err != nil {
			return nil, err
		}
	}
	return r.out, nil
}

// soFar returns the slices ready now and the names of the methods still
// being computed.
func (r *running) soFar() (done []CoverageSlice, pending []string) {
	for i := range r.shown {
		switch {
		case !r.ready[i].Load():
			pending = append(pending, r.shown[i].Name)
		case r.errs[i] == nil:
			done = append(done, r.out[i])
		}
	}
	return done, pending
}

func (m *intervalModel) slice(ctx context.Context, me proportions.IntervalMethod, d operating.Design, s sliceSettings) (CoverageSlice, error) {
	t, err := m.tables.get(ctx, me, d)
	if err != nil {
		return CoverageSlice{}, err
	}
	// The methods already run in parallel: one worker each.
	var es *operating.Slice
	if s.holdDiff {
		// π2 over its whole range in steps of one percentage point.
		k := int(math.Round(100*(1-math.Abs(s.difference)))) + 1
		es, err = t.AlongEffect(ctx, s.difference, operating.WithSteps(k), operating.WithWorkers(1))
	} else {
		es, err = t.AlongFirst(ctx, s.pi2, operating.WithSteps(101), operating.WithWorkers(1))
	}
	if err != nil {
		return CoverageSlice{}, err
	}
	cs := CoverageSlice{Slice: es, Method: me.Key, MethodName: me.Name, Min: math.Inf(1)}
	var n int
	for _, p := range es.Points {
		if samePoint(p, s.pi1, s.pi2) {
			cs.At, cs.AtValid = p, p.Defined
		}
		if !p.Defined {
			continue
		}
		n++
		cs.Mean += p.Coverage
		cs.MeanWidth += p.Width
		if p.Coverage < cs.Min {
			cs.Min, cs.MinPi1, cs.MinPi2 = p.Coverage, p.Pi1, p.Pi2
		}
	}
	if n == 0 {
		return CoverageSlice{}, fmt.Errorf("%s: %w; no point of the slice has a defined true value", me.Name, proportions.ErrEmptyInput)
	}
	cs.Mean /= float64(n)
	cs.MeanWidth /= float64(n)
	return cs, nil
}

func samePoint(p operating.Point, pi1, pi2 float64) bool {
	return math.Abs(p.Pi1-pi1) < 1e-9 && math.Abs(p.Pi2-pi2) < 1e-9
}

// render computes the slices and shows the chart and the summary table.
func (m *intervalModel) render(pos []int) Displayable {
	s := m.settings(pos)
	sl, err := m.slices(context.Background(), s)
	return m.view(s, sl, err)
}

// renderWithin shows what is ready within the budget: after a change of n
// or of the level the score methods' tables take a few hundred
// milliseconds at 200 per group, so the others are drawn first. In a live
// explorer a newer call cancels the computation of this one; the view it
// then completes to says the settings were left.
func (m *intervalModel) renderWithin(pos []int, budget time.Duration) (Displayable, func() Displayable) {
	s := m.settings(pos)
	ctx := m.latest.start()
	r, err := m.start(ctx, s)
	if err != nil {
		return m.view(s, nil, err), nil
	}
	full := func() Displayable {
		<-r.all
		if ctx.Err() != nil {
			return message{kind: "interval", text: "These settings were left before their exact tables were computed; the view for the newest settings follows."}
		}
		sl, err := r.results()
		return m.view(s, sl, err)
	}
	select {
	case <-r.all:
		return full(), nil
	case <-time.After(budget):
	}
	done, pending := r.soFar()
	if len(pending) == 0 {
		return full(), nil
	}
	note := message{kind: "interval", text: fmt.Sprintf("Computing the exact tables of %s for n1 = %d, n2 = %d at %s; they appear in a moment.",
		strings.Join(pending, ", "), s.n1, s.n2, trimPct(s.level))}
	if len(done) == 0 {
		return note, full
	}
	v := m.view(s, done, nil)
	return views{note, v}, full
}

// view shows the chart and the summary table, or why there are none.
func (m *intervalModel) view(s sliceSettings, sl []CoverageSlice, err error) Displayable {
	if err != nil {
		return message{kind: "interval", text: "No coverage for these settings: " + err.Error()}
	}
	ch, err := coverageSliceChart(sl, s)
	if err != nil {
		return message{kind: "interval", text: "The coverage chart cannot be drawn: " + err.Error()}
	}
	return views{ch, coverageSummary{slices: sl, s: s}}
}

// tableCache keeps the most recently used tables of limits, so that moving
// a rate slider reuses them. It is owned by one explorer.
type tableCache struct {
	mu    sync.Mutex
	limit int
	order []string
	byKey map[string]*operating.OutcomeLimits
}

func newTableCache(limit int) *tableCache {
	return &tableCache{limit: max(limit, 4), byKey: map[string]*operating.OutcomeLimits{}}
}

// get returns the table of me for d, computing it (stopped with ctx's error
// when ctx is cancelled; a stopped table is not kept) when it is not kept.
func (c *tableCache) get(ctx context.Context, me proportions.IntervalMethod, d operating.Design) (*operating.OutcomeLimits, error) {
	key := fmt.Sprintf("%s/%d/%d/%v", me.Key, d.N1, d.N2, d.Level)
	c.mu.Lock()
	if t, ok := c.byKey[key]; ok {
		c.touch(key)
		c.mu.Unlock()
		return t, nil
	}
	c.mu.Unlock()
	t, err := operating.NewOutcomeLimits(ctx, me, d)
	if err != nil {
		return nil, err
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	if _, ok := c.byKey[key]; !ok {
		c.byKey[key] = t
		c.order = append(c.order, key)
		for len(c.order) > c.limit {
			delete(c.byKey, c.order[0])
			c.order = c.order[1:]
		}
	}
	return t, nil
}

// touch moves key to the most recently used end.
func (c *tableCache) touch(key string) {
	for i, k := range c.order {
		if k == key {
			c.order = append(append(c.order[:i:i], c.order[i+1:]...), key)
			return
		}
	}
}
