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
