// Package nbrun executes Jupyter notebooks headless with nbconvert and the
// project-local GoNB kernel, checks every cell's output for errors, and
// exports the executed notebook to HTML. The browser tests and
// `make reports` share it.
package nbrun

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
)

// Python is Debian's interpreter, which has Jupyter; a python3 earlier on
// PATH (pyenv, a virtualenv) may not.
const Python = "/usr/bin/python3"

// Root returns the repository root: the closest folder at or above dir
// holding both go.mod and notebooks/.
func Root(dir string) (string, error) {
	d, err := filepath.Abs(dir)
	if err != nil {
		return "", err
	}
	for {
		if isFile(filepath.Join(d, "go.mod")) && isDir(filepath.Join(d, "notebooks")) {
			return d, nil
		}
		parent := filepath.Dir(d)
		if parent == d {
			return "", fmt.Errorf("no folder above %s holds go.mod and notebooks/", dir)
		}
		d = parent
	}
}

// Notebooks lists the .ipynb files in dir (not checkpoints, not outputs of
// earlier runs), sorted.
func Notebooks(dir string) ([]string, error) {
	paths, err := filepath.Glob(filepath.Join(dir, "*.ipynb"))
	if err != nil {
		return nil, err
	}
	var out []string
	for _, p := range paths {
		if !strings.HasSuffix(p, ".out.ipynb") {
			out = append(out, p)
		}
	}
	sort.Strings(out)
	return out, nil
}

// Env returns the environment for Jupyter: the project-local kernel spec
// from scripts/setup-notebooks.sh first.
func Env(root string) []string {
	jupyter := filepath.Join(root, ".jupyter")
	return append(os.Environ(), "JUPYTER_PATH="+jupyter, "JUPYTER_DATA_DIR="+jupyter)
}

// CheckSetup reports what is missing for executing notebooks, with the
// command that installs it.
func CheckSetup(root string) error {
	if !isFile(Python) {
		return fmt.Errorf("%s not found: run scripts/setup-notebooks.sh (or make setup)", Python)
	}
	if !isFile(filepath.Join(root, ".jupyter", "kernels", "gonb", "kernel.json")) {
		return fmt.Errorf("the GoNB kernel is not installed in %s/.jupyter: run scripts/setup-notebooks.sh (or make setup)", root)
	}
	return nil
}

// Result is one executed notebook.
type Result struct {
	Notebook string // the source notebook
	Executed string // the executed copy (.ipynb)
	HTML     string // its HTML export
	// CellErrors describes every cell whose output holds an error: a
	// raised error, or a GoNB compile/run error (HTML with a gonb-err class).
	CellErrors []string
	// Log is nbconvert's output with the kernel's log lines removed.
	Log string
}

// Run executes the notebook in its own folder (so relative paths in cells
// work), writes NAME.ipynb and NAME.html into outDir, and reports the cells
// that failed. An error means the notebook could not be executed or
// exported at all.
func Run(ctx context.Context, root, notebook, outDir string) (Result, error) {
	r := Result{Notebook: notebook}
	if err := os.MkdirAll(outDir, 0o755); err != nil {
		return r, err
	}
	absOut, err := filepath.Abs(outDir)
	if err != nil {
		return r, err
	}
	name := strings.TrimSuffix(filepath.Base(notebook), ".ipynb")
	r.Executed = filepath.Join(absOut, name+".ipynb")
	// --allow-errors: keep executing so that every failing cell is reported,
	// not just the first; the outputs are checked below.
	log, err := nbconvert(ctx, root, filepath.Dir(notebook), "--to", "notebook", "--execute", "--allow-errors",
		"--ExecutePreprocessor.timeout=600", "--output-dir", absOut, "--output", name, filepath.Base(notebook))
	r.Log = log
	if err != nil {
		return r, fmt.Errorf("executing %s: %w\n%s", notebook, err, log)
	}
	if r.CellErrors, err = CellErrors(r.Executed); err != nil {
		return r, err
	}
	html, log, err := ExportHTML(ctx, root, r.Executed, name)
	r.HTML = html
	r.Log += "\n" + log
	return r, err
}

// ExportHTML exports an executed notebook to NAME.html beside it, with
// extra nbconvert arguments (for example "--template", "lab",
// "--HTMLExporter.theme=dark" for JupyterLab's dark theme). It returns the
// HTML's path and nbconvert's output.
func ExportHTML(ctx context.Context, root, executed, name string, args ...string) (path, log string, err error) {
	dir := filepath.Dir(executed)
	all := append([]string{"--to", "html", "--output-dir", dir, "--output", name, noMathJax}, args...)
	log, err = nbconvert(ctx, root, dir, append(all, filepath.Base(executed))...)
	if err != nil {
		return "", log, fmt.Errorf("exporting %s to HTML: %w\n%s", executed, err, log)
	}
	return filepath.Join(dir, name+".html"), log, nil
}

// noMathJax leaves MathJax out of the exported HTML (an empty script in
// its place): the notebooks hold no formulas, and MathJax only put its
// "Loading [MathJax]" badge over the content of reports and screenshots.
const noMathJax = "--HTMLExporter.mathjax_url=data:text/javascript,"

