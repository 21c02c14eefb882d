package e2e

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"net/http"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
	"github.com/propscope/propscope/e2e/nbrun"
	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/operating"
	"github.com/propscope/propscope/proportions/planning"
)

// The explorers notebook (notebooks/explorers.ipynb) holds three live
// explorers: a study plan, the exact coverage of the interval methods at
// 150 clips per line, and a what-if result card for a pilot of 9 of 150
// against 4 of 150 defective clips. Run headless (TestNotebooks) each shows
// a static view of its starting settings; TestLiveExplorers runs it in a
// real Notebook server and moves the sliders.

func init() {
	pageChecks["explorers"] = checkExplorersStatic
	outputChecks["explorers"] = func(t *testing.T, r nbrun.Result) {
		outs, err := nbrun.Outputs(r.Executed)
		if err != nil {
			t.Fatal(err)
		}
		var explorers int
		for _, o := range outs {
			if o.Kind == "explorer" {
				explorers++
			}
		}
		if explorers != 3 {
			t.Errorf("want three explorer outputs (plan, intervals, what-if), got %d: %+v", explorers, outs)
		}
	}
}

// checkExplorersStatic: under nbconvert each explorer showed its starting
// state, said so, and drew its chart.
func checkExplorersStatic(t *testing.T, ctx context.Context) {
	for _, kind := range []string{"planning", "interval", "what-if"} {
		note := eval[string](t, ctx, fmt.Sprintf(`(() => { const f = document.querySelector('.propscope-explorer[data-explorer=%q] .propscope-explorer-note'); return f ? f.innerText : ""; })()`, kind))
		if !strings.Contains(note, "Static view of the starting settings") {
			t.Errorf("%s explorer: want the static note, got %q", kind, note)
		}
	}
	if n := planN1(t, ctx); n != int(startPlan(t).N1) {
		t.Errorf("static plan shows n1 = %d, want %d", n, startPlan(t).N1)
	}
	waitFor(t, ctx, "the static charts to draw", `document.querySelectorAll('.propscope-explorer [data-propscope-drawn="true"]').length >= 2`)
}

// startPlan is the notebook's plan, computed here with the planning engine.
func startPlan(t *testing.T) planning.SampleSizeResult {
	t.Helper()
	return planFor(t, 0.04, 0.04)
}

func planFor(t *testing.T, rate1, rate2 float64) planning.SampleSizeResult {
	t.Helper()
	d := planning.NewPlan(planning.NonInferiority, rate1, rate2)
	d.Better, d.Margin = proportions.LowerIsBetter, 0.02
	r, err := planning.SampleSize(d)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func planN1(t *testing.T, ctx context.Context) int {
	t.Helper()
	s := eval[string](t, ctx, `(() => { const p = document.querySelector('.propscope-explorer[data-explorer="planning"] .propscope-plan'); return p ? p.dataset.n1 : ""; })()`)
	n, err := strconv.Atoi(s)
	if err != nil {
		t.Fatalf("the plan shows no n1 (%q)", s)
	}
	return n
}

// liveBrowser is browse with room for the whole live run: the kernel
// compiles each explorer cell before it runs (seconds each, longer on a
// busy machine). The deadline only stops a hung run.
func liveBrowser(t *testing.T) context.Context {
	t.Helper()
	return browseFor(t, 12*time.Minute)
}

// liveCopy copies the explorers notebook into a fresh folder under
// notebooks/ (so the notebook's setup cell finds the repository), which the
// test removes (gitignored; Jupyter refuses hidden folders); the live run
// saves there, never over the example.
func liveCopy(t *testing.T, root string) (dir, rel string) {
	t.Helper()
	dir, err := os.MkdirTemp(filepath.Join(root, "notebooks"), "live-")
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { os.RemoveAll(dir) })
	src, err := os.ReadFile(filepath.Join(root, "notebooks", "explorers.ipynb"))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "explorers.ipynb"), src, 0o644); err != nil {
		t.Fatal(err)
	}
	return dir, "notebooks/" + filepath.Base(dir) + "/explorers.ipynb"
}

