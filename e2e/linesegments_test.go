package e2e

import (
	"context"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

func init() {
	pageChecks["line-shift-segments"] = checkLineShiftSegments
}

// checkLineShiftSegments asserts what a reader of the line × shift notebook
// sees. Expected facts, from the notebook's invented design and not from
// propscope: 8 plants × 12 lines × 3 shifts = 288 segments (arithmetic);
// every part id divisible by 13001 has no result, so the first read stops
// naming the column "defective" and the second skips ⌊parts / 13001⌋ rows
// (the notebook prints the number of parts it wrote); every segment has
// both suppliers (each gets 120 to 199 parts); the flagged list has one
// line per flagged segment, 3 segments are truly worse, and the chance
// expectation printed is 5% of the 285 others, 14 (arithmetic).
func checkLineShiftSegments(t *testing.T, ctx context.Context) {
	text := eval[string](t, ctx, `document.body.innerText`)
	m := regexp.MustCompile(`wrote (\d+) inspected parts`).FindStringSubmatch(text)
	if m == nil {
		t.Fatalf("no count of parts written in the page")
	}
	parts, _ := strconv.Atoi(m[1])
	for _, want := range []string{
		`first read: table "inspections"`, `column "defective" is NULL`,
		"read 288 segments, " + strconv.Itoa(parts/13001) + " rows skipped for missing values, 0 segments with a supplier missing",
		"about 14 expected by chance alone", "Before acting on this",
	} {
		if !strings.Contains(text, want) {
			t.Errorf("page lacks %q", want)
		}
	}
	f := regexp.MustCompile(`flagged (\d+) of 288 segments at the 5% level: (\d) of the 3 truly worse, (\d+) by chance`).FindStringSubmatch(text)
	if f == nil {
		t.Fatalf("no summary of the flagged segments")
	}
	n, _ := strconv.Atoi(f[1])
	truly, _ := strconv.Atoi(f[2])
	chance, _ := strconv.Atoi(f[3])
	if lines := strings.Count(text, "(chance)"); lines != chance {
		t.Errorf("%d chance lines listed, summary says %d", lines, chance)
	}
	if lines := strings.Count(text, "(truly worse)"); lines != truly || truly+chance != n {
		t.Errorf("%d truly worse lines listed, summary says %d of %d", lines, truly, n)
	}
}
