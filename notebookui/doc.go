// Package notebookui shows propscope's results in Jupyter notebooks run by
// the GoNB kernel, and in files for write-ups.
//
// Every result is a [Displayable]: it renders itself as a self-contained
// HTML fragment, as Markdown and as plain text, and carries its data as
// JSON. [Display] sends all of them as one notebook output when the program
// runs in a GoNB cell and prints the text otherwise; [Page] and
// [WriteHTMLFile] make a standalone HTML document. The package renders
// results computed by package proportions and never recomputes statistics.
package notebookui
