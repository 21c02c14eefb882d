package e2e

import (
	"context"
	"net/url"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
)

// chromium is Debian's browser, installed by scripts/setup-notebooks.sh.
const chromium = "/usr/bin/chromium"

// outDir holds what the browser tests leave for a person to look at:
// executed notebooks, their HTML exports and screenshots (gitignored).
const outDir = "out"

// browse starts a headless Chromium for one test and returns its context.
// The deadline only stops a hung browser; it is not a speed check.
func browse(t *testing.T) context.Context {
	t.Helper()
	return browseFor(t, 3*time.Minute)
}

// browseFor starts a headless Chromium for one test with the given
// deadline (a guard against a hung browser, not a speed check).
func browseFor(t *testing.T, deadline time.Duration) context.Context {
	t.Helper()
	if _, err := os.Stat(chromium); err != nil {
		t.Fatalf("%s not found: run scripts/setup-notebooks.sh (make setup)", chromium)
	}
	opts := append(chromedp.DefaultExecAllocatorOptions[:],
		chromedp.ExecPath(chromium),
		chromedp.NoSandbox,
		chromedp.DisableGPU,
		chromedp.UserDataDir(t.TempDir()),
		chromedp.Flag("disable-quic", true),
		chromedp.Flag("disable-dev-shm-usage", true),
		chromedp.WindowSize(1100, 1400),
	)
	alloc, cancelAlloc := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, cancelCtx := chromedp.NewContext(alloc)
	ctx, cancelTimeout := context.WithTimeout(ctx, deadline)
	t.Cleanup(func() { cancelTimeout(); cancelCtx(); cancelAlloc() })
	return ctx
}

// open loads a local file in the browser and waits for the page.
func open(t *testing.T, ctx context.Context, path string) {
	t.Helper()
	abs, err := filepath.Abs(path)
	if err != nil {
		t.Fatal(err)
	}
	u := url.URL{Scheme: "file", Path: abs}
	if err := chromedp.Do(ctx, chromedp.Navigate(u.String())); err != nil {
		t.Fatalf("opening %s: %v", path, err)
	}
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](`document.readyState === "complete"`)); err != nil {
		t.Fatalf("waiting for %s: %v", path, err)
	}
}

// eval runs a JavaScript expression in the page.
func eval[T any](t *testing.T, ctx context.Context, js string) T {
	t.Helper()
	v, err := chromedp.Run(ctx, chromedp.Evaluate[T](js))
	if err != nil {
		t.Fatalf("evaluating %s: %v", js, err)
	}
	return v
}

// screenshot writes a full-page PNG into outDir and logs its path.
func screenshot(t *testing.T, ctx context.Context, name string) {
	t.Helper()
	png, err := chromedp.Run(ctx, chromedp.FullScreenshot(100))
	if err != nil {
		t.Fatalf("screenshot %s: %v", name, err)
	}
	path := filepath.Join(outDir, name+".png")
	if err := os.WriteFile(path, png, 0o644); err != nil {
		t.Fatal(err)
	}
	abs, _ := filepath.Abs(path)
	t.Logf("screenshot: %s", abs)
}

// screenshotOf writes a PNG of the first element matching selector.
func screenshotOf(t *testing.T, ctx context.Context, name, selector string) {
	t.Helper()
	png, err := chromedp.Run(ctx, chromedp.Screenshot(chromedp.CSS(selector)))
	if err != nil {
		t.Fatalf("screenshot %s: %v", name, err)
	}
	path := filepath.Join(outDir, name+".png")
	if err := os.WriteFile(path, png, 0o644); err != nil {
		t.Fatal(err)
	}
	abs, _ := filepath.Abs(path)
	t.Logf("screenshot: %s", abs)
}

// setWidth resizes the page's viewport (a narrow phone-sized notebook, say).
func setWidth(t *testing.T, ctx context.Context, width int64) {
	t.Helper()
	if err := chromedp.Do(ctx, chromedp.EmulateViewport(width, 1400)); err != nil {
		t.Fatal(err)
	}
}

// cardText returns the visible text of the n-th result card on the page.
func cardText(t *testing.T, ctx context.Context, n int) string {
	t.Helper()
	return eval[string](t, ctx, `(() => { const c = document.querySelectorAll('section[data-propscope="result-card"]')[`+strconv.Itoa(n)+`]; return c ? c.innerText : ""; })()`)
}

// wantText fails for each wanted string missing from text.
func wantText(t *testing.T, what, text string, wants ...string) {
	t.Helper()
	for _, w := range wants {
		if !strings.Contains(text, w) {
			t.Errorf("%s does not show %q", what, w)
		}
	}
}
