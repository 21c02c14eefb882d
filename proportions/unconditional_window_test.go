package proportions

import (
	"context"
	"fmt"
	"testing"
)

// windowTests are the tests with a window decider, with the nulls each
// accepts.
var windowTests = []struct {
	m     TestMethod
	nulls []float64
}{
	{BarnardTest, []float64{0, -0.15, 0.2}},
	{BarnardWaldTest, []float64{0, 0.1}},
	{BoschlooTest, []float64{0}},
	{BoschlooDoubledTest, []float64{0}},
}

// checkWindow compares the window decider with the per-outcome definition
// (Run at every outcome of the window, the test's own one-at-a-time
// computation) and returns the number of outcomes compared.
func checkWindow(t *testing.T, m TestMethod, w OutcomeWindow, h Hypothesis, mem *DecisionMemory) int {
	t.Helper()
	got, err := m.Window.Decide(context.Background(), w, h, mem)
	if err != nil {
		t.Fatalf("%s %+v %+v: %v", m.Key, w, h, err)
	}
	i := 0
	for x1 := w.X1From; x1 <= w.X1To; x1++ {
		for x2 := w.X2From; x2 <= w.X2To; x2++ {
			r := m.Run(Counts{X1: int64(x1), N1: int64(w.N1), X2: int64(x2), N2: int64(w.N2)}, h)
			if r.Reject != got[i] {
				t.Errorf("%s at %d/%d vs %d/%d, %s, null %v, level %v: window decides %v, Run %v (p = %.17g)",
					m.Key, x1, w.N1, x2, w.N2, h.Alternative, h.Null, h.Conf.Level, got[i], r.Reject, r.PValue)
			}
			i++
		}
	}
	return i
}

// TestWindowMatchesRunSmall: on every design with n1 ≤ n2 ≤ 8 (the larger
// test has the other orientation), every test with a window decider,
// every alternative, the test's nulls, and levels 95% and 90% by turns,
// the window's decisions equal Run's at every outcome (brute force: one
// nuisance search per outcome).
func TestWindowMatchesRunSmall(t *testing.T) {
	total := 0
	for _, wt := range windowTests {
		for _, null := range wt.nulls {
			for _, alt := range []Alternative{TwoSided, Greater, Less} {
				mems := map[float64]*DecisionMemory{0.95: {}, 0.9: {}} // shared across designs, as a scan does
				for n1 := 1; n1 <= 8; n1++ {
					for n2 := n1; n2 <= 8; n2++ {
						level := 0.95 // the two levels take turns
						if (n1+n2)%2 == 1 {
							level = 0.9
						}
						h := Hypothesis{Null: null, Alternative: alt, Conf: Confidence{Level: level}}
						w := OutcomeWindow{N1: n1, N2: n2, X1To: n1, X2To: n2}
						total += checkWindow(t, wt.m, w, h, mems[level])
					}
				}
			}
		}
	}
	t.Logf("%d outcomes compared", total)
}

// TestWindowMatchesRunLarger: larger and unequal designs, whole and
// partial windows, with and without memory.
func TestWindowMatchesRunLarger(t *testing.T) {
	if testing.Short() {
		t.Skip("brute force over larger designs")
	}
	designs := [][2]int{{17, 31}, {30, 24}}
	for _, wt := range windowTests {
		for _, null := range wt.nulls[len(wt.nulls)-1:] {
			for _, alt := range []Alternative{TwoSided, Greater} {
				h := Hypothesis{Null: null, Alternative: alt, Conf: Confidence{Level: 0.95}}
				mem := &DecisionMemory{}
				for _, d := range designs {
					t.Run(fmt.Sprintf("%s/%v/%s/%dx%d", wt.m.Key, null, alt, d[0], d[1]), func(t *testing.T) {
						checkWindow(t, wt.m, OutcomeWindow{N1: d[0], N2: d[1], X1To: d[0], X2To: d[1]}, h, mem)
						checkWindow(t, wt.m, OutcomeWindow{N1: d[0], N2: d[1], X1From: d[0] / 4, X1To: d[0] * 3 / 4, X2From: d[1] / 3, X2To: d[1]}, h, nil)
					})
				}
			}
		}
	}
}
