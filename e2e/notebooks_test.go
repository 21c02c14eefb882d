// Package e2e executes the example notebooks with the GoNB kernel and checks
// what they show in a real browser (headless Chromium via chromedp). It is
// its own module so that the library does not depend on chromedp.
//
// Every notebook in notebooks/ is executed and exported to HTML; a cell
// error fails the test. To check what a notebook shows, add functions to
// pageChecks (browser) or outputChecks (executed .ipynb) under the
// notebook's base name (see germination_test.go).
package e2e

import (
	"context"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/propscope/propscope/e2e/nbrun"
)

// pageChecks holds the browser assertions of each notebook, by base name.
// They run on the exported HTML after the generic checks.
var pageChecks = map[string]func(t *testing.T, ctx context.Context){}

// outputChecks holds assertions on each executed notebook's outputs (the
// .ipynb), by base name.
var outputChecks = map[string]func(t *testing.T, r nbrun.Result){}

func TestMain(m *testing.M) {
	if err := os.MkdirAll(outDir, 0o755); err != nil {
		panic(err)
	}
	code := m.Run()
	abs, _ := filepath.Abs(outDir)
	progress("screenshots, executed notebooks and their HTML reports are in %s (charts in %s)", abs, filepath.Join(abs, "charts"))
	os.Exit(code)
}

// testStart is when the browser tests started, for progress lines.
var testStart = time.Now()

// progress prints one line of progress to stderr, which go test passes on
// as it comes when run with no package argument (make notebook-test), with
// the time since PROPSCOPE_T0 (set by the Makefile when make started) or
// else since these tests started.
func progress(format string, args ...any) {
	since := testStart
	if t0, err := strconv.ParseInt(os.Getenv("PROPSCOPE_T0"), 10, 64); err == nil {
		since = time.Unix(t0, 0)
	}
	d := time.Since(since).Round(time.Second)
	fmt.Fprintf(os.Stderr, "make test [%02d:%02d] %s\n", int(d.Minutes()), int(d.Seconds())%60, fmt.Sprintf(format, args...))
}

func repoRoot(t *testing.T) string {
	t.Helper()
	root, err := nbrun.Root("..")
	if err != nil {
		t.Fatal(err)
	}
	if err := nbrun.CheckSetup(root); err != nil {
		t.Fatal(err)
	}
	return root
}

// TestNotebooks executes every example notebook, fails on any cell error,
// and opens the HTML export in Chromium.
func TestNotebooks(t *testing.T) {
	root := repoRoot(t)
	notebooks, err := nbrun.Notebooks(filepath.Join(root, "notebooks"))
	if err != nil {
		t.Fatal(err)
	}
	if len(notebooks) == 0 {
		t.Fatal("no notebooks in notebooks/")
	}
	for _, nb := range notebooks {
		name := strings.TrimSuffix(filepath.Base(nb), ".ipynb")
		t.Run(name, func(t *testing.T) {
			r := execute(t, root, nb)
			checkOutputs(t, r)
			if check := outputChecks[name]; check != nil {
				check(t, r)
			}
			ctx := browse(t)
			open(t, ctx, r.HTML)
			genericChecks(t, ctx)
			if check := pageChecks[name]; check != nil {
				check(t, ctx)
			}
			screenshot(t, ctx, name)
			checkContrast(t, ctx)
			// The same notebook in JupyterLab's dark theme.
			dark, _, err := nbrun.ExportHTML(context.Background(), root, r.Executed, name+"-dark", "--template", "lab", "--HTMLExporter.theme=dark")
			if err != nil {
				t.Fatal(err)
			}
			open(t, ctx, dark)
			checkContrast(t, ctx)
			if eval[int](t, ctx, `document.querySelectorAll('section[data-propscope="result-card"]').length`) > 0 {
				screenshotOf(t, ctx, name+"-card-dark", `section[data-propscope="result-card"]`)
			}
		})
	}
}

// execute runs a notebook into outDir and fails the test on cell errors.
func execute(t *testing.T, root, notebook string) nbrun.Result {
	t.Helper()
	name := filepath.Base(notebook)
	progress("executing %s ...", name)
	start := time.Now()
	defer func() { progress("%s: executed and exported in %s", name, time.Since(start).Round(time.Second)) }()
	r, err := nbrun.Run(context.Background(), root, notebook, outDir)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range r.CellErrors {
		t.Errorf("%s: %s", filepath.Base(notebook), e)
	}
	if t.Failed() {
		t.Logf("nbconvert said:\n%s", r.Log)
	}
	return r
}

