package notebookui

import (
	"fmt"
	"html"
	"os"
	"strings"
	"time"

	"github.com/janpfeifer/gonb/gonbui"
	"github.com/janpfeifer/gonb/gonbui/comms"
	"github.com/janpfeifer/gonb/gonbui/widgets"
)

// LiveOption tunes a live explorer.
type LiveOption func(*liveSettings)

type liveSettings struct {
	idle  time.Duration
	setup time.Duration
}

// Default time limits of a live explorer.
const (
	// DefaultIdleTimeout is how long a live explorer waits for the next
	// change before it stops by itself and keeps its last state.
	DefaultIdleTimeout = 15 * time.Minute
	// DefaultSetupTimeout is how long it waits for the front end to
	// answer for each control it creates.
	DefaultSetupTimeout = 30 * time.Second
)

// WithIdleTimeout stops the explorer after d without any change (default
// DefaultIdleTimeout). While an explorer runs, its cell is busy and the
// kernel runs no other cell; the timeout frees it if the reader walks away.
func WithIdleTimeout(d time.Duration) LiveOption {
	return func(s *liveSettings) {
		if d > 0 {
			s.idle = d
		}
	}
}

// WithSetupTimeout sets how long to wait for the front end to answer for
// each control created (default DefaultSetupTimeout); without an answer
// the explorer shows its static view and returns.
func WithSetupTimeout(d time.Duration) LiveOption {
	return func(s *liveSettings) {
		if d > 0 {
			s.setup = d
		}
	}
}

func newLiveSettings(opts []LiveOption) liveSettings {
	s := liveSettings{idle: DefaultIdleTimeout, setup: DefaultSetupTimeout}
	for _, o := range opts {
		if o != nil {
			o(&s)
		}
	}
	return s
}

// run shows an explorer in the mode its surroundings allow:
//   - outside a notebook, the text of the static frame on standard output;
//   - in a notebook with no front end attached (nbconvert), the static
//     frame, returning at once;
//   - in a live notebook, the controls and the view, redrawn on every
//     change until the reader presses Done or the idle timeout passes;
//     then the final frame is displayed so that the saved notebook keeps it.
func run(m model, opts []LiveOption) error {
	switch {
	case !InKernel():
		return DisplayTo(os.Stdout, staticFrame(m))
	case !frontEndAttached():
		return Display(staticFrame(m))
	}
	return live(m, newLiveSettings(opts))
}

// widgetSet is the live controls of one explorer.
type widgetSet struct {
	changes []*comms.AddressChan[int]
	done    *comms.AddressChan[int]
}

// change is a control that moved to a new position.
type change struct{ control, pos int }

