package e2e

import (
	"context"
	"crypto/rand"
	"encoding/hex"
	"fmt"
	"net"
	"net/http"
	"os"
	"os/exec"
	"path/filepath"
	"syscall"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
	"github.com/propscope/propscope/e2e/nbrun"
)

// jupyterServer is a Notebook server started the way `make notebook` starts
// it (scripts/notebook.sh), on 127.0.0.1 with a random token.
type jupyterServer struct {
	URL   string // http://127.0.0.1:PORT
	Token string
}

// serveNotebooks starts the server for the test and stops it (with its
// kernels) when the test ends.
func serveNotebooks(t *testing.T, root string) jupyterServer {
	t.Helper()
	port := freePort(t)
	token := randomToken(t)
	cmd := exec.Command(filepath.Join(root, "scripts", "notebook.sh"), "--no-browser",
		fmt.Sprintf("--port=%d", port), "--port-retries=0", "--NotebookApp.token="+token)
	cmd.Env = nbrun.Env(root)
	log, err := os.Create(filepath.Join(outDir, "jupyter-server.log"))
	if err != nil {
		t.Fatal(err)
	}
	cmd.Stdout, cmd.Stderr = log, log
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() {
		// SIGTERM makes the server shut its kernels down before it exits.
		_ = cmd.Process.Signal(syscall.SIGTERM)
		done := make(chan error, 1)
		go func() { done <- cmd.Wait() }()
		select {
		case <-done:
		case <-time.After(30 * time.Second):
			_ = cmd.Process.Kill()
			<-done
		}
		log.Close()
	})
	s := jupyterServer{URL: fmt.Sprintf("http://127.0.0.1:%d", port), Token: token}
	waitForServer(t, s)
	return s
}

func freePort(t *testing.T) int {
	t.Helper()
	l, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer l.Close()
	return l.Addr().(*net.TCPAddr).Port
}

func randomToken(t *testing.T) string {
	t.Helper()
	b := make([]byte, 16)
	if _, err := rand.Read(b); err != nil {
		t.Fatal(err)
	}
	return hex.EncodeToString(b)
}

// waitForServer polls the server's status API; the limit only stops a
// server that never comes up.
func waitForServer(t *testing.T, s jupyterServer) {
	t.Helper()
	deadline := time.Now().Add(2 * time.Minute)
	for time.Now().Before(deadline) {
		resp, err := http.Get(s.URL + "/api/status?token=" + s.Token)
		if err == nil {
			resp.Body.Close()
			if resp.StatusCode == http.StatusOK {
				return
			}
		}
		time.Sleep(500 * time.Millisecond)
	}
	t.Fatalf("Jupyter did not answer on %s; see %s", s.URL, filepath.Join(outDir, "jupyter-server.log"))
}

// TestLiveNotebook serves the repository as `make notebook` does, opens the
// germination notebook in Chromium, runs every cell through the GoNB
// kernel and checks the card in the live Notebook page. Autosave is turned
// off first so that the run leaves the notebook file untouched.
func TestLiveNotebook(t *testing.T) {
	root := repoRoot(t)
	s := serveNotebooks(t, root)
	ctx := browse(t)
	if err := chromedp.Do(ctx, chromedp.Navigate(s.URL+"/notebooks/notebooks/germination.ipynb?token="+s.Token)); err != nil {
		t.Fatal(err)
	}
	waitFor(t, ctx, "the kernel to connect", `window.Jupyter && Jupyter.notebook && Jupyter.notebook.kernel && Jupyter.notebook.kernel.is_connected()`)
	eval[bool](t, ctx, `Jupyter.notebook.set_autosave_interval(0); Jupyter.notebook.execute_all_cells(); true`)
	waitFor(t, ctx, "the result card", `document.querySelectorAll('section[data-propscope="result-card"]').length > 0`)
	waitFor(t, ctx, "every cell to finish", `Jupyter.notebook.get_cells().every(c => c.cell_type !== "code" || (c.input_prompt_number !== "*" && c.input_prompt_number !== undefined && c.input_prompt_number !== null))`)
	if n := eval[int](t, ctx, `document.querySelectorAll('.output_stderr, .output_error, [class^="gonb-err"]').length`); n > 0 {
		t.Errorf("the live notebook shows %d error outputs", n)
	}
	text := cardText(t, ctx, 0)
	wantText(t, "the live card", text, "primed", "untreated", "+11.9", "81.9%", "70.0%", "+2.5 to +21.1")
	// The card uses the output's width (up to its own maximum of 60em):
	// classic Notebook's 10px root font would shrink rem-based sizes.
	if !eval[bool](t, ctx, `(() => { const c = document.querySelector('section[data-propscope="result-card"]');
		const room = Math.min(c.parentElement.getBoundingClientRect().width, 60 * parseFloat(getComputedStyle(c).fontSize));
		return c.getBoundingClientRect().width >= 0.95 * room; })()`) {
		t.Error("the card does not use the width of the notebook's output area")
	}
	// The folds show their triangle (summary as a list item).
	if n := eval[int](t, ctx, `[...document.querySelectorAll('section[data-propscope="result-card"] summary')].filter(s => getComputedStyle(s).display !== "list-item").length`); n > 0 {
		t.Errorf("%d folds lack their disclosure triangle", n)
	}
	// Classic Notebook scrolls inside #site, so bring the card into view
	// and take the visible page.
	eval[bool](t, ctx, `document.querySelector('section[data-propscope="result-card"]').scrollIntoView(); true`)
	screenshotOf(t, ctx, "germination-live", `section[data-propscope="result-card"]`)
}

// waitFor polls a JavaScript condition; the limit only stops a hung page.
func waitFor(t *testing.T, ctx context.Context, what, js string) {
	t.Helper()
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](js, chromedp.WithPollingTimeout(3*time.Minute))); err != nil {
		t.Fatalf("waiting for %s: %v", what, err)
	}
}