// checkOutputs checks every propscope display output in the executed
// notebook: one output holding HTML, plain text and a JSON object (the
// Displayable contract in notebookui/display.go).
func checkOutputs(t *testing.T, r nbrun.Result) {
	t.Helper()
	outs, err := nbrun.Outputs(r.Executed)
	if err != nil {
		t.Fatal(err)
	}
	for _, o := range outs {
		for _, mime := range []string{"text/html", "text/plain", "application/json"} {
			if _, ok := o.Data[mime]; !ok {
				t.Errorf("cell %d: %s output lacks %s", o.Cell, o.Kind, mime)
			}
		}
		var obj map[string]any
		if err := json.Unmarshal(o.Data["application/json"], &obj); err != nil {
			t.Errorf("cell %d: %s output's application/json is not a JSON object: %v", o.Cell, o.Kind, err)
		}
	}
}

// checkContrast requires every propscope element's text colour to stand
// out from the background behind it by the WCAG 2 contrast ratio for body
// text, 4.5:1 (W3C Web Content Accessibility Guidelines 2.1, success
// criterion 1.4.3), with the relative luminance formula defined there.
func checkContrast(t *testing.T, ctx context.Context) {
	t.Helper()
	ratios := eval[[]float64](t, ctx, `(() => {
		const rgb = c => c.match(/[\d.]+/g).map(Number);
		const lin = v => { v /= 255; return v <= 0.03928 ? v / 12.92 : Math.pow((v + 0.055) / 1.055, 2.4); };
		const lum = c => { const [r, g, b] = rgb(c); return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b); };
		const background = el => {
			for (let e = el; e; e = e.parentElement) {
				const m = rgb(getComputedStyle(e).backgroundColor);
				if (m.length < 4 || m[3] > 0.5) return getComputedStyle(e).backgroundColor;
			}
			return "rgb(255, 255, 255)";
		};
		return [...document.querySelectorAll('[data-propscope]')].map(el => {
			const a = lum(getComputedStyle(el).color), b = lum(background(el));
			return (Math.max(a, b) + 0.05) / (Math.min(a, b) + 0.05);
		});
	})()`)
	for i, r := range ratios {
		if r < 4.5 {
			t.Errorf("propscope element %d: text contrast %.2f:1 is below 4.5:1", i, r)
		}
	}
}

// genericChecks apply to every exported notebook: no GoNB error report,
// and every result card drawn with its headline.
func genericChecks(t *testing.T, ctx context.Context) {
	t.Helper()
	if n := eval[int](t, ctx, `document.querySelectorAll('[class^="gonb-err"]').length`); n > 0 {
		t.Errorf("the page shows %d GoNB error elements", n)
	}
	empty := eval[int](t, ctx, `[...document.querySelectorAll('section[data-propscope="result-card"]')]
		.filter(c => !c.querySelector('[data-role="difference"]') || c.querySelector('[data-role="difference"]').innerText.trim() === "").length`)
	if empty > 0 {
		t.Errorf("%d result cards have no headline difference", empty)
	}
	// No "Loading [MathJax]" badge over the content of the report or its
	// screenshots (the exports leave MathJax out, see nbrun.ExportHTML).
	if badge := eval[bool](t, ctx, `(() => { const m = document.getElementById('MathJax_Message');
		return !!window.MathJax || (!!m && m.offsetParent !== null && m.innerText.trim() !== ""); })()`); badge {
		t.Error("the page loads MathJax or shows its loading badge")
	}
	// Code cells are read, not scrolled: no line of the setup cell (the
	// first code cell) runs off the right edge at the test's width.
	wide := eval[[]string](t, ctx, `[...document.querySelectorAll('.jp-InputArea-editor pre, .input_area pre, div.highlight pre')].slice(0, 1)
		.filter(p => p.scrollWidth > p.clientWidth + 1 || p.getBoundingClientRect().right > document.documentElement.clientWidth + 1)
		.map(p => p.innerText.split("\n").sort((a, b) => b.length - a.length)[0])`)
	if len(wide) > 0 {
		t.Errorf("the setup cell runs off the right edge: %q", wide)
	}
}

// wantOutputKinds returns an output check that the executed notebook
// displayed exactly the given number of outputs of each kind (the Kind of
// notebookui's displayables: "result-card", "chart", ...); kinds not named
// (the chart engine's one-off output) are not counted.
func wantOutputKinds(want map[string]int) func(t *testing.T, r nbrun.Result) {
	return func(t *testing.T, r nbrun.Result) {
		outs, err := nbrun.Outputs(r.Executed)
		if err != nil {
			t.Fatal(err)
		}
		got := map[string]int{}
		for _, o := range outs {
			got[o.Kind]++
		}
		for kind, n := range want {
			if got[kind] != n {
				t.Errorf("want %d %s output(s), got %v", n, kind, got)
			}
		}
	}
}
