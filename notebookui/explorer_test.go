package notebookui

import (
	"encoding/json"
	"errors"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/planning"
	"gonum.org/v1/gonum/stat/distuv"
)

// bruteCoverage enumerates every outcome (x1, x2) of the design with
// gonum's binomial probabilities and sums those whose interval covers
// θ = π1 − π2: an independent recomputation of the exact coverage (no
// tables, runs or prefix sums), from the method's own limits.
func bruteCoverage(limits func(c proportions.Counts, conf proportions.Confidence) (float64, float64),
	n1, n2 int, level, pi1, pi2 float64) float64 {
	conf, _ := proportions.NewConfidence(level)
	b1 := distuv.Binomial{N: float64(n1), P: pi1}
	b2 := distuv.Binomial{N: float64(n2), P: pi2}
	theta := pi1 - pi2
	var cov float64
	for x1 := 0; x1 <= n1; x1++ {
		p1 := binomProb(b1, x1, pi1, n1)
		for x2 := 0; x2 <= n2; x2++ {
			lo, hi := limits(proportions.Counts{X1: int64(x1), N1: int64(n1), X2: int64(x2), N2: int64(n2)}, conf)
			if lo <= theta && theta <= hi {
				cov += p1 * binomProb(b2, x2, pi2, n2)
			}
		}
	}
	return cov
}

// binomProb is gonum's pmf, with the degenerate rates 0 and 1 by hand.
func binomProb(b distuv.Binomial, x int, p float64, n int) float64 {
	switch p {
	case 0:
		return boolTo(x == 0)
	case 1:
		return boolTo(x == n)
	}
	return b.Prob(float64(x))
}

func boolTo(b bool) float64 {
	if b {
		return 1
	}
	return 0
}

// waldLimits is the Wald interval written out from its textbook formula
// p1 − p2 ± z·√(p1q1/n1 + p2q2/n2) (common practice), independent of the
// library's implementation.
func waldLimits(c proportions.Counts, conf proportions.Confidence) (float64, float64) {
	z := distuv.UnitNormal.Quantile(1 - (1-conf.Level)/2)
	p1, p2 := float64(c.X1)/float64(c.N1), float64(c.X2)/float64(c.N2)
	se := math.Sqrt(p1*(1-p1)/float64(c.N1) + p2*(1-p2)/float64(c.N2))
	return p1 - p2 - z*se, p1 - p2 + z*se
}

func TestIntervalExplorerSliceMatchesEnumeration(t *testing.T) {
	e := IntervalExplorer{N1: 25, N2: 30, Level: 0.95, Rate1: 0.3, Rate2: 0.2, Method: "wald", Methods: []string{"wald", "newcombe"}}
	sl, err := e.Slice()
	if err != nil {
		t.Fatal(err)
	}
	if len(sl) != 1 || sl[0].Method != "wald" {
		t.Fatalf("want the Wald slice only, got %d slices", len(sl))
	}
	s := sl[0]
	if len(s.Slice.Points) != 101 {
		t.Fatalf("slice with π2 held: want 101 points (π1 = 0, 1, …, 100%%), got %d", len(s.Slice.Points))
	}
	var sum, lowest float64 = 0, 2
	for k, p := range s.Slice.Points {
		want := bruteCoverage(waldLimits, 25, 30, 0.95, float64(k)/100, 0.2)
		if p.Pi2 != 0.2 || math.Abs(p.Pi1-float64(k)/100) > 1e-12 {
			t.Fatalf("point %d at (%v, %v), want (%v, 0.2)", k, p.Pi1, p.Pi2, float64(k)/100)
		}
		if math.Abs(p.Coverage-want) > 1e-9 {
			t.Errorf("Wald coverage at π1 = %v, π2 = 0.2: explorer %.12f, enumeration %.12f", p.Pi1, p.Coverage, want)
		}
		sum += want
		lowest = math.Min(lowest, want)
	}
	if !s.AtValid || s.At.Pi1 != 0.3 || math.Abs(s.At.Coverage-bruteCoverage(waldLimits, 25, 30, 0.95, 0.3, 0.2)) > 1e-9 {
		t.Errorf("chosen point: %+v", s.At)
	}
	if math.Abs(s.Mean-sum/101) > 1e-9 || math.Abs(s.Min-lowest) > 1e-9 {
		t.Errorf("summary: mean %v min %v, want %v and %v", s.Mean, s.Min, sum/101, lowest)
	}
	// Known behaviour of the Wald interval (common practice): near a rate
	// of 0 or 1 its coverage falls well below the nominal level.
	if s.Min > 0.9 {
		t.Errorf("Wald's lowest coverage along the slice is %v; it should collapse near the edges", s.Min)
	}
}