// explorer is one live explorer on the page, found by its kind.
type explorer struct {
	t    *testing.T
	ctx  context.Context
	kind string
}

func (e explorer) controls() string {
	return fmt.Sprintf(`document.querySelector('.propscope-controls[data-explorer=%q]')`, e.kind)
}

func (e explorer) frame() string {
	return fmt.Sprintf(`document.querySelector('.propscope-explorer[data-explorer=%q]')`, e.kind)
}

// runAllCells waits for the page's kernel and runs every cell, with
// autosave off so the file on disk is only written when the test saves it.
func runAllCells(t *testing.T, ctx context.Context) {
	t.Helper()
	waitFor(t, ctx, "the kernel to connect", `window.Jupyter && Jupyter.notebook && Jupyter.notebook.kernel && Jupyter.notebook.kernel.is_connected()`)
	eval[bool](t, ctx, `Jupyter.notebook.set_autosave_interval(0); Jupyter.notebook.execute_all_cells(); true`)
}

// restartKernel restarts the page's kernel through the server's REST API,
// which answers once the new kernel is up; cells still running stop.
func restartKernel(t *testing.T, ctx context.Context, s jupyterServer) {
	t.Helper()
	id := eval[string](t, ctx, `Jupyter.notebook.kernel.id`)
	resp, err := http.Post(s.URL+"/api/kernels/"+id+"/restart?token="+s.Token, "application/json", nil)
	if err != nil {
		t.Fatalf("restarting the kernel: %v", err)
	}
	resp.Body.Close()
	if resp.StatusCode != http.StatusOK {
		t.Fatalf("restarting the kernel: %s", resp.Status)
	}
}

// waitLiveOrStatic waits until the explorer is live (true) or has fallen
// back to its static view because the page did not answer (false).
func (e explorer) waitLiveOrStatic() bool {
	e.t.Helper()
	js := fmt.Sprintf(`(() => { const c = %s, f = %s;
		if (c && c.querySelector('[data-control="done"] button') && f && f.dataset.sequence === "0") return "live";
		if (f && !c && f.textContent.includes("did not answer")) return "static";
		return ""; })()`, e.controls(), e.frame())
	got, err := chromedp.Run(e.ctx, chromedp.Poll[string](js, chromedp.WithPollingTimeout(3*time.Minute)))
	if err != nil {
		e.t.Fatalf("waiting for the %s explorer's controls or its static view: %v", e.kind, err)
	}
	return got == "live"
}

// waitLive waits until the explorer's controls are answered and its first
// frame is drawn.
func (e explorer) waitLive() {
	e.t.Helper()
	waitFor(e.t, e.ctx, e.kind+" explorer's controls and first frame",
		fmt.Sprintf(`(() => { const c = %s, f = %s; return !!(c && c.querySelector('[data-control="done"] button') && f && f.dataset.sequence === "0"); })()`, e.controls(), e.frame()))
}

// move sets a slider (or a drop-down) the way a reader's drag ends (GoNB's slider sends its
// value on "change"), waits for the redrawn complete frame (a partial one
// may come first) and returns the time from the event to that frame in the
// page, in milliseconds.
func (e explorer) move(control string, value int) float64 {
	e.t.Helper()
	seq := eval[string](e.t, e.ctx, e.frame()+`.dataset.sequence`)
	eval[bool](e.t, e.ctx, fmt.Sprintf(`(() => { const s = %s.querySelector('[data-control=%q] :is(input, select)');
		window.propscopeMoved = Date.now(); window.propscopeFirst = 0; window.propscopeRedrawn = 0;
		s.value = %d; s.dispatchEvent(new Event("change")); return true; })()`, e.controls(), control, value))
	waitFor(e.t, e.ctx, fmt.Sprintf("%s explorer to redraw after %s = %d", e.kind, control, value),
		fmt.Sprintf(`(() => { const f = %s; if (!f || f.dataset.sequence === %q) return false;
			if (!window.propscopeFirst) window.propscopeFirst = Date.now();
			if (f.dataset.partial) return false;
			const st = JSON.parse(f.dataset.settings); if (st[%q] !== %d) return false;
			if (!window.propscopeRedrawn) window.propscopeRedrawn = Date.now(); return true; })()`, e.frame(), seq, control, value))
	return eval[float64](e.t, e.ctx, `window.propscopeRedrawn - window.propscopeMoved`)
}

