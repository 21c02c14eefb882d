package notebookui

import (
	"context"
	"fmt"
	"strconv"
	"sync"
	"time"

	"github.com/propscope/propscope/proportions"
)

// WhatIfExplorer shows the result card of a comparison and lets the reader
// change the observed counts: the events and trials of each group. Each
// change reruns proportions.Analyze and redraws the card, so one sees how
// the interval, the tests and the conclusion would move had a few more
// units failed, or had the study been twice as large.
//
// Build it as a literal; Comparison is required.
type WhatIfExplorer struct {
	// Comparison holds the starting counts and the labels of the groups
	// and of the event.
	Comparison proportions.Comparison
	// Analysis holds the options of the analysis (level, null value,
	// alternative, continuity correction, method scope), as for
	// proportions.Analyze. The card runs every method
	// (proportions.ScopeAll) unless these options set another scope.
	Analysis []proportions.Option
	// SliderMaxTrials is the largest group size the sliders reach; 0 means
	// twice the larger group (at least 20). At most MaxWhatIfTrials.
	SliderMaxTrials int
}

// MaxWhatIfTrials is the largest MaxTrials a what-if explorer accepts: the
// sliders move in single units, and beyond a few thousand positions a
// slider can no longer pick one.
const MaxWhatIfTrials = 5000

func (e WhatIfExplorer) validate() error {
	if err := e.Comparison.Counts().Validate(); err != nil {
		return fmt.Errorf("what-if explorer: starting counts: %w", err)
	}
	if _, err := proportions.NewSettings(e.Analysis...); err != nil {
		return fmt.Errorf("what-if explorer: %w", err)
	}
	top := e.maxTrials()
	if top > MaxWhatIfTrials || e.SliderMaxTrials < 0 {
		return fmt.Errorf("what-if explorer: slider range up to %d trials: %w; use 0 (twice the larger group) or at most %d",
			e.SliderMaxTrials, proportions.ErrTooLarge, MaxWhatIfTrials)
	}
	c := e.Comparison.Counts()
	if c.N1 > int64(top) || c.N2 > int64(top) {
		return fmt.Errorf("what-if explorer: the groups have %d and %d trials but the sliders stop at %d: %w; raise MaxTrials",
			c.N1, c.N2, top, proportions.ErrTooLarge)
	}
	return nil
}

func (e WhatIfExplorer) maxTrials() int {
	if e.SliderMaxTrials != 0 {
		return e.SliderMaxTrials
	}
	c := e.Comparison.Counts()
	return int(max(20, 2*max(c.N1, c.N2)))
}

// Run shows the explorer (see the package's explorer modes: live in a
// notebook with a front end, a static card of the starting counts under
// nbconvert or outside a notebook). In a live notebook it returns when the
// reader presses Done or after the idle timeout. The error reports bad
// starting settings or a failure to display.
func (e WhatIfExplorer) Run(opts ...LiveOption) error {
	if err := e.validate(); err != nil {
		return err
	}
	return run(whatIfModel{e: e, latest: &latestRun{}}, opts)
}

// Frame returns what the explorer shows for the given counts, as the live
// explorer would draw it (no notebook needed). The counts must fit the
// sliders' range.
func (e WhatIfExplorer) Frame(x1, n1, x2, n2 int) (Frame, error) {
	if err := e.validate(); err != nil {
		return Frame{}, err
	}
	top := e.maxTrials()
	for _, v := range []int{x1, n1, x2, n2} {
		if v < 0 || v > top {
			return Frame{}, fmt.Errorf("what-if explorer: count %d: %w; the sliders run from 0 to %d", v, proportions.ErrTooLarge, top)
		}
	}
	return frameOf(whatIfModel{e: e}, []int{x1, n1, x2, n2}), nil
}

type whatIfModel struct {
	e WhatIfExplorer
	// latest, in a live explorer, cancels the full analysis of counts the
	// reader has already moved away from, so slider moves never queue up
	// seconds of exact computation; nil in a static frame.
	latest *latestRun
}

// latestRun holds the cancel function of the newest full analysis.
type latestRun struct {
	mu     sync.Mutex
	cancel context.CancelFunc
}

// start cancels the previous analysis and returns the context of the next.
func (l *latestRun) start() context.Context {
	if l == nil {
		return context.Background()
	}
	l.mu.Lock()
	defer l.mu.Unlock()
	if l.cancel != nil {
		l.cancel()
	}
	ctx, cancel := context.WithCancel(context.Background())
	l.cancel = cancel
	return ctx
}