func nbconvert(ctx context.Context, root, dir string, args ...string) (string, error) {
	cmd := exec.CommandContext(ctx, Python, append([]string{"-m", "nbconvert"}, args...)...)
	cmd.Dir = dir
	cmd.Env = Env(root)
	out, err := cmd.CombinedOutput()
	return dropKernelLog(string(out)), err
}

// kernelLogLine matches klog lines ("I1202 01:02:03.456789 ...") that the
// GoNB kernel writes to stderr.
var kernelLogLine = regexp.MustCompile(`^[IWEF]\d{4} \d\d:\d\d:\d\d`)

func dropKernelLog(s string) string {
	var keep []string
	for _, line := range strings.Split(s, "\n") {
		if !kernelLogLine.MatchString(line) && strings.TrimSpace(line) != "" {
			keep = append(keep, line)
		}
	}
	return strings.Join(keep, "\n")
}

// notebook is the part of the .ipynb format read here.
type notebook struct {
	Cells []struct {
		CellType string          `json:"cell_type"`
		Source   json.RawMessage `json:"source"`
		Outputs  []struct {
			OutputType string                     `json:"output_type"`
			Name       string                     `json:"name"`
			Text       json.RawMessage            `json:"text"`
			Ename      string                     `json:"ename"`
			Evalue     string                     `json:"evalue"`
			Data       map[string]json.RawMessage `json:"data"`
			Metadata   map[string]any             `json:"metadata"`
		} `json:"outputs"`
	} `json:"cells"`
}

// GoNB reports a compile error as display data (HTML with gonb-err-*
// classes) plus an error output, and a program that panics or exits with a
// non-zero status only on stderr, ending in "exit status N".
var (
	gonbError   = regexp.MustCompile(`class=["']?gonb-err`)
	programFail = regexp.MustCompile(`(?m)^(exit status \d+|panic: .*)\s*$`)
)

var (
	tags = regexp.MustCompile(`<[^>]*>`)
	// ansi matches terminal colour codes in GoNB's stack traces.
	ansi = regexp.MustCompile("\x1b\\[[0-9;]*m")
)

// oneLine squeezes a report into one readable line.
func oneLine(s string) string {
	return strings.Join(strings.Fields(ansi.ReplaceAllString(s, "")), " ")
}

// CellErrors reads an executed notebook and describes each cell output
// that reports an error: an error output (a compile error, a kernel
// error), GoNB's HTML error report, or stderr ending a failed program.
func CellErrors(path string) ([]string, error) {
	nb, err := readNotebook(path)
	if err != nil {
		return nil, err
	}
	var errs []string
	for i, c := range nb.Cells {
		for _, o := range c.Outputs {
			switch {
			case o.OutputType == "stream" && o.Name == "stderr":
				text := multiline(o.Text)
				if programFail.MatchString(text) {
					errs = append(errs, fmt.Sprintf("cell %d: the program failed: %s", i+1, oneLine(text)))
				}
			case o.OutputType == "error":
				errs = append(errs, fmt.Sprintf("cell %d: %s: %s", i+1, o.Ename, o.Evalue))
			case o.Data["text/html"] != nil:
				html := multiline(o.Data["text/html"])
				if gonbError.MatchString(html) {
					errs = append(errs, fmt.Sprintf("cell %d: GoNB error: %s", i+1, oneLine(tags.ReplaceAllString(html, " "))))
				}
			}
		}
	}
	return errs, nil
}

// readNotebook reads an executed notebook's cells and outputs.
func readNotebook(path string) (notebook, error) {
	raw, err := os.ReadFile(path)
	if err != nil {
		return notebook{}, err
	}
	var nb notebook
	if err := json.Unmarshal(raw, &nb); err != nil {
		return notebook{}, fmt.Errorf("%s is not a notebook: %w", path, err)
	}
	return nb, nil
}

// Output is one display output of propscope (a card, a chart) in an
// executed notebook: the ones whose metadata carry a "propscope" kind.
type Output struct {
	Cell int    // 1-based cell number
	Kind string // the metadata's "propscope" value
	// Data maps each MIME type to its raw JSON value in the notebook.
	Data map[string]json.RawMessage
}

// Outputs lists the propscope display outputs of an executed notebook.
func Outputs(path string) ([]Output, error) {
	nb, err := readNotebook(path)
	if err != nil {
		return nil, err
	}
	var out []Output
	for i, c := range nb.Cells {
		for _, o := range c.Outputs {
			if kind, ok := o.Metadata["propscope"].(string); ok {
				out = append(out, Output{Cell: i + 1, Kind: kind, Data: o.Data})
			}
		}
	}
	return out, nil
}

// multiline reads a notebook string field, stored either as one string or
// as a list of lines.
func multiline(raw json.RawMessage) string {
	var s string
	if json.Unmarshal(raw, &s) == nil {
		return s
	}
	var lines []string
	if json.Unmarshal(raw, &lines) == nil {
		return strings.Join(lines, "")
	}
	return string(raw)
}

// ErrCells is returned by RunAll when any notebook had failing cells.
var ErrCells = errors.New("notebook cells failed")

func isFile(p string) bool {
	st, err := os.Stat(p)
	return err == nil && st.Mode().IsRegular()
}

func isDir(p string) bool {
	st, err := os.Stat(p)
	return err == nil && st.IsDir()
}