// done presses Done and waits for the final frame.
func (e explorer) done() {
	e.t.Helper()
	eval[bool](e.t, e.ctx, e.controls()+`.querySelector('[data-control="done"] button').click(); true`)
	waitFor(e.t, e.ctx, e.kind+" explorer's final frame",
		fmt.Sprintf(`(() => { const f = %s, n = f && f.querySelector('.propscope-explorer-note'); return !%s && !!n && n.innerText.startsWith("Final settings"); })()`, e.frame(), e.controls()))
}

func (e explorer) shot(name string) {
	e.t.Helper()
	// The controls sit just above the frame: show both.
	eval[bool](e.t, e.ctx, `(`+e.controls()+` || `+e.frame()+`).scrollIntoView(); true`)
	// Classic Notebook scrolls inside #site: take the visible page.
	png, err := chromedp.Run(e.ctx, chromedp.CaptureScreenshot())
	if err != nil {
		e.t.Fatalf("screenshot %s: %v", name, err)
	}
	path := filepath.Join(outDir, name+".png")
	if err := os.WriteFile(path, png, 0o644); err != nil {
		e.t.Fatal(err)
	}
	abs, _ := filepath.Abs(path)
	e.t.Logf("screenshot: %s", abs)
}

// checkCoverage compares the interval explorer's table with the exact
// engine's coverage at (π1, π2), computed here for every difference method.
func (e explorer) checkCoverage(n1, n2 int, pi1, pi2 float64) {
	e.t.Helper()
	d, err := operating.NewDesign(n1, n2, 0.95)
	if err != nil {
		e.t.Fatal(err)
	}
	rows := eval[map[string]string](e.t, e.ctx, `Object.fromEntries([...`+e.frame()+`.querySelectorAll('tr[data-method]')].map(r => [r.dataset.method, r.dataset.coverage]))`)
	methods := proportions.EnumerableIntervalMethods(proportions.Difference)
	if len(rows) != len(methods) {
		e.t.Errorf("want a row per difference method (%d), got %v", len(methods), rows)
	}
	for _, m := range methods {
		p, err := operating.Coverage(m, d, pi1, pi2)
		if err != nil {
			e.t.Fatal(err)
		}
		got, err := strconv.ParseFloat(rows[m.Key], 64)
		if err != nil || math.Abs(got-p.Coverage) > 1e-9 {
			e.t.Errorf("%s, n1 = %d, n2 = %d: coverage at (%v, %v) shown %q, the exact engine says %.12f", m.Name, n1, n2, pi1, pi2, rows[m.Key], p.Coverage)
		}
	}
}

// canvasInk counts the drawn (neither blank nor white) pixels of the
// explorer's charts.
func (e explorer) canvasInk() int {
	return eval[int](e.t, e.ctx, e.frame()+`.querySelectorAll('canvas').length === 0 ? 0 : [...`+e.frame()+`.querySelectorAll('canvas')].reduce((n, c) => {
		const d = c.getContext("2d").getImageData(0, 0, c.width, c.height).data; let k = 0;
		for (let i = 0; i < d.length; i += 4) { if (d[i+3] > 0 && !(d[i] > 245 && d[i+1] > 245 && d[i+2] > 245)) k++; }
		return n + k; }, 0)`)
}

