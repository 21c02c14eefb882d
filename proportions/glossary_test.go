package proportions_test

import (
	"go/ast"
	"go/parser"
	"go/token"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// glossaryPackages are the packages whose exported names the glossary may
// spell, by the name a reader writes before the dot.
var glossaryPackages = map[string]string{
	"proportions": ".",
	"planning":    "planning",
	"operating":   "operating",
	"bayes":       "bayes",
	"clusters":    "clusters",
	"simulate":    "clusters/simulate",
	"strata":      "strata",
	"notebookui":  "../notebookui",
}

// exportedNames returns a package's exported top-level names and its
// exported "Type.Member" names (fields and methods).
func exportedNames(t *testing.T, dir string) map[string]bool {
	t.Helper()
	names := map[string]bool{}
	files, err := filepath.Glob(filepath.Join(dir, "*.go"))
	if err != nil {
		t.Fatal(err)
	}
	fset := token.NewFileSet()
	for _, f := range files {
		if strings.HasSuffix(f, "_test.go") {
			continue
		}
		af, err := parser.ParseFile(fset, f, nil, 0)
		if err != nil {
			t.Fatal(err)
		}
		for _, d := range af.Decls {
			switch x := d.(type) {
			case *ast.FuncDecl:
				if x.Recv == nil {
					names[x.Name.Name] = true
					continue
				}
				rt := x.Recv.List[0].Type
				if s, ok := rt.(*ast.StarExpr); ok {
					rt = s.X
				}
				if id, ok := rt.(*ast.Ident); ok {
					names[id.Name+"."+x.Name.Name] = true
				}
			case *ast.GenDecl:
				for _, sp := range x.Specs {
					switch s := sp.(type) {
					case *ast.TypeSpec:
						names[s.Name.Name] = true
						if st, ok := s.Type.(*ast.StructType); ok {
							for _, fl := range st.Fields.List {
								for _, n := range fl.Names {
									names[s.Name.Name+"."+n.Name] = true
								}
							}
						}
					case *ast.ValueSpec:
						for _, n := range s.Names {
							names[n.Name] = true
						}
					}
				}
			}
		}
	}
	return names
}

// glossaryRows reads GLOSSARY.md's table: concept, meaning, Go, JSON, screen.
func glossaryRows(t *testing.T) [][]string {
	t.Helper()
	b, err := os.ReadFile("../GLOSSARY.md")
	if err != nil {
		t.Fatal(err)
	}
	var rows [][]string
	for _, line := range strings.Split(string(b), "\n") {
		if !strings.HasPrefix(line, "| ") || strings.HasPrefix(line, "| concept") {
			continue
		}
		cells := strings.Split(strings.Trim(line, "| "), " | ")
		if len(cells) != 5 {
			t.Fatalf("glossary row with %d cells: %q", len(cells), line)
		}
		rows = append(rows, cells)
	}
	if len(rows) < 20 {
		t.Fatalf("glossary has only %d rows", len(rows))
	}
	return rows
}

var backticked = regexp.MustCompile("`([^`]+)`")

// Every Go spelling in the glossary names an exported identifier, field or
// method that exists, so the glossary cannot drift from the code.
func TestGlossaryGoSpellings(t *testing.T) {
	pkgNames := map[string]map[string]bool{}
	all := map[string]bool{}
	for pkg, dir := range glossaryPackages {
		pkgNames[pkg] = exportedNames(t, dir)
		all[pkg] = true // a package named on its own
		for n := range pkgNames[pkg] {
			all[n] = true
			if _, member, ok := strings.Cut(n, "."); ok {
				all[member] = true // a field or method named without its type
			}
		}
	}
	checked := 0
	for _, row := range glossaryRows(t) {
		for _, m := range backticked.FindAllStringSubmatch(row[2], -1) {
			tok := m[1]
			if pkg, ok := strings.CutPrefix(tok, "package "); ok {
				if _, known := glossaryPackages[pkg]; !known {
					t.Errorf("%s: unknown package %q", row[0], pkg)
				}
				continue
			}
			checked++
			if pkg, name, ok := strings.Cut(tok, "."); ok {
				if names, isPkg := pkgNames[pkg]; isPkg {
					if !names[name] {
						t.Errorf("%s: %s is not an exported name of package %s", row[0], tok, pkg)
					}
					continue
				}
			}
			if !all[tok] {
				t.Errorf("%s: %s is not an exported name, field or method", row[0], tok)
			}
		}
	}
	if checked < 40 {
		t.Errorf("only %d Go spellings checked", checked)
	}
}

// Every JSON spelling in the glossary is a field or value the JSON Schemas
// define, or a registry key.
func TestGlossaryJSONSpellings(t *testing.T) {
	files, err := filepath.Glob("schema/*.json")
	if err != nil || len(files) == 0 {
		t.Fatalf("no schema files (%v)", err)
	}
	var schemas strings.Builder
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		schemas.Write(b)
	}
	text := schemas.String()
	for _, row := range glossaryRows(t) {
		cell, _, _ := strings.Cut(row[3], "(") // a note in brackets names JSON outside these schemas
		for _, m := range backticked.FindAllStringSubmatch(cell, -1) {
			word, _, _ := strings.Cut(m[1], ":") // "scale: difference, ..." names the field first
			for _, w := range append([]string{word}, values(m[1])...) {
				if strings.Contains(text, `"`+w+`"`) {
					continue
				}
				if _, err := proportions.LookupTest(w); err == nil {
					continue
				}
				t.Errorf("%s: JSON spelling %q is in no schema", row[0], w)
			}
		}
	}
}

// values returns the enumerated values in a cell such as
// "alternative: two-sided, greater, less" (none without a colon).
func values(cell string) []string {
	_, list, ok := strings.Cut(cell, ": ")
	if !ok {
		return nil
	}
	var out []string
	for _, v := range strings.Split(list, ", ") {
		out = append(out, strings.TrimSpace(v))
	}
	return out
}
