package nbrun

import (
	"strings"
	"testing"
)

// testdata/failing.ipynb was executed by GoNB v0.11.1 under nbconvert: a
// cell exiting with status 3, a cell that panics and a cell that only logs
// to stderr. compile-error.ipynb holds GoNB's report of an undefined name.
func TestCellErrorsFindsFailedPrograms(t *testing.T) {
	errs, err := CellErrors("testdata/failing.ipynb")
	if err != nil {
		t.Fatal(err)
	}
	if len(errs) != 2 {
		t.Fatalf("want the exit and the panic reported, got %q", errs)
	}
	if !strings.Contains(errs[0], "cell 1") || !strings.Contains(errs[0], "exit status 3") {
		t.Errorf("first error = %q", errs[0])
	}
	if !strings.Contains(errs[1], "cell 2") || !strings.Contains(errs[1], "panic: boom") {
		t.Errorf("second error = %q", errs[1])
	}
}

func TestCellErrorsFindsCompileErrors(t *testing.T) {
	errs, err := CellErrors("testdata/compile-error.ipynb")
	if err != nil {
		t.Fatal(err)
	}
	if len(errs) == 0 || !strings.Contains(strings.Join(errs, " "), "undefinedThing") {
		t.Fatalf("compile error not reported: %q", errs)
	}
}