// TestLiveExplorers opens the explorers notebook in a Notebook server on
// 127.0.0.1, runs it, moves one slider of each explorer and checks the
// redrawn numbers against the engines (called here, in the test), presses
// Done on each, saves and checks the saved file. Redraw times (in the page
// and as the kernel measured them) are logged.
func TestLiveExplorers(t *testing.T) {
	root := repoRoot(t)
	dir, rel := liveCopy(t, root)
	s := serveNotebooks(t, root)
	ctx := liveBrowser(t)
	t.Cleanup(func() {
		if t.Failed() { // show what the page looked like
			if png, err := chromedp.Run(ctx, chromedp.CaptureScreenshot()); err == nil {
				_ = os.WriteFile(filepath.Join(outDir, "explorers-live-failed.png"), png, 0o644)
			}
		}
	})
	if err := chromedp.Do(ctx, chromedp.Navigate(s.URL+"/notebooks/"+rel+"?token="+s.Token)); err != nil {
		t.Fatal(err)
	}
	runAllCells(t, ctx)

	// 1. The plan: move π1 from 4% to 3.5% (slider steps of 0.1 point).
	plan := explorer{t, ctx, "planning"}
	if !plan.waitLiveOrStatic() {
		// The first widgets of a fresh kernel now and then get no answer
		// from the page (GoNB's widget channel is set up by the page as the
		// first widget arrives); the explorer then shows its static view, as
		// a reader would see it, and says to run the cell again. Do what the
		// reader would: restart the kernel and run the notebook again, once.
		t.Log("the planning explorer fell back to its static view (no answer from the page); restarting the kernel and running the notebook again")
		restartKernel(t, ctx, s)
		if err := chromedp.Do(ctx, chromedp.Navigate(s.URL+"/notebooks/"+rel+"?token="+s.Token)); err != nil {
			t.Fatal(err)
		}
		runAllCells(t, ctx)
		plan.waitLive()
	}
	if n := planN1(t, ctx); n != int(startPlan(t).N1) {
		t.Errorf("plan at the start: n1 = %d, the planning engine says %d", n, startPlan(t).N1)
	}
	ms := plan.move("rate1", 35)
	want := planFor(t, 0.035, 0.04)
	if n := planN1(t, ctx); n != int(want.N1) {
		t.Errorf("plan at π1 = 3.5%%: n1 = %d, the planning engine says %d", n, want.N1)
	}
	if ink := plan.canvasInk(); ink < 1000 {
		t.Errorf("the power curve is not drawn (%d pixels)", ink)
	}
	logRedraw(t, plan, ms)
	plan.shot("explorer-planning-live")
	plan.done()

	// 2. The intervals: move π1 from 4% to 8% with π2 held at 4%.
	iv := explorer{t, ctx, "interval"}
	iv.waitLive()
	ms = iv.move("pi1", 8)
	iv.checkCoverage(150, 150, 0.08, 0.04)
	if sub := eval[string](t, ctx, iv.frame()+`.innerText`); !strings.Contains(sub, "your point: π1 = 8%") && !strings.Contains(sub, "coverage at π1 = 8%, π2 = 4%") {
		t.Errorf("the interval explorer does not show the new point:\n%s", sub)
	}
	if ink := iv.canvasInk(); ink < 1000 {
		t.Errorf("the coverage chart is not drawn (%d pixels)", ink)
	}
	logRedraw(t, iv, ms)
	// A new group size needs new tables: the score methods' may come a
	// moment after the others.
	ms = iv.move("n1", 120)
	iv.checkCoverage(120, 150, 0.08, 0.04)
	logRedraw(t, iv, ms)
	// Hold the difference (0 points) instead of π2: the point becomes
	// (8%, 8%) on the line π1 = π2.
	iv.move("hold", 1)
	iv.checkCoverage(120, 150, 0.08, 0.08)
	iv.shot("explorer-interval-live")
	iv.done()

	// 3. What if line A had 12 defective clips of 150 instead of 9?
	wi := explorer{t, ctx, "what-if"}
	wi.waitLive()
	ms = wi.move("x1", 12)
	c, err := proportions.NewComparison(12, 150, 4, 150, proportions.Labels{First: "line A", Second: "line B", Event: "defective"})
	if err != nil {
		t.Fatal(err)
	}
	a, err := proportions.Analyze(c)
	if err != nil {
		t.Fatal(err)
	}
	card := eval[string](t, ctx, wi.frame()+`.querySelector('section[data-propscope="result-card"]').innerText`)
	// 12/150 = 8.0% and 4/150 = 2.7%, a difference of +5.3 points
	// (arithmetic); the interval limits are the analysis engine's.
	wantText(t, "the what-if card", card, "8.0%", "2.7%", "+5.3", signedPoints(a.Interval.Lower)+" to "+signedPoints(a.Interval.Upper))
	logRedraw(t, wi, ms)
	wi.shot("explorer-whatif-live")
	wi.done()

	waitFor(t, ctx, "every cell to finish", `Jupyter.notebook.get_cells().every(c => c.cell_type !== "code" || (c.input_prompt_number !== "*" && c.input_prompt_number !== undefined && c.input_prompt_number !== null))`)
	if n := eval[int](t, ctx, `document.querySelectorAll('.output_error, [class^="gonb-err"]').length`); n > 0 {
		t.Errorf("the live notebook shows %d error outputs", n)
	}
	eval[bool](t, ctx, `Jupyter.notebook.save_notebook(); true`)
	waitFor(t, ctx, "the notebook to be saved", `Jupyter.notebook.dirty === false`)
	checkSaved(t, filepath.Join(dir, "explorers.ipynb"))
}