func TestIntervalExplorerHoldDifference(t *testing.T) {
	nc, err := proportions.LookupInterval("newcombe")
	if err != nil {
		t.Fatal(err)
	}
	e := IntervalExplorer{N1: 20, N2: 20, Level: 0.9, Rate1: 0.5, Difference: 0.1, HoldDifference: true, Method: "newcombe"}
	sl, err := e.Slice()
	if err != nil {
		t.Fatal(err)
	}
	s := sl[0]
	// π1 from 10% to 100% in whole points, π2 = π1 − 10 points.
	if len(s.Slice.Points) != 91 {
		t.Fatalf("want 91 points, got %d", len(s.Slice.Points))
	}
	for _, p := range s.Slice.Points {
		if math.Abs(p.Pi1-p.Pi2-0.1) > 1e-9 || p.Pi2 < 0 || p.Pi1 > 1 {
			t.Fatalf("point (%v, %v) is not on the line π1 − π2 = 0.1", p.Pi1, p.Pi2)
		}
	}
	for _, k := range []int{0, 17, 40, 90} {
		p := s.Slice.Points[k]
		want := bruteCoverage(nc.Limits, 20, 20, 0.9, p.Pi1, p.Pi2)
		if math.Abs(p.Coverage-want) > 1e-9 {
			t.Errorf("Newcombe coverage at (%v, %v): %v, enumeration %v", p.Pi1, p.Pi2, p.Coverage, want)
		}
	}
	if !s.AtValid || math.Abs(s.At.Pi1-0.5) > 1e-9 || math.Abs(s.At.Pi2-0.4) > 1e-9 {
		t.Errorf("chosen point %+v, want (0.5, 0.4)", s.At)
	}
	f, err := e.Frame()
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(f.Text(), "true rate π2: 0% (not used)") || strings.Contains(f.Text(), "+10 pp (not used)") {
		t.Errorf("with the difference held the π2 slider is the unused one:\n%s", f.Text())
	}
}

func TestIntervalExplorerFrameShowsTheNumbers(t *testing.T) {
	e := IntervalExplorer{N1: 30, N2: 30, Rate1: 0.25, Rate2: 0.25, Methods: []string{"wald", "agresti-caffo"}}
	f, err := e.Frame()
	if err != nil {
		t.Fatal(err)
	}
	html := f.HTML()
	for _, want := range []string{`data-explorer="interval"`, `data-method="wald"`, `data-method="agresti-caffo"`, "nominal 95%", "π2 held at 25%", "Exact coverage along a slice of true rates", "your point: π1 = 25%"} {
		if !strings.Contains(html, want) {
			t.Errorf("frame HTML lacks %q", want)
		}
	}
	// The data-coverage attribute carries the coverage at the point.
	m := regexp.MustCompile(`data-method="wald" data-coverage="([^"]+)"`).FindStringSubmatch(html)
	if m == nil {
		t.Fatal("no coverage for Wald in the summary table")
	}
	got, _ := strconv.ParseFloat(m[1], 64)
	if want := bruteCoverage(waldLimits, 30, 30, 0.95, 0.25, 0.25); math.Abs(got-want) > 1e-9 {
		t.Errorf("Wald coverage at (0.25, 0.25): shown %v, enumeration %v", got, want)
	}
	var j struct {
		Settings []Setting `json:"settings"`
	}
	raw, err := f.JSON()
	if err != nil || json.Unmarshal(raw, &j) != nil || len(j.Settings) != 8 {
		t.Fatalf("frame JSON: %v, %s", err, raw)
	}
	ac, _ := proportions.LookupInterval("agresti-caffo")
	if !strings.Contains(f.Text(), ac.Name) || !strings.Contains(f.Markdown(), "| Wald |") {
		t.Error("text and Markdown forms should list the methods")
	}
}

