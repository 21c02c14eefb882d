package notebookui

import (
	"encoding/json"
	"fmt"
	"html"
	"os"
	"strconv"
	"strings"
	"time"
)

// The explorers ([IntervalExplorer], [PlanningExplorer], [WhatIfExplorer])
// share one model: a few controls, each an integer position (a slider) or
// a choice among labels (a drop-down), and a pure function from the
// positions to what is shown. The live loop in explorer_live.go moves the
// positions; everything in this file works without a notebook, so the
// views and their numbers are testable as plain Go.

// control is one input of an explorer.
type control struct {
	// key names the control in element ids and in the JSON state.
	key string
	// label is what the reader sees beside the control.
	label string
	// min, max and value are slider positions; for a choice, value is the
	// index into options and min, max are ignored.
	min, max, value int
	// options, when not nil, makes the control a drop-down.
	options []string
	// show prints the setting a position stands for ("40 units", "95%").
	show func(pos int) string
}

func (c control) isChoice() bool { return c.options != nil }

// shown is the value a position stands for, as the reader sees it.
func (c control) shown(pos int) string {
	if c.isChoice() {
		if pos >= 0 && pos < len(c.options) {
			return c.options[pos]
		}
		return "?"
	}
	if c.show != nil {
		return c.show(pos)
	}
	return strconv.Itoa(pos)
}

// clamp keeps a position that came from the front end inside the control's
// range, so a stale or tampered message cannot index outside it.
func (c control) clamp(pos int) int {
	lo, hi := c.min, c.max
	if c.isChoice() {
		lo, hi = 0, len(c.options)-1
	}
	return min(max(pos, lo), hi)
}

// model is what an explorer supplies to the shared machinery.
type model interface {
	// name is the explorer's kind ("interval", "planning", "what-if").
	name() string
	// title heads the explorer's frame.
	title() string
	// controls lists the inputs with their starting positions.
	controls() []control
	// render computes and renders the view for the positions. It never
	// fails: bad combinations (no finite sample size, events above
	// trials) are shown as a message in place of the results.
	render(pos []int) Displayable
}

// startPositions returns each control's starting position.
func startPositions(m model) []int {
	cs := m.controls()
	pos := make([]int, len(cs))
	for i, c := range cs {
		pos[i] = c.clamp(c.value)
	}
	return pos
}

// Frame is one state of an explorer as shown to the reader: the settings
// of its controls, the view computed for them (charts, tables, a result
// card) and a note saying whether it is live, static or final. Explorers
// show a Frame in every mode; [Frame.HTML] marks it with data attributes
// (explorer kind, settings, redraw time) that tools and tests read.
type Frame struct {
	// Explorer is the explorer's kind: "interval", "planning" or "what-if".
	Explorer string
	// Title heads the frame.
	Title string
	// Settings are the controls' labels and values, in order.
	Settings []Setting
	// View is what the settings produce.
	View Displayable
	// Note says what the reader is looking at (a static view, the final
	// settings); empty while live.
	Note string
	// Redraw is how long computing and rendering the view took (0 when
	// not measured).
	Redraw time.Duration
	// Sequence counts the redraws of a live explorer (0 for the first).
	Sequence int
	// Partial marks a live frame that shows only the parts ready in time;
	// the complete frame follows with the same Sequence.
	Partial bool
	// arrived is when the change that led to this frame reached the
	// kernel (zero for the first frame); it goes into data-arrived-ms as
	// Unix milliseconds, so a browser test can split a redraw's delay into
	// the trip to the kernel, the work and the trip back.
	arrived time.Time
	// viewHTML caches View.HTML() (rendering is part of the timed work).
	viewHTML string
}

// Setting is one control's label, its position and the value shown.
type Setting struct {
	Key      string `json:"key"`
	Label    string `json:"label"`
	Position int    `json:"position"`
	Value    string `json:"value"`
}

// frameOf computes the view of m at the positions and wraps it in a Frame,
// timing the work.
func frameOf(m model, pos []int) Frame {
	start := time.Now()
	return newFrame(m, pos, m.render(pos), start)
}

// newFrame wraps a view computed since start.
func newFrame(m model, pos []int, v Displayable, start time.Time) Frame {
	cs := m.controls()
	settings := make([]Setting, len(cs))
	idle, _ := m.(interface{ unused(pos []int, i int) bool })
	for i, c := range cs {
		settings[i] = Setting{Key: c.key, Label: c.label, Position: pos[i], Value: c.shown(pos[i])}
		if idle != nil && idle.unused(pos, i) {
			settings[i].Value += " (not used)"
		}
	}
	f := Frame{Explorer: m.name(), Title: m.title(), Settings: settings, View: v}
	// Rendering the view's HTML is part of a redraw's cost.
	f.viewHTML = v.HTML()
	f.Redraw = time.Since(start)
	return f
}