// checkSaved reads the saved notebook: each explorer's final frame is
// there, with the settings the test left.
func checkSaved(t *testing.T, path string) {
	t.Helper()
	var nb struct {
		Cells []struct {
			Outputs []struct {
				Data map[string]json.RawMessage `json:"data"`
			} `json:"outputs"`
		} `json:"cells"`
	}
	deadline := time.Now().Add(30 * time.Second)
	for {
		raw, err := os.ReadFile(path)
		if err == nil && json.Unmarshal(raw, &nb) == nil && strings.Count(string(raw), "Final settings of the explorer") >= 3 {
			break
		}
		if time.Now().After(deadline) {
			t.Fatalf("the saved notebook %s lacks the three final frames", path)
		}
		time.Sleep(200 * time.Millisecond)
	}
	finals := map[string]map[string]any{}
	for _, c := range nb.Cells {
		for _, o := range c.Outputs {
			var f struct {
				Kind     string `json:"kind"`
				Explorer string `json:"explorer"`
				Settings []struct {
					Key      string `json:"key"`
					Position int    `json:"position"`
				} `json:"settings"`
			}
			if json.Unmarshal(o.Data["application/json"], &f) != nil || f.Kind != "explorer" {
				continue
			}
			pos := map[string]any{}
			for _, s := range f.Settings {
				pos[s.Key] = s.Position
			}
			finals[f.Explorer] = pos
		}
	}
	for kind, want := range map[string][2]any{"planning": {"rate1", 35}, "interval": {"n1", 120}, "what-if": {"x1", 12}} {
		if got := finals[kind][want[0].(string)]; got != want[1] {
			t.Errorf("saved %s explorer: %s = %v, want %v", kind, want[0], got, want[1])
		}
	}
}

// logRedraw reports how long a redraw took: in the page, from the slider's
// event to the new frame in the DOM, split (both clocks are this machine's)
// into the trip to the cell program, its computing and rendering, and the
// trip back through the kernel and the server into the page.
func logRedraw(t *testing.T, e explorer, pageMS float64) {
	t.Helper()
	parts := eval[[]float64](t, e.ctx, `[window.propscopeMoved, +`+e.frame()+`.dataset.arrivedMs, +`+e.frame()+`.dataset.redrawMs, window.propscopeFirst]`)
	toKernel := parts[1] - parts[0]
	first := ""
	if firstMS := parts[3] - parts[0]; firstMS < pageMS-1 {
		first = fmt.Sprintf(" (a partial frame, the methods ready first, after %.0f ms)", firstMS)
	}
	t.Logf("%s explorer redraw: %.0f ms from the slider event to the complete new frame in the page = %.0f ms to the cell program + %.1f ms computing and rendering + %.0f ms back into the page%s",
		e.kind, pageMS, toKernel, parts[2], pageMS-toKernel-parts[2], first)
}

// signedPoints prints a difference in percentage points as the card does
// ("+1.4", "−0.4").
func signedPoints(v float64) string {
	s := strconv.FormatFloat(math.Abs(100*v), 'f', 1, 64)
	if v < 0 && s != "0.0" {
		return "−" + s
	}
	if v > 0 && s != "0.0" {
		return "+" + s
	}
	return s
}
