package main

import (
	"os"
	"strings"
	"testing"
)

// The README's Go program is this command's source, verbatim (without the
// command's own doc comment), so the program a newcomer copies compiles.
func TestReadmeShowsThisProgram(t *testing.T) {
	readme, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	src, err := os.ReadFile("main.go")
	if err != nil {
		t.Fatal(err)
	}
	body := string(src)
	body = body[strings.Index(body, "package main"):]
	if !strings.Contains(string(readme), "```go\n"+body+"```\n") {
		t.Error("README.md does not show cmd/readme-example/main.go verbatim in a ```go block; copy the file into the README")
	}
}

// goLine returns the go directive of a go.mod file ("1.26.0").
func goLine(t *testing.T, path string) string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	for _, l := range strings.Split(string(b), "\n") {
		if v, ok := strings.CutPrefix(l, "go "); ok {
			return strings.TrimSpace(v)
		}
	}
	t.Fatalf("%s has no go directive", path)
	return ""
}

// minor is "1.26" of "1.26.0".
func minor(v string) string {
	parts := strings.SplitN(v, ".", 3)
	if len(parts) < 2 {
		return v
	}
	return parts[0] + "." + parts[1]
}

// TestGoVersionsAgree: the README's requirement is the Go version the
// tests need (the notebook tools and the browser tests), and the library's
// own minimum is the one its go.mod states.
func TestGoVersionsAgree(t *testing.T) {
	readme, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	tools, e2e := minor(goLine(t, "../../tools/go.mod")), minor(goLine(t, "../../e2e/go.mod"))
	if tools != e2e {
		t.Errorf("tools/go.mod says Go %s and e2e/go.mod %s: the tests need one version", tools, e2e)
	}
	lib := minor(goLine(t, "../../go.mod"))
	for _, want := range []string{"Go " + tools + " or later", "builds with Go " + lib} {
		if !strings.Contains(strings.Join(strings.Fields(string(readme)), " "), want) {
			t.Errorf("README.md does not say %q (tools/go.mod %s, e2e/go.mod %s, go.mod %s)", want, tools, e2e, lib)
		}
	}
}
