package notebookui_test

import (
	"fmt"
	"strings"

	"github.com/propscope/propscope/notebookui"
	"github.com/propscope/propscope/proportions"
)

// A result card for 131 of 160 primed seeds germinating against 112 of 160
// untreated seeds (invented data). In a GoNB cell, card.Display() shows it
// as one rich output; here its plain-text form starts like this.
func ExampleResultCard() {
	c, err := proportions.NewComparison(131, 160, 112, 160, proportions.Labels{
		First: "primed", Second: "untreated", Event: "germinated",
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	a, err := proportions.Analyze(c)
	if err != nil {
		fmt.Println(err)
		return
	}
	card := notebookui.NewResultCard(a)
	lines := strings.Split(card.Text(), "\n")
	fmt.Println(strings.Join(lines[:4], "\n"))
	// Output:
	// Germinated: primed vs untreated
	// ===============================
	// Difference in the share germinated, primed minus untreated: +11.9 percentage points
	// 95% confidence interval: +2.5 to +21.1 points (Mee score)
}
