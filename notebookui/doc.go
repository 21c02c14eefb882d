// Package notebookui shows propscope's results in Jupyter notebooks run by
// the GoNB kernel, and in files for write-ups.
//
// Every result is a [Displayable]: it renders itself as a self-contained
// HTML fragment, as Markdown and as plain text, and carries its data as
// JSON. [Display] sends all of them as one notebook output when the program
// runs in a GoNB cell and prints the text otherwise; [Page] and
// [WriteHTMLFile] make a standalone HTML document. The package renders
// results computed by package proportions and never recomputes statistics.
//
// Charts ([RatesChart], [DifferenceIntervalsChart], [ConfidenceCurveChart],
// [CoverageSliceChart], [CoverageMapChart], [PowerChart]) are Displayables
// built with go-echarts and drawn by echarts 5.4.3, which the package
// carries itself (folder echarts, with its licence, notice and a checksum
// test): show [ChartEngine] once in a notebook before the first chart, and
// the notebook and its exported report draw with no network. [Page] inlines
// the engine by itself when a chart is on the page. Chart IDs come from the
// chart's content, so the same data give byte-identical HTML.
package notebookui