func TestIntervalExplorerPointOffTheSlice(t *testing.T) {
	e := IntervalExplorer{N1: 10, N2: 10, Rate1: 0.1, Difference: 0.3, HoldDifference: true, Method: "wald"}
	f, err := e.Frame()
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(f.Text(), "π2 would be −20%: not a rate") {
		t.Errorf("a point off the slice should be explained:\n%s", f.Text())
	}
}

func TestIntervalExplorerRejectsBadSettings(t *testing.T) {
	cases := []struct {
		e    IntervalExplorer
		want error
	}{
		{IntervalExplorer{N1: 0, N2: 10}, proportions.ErrNoTrials},
		{IntervalExplorer{N1: 10, N2: 10, SliderMaxTrials: 5000}, proportions.ErrTooLarge},
		{IntervalExplorer{N1: 300, N2: 10, SliderMaxTrials: 200}, proportions.ErrTooLarge},
		{IntervalExplorer{N1: 10, N2: 10, Level: 0.5}, proportions.ErrLevel},
		{IntervalExplorer{N1: 10, N2: 10, Rate1: 1.5}, proportions.ErrPlan},
		{IntervalExplorer{N1: 10, N2: 10, Methods: []string{"no-such"}}, proportions.ErrUnknownMethod},
		{IntervalExplorer{N1: 10, N2: 10, Methods: []string{"katz-ratio"}}, proportions.ErrUnsupported},
		{IntervalExplorer{N1: 10, N2: 10, Methods: []string{"wald"}, Method: "mee"}, proportions.ErrUnknownMethod},
	}
	for _, c := range cases {
		if _, err := c.e.Frame(); !errors.Is(err, c.want) {
			t.Errorf("%+v: error %v, want %v", c.e, err, c.want)
		}
	}
}

func TestControlsClampPositions(t *testing.T) {
	c := control{min: 1, max: 200}
	if c.clamp(-5) != 1 || c.clamp(900) != 200 || c.clamp(40) != 40 {
		t.Error("slider positions must be clamped to the slider's range")
	}
	ch := control{options: []string{"a", "b"}}
	if ch.clamp(7) != 1 || ch.clamp(-1) != 0 || ch.shown(1) != "b" {
		t.Error("choice positions must be clamped to the options")
	}
}

// fleissEquality is the equality sample size with pooled null variance,
// n1 = [z(1−α/2)√(2p̄q̄) + z(power)√(p1q1 + p2q2)]² / (p1 − p2)², written
// out from Fleiss, Levin & Paik (2003), ch. 4, for equal groups.
func fleissEquality(p1, p2, alpha, power float64) int {
	za := distuv.UnitNormal.Quantile(1 - alpha/2)
	zb := distuv.UnitNormal.Quantile(power)
	pb := (p1 + p2) / 2
	n := math.Pow(za*math.Sqrt(2*pb*(1-pb))+zb*math.Sqrt(p1*(1-p1)+p2*(1-p2)), 2) / ((p1 - p2) * (p1 - p2))
	return int(math.Ceil(n - 1e-9))
}