// progressive is a model whose view can take longer than a redraw should
// (new exact tables after a change of n): renderWithin returns within
// about the budget what is ready, and, when that is not the whole view, a
// function that waits for the rest and returns the complete view (safe to
// call more than once).
type progressive interface {
	renderWithin(pos []int, budget time.Duration) (v Displayable, rest func() Displayable)
}

// quickBudget is how long a live redraw waits for slow parts before it
// shows what is ready.
const quickBudget = 150 * time.Millisecond

// frameWithin is frameOf for a live redraw: a progressive model's frame
// may be partial (Partial set), with a function that completes it.
func frameWithin(m model, pos []int, budget time.Duration) (Frame, func() Frame) {
	p, ok := m.(progressive)
	if !ok {
		return frameOf(m, pos), nil
	}
	start := time.Now()
	v, rest := p.renderWithin(pos, budget)
	f := newFrame(m, pos, v, start)
	if rest == nil {
		return f, nil
	}
	f.Partial = true
	at := append([]int(nil), pos...)
	return f, func() Frame { return newFrame(m, at, rest(), start) }
}

// Kind is "explorer".
func (f Frame) Kind() string { return "explorer" }

// needsChartEngine: a frame usually holds a chart.
func (f Frame) needsChartEngine() {}

// settingsText prints "n1 = 40 units · level 95%".
func (f Frame) settingsText(sep string) string {
	parts := make([]string, len(f.Settings))
	for i, s := range f.Settings {
		parts[i] = s.Label + ": " + s.Value
	}
	return strings.Join(parts, sep)
}

// HTML returns the frame as a fragment: a heading, the settings, the note,
// the view, and the redraw time. The outer element carries
// data-explorer, data-sequence, data-redraw-ms, data-settings (JSON of
// the keys and positions) and, on a live redraw, data-arrived-ms (and
// data-partial on a partial frame).
func (f Frame) HTML() string {
	state := map[string]int{}
	for _, s := range f.Settings {
		state[s.Key] = s.Position
	}
	js, _ := json.Marshal(state)
	arrived := ""
	if !f.arrived.IsZero() {
		arrived = fmt.Sprintf(` data-arrived-ms="%.1f"`, float64(f.arrived.UnixMicro())/1000)
	}
	if f.Partial {
		arrived += ` data-partial="true"`
	}
	var b strings.Builder
	fmt.Fprintf(&b, `<div class="propscope-explorer" data-explorer="%s" data-sequence="%d" data-redraw-ms="%.1f" data-settings="%s"%s style="max-width:860px;margin:.25rem 0;">`,
		html.EscapeString(f.Explorer), f.Sequence, msOf(f.Redraw), html.EscapeString(string(js)), arrived)
	fmt.Fprintf(&b, `<div style="font-weight:650;font-size:1.05em;margin:.2rem 0;">%s</div>`, html.EscapeString(f.Title))
	b.WriteString(`<div class="propscope-settings" style="font-size:.9em;opacity:.85;margin:.1rem 0 .4rem;">`)
	for i, s := range f.Settings {
		if i > 0 {
			b.WriteString(` · `)
		}
		fmt.Fprintf(&b, `<span data-setting="%s">%s: <strong>%s</strong></span>`,
			html.EscapeString(s.Key), html.EscapeString(s.Label), html.EscapeString(s.Value))
	}
	b.WriteString(`</div>`)
	if f.Note != "" {
		fmt.Fprintf(&b, `<div class="propscope-explorer-note" style="font-size:.85em;margin:.2rem 0 .5rem;padding:.3rem .6rem;border-left:3px solid rgba(128,128,128,.6);">%s</div>`, html.EscapeString(f.Note))
	}
	if f.viewHTML != "" {
		b.WriteString(f.viewHTML)
	} else {
		b.WriteString(f.View.HTML())
	}
	if f.Redraw > 0 {
		fmt.Fprintf(&b, `<div class="propscope-redraw" style="font-size:.75em;opacity:.6;margin-top:.2rem;">computed and drawn in %s</div>`, fmtDuration(f.Redraw))
	}
	b.WriteString(`</div>`)
	return b.String()
}

