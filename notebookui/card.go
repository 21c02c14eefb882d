package notebookui

import (
	"encoding/json"

	"github.com/propscope/propscope/proportions"
)

// ResultCard shows the default analysis of a comparison (what
// proportions.Analyze returns) as a card: a headline with the difference
// and its interval in the groups' own words, each group's share, the
// tests, the plain-language conclusion, the warnings, every interval
// method (folded away), the methods' references and the standing caution.
//
// It renders what the analysis holds and never recomputes statistics.
// Build one with NewResultCard, or as a literal.
type ResultCard struct {
	Analysis proportions.Analysis
	// Title replaces the default heading "<event>: <first> vs <second>".
	Title string
	// lookup finds a method's reference; nil means the registry.
	lookup referenceLookup
}

// NewResultCard returns the card for an analysis.
func NewResultCard(a proportions.Analysis) ResultCard { return ResultCard{Analysis: a} }

// Kind is "result-card".
func (c ResultCard) Kind() string { return "result-card" }

// HTML returns the card as a self-contained HTML fragment: one <section>
// with its own scoped <style>, no scripts and nothing loaded from outside.
// Every label, the event name and every message are escaped.
func (c ResultCard) HTML() string { return renderHTML(c.view()) }

// Markdown returns the card as Markdown for a write-up. User strings are
// escaped so that they show literally.
func (c ResultCard) Markdown() string { return renderMarkdown(c.view()) }

// Text returns the card as plain text, lines at most about 90 characters
// wide except for long labels.
func (c ResultCard) Text() string { return renderText(c.view()) }

// String returns Text, so fmt.Println(card) prints the card.
func (c ResultCard) String() string { return c.Text() }

// cardJSON is the card's JSON form: the analysis, under a kind tag and a
// version for consumers that read notebook outputs.
type cardJSON struct {
	Kind     string               `json:"kind"`
	Version  int                  `json:"version"`
	Analysis proportions.Analysis `json:"analysis"`
}

// JSON returns {"kind": "result-card", "version": 1, "analysis": {...}},
// with the analysis in its stable JSON form.
func (c ResultCard) JSON() ([]byte, error) {
	return json.Marshal(cardJSON{Kind: c.Kind(), Version: 1, Analysis: c.Analysis})
}

// Display shows the card: one notebook output with HTML, text and JSON in
// a GoNB cell, the text on standard output elsewhere.
func (c ResultCard) Display() error { return Display(c) }

// WriteHTMLFile writes the card as a standalone HTML page.
func (c ResultCard) WriteHTMLFile(path string) error {
	return WriteHTMLFile(path, c.view().Title, c)
}