func TestPlanningExplorerFollowsTheSliders(t *testing.T) {
	start := planning.NewPlan(planning.Equality, 0.6, 0.4)
	e := PlanningExplorer{Plan: start}
	m := planningModel{e}
	for _, c := range []struct{ r1, r2, power float64 }{{0.6, 0.4, 0.8}, {0.3, 0.2, 0.9}, {0.15, 0.1, 0.8}} {
		d := start
		d.Rate1, d.Rate2, d.Power = c.r1, c.r2, c.power
		f, err := e.Frame(d)
		if err != nil {
			t.Fatal(err)
		}
		want := fleissEquality(c.r1, c.r2, 0.05, c.power)
		if !strings.Contains(f.HTML(), `data-n1="`+strconv.Itoa(want)+`"`) {
			t.Errorf("π1 = %v, π2 = %v, power %v: want n1 = %d in\n%s", c.r1, c.r2, c.power, want, f.Text())
		}
		if !strings.Contains(f.HTML(), `data-kind="power-by-size"`) {
			t.Error("the frame should hold the power curve")
		}
		if got := m.plan(m.positions(d)); got.Rate1 != c.r1 || got.Rate2 != c.r2 || got.Power != c.power {
			t.Errorf("positions do not round-trip: %+v", got)
		}
	}
	// Equal rates in a test of equality have no finite sample size: a
	// message, not a panic.
	d := start
	d.Rate1 = 0.4
	f, err := e.Frame(d)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(f.Text(), "No sample size for these settings") {
		t.Errorf("equal rates: %s", f.Text())
	}
}

func TestPlanningExplorerGoalSwitch(t *testing.T) {
	start := planning.NewPlan(planning.NonInferiority, 0.04, 0.04)
	start.Better, start.Margin = proportions.LowerIsBetter, 0.02 // defect rates
	m := planningModel{PlanningExplorer{Plan: start}}
	pos := m.positions(start)
	pos[0] = int(planning.Superiority)
	if d := m.plan(pos); d.Better != proportions.LowerIsBetter || d.Alpha != planning.DefaultOneSidedAlpha {
		t.Errorf("switching to superiority keeps lower-is-better and one-sided α: %+v", d)
	}
	pos[0] = int(planning.Equality)
	if d := m.plan(pos); d.Better != proportions.LowerIsBetter || d.Margin != 0 || d.Alpha != planning.DefaultTwoSidedAlpha {
		t.Errorf("switching to equality: %+v", d)
	}
}

func TestWhatIfExplorer(t *testing.T) {
	c, err := proportions.NewComparison(30, 200, 18, 200, proportions.Labels{First: "line <A>", Second: "line B", Event: "defective"})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := proportions.Analyze(c); err != nil {
		t.Skipf("the default analysis is not available: %v", err)
	}
	e := WhatIfExplorer{Comparison: c}
	f, err := e.Frame(30, 200, 18, 200)
	if err != nil {
		t.Fatal(err)
	}
	html := f.HTML()
	// 30/200 = 15.0% and 18/200 = 9.0%, a difference of +6.0 points
	// (arithmetic).
	// html/template writes "+" as "&#43;".
	html = strings.ReplaceAll(html, "&#43;", "+")
	for _, want := range []string{`data-propscope="result-card"`, "15.0%", "9.0%", "+6.0", "line &lt;A&gt;"} {
		if !strings.Contains(html, want) {
			t.Errorf("what-if card lacks %q", want)
		}
	}
	if strings.Contains(html, "line <A>") {
		t.Error("group labels must be escaped")
	}
	f, err = e.Frame(40, 200, 18, 200)
	if err != nil {
		t.Fatal(err)
	}
	if h := strings.ReplaceAll(f.HTML(), "&#43;", "+"); !strings.Contains(h, "20.0%") || !strings.Contains(h, "+11.0") {
		t.Error("moving the first group's events to 40 should show 20.0% and +11.0 points")
	}
	f, err = e.Frame(250, 200, 18, 200)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(f.Text(), "events cannot exceed trials") {
		t.Errorf("more events than trials: %s", f.Text())
	}
	if _, err := e.Frame(30, 900, 18, 200); !errors.Is(err, proportions.ErrTooLarge) {
		t.Errorf("counts past the sliders: %v", err)
	}
	if err := (WhatIfExplorer{Comparison: c, SliderMaxTrials: 100}).Run(); !errors.Is(err, proportions.ErrTooLarge) {
		t.Errorf("groups larger than the sliders' range: %v", err)
	}
}

