package notebookui

import (
	_ "embed"
	"strings"
)

// echartsJS is dist/echarts.min.js of the npm package echarts 5.4.3
// (Apache-2.0; licence, notice and bundled components' licences beside it in
// the echarts folder). It is vendored so that charts draw with no network.
//
//go:embed echarts/echarts.min.js
var echartsJS string

// EngineVersion is the version of the vendored echarts library.
const EngineVersion = "5.4.3"

// EngineSHA256 is the SHA-256 checksum of the vendored echarts.min.js, as
// published in the npm package echarts@5.4.3 (checked by the tests).
const EngineSHA256 = "1156429a16a38cb8604dcc6518c19406d4226142d908f8edd2e3531443c54d19"

// EngineScript returns the vendored echarts library as one inline <script>
// element that defines window.echarts. Include it once per page or
// notebook, before the charts (later charts wait briefly for it, so order
// within a page is forgiving).
//
// Why the wrapper: Jupyter pages and nbconvert's HTML export load
// RequireJS, and echarts.min.js is a UMD bundle that, when it sees
// define.amd, registers itself as an AMD module and never sets the global
// echarts. Running the bundle inside a function whose define, exports and
// module parameters are undefined makes it take its browser-global branch.
// The guard skips the work when the engine is already present.
func EngineScript() string {
	var b strings.Builder
	b.Grow(len(echartsJS) + 256)
	b.WriteString(`<script type="text/javascript" data-propscope-engine="echarts ` + EngineVersion + `">`)
	b.WriteString("if (!(window.echarts && window.echarts.version === \"" + EngineVersion + "\")) {\n")
	b.WriteString("(function (define, exports, module) {\n")
	b.WriteString(echartsJS)
	b.WriteString("\n}).call(window);\n}\n</script>")
	return b.String()
}

// engineFor returns the engine script when any of the displayables draws
// with it (so a standalone page needs no network), and "" otherwise.
func engineFor(ds []Displayable) string {
	for _, d := range ds {
		if _, ok := d.(interface{ needsChartEngine() }); ok {
			return EngineScript() + "\n"
		}
	}
	return ""
}

// ChartEngine returns the displayable that loads the chart engine into a
// notebook: show it once, in a cell before the first chart (charts shown
// earlier wait ten seconds for it, then say how to fix it). It inlines the
// vendored echarts (about 1 MB in the saved notebook), so the notebook and
// its HTML export draw their charts with no network. Running it again is
// harmless.
func ChartEngine() Displayable { return engineDisplay{} }

type engineDisplay struct{}

const engineNote = "Charts ready: echarts " + EngineVersion + " loaded from propscope's own copy (no network needed)."

func (engineDisplay) HTML() string {
	return EngineScript() + `<div class="propscope-engine" style="font-size:0.85em;opacity:0.75;">` + engineNote + `</div>`
}
func (engineDisplay) Markdown() string { return "_" + engineNote + "_\n" }
func (engineDisplay) Text() string     { return engineNote }
func (engineDisplay) Kind() string     { return "chart-engine" }
func (engineDisplay) JSON() ([]byte, error) {
	return []byte(`{"kind":"chart-engine","engine":"echarts","version":"` + EngineVersion + `","sha256":"` + EngineSHA256 + `"}`), nil
}