func (whatIfModel) name() string { return "what-if" }

func (m whatIfModel) title() string {
	c := m.e.Comparison
	return fmt.Sprintf("What if the counts were different? %s: %s vs %s", capitalize(c.Event), c.First.Label, c.Second.Label)
}

func (m whatIfModel) controls() []control {
	c := m.e.Comparison
	top := m.e.maxTrials()
	units := func(p int) string { return strconv.Itoa(p) }
	return []control{
		{key: "x1", label: c.First.Label + ": " + c.Event, min: 0, max: top, value: int(c.First.Events), show: units},
		{key: "n1", label: c.First.Label + ": trials", min: 1, max: top, value: int(c.First.Trials), show: units},
		{key: "x2", label: c.Second.Label + ": " + c.Event, min: 0, max: top, value: int(c.Second.Events), show: units},
		{key: "n2", label: c.Second.Label + ": trials", min: 1, max: top, value: int(c.Second.Trials), show: units},
	}
}

// render analyses the counts at the positions and shows the result card;
// counts that do not make a comparison (more events than trials) get a
// message saying which group and what to move.
func (m whatIfModel) render(pos []int) Displayable {
	cmp, bad := m.comparison(pos)
	if bad != nil {
		return bad
	}
	return m.card(context.Background(), cmp, m.fullOptions())
}

// renderWithin shows the full analysis when it is ready within the budget;
// otherwise (the exact tests and intervals take up to a second at a few
// hundred units) first the card without the exact methods, which takes
// microseconds, then the full card.
func (m whatIfModel) renderWithin(pos []int, budget time.Duration) (Displayable, func() Displayable) {
	cmp, bad := m.comparison(pos)
	if bad != nil {
		return bad, nil
	}
	ctx := m.latest.start()
	full := make(chan Displayable, 1)
	go func() { full <- m.card(ctx, cmp, m.fullOptions()) }()
	select {
	case v := <-full:
		return v, nil
	case <-time.After(budget):
	}
	quick := m.card(context.Background(), cmp, append(append([]proportions.Option(nil), m.e.Analysis...), proportions.WithScope(proportions.ScopeQuick)))
	var once sync.Once
	var v Displayable
	rest := func() Displayable {
		once.Do(func() { v = <-full })
		return v
	}
	note := message{kind: "what-if", text: "Computing the exact tests and intervals for these counts; the card shows the others until they are ready."}
	return views{note, quick}, rest
}

// fullOptions are the analysis options of the full card: every method
// (the exact tests and intervals matter most for the small, sparse tables
// a what-if reaches), unless the explorer's own options say otherwise.
func (m whatIfModel) fullOptions() []proportions.Option {
	return append([]proportions.Option{proportions.WithScope(proportions.ScopeAll)}, m.e.Analysis...)
}

// comparison builds the comparison at the positions, or the message
// saying why there is none.
func (m whatIfModel) comparison(pos []int) (proportions.Comparison, Displayable) {
	c := m.e.Comparison
	labels := proportions.Labels{First: c.First.Label, Second: c.Second.Label, Event: c.Event}
	for g, which := range [2]string{c.First.Label, c.Second.Label} {
		if x, n := pos[2*g], pos[2*g+1]; x > n {
			return proportions.Comparison{}, message{kind: "what-if", text: fmt.Sprintf(
				"%s: %d %s out of %d trials is not possible: events cannot exceed trials. Lower the events or raise the trials.",
				which, x, c.Event, n)}
		}
	}
	cmp, err := proportions.NewComparison(int64(pos[0]), int64(pos[1]), int64(pos[2]), int64(pos[3]), labels)
	if err != nil {
		return proportions.Comparison{}, message{kind: "what-if", text: "These counts cannot be analysed: " + err.Error()}
	}
	return cmp, nil
}

// card analyses the comparison and shows its result card; an analysis
// cancelled because the reader moved on says so.
func (m whatIfModel) card(ctx context.Context, cmp proportions.Comparison, opts []proportions.Option) Displayable {
	a, err := proportions.AnalyzeContext(ctx, cmp, opts...)
	if ctx.Err() != nil {
		return message{kind: "what-if", text: "These counts were left before their exact methods finished; the card for the newest counts follows."}
	}
	if err != nil {
		return message{kind: "what-if", text: "These counts cannot be analysed: " + err.Error()}
	}
	return NewResultCard(a)
}