func TestStaticFrameOutsideANotebook(t *testing.T) {
	// Outside a kernel (and under nbconvert, with no kernel id) the
	// explorers show their starting settings with a note and return.
	e := IntervalExplorer{N1: 12, N2: 12, Rate1: 0.5, Rate2: 0.5, Method: "wald"}
	m, err := e.model()
	if err != nil {
		t.Fatal(err)
	}
	f := staticFrame(m)
	if f.Note != staticNote || !strings.Contains(f.HTML(), "Static view of the starting settings") {
		t.Errorf("static frame note: %q", f.Note)
	}
	t.Setenv("GONB_JUPYTER_KERNEL_ID", "")
	if frontEndAttached() {
		t.Error("no kernel id means no front end")
	}
	if err := e.Run(); err != nil {
		t.Fatal(err)
	}
}

func TestIntervalExplorerDrawsReadyMethodsFirst(t *testing.T) {
	e := IntervalExplorer{N1: 150, N2: 150, Rate1: 0.3, Rate2: 0.2}
	m, err := e.model()
	if err != nil {
		t.Fatal(err)
	}
	pos := startPositions(m)
	// A zero budget: the score methods' new tables cannot be ready.
	f, complete := frameWithin(m, pos, 0)
	if complete == nil || !f.Partial || !strings.Contains(f.HTML(), `data-partial="true"`) {
		t.Fatalf("a change that needs new tables should first show a partial frame")
	}
	if !strings.Contains(f.Text(), "Computing the exact tables of") {
		t.Errorf("the partial frame should say what is being computed:\n%s", f.Text())
	}
	full := complete()
	if full.Partial || strings.Contains(full.HTML(), "data-partial") {
		t.Fatal("the completed frame is still partial")
	}
	again := complete() // safe to call twice
	want := frameOf(m, pos)
	rows := regexp.MustCompile(`<tr data-method="[^"]+" data-coverage="[^"]*"`)
	got := rows.FindAllString(full.HTML(), -1)
	if len(got) != len(proportions.EnumerableIntervalMethods(proportions.Difference)) ||
		strings.Join(got, "|") != strings.Join(rows.FindAllString(want.HTML(), -1), "|") ||
		strings.Join(rows.FindAllString(again.HTML(), -1), "|") != strings.Join(got, "|") {
		t.Errorf("completed frame rows differ from a direct computation:\n%v\n%v", got, rows.FindAllString(want.HTML(), -1))
	}
	// With the tables cached, the whole frame is ready at once.
	pos[3] = 40
	if f, complete := frameWithin(m, pos, time.Minute); complete != nil || f.Partial {
		t.Error("a change of π1 reuses the tables and should not be partial")
	}
}