// Markdown returns the title, settings, note and the view's Markdown.
func (f Frame) Markdown() string {
	var b strings.Builder
	b.WriteString("### " + mdEscape(f.Title) + "\n\n")
	b.WriteString(mdEscape(f.settingsText(" · ")) + "\n\n")
	if f.Note != "" {
		b.WriteString("_" + mdEscape(f.Note) + "_\n\n")
	}
	b.WriteString(f.View.Markdown())
	return b.String()
}

// Text returns the title, settings, note and the view's text.
func (f Frame) Text() string {
	var b strings.Builder
	b.WriteString(f.Title + "\n")
	b.WriteString(f.settingsText("; ") + "\n")
	if f.Note != "" {
		b.WriteString(f.Note + "\n")
	}
	b.WriteString("\n" + f.View.Text())
	return b.String()
}

// String is [Frame.Text].
func (f Frame) String() string { return f.Text() }

// JSON returns {"kind": "explorer", "explorer": ..., "settings": [...],
// "note": ..., "redraw_ms": ..., "view": <the view's JSON>}.
func (f Frame) JSON() ([]byte, error) {
	view, err := f.View.JSON()
	if err != nil {
		return nil, err
	}
	return json.Marshal(struct {
		Kind     string          `json:"kind"`
		Explorer string          `json:"explorer"`
		Title    string          `json:"title"`
		Settings []Setting       `json:"settings"`
		Note     string          `json:"note,omitempty"`
		RedrawMS float64         `json:"redraw_ms"`
		View     json.RawMessage `json:"view"`
	}{"explorer", f.Explorer, f.Title, f.Settings, f.Note, msOf(f.Redraw), view})
}

func msOf(d time.Duration) float64 { return float64(d.Microseconds()) / 1000 }

func fmtDuration(d time.Duration) string {
	if d < 10*time.Millisecond {
		return strconv.FormatFloat(msOf(d), 'f', 1, 64) + " ms"
	}
	return strconv.FormatInt(d.Milliseconds(), 10) + " ms"
}

// Notes shown in the three modes.
const (
	staticNote = "Static view of the starting settings: no live notebook front end is attached " +
		"(the notebook is being run headless, for example by nbconvert). Open the notebook in Jupyter " +
		"and run this cell to move the controls."
	finalNote = "Final settings of the explorer (it has stopped; run the cell again to explore further)."
)

// frontEndAttached reports whether a Jupyter front end can talk to the
// cell: GoNB sets the kernel id only when it runs under a notebook server.
// Under nbconvert there is no kernel id, the widgets cannot be set up, and
// waiting for them would hang the cell until the executor's timeout.
func frontEndAttached() bool { return os.Getenv("GONB_JUPYTER_KERNEL_ID") != "" }

// StaticFrame returns the frame an explorer shows when no front end is
// attached: its starting settings, with a note saying how to get the live
// version. It is what Run displays under nbconvert, and it needs no notebook.
func staticFrame(m model) Frame {
	f := frameOf(m, startPositions(m))
	f.Note = staticNote
	return f
}

// message is a view that only says something (why a combination of
// settings has no result).
type message struct {
	kind, text string
}

func (m message) HTML() string {
	return `<div class="propscope-explorer-message" role="status" style="padding:.6rem .8rem;margin:.4rem 0;border-left:4px solid #c98a12;background:rgba(201,138,18,.1);">` +
		html.EscapeString(m.text) + `</div>`
}
func (m message) Markdown() string { return "> " + mdEscape(m.text) + "\n" }
func (m message) Text() string     { return m.text }
func (m message) Kind() string     { return m.kind }
func (m message) JSON() ([]byte, error) {
	return json.Marshal(map[string]string{"kind": m.kind, "message": m.text})
}

// views shows several displayables one after the other.
type views []Displayable

func (v views) HTML() string {
	var b strings.Builder
	for _, d := range v {
		b.WriteString(d.HTML())
	}
	return b.String()
}

func (v views) Markdown() string {
	parts := make([]string, len(v))
	for i, d := range v {
		parts[i] = d.Markdown()
	}
	return strings.Join(parts, "\n")
}

func (v views) Text() string {
	parts := make([]string, len(v))
	for i, d := range v {
		parts[i] = d.Text()
	}
	return strings.Join(parts, "\n")
}

func (v views) Kind() string { return "views" }

func (v views) JSON() ([]byte, error) {
	parts := make([]json.RawMessage, 0, len(v))
	for _, d := range v {
		b, err := d.JSON()
		if err != nil {
			return nil, err
		}
		parts = append(parts, b)
	}
	return json.Marshal(map[string]any{"kind": "views", "parts": parts})
}
