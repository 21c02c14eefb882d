package notebookui

import (
	"encoding/gob"
	"encoding/json"
	"errors"
	"fmt"
	"html"
	"io"
	"os"
	"path/filepath"
	"strings"

	"github.com/janpfeifer/gonb/gonbui"
	"github.com/janpfeifer/gonb/gonbui/protocol"
)

// Displayable is anything notebookui shows: a result card, a chart. Each
// form is complete on its own, so the same value reads well in a live
// notebook, in an exported report and in a plain-text log.
//
// Implementations keep to three rules: HTML is a self-contained fragment
// (inline <style> only, no external fonts, scripts or images) that escapes
// every user-supplied string; Markdown escapes user strings for Markdown
// and HTML alike; JSON is an object, since notebooks store a JSON string
// as a string rather than as data.
type Displayable interface {
	// HTML returns the fragment shown in the notebook.
	HTML() string
	// Markdown returns the same content for a write-up.
	Markdown() string
	// Text returns the same content as plain text (what a terminal, a log
	// or a front end without HTML shows).
	Text() string
	// JSON returns the machine-readable form: a JSON object.
	JSON() ([]byte, error)
	// Kind names what is displayed ("result-card", "chart", ...); it goes
	// into the display output's metadata so tools can find it.
	Kind() string
}

func init() {
	// GoNB sends display data to the kernel with encoding/gob as `any`
	// values; the decoded JSON object is made of these two container
	// types, which gob refuses to send unless they are registered.
	gob.Register(map[string]any{})
	gob.Register([]any{})
}

// InKernel reports whether the program runs as a GoNB notebook cell.
func InKernel() bool { return gonbui.IsNotebook }

// Display shows d. In a GoNB cell it sends one display output holding
// text/html, text/plain and application/json (Jupyter shows the richest
// form the front end supports; exported reports use the HTML). Outside a
// kernel it writes d's text form to standard output.
func Display(d Displayable) error {
	if !InKernel() {
		return DisplayTo(os.Stdout, d)
	}
	return sendBundle(d)
}

// DisplayTo writes d's text form to w, followed by a newline. It is what
// Display does outside a notebook.
func DisplayTo(w io.Writer, d Displayable) error {
	_, err := fmt.Fprintln(w, d.Text())
	return err
}

// Bundle returns the MIME bundle Display sends in a notebook: text/html,
// text/plain and, when d's JSON is a valid object, application/json as a
// decoded JSON object. The error reports a JSON form that could not be
// produced; the bundle then still carries the HTML and the text.
func Bundle(d Displayable) (map[string]any, error) {
	bundle := map[string]any{
		"text/html":  d.HTML(),
		"text/plain": d.Text(),
	}
	obj, err := jsonObject(d)
	if err != nil {
		return bundle, err
	}
	bundle["application/json"] = obj
	return bundle, nil
}

func jsonObject(d Displayable) (map[string]any, error) {
	raw, err := d.JSON()
	if err != nil {
		return nil, fmt.Errorf("%s: JSON form: %w", d.Kind(), err)
	}
	var obj map[string]any
	if err := json.Unmarshal(raw, &obj); err != nil {
		return nil, fmt.Errorf("%s: JSON form is not an object: %w", d.Kind(), err)
	}
	return dropNulls(obj).(map[string]any), nil
}

// dropNulls removes JSON nulls from objects and replaces them in arrays by
// the string "null": gob cannot carry a nil interface value, and a missing
// key reads the same as null to a JSON consumer.
func dropNulls(v any) any {
	switch x := v.(type) {
	case map[string]any:
		for k, e := range x {
			if e == nil {
				delete(x, k)
				continue
			}
			x[k] = dropNulls(e)
		}
	case []any:
		for i, e := range x {
			if e == nil {
				x[i] = "null"
				continue
			}
			x[i] = dropNulls(e)
		}
	}
	return v
}

func sendBundle(d Displayable) error {
	bundle, jsonErr := Bundle(d)
	data := make(map[protocol.MIMEType]any, len(bundle))
	for mime, v := range bundle {
		data[protocol.MIMEType(mime)] = v
	}
	gonbui.SendData(&protocol.DisplayData{
		Data:     data,
		Metadata: map[string]any{"propscope": d.Kind()},
	})
	// Wait until GoNB has taken the output: a cell program that exits right
	// after sending a large output (a chart holds hundreds of kilobytes)
	// otherwise loses it now and then.
	gonbui.Sync()
	return errors.Join(jsonErr, gonbui.Error())
}

// Page returns the displayables as one complete, self-contained HTML
// document with the given title: their fragments plus page colours for
// light and dark system themes. It loads nothing from outside, so it can be
// mailed or archived as is.
func Page(title string, ds ...Displayable) string {
	var b strings.Builder
	b.WriteString(pageHead)
	b.WriteString("<title>" + html.EscapeString(title) + "</title>\n")
	b.WriteString(pageStyle)
	b.WriteString(engineFor(ds))
	b.WriteString("</head>\n<body>\n<main>\n")
	for _, d := range ds {
		b.WriteString(d.HTML())
		b.WriteString("\n")
	}
	b.WriteString("</main>\n</body>\n</html>\n")
	return b.String()
}

// WriteHTMLFile writes Page(title, ds...) to path, creating its folder.
func WriteHTMLFile(path, title string, ds ...Displayable) error {
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		return err
	}
	return os.WriteFile(path, []byte(Page(title, ds...)), 0o644)
}

const pageHead = `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
`

// pageStyle gives a standalone page the colours a notebook front end would
// otherwise give: the fragments inherit them.
const pageStyle = `<style>
:root { color-scheme: light dark; }
body { margin: 0; padding: 1.5rem 1rem; background: #ffffff; color: #1b1f24;
  font-family: system-ui, -apple-system, "Segoe UI", Roboto, "Noto Sans", "DejaVu Sans", sans-serif; }
main { max-width: 52rem; margin: 0 auto; }
@media (prefers-color-scheme: dark) { body { background: #16191d; color: #e6e8eb; } }
</style>
`