func TestWhatIfExplorerShowsTheQuickCardFirst(t *testing.T) {
	c, err := proportions.NewComparison(30, 200, 18, 200, proportions.Labels{First: "line A", Second: "line B", Event: "defective"})
	if err != nil {
		t.Fatal(err)
	}
	m := whatIfModel{e: WhatIfExplorer{Comparison: c}}
	pos := startPositions(m)
	f, complete := frameWithin(m, pos, 0) // no time at all: the exact methods cannot be ready
	if complete == nil || !f.Partial || !strings.Contains(f.Text(), "Computing the exact tests and intervals") {
		t.Fatalf("want a partial frame first:\n%s", f.Text())
	}
	full := complete()
	// The full card has the costly exact tests (Barnard's among them); the
	// quick one does not, though it has Fisher's, which costs microseconds.
	barnard, err := proportions.LookupTest("barnard-test")
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(f.Text(), barnard.Name+" ") || !strings.Contains(full.Text(), barnard.Name) {
		t.Errorf("the quick card should leave out %s and the full card show it", barnard.Name)
	}
	if !strings.Contains(f.Text(), "Fisher exact") {
		t.Error("the quick card should show Fisher's exact test")
	}
	if full.Partial || strings.Contains(full.Text(), "Computing the exact") {
		t.Error("the completed frame is still partial")
	}
	if complete().Text() != full.Text() {
		t.Error("completing twice should give the same frame")
	}
}

// Moving on from counts cancels their full analysis: the earlier frame's
// completion says it was left, instead of finishing seconds of exact work
// nobody will see.
func TestWhatIfSupersededAnalysisIsCancelled(t *testing.T) {
	c, err := proportions.NewComparison(150, 300, 120, 300, proportions.Labels{First: "a", Second: "b", Event: "sprouted"})
	if err != nil {
		t.Fatal(err)
	}
	m := whatIfModel{e: WhatIfExplorer{Comparison: c}, latest: &latestRun{}}
	_, rest := m.renderWithin([]int{150, 300, 120, 300}, time.Millisecond)
	if rest == nil {
		t.Skip("the full analysis finished within a millisecond; nothing to cancel")
	}
	_, rest2 := m.renderWithin([]int{151, 300, 120, 300}, time.Millisecond)
	first := rest()
	if msg, ok := first.(message); !ok || !strings.Contains(msg.text, "left before") {
		t.Errorf("the superseded analysis finished as %T %q, want the note that it was left", first, first.Text())
	}
	if rest2 != nil {
		if _, ok := rest2().(ResultCard); !ok {
			t.Error("the newest counts' full analysis did not give a card")
		}
	}
}

// Moving a slider on from a design cancels the exact tables of the design
// left: the earlier frame's completion says so, the table stopped half-way
// is not kept, and the newest settings still get their full view.
func TestIntervalSupersededTablesAreCancelled(t *testing.T) {
	// The profile-likelihood tail-area interval's table takes most of a
	// second at 150 per group and several seconds at 300.
	slow := "profile-exact-tails"
	e := IntervalExplorer{N1: 300, N2: 300, Rate1: 0.3, Rate2: 0.2, Methods: []string{"wald", slow}}
	m, err := e.model()
	if err != nil {
		t.Fatal(err)
	}
	m.latest = &latestRun{}
	pos := startPositions(m)
	_, rest := m.renderWithin(pos, time.Millisecond)
	if rest == nil {
		t.Skip("every table was ready within a millisecond; nothing to cancel")
	}
	moved := append([]int(nil), pos...)
	moved[0], moved[1] = 20, 20 // n1, n2
	_, rest2 := m.renderWithin(moved, time.Millisecond)
	first := rest()
	if msg, ok := first.(message); !ok || !strings.Contains(msg.text, "were left before") {
		t.Errorf("the superseded computation finished as %T %q, want the note that its settings were left", first, first.Text())
	}
	m.tables.mu.Lock()
	for key := range m.tables.byKey {
		if strings.HasPrefix(key, slow+"/300/") {
			t.Errorf("the table %s was kept: its computation was not stopped by the move", key)
		}
	}
	m.tables.mu.Unlock()
	second := m.render(moved)
	if rest2 != nil {
		second = rest2()
	}
	if _, ok := second.(views); !ok || !strings.Contains(second.HTML(), `data-method="`+slow+`"`) {
		t.Fatalf("the newest settings' view is %T:\n%s", second, second.Text())
	}
}
