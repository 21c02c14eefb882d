package notebookui

import (
	"fmt"
	"strings"
	"unicode/utf8"
)

// textWidth is where plain-text paragraphs wrap.
const textWidth = 88

// renderText lays out the view as plain text.
func renderText(v cardView) string {
	var b strings.Builder
	b.WriteString(v.Title + "\n" + strings.Repeat("=", min(utf8.RuneCountInString(v.Title), textWidth)) + "\n")
	fmt.Fprintf(&b, "Difference in the share %s, %s minus %s: %s percentage points\n", v.Event, v.First, v.Second, v.Difference)
	fmt.Fprintf(&b, "%s confidence interval: %s to %s points (%s)\n", v.Level, v.Lower, v.Upper, v.Method)
	if v.Verdict != "" {
		b.WriteString(wrap(v.Verdict, "", textWidth))
	}
	b.WriteString("\nEach group\n")
	b.WriteString(textTable(groupCells(v.Groups), "  "))
	if len(v.Tests) > 0 {
		b.WriteString("\nTests\n")
		b.WriteString(wrap(v.Hypothesis, "  ", textWidth))
		b.WriteString(textTable(testCells(v.Tests), "  "))
		for _, n := range v.StatNotes {
			b.WriteString(wrap(n, "  ", textWidth))
		}
	}
	if v.Conclusion != "" {
		b.WriteString("\nWhat the data say\n")
		b.WriteString(wrap(v.Conclusion, "  ", textWidth))
	}
	if len(v.Warnings) > 0 {
		b.WriteString("\nWarnings\n")
		for _, w := range v.Warnings {
			b.WriteString(wrap("- "+w, "    ", textWidth)[2:])
		}
	}
	if v.NotRun != "" {
		b.WriteString("\n" + wrap(v.NotRun, "", textWidth))
	}
	for _, s := range v.Sections {
		fmt.Fprintf(&b, "\nEvery interval method: %s (%s, %s)\n", s.Title, s.Unit, v.Level)
		b.WriteString(textTable(methodCells(s), "  "))
	}
	if len(v.References) > 0 {
		b.WriteString("\nMethods and their sources\n")
		for i, r := range v.References {
			b.WriteString(wrap(fmt.Sprintf("[%d] %s — %s", i+1, r.Name, r.Citation), "      ", textWidth)[4:])
		}
		for _, l := range v.Bounds {
			b.WriteString(wrap("- "+l, "    ", textWidth)[2:])
		}
	}
	b.WriteString("\n")
	b.WriteString(wrap("Before acting on this: "+v.Caution, "", textWidth))
	return b.String()
}

// renderMarkdown lays out the view as Markdown (pipe tables; the folded
// method table becomes an ordinary section).
func renderMarkdown(v cardView) string {
	var b strings.Builder
	e := mdEscape
	fmt.Fprintf(&b, "### %s\n\n", e(v.Title))
	fmt.Fprintf(&b, "Difference in the share %s, **%s** minus **%s**: **%s percentage points**  \n", e(v.Event), e(v.First), e(v.Second), v.Difference)
	fmt.Fprintf(&b, "%s confidence interval: **%s to %s** points (%s)\n", v.Level, v.Lower, v.Upper, e(v.Method))
	if v.Verdict != "" {
		fmt.Fprintf(&b, "\n%s\n", e(v.Verdict))
	}
	b.WriteString("\n#### Each group\n\n")
	b.WriteString(mdTable(groupCells(v.Groups)))
	if len(v.Tests) > 0 {
		fmt.Fprintf(&b, "\n#### Tests\n\n%s\n\n", e(v.Hypothesis))
		b.WriteString(mdTable(testCells(v.Tests)))
		for _, n := range v.StatNotes {
			fmt.Fprintf(&b, "\n%s\n", e(n))
		}
	}
	if v.Conclusion != "" {
		fmt.Fprintf(&b, "\n#### What the data say\n\n%s\n", e(v.Conclusion))
	}
	if len(v.Warnings) > 0 {
		b.WriteString("\n#### Warnings\n\n")
		for _, w := range v.Warnings {
			fmt.Fprintf(&b, "- %s\n", e(w))
		}
	}
	if v.NotRun != "" {
		fmt.Fprintf(&b, "\n*%s*\n", e(v.NotRun))
	}
	for _, s := range v.Sections {
		fmt.Fprintf(&b, "\n#### Every interval method: %s (%s, %s)\n\n", e(s.Title), s.Unit, v.Level)
		b.WriteString(mdTable(methodCells(s)))
	}
	if len(v.References) > 0 {
		b.WriteString("\n#### Methods and their sources\n\n")
		for i, r := range v.References {
			fmt.Fprintf(&b, "%d. **%s** — %s\n", i+1, e(r.Name), e(r.Citation))
		}
		if len(v.Bounds) > 0 {
			b.WriteString("\n")
		}
		for _, l := range v.Bounds {
			fmt.Fprintf(&b, "- %s\n", e(l))
		}
	}
	fmt.Fprintf(&b, "\n> **Before acting on this:** %s\n", e(v.Caution))
	return b.String()
}

// cells is a table: a header row, body rows, and which columns hold numbers
// (right-aligned).
type cells struct {
	header  []string
	rows    [][]string
	numeric []bool
}

func groupCells(g groupTable) cells {
	c := cells{header: []string{"Group", g.EventHeader, "Out of", g.ShareHeader}, numeric: []bool{false, true, true, true}}
	if g.IntervalHeader != "" {
		c.header = append(c.header, g.IntervalHeader)
		c.numeric = append(c.numeric, true)
	}
	for _, r := range g.Rows {
		row := []string{r.Label, r.Events, r.Trials, r.Share}
		if g.IntervalHeader != "" {
			row = append(row, r.Interval)
		}
		c.rows = append(c.rows, row)
	}
	return c
}

