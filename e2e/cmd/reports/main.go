// Command reports executes every notebook in notebooks/ headless and writes
// the executed notebooks and their HTML exports to a folder (reports/ by
// default). It exits with status 1 if a notebook fails to run or any of
// its cells reports an error. `make reports` runs it.
package main

import (
	"context"
	"flag"
	"fmt"
	"os"
	"path/filepath"

	"github.com/propscope/propscope/e2e/nbrun"
)

func main() {
	out := flag.String("out", "", "output folder (default: <repo>/reports)")
	flag.Parse()
	if err := run(*out); err != nil {
		fmt.Fprintln(os.Stderr, "reports:", err)
		os.Exit(1)
	}
}

func run(out string) error {
	root, err := nbrun.Root(".")
	if err != nil {
		return err
	}
	if err := nbrun.CheckSetup(root); err != nil {
		return err
	}
	if out == "" {
		out = filepath.Join(root, "reports")
	}
	notebooks, err := nbrun.Notebooks(filepath.Join(root, "notebooks"))
	if err != nil {
		return err
	}
	failed := 0
	for _, nb := range notebooks {
		r, err := nbrun.Run(context.Background(), root, nb, out)
		if err != nil {
			return err
		}
		for _, e := range r.CellErrors {
			fmt.Fprintf(os.Stderr, "%s: %s\n", filepath.Base(nb), e)
		}
		if len(r.CellErrors) > 0 {
			failed++
		}
		fmt.Println(r.HTML)
	}
	if failed > 0 {
		return fmt.Errorf("%d of %d notebooks had failing cells: %w", failed, len(notebooks), nbrun.ErrCells)
	}
	return nil
}