func live(m model, s liveSettings) error {
	cs := m.controls()
	pos := startPositions(m)
	root := "propscope-" + m.name() + "-" + gonbui.UniqueId()
	controlsOut, viewOut := root+"-controls", root+"-view"
	gonbui.UpdateHTML(controlsOut, controlsHTML(root, m.name(), cs))

	// Creating a widget waits for the front end's first message; a front
	// end that never answers must not hang the cell. Each widget that
	// answers restarts the wait, so a slow but working front end (a busy
	// machine) is not mistaken for a missing one.
	ready := make(chan widgetSet, 1)
	progress := make(chan struct{}, len(cs)+1)
	go func() { ready <- buildWidgets(root, cs, pos, progress) }()
	var w widgetSet
	wait := time.NewTimer(s.setup)
	defer wait.Stop()
setup:
	for {
		select {
		case w = <-ready:
			break setup
		case <-progress:
			wait.Reset(s.setup)
		case <-wait.C:
			gonbui.UpdateHTML(controlsOut, "")
			f := staticFrame(m)
			f.Note = fmt.Sprintf("The notebook front end did not answer within %s, so the controls could not be set up: "+
				"this is a static view of the starting settings. Run the cell again to retry.", s.setup)
			return Display(f)
		}
	}

	changes := make(chan change, 64)
	for i, ch := range w.changes {
		go func() {
			for v := range ch.C {
				changes <- change{i, v}
			}
		}()
	}
	f := frameOf(m, pos)
	gonbui.UpdateHTML(viewOut, f.HTML())
	idle := time.NewTimer(s.idle)
	defer idle.Stop()
	seq := 0
	stopped := finalNote
	// A partial frame's completion arrives here; one for an earlier
	// change than the latest is dropped.
	type completed struct {
		seq int
		f   Frame
	}
	completions := make(chan completed, 16)
	var complete func() Frame // completes the frame on show, if partial
	var arrived time.Time
loop:
	for {
		select {
		case done := <-completions:
			if done.seq == seq {
				f, complete = done.f, nil
				f.Sequence, f.arrived = seq, arrived
				gonbui.UpdateHTML(viewOut, f.HTML())
			}
		case c := <-changes:
			arrived = time.Now()
			pos[c.control] = cs[c.control].clamp(c.pos)
			// A slider sends a stream of positions while it is dragged:
			// take every pending one and draw only the last state.
			for drained := false; !drained; {
				select {
				case c := <-changes:
					pos[c.control] = cs[c.control].clamp(c.pos)
				default:
					drained = true
				}
			}
			seq++
			f, complete = frameWithin(m, pos, quickBudget)
			f.Sequence, f.arrived = seq, arrived
			gonbui.UpdateHTML(viewOut, f.HTML())
			if complete != nil {
				go func(seq int, complete func() Frame) { completions <- completed{seq, complete()} }(seq, complete)
			}
			idle.Reset(s.idle)
		case <-w.done.C:
			break loop
		case <-idle.C:
			stopped = fmt.Sprintf("The explorer stopped after %s without a change; these are its last settings (run the cell again to explore further).", s.idle)
			break loop
		}
	}
	for _, ch := range w.changes {
		ch.Close()
	}
	w.done.Close()
	if complete != nil { // the saved notebook keeps a complete frame
		f = complete()
	}
	gonbui.UpdateHTML(controlsOut, "")
	gonbui.UpdateHTML(viewOut, "")
	f.Note, f.Sequence, f.arrived = stopped, seq, time.Time{}
	return Display(f)
}

// buildWidgets creates the controls in their cells of the controls table
// and a Done button, one after the other (GoNB runs each widget's script
// through one shared transient output, so they are not created
// concurrently), and signals progress after each; it returns once the
// front end has answered for all of them.
func buildWidgets(root string, cs []control, pos []int, progress chan<- struct{}) widgetSet {
	var w widgetSet
	for i, c := range cs {
		cell, id := root+"-cell-"+c.key, root+"-"+c.key
		if c.isChoice() {
			opts := make([]string, len(c.options))
			for k, o := range c.options {
				opts[k] = html.EscapeString(o)
			}
			sel := widgets.Select(opts).WithHtmlId(id).SetDefault(pos[i]).AppendTo(cell).Done()
			w.changes = append(w.changes, sel.Listen().LatestOnly())
		} else {
			sl := widgets.Slider(c.min, c.max, pos[i]).WithHtmlId(id).AppendTo(cell).Done()
			w.changes = append(w.changes, sl.Listen().LatestOnly())
		}
		progress <- struct{}{}
	}
	done := widgets.Button("Done").WithHtmlId(root + "-done").AppendTo(root + "-cell-done").Done()
	w.done = done.Listen()
	return w
}

// controlsHTML lays out the controls: a label and an empty cell per
// control (the widget is appended into it), and a cell for Done.
func controlsHTML(root, name string, cs []control) string {
	var b strings.Builder
	fmt.Fprintf(&b, `<div id="%s" class="propscope-controls" data-explorer="%s" style="display:grid;grid-template-columns:max-content minmax(12rem,24rem);gap:.3rem .8rem;align-items:center;margin:.4rem 0;font-size:.92em;">`,
		root, html.EscapeString(name))
	for _, c := range cs {
		hint := ""
		if !c.isChoice() {
			hint = fmt.Sprintf(` <span style="opacity:.65;font-size:.85em;">(%s to %s)</span>`, html.EscapeString(c.shown(c.min)), html.EscapeString(c.shown(c.max)))
		}
		fmt.Fprintf(&b, `<label for="%s-%s">%s%s</label><div id="%s-cell-%s" data-control="%s"></div>`,
			root, c.key, html.EscapeString(c.label), hint, root, c.key, c.key)
	}
	fmt.Fprintf(&b, `<span></span><div id="%s-cell-done" data-control="done"></div>`, root)
	b.WriteString(`</div>`)
	return b.String()
}