func testCells(tests []testRow) cells {
	c := cells{header: []string{"Test", "Statistic", "p-value", "Decision"}, numeric: []bool{false, true, true, false}}
	for _, t := range tests {
		name := t.Name
		if t.Headline {
			name += " [headline]"
		}
		c.rows = append(c.rows, []string{name, t.Statistic, t.P, t.Decision})
	}
	return c
}

func methodCells(s methodSection) cells {
	c := cells{header: []string{"Method", "Estimate", "Lower", "Upper"}, numeric: []bool{false, true, true, true}}
	if s.HasNotes() {
		c.header, c.numeric = append(c.header, "Note"), append(c.numeric, false)
	}
	for _, r := range s.Rows {
		name := r.Name
		if r.Headline {
			name += " [headline]"
		}
		row := []string{name, r.Estimate, r.Lower, r.Upper}
		if s.HasNotes() {
			row = append(row, r.Note)
		}
		c.rows = append(c.rows, row)
	}
	return c
}

// textTable pads columns to their widest cell (in runes) and drops a
// trailing empty column.
func textTable(c cells, indent string) string {
	widths := make([]int, len(c.header))
	for _, row := range append([][]string{c.header}, c.rows...) {
		for i, cell := range row {
			widths[i] = max(widths[i], utf8.RuneCountInString(cell))
		}
	}
	var b strings.Builder
	for _, row := range append([][]string{c.header}, c.rows...) {
		line := indent
		for i, cell := range row {
			pad := strings.Repeat(" ", widths[i]-utf8.RuneCountInString(cell))
			if c.numeric[i] {
				line += pad + cell
			} else {
				line += cell + pad
			}
			if i < len(row)-1 {
				line += "  "
			}
		}
		b.WriteString(strings.TrimRight(line, " ") + "\n")
	}
	return b.String()
}

// mdTable writes a pipe table with escaped cells.
func mdTable(c cells) string {
	var b strings.Builder
	write := func(row []string) {
		b.WriteString("|")
		for _, cell := range row {
			b.WriteString(" " + mdEscape(cell) + " |")
		}
		b.WriteString("\n")
	}
	write(c.header)
	b.WriteString("|")
	for _, num := range c.numeric {
		if num {
			b.WriteString(" ---: |")
		} else {
			b.WriteString(" --- |")
		}
	}
	b.WriteString("\n")
	for _, row := range c.rows {
		write(row)
	}
	return b.String()
}

// mdEscape makes a string show literally in Markdown, wherever it is put:
// in a table cell, a heading, emphasis, a list item, a quote or at the
// start of a line.
//   - Newlines (and tabs) become spaces, since a label must stay on its
//     line and its table row; the ends are trimmed, so that leading spaces
//     cannot make a code block and trailing ones neither a hard line break
//     nor a "**" that no longer closes.
//   - <, > and & become HTML entities, so no raw HTML or entity reaches a
//     renderer that allows them.
//   - The punctuation that marks emphasis, code, links and images, table
//     cells, strike-through, headings, footnotes and attribute lists gets
//     a backslash, which CommonMark defines for every ASCII punctuation.
//   - The bare-URL links of GitHub's Markdown are broken up: "://", "www."
//     and "@" (e-mail addresses, mailto:) get a backslash.
//   - A first character that would open a block (a list, a rule, a
//     heading underline, a definition) or an ordered list's "1." gets a
//     backslash; a signed number such as "+15.00" keeps its sign as is.
func mdEscape(s string) string {
	s = strings.TrimSpace(strings.Map(func(r rune) rune {
		switch r {
		case '\n', '\r', '\t', '\v', '\f':
			return ' '
		}
		return r
	}, s))
	// An ordered-list marker: up to nine digits, "." or ")", then a space
	// or the end (so that "86.0%" stays as it is).
	listMark := -1
	if d := strings.IndexFunc(s, func(r rune) bool { return r < '0' || r > '9' }); d > 0 && d <= 9 &&
		(s[d] == '.' || s[d] == ')') && (d+1 == len(s) || s[d+1] == ' ') {
		listMark = d
	}
	var b strings.Builder
	for i, r := range s {
		switch {
		case r == '<':
			b.WriteString("&lt;")
		case r == '>':
			b.WriteString("&gt;")
		case r == '&':
			b.WriteString("&amp;")
		case i == 0 && strings.ContainsRune("=:", r),
			i == 0 && (r == '-' || r == '+') && !(len(s) > 1 && '0' <= s[1] && s[1] <= '9'),
			i == listMark,
			strings.ContainsRune("\\`*_[]|~#{}@", r),
			r == ':' && strings.HasPrefix(s[i:], "://"),
			r == '.' && i >= 3 && strings.EqualFold(s[i-3:i], "www"):
			b.WriteByte('\\')
			b.WriteRune(r)
		default:
			b.WriteRune(r)
		}
	}
	return b.String()
}

// wrap breaks s into lines of at most width runes (longer words stay
// whole), each starting with indent, each ending in a newline.
func wrap(s, indent string, width int) string {
	var b strings.Builder
	line := indent
	for _, word := range strings.Fields(s) {
		if utf8.RuneCountInString(line) > len(indent) && utf8.RuneCountInString(line)+1+utf8.RuneCountInString(word) > width {
			b.WriteString(line + "\n")
			line = indent
		}
		if utf8.RuneCountInString(line) > len(indent) {
			line += " "
		}
		line += word
	}
	b.WriteString(line + "\n")
	return b.String()
}
