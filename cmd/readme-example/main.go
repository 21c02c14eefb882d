// Command readme-example is the Go program shown in the README, kept here so
// that `go vet ./...` compiles it and a test checks that the README shows it
// verbatim. It analyses an invented seed trial and writes its result card.
package main

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"log"

	"github.com/propscope/propscope/notebookui"
	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/operating"
)

func main() {
	c, err := proportions.NewComparison(41, 50, 33, 50,
		proportions.Labels{First: "coated", Second: "bare", Event: "germinated"})
	if errors.Is(err, proportions.ErrEventsExceedTrials) {
		log.Fatal("more events than trials: ", err)
	} else if err != nil {
		log.Fatal(err)
	}
	a, err := proportions.Analyze(c, proportions.WithLevel(0.95))
	if err != nil {
		log.Fatal(err)
	}
	// Warn where an interval undercovers at this design (exact enumeration).
	if err := operating.CheckAnalysis(context.Background(), &a); err != nil {
		log.Fatal(err)
	}
	fmt.Println(a) // the text summary
	b, err := json.Marshal(a)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("%d bytes of JSON\n", len(b))
	card := notebookui.NewResultCard(a) // card.Display() in a notebook
	if err := card.WriteHTMLFile("seed-trial.html"); err != nil {
		log.Fatal(err)
	}
}
