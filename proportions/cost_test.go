package proportions_test

import (
	"context"
	"errors"
	"os"
	"strings"
	"testing"
	"time"

	"github.com/propscope/propscope/internal/canceltest"
	"github.com/propscope/propscope/proportions"
)

// The reproducers of issue 20 that ran for tens of seconds to minutes
// (34.7 s, 48.8 s, 68 s and 2 GB) are refused with an error wrapping
// ErrTooLarge that says what the call would need. The assertion is on the
// error, not on the time.
func TestCostGuardRefusesLongCalls(t *testing.T) {
	cases := []struct {
		name string
		m    proportions.TestMethod
		c    proportions.Counts
		null float64
	}{
		{"memory and steps up front", proportions.BarnardTest, proportions.Counts{X1: 1, N1: 1, X2: 5e7, N2: 1e8}, 0},
		{"log-space search, one small group", proportions.BarnardTest, proportions.Counts{X1: 0, N1: 1, X2: 1, N2: 100000}, -0.3},
		{"log-space search inside the trial limit", proportions.BarnardTest, proportions.Counts{X1: 0, N1: 2999, X2: 1, N2: 3001}, 0.5},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			r, err := tc.m.Test(tc.c, proportions.WithNull(tc.null))
			if !errors.Is(err, proportions.ErrTooLarge) {
				t.Fatalf("%s %v null %v: got %v, %v; want an error wrapping ErrTooLarge", tc.m.Key, tc.c, tc.null, r, err)
			}
			if msg := err.Error(); !strings.Contains(msg, "would need about") || !strings.Contains(msg, "the limit is") {
				t.Errorf("the error should say what the call would need and the limit: %q", msg)
			}
		})
	}
}

// The up-front estimate depends on the null and the counts, not only on
// n1 + n2: the score statistic at a non-zero null solves a cubic per table.
func TestCostDependsOnNullAndMethod(t *testing.T) {
	c := proportions.Counts{X1: 100, N1: 1500, X2: 120, N2: 1500}
	h0 := proportions.Hypothesis{Null: 0, Conf: proportions.Confidence{Level: 0.95}}
	h1 := proportions.Hypothesis{Null: 0.02, Conf: proportions.Confidence{Level: 0.95}}
	at0, at1 := proportions.BarnardTest.Cost(c, h0), proportions.BarnardTest.Cost(c, h1)
	if !(at1.Steps > 2*at0.Steps) {
		t.Errorf("Barnard at null 0.02 costs %v, at null 0 %v: the score at a non-zero null should cost more", at1, at0)
	}
	doubled := proportions.BoschlooDoubledTest.Cost(c, h0)
	if single := proportions.BoschlooTest.Cost(c, h0); !(doubled.Steps > 1.5*single.Steps) {
		t.Errorf("the doubled Boschloo test searches two regions: %v against %v", doubled, single)
	}
	big := proportions.Counts{X1: 1, N1: 1, X2: 5e7, N2: 1e8}
	if b := proportions.BarnardTest.Cost(big, h0).Bytes; b < 1<<30 {
		t.Errorf("1 and 10⁸ trials hold the binomial terms of 10⁸ outcomes, over 1 GB; the estimate says %v bytes", b)
	}
}

// Analyze skips a costly test whose work would exceed its guard, with the
// usual warning, instead of running for a minute (issue 20: 50.8 s).
func TestAnalyzeSkipsCostlyTest(t *testing.T) {
	cmp, err := proportions.NewComparison(0, 2999, 1, 3001, proportions.Labels{})
	if err != nil {
		t.Fatal(err)
	}
	a, err := proportions.AnalyzeContext(context.Background(), cmp, proportions.WithNull(0.5), proportions.WithScope(proportions.ScopeAll))
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range a.Tests {
		if r.Method == proportions.BarnardTest.Key {
			t.Fatalf("Barnard's test ran: %v", r)
		}
	}
	found := false
	for _, w := range a.Warnings {
		if w.Code == proportions.WarnSkipped && strings.Contains(w.Message, proportions.BarnardTest.Name) {
			found = true
		}
	}
	if !found {
		t.Errorf("no warning names the skipped Barnard test: %v", a.Warnings)
	}
}

// AnalyzeContext with every method on a table whose exact tests take
// seconds returns within 100 ms of a cancel (the bound; several
// times that under the race detector). The best of three attempts counts,
// so one scheduling stall on a loaded machine does not fail it.
func TestAnalyzeContextCancel(t *testing.T) {
	cmp, err := proportions.NewComparison(30, 1500, 45, 1500, proportions.Labels{})
	if err != nil {
		t.Fatal(err)
	}
	canceltest.Check(t, 30*time.Millisecond, func(ctx context.Context) error {
		_, err := proportions.AnalyzeContext(ctx, cmp, proportions.WithNull(0.02), proportions.WithScope(proportions.ScopeAll))
		return err
	})
}

// The README quotes the refusal of the 34.7 s reproducer (Barnard,
// 0/1 vs 1/100000, null −0.3): the quote must be what the code says.
func TestREADMEQuotesTheCostRefusal(t *testing.T) {
	_, err := proportions.BarnardTest.Test(proportions.Counts{X1: 0, N1: 1, X2: 1, N2: 100000}, proportions.WithNull(-0.3))
	if !errors.Is(err, proportions.ErrTooLarge) {
		t.Fatalf("got %v, want an error wrapping ErrTooLarge", err)
	}
	_, quote, ok := strings.Cut(err.Error(), " would need ")
	if !ok {
		t.Fatalf("the error does not say what the call would need: %q", err)
	}
	b, err := os.ReadFile("../README.md")
	if err != nil {
		t.Fatal(err)
	}
	readme := strings.Join(strings.Fields(string(b)), " ")
	if !strings.Contains(readme, "would need "+quote) {
		t.Errorf("README.md should quote the refusal as the code gives it: %q", "would need "+quote)
	}
}
