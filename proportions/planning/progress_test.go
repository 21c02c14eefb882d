package planning

import (
	"context"
	"errors"
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/operating"
)

// progressLog records the calls of an operating.Progress.
type progressLog struct{ done, total []int }

func (l *progressLog) option() operating.RunOption {
	return operating.WithProgress(func(done, total int) {
		l.done = append(l.done, done)
		l.total = append(l.total, total)
	})
}

// check requires every report to be out of ProgressTotal, done to
// increase at every call, at least minReports calls, and the last call to
// be the whole work.
func (l *progressLog) check(t *testing.T, what string, minReports int) {
	t.Helper()
	if len(l.done) < minReports {
		t.Fatalf("%s: %d progress reports %v, want at least %d", what, len(l.done), l.done, minReports)
	}
	for i, d := range l.done {
		if l.total[i] != ProgressTotal {
			t.Errorf("%s: report %d is out of %d, want %d", what, i, l.total[i], ProgressTotal)
		}
		if d < 0 || d > ProgressTotal || (i > 0 && d <= l.done[i-1]) {
			t.Errorf("%s: done goes %v: it must increase within [0, %d]", what, l.done, ProgressTotal)
			break
		}
	}
	if last := l.done[len(l.done)-1]; last != ProgressTotal {
		t.Errorf("%s: the last report is %d, want %d", what, last, ProgressTotal)
	}
}

func TestExactPlanningReportsProgress(t *testing.T) {
	ctx := context.Background()
	// Fisher's test at 0.7 vs 0.2, target 0.85: a scan from 1 to a horizon
	// of 31 (see TestExactSampleSizeDefinition).
	d := NewPlan(Equality, 0.7, 0.2)
	d.Power = 0.85
	var scan progressLog
	res, err := ExactSampleSize(ctx, d, proportions.FisherTest, Search{}, scan.option())
	if err != nil {
		t.Fatal(err)
	}
	scan.check(t, "ExactSampleSize", len(res.Curve.Points)/2)
	// Reported as the scan goes, not only at its end.
	if scan.done[0] > ProgressTotal/10 {
		t.Errorf("ExactSampleSize: the first report is already %d of %d", scan.done[0], ProgressTotal)
	}

	var curve progressLog
	c, err := ExactPowerByTrials(ctx, d, proportions.FisherTest, 1, 40, curve.option())
	if err != nil {
		t.Fatal(err)
	}
	curve.check(t, "ExactPowerByTrials", len(c.Points)/2)

	var region progressLog
	if _, err := ExactPowerByDifference(ctx, d, proportions.FisherTest, 25, 30, 0.05, 0.95, 7, region.option()); err != nil {
		t.Fatal(err)
	}
	// One report per row of outcomes, x1 = 0..25.
	region.check(t, "ExactPowerByDifference", 26)

	// A single exact power reports by rows of outcomes: Fisher's test runs
	// one outcome at a time, Boschloo's decides them all at once.
	var single progressLog
	if _, err := ExactPower(ctx, d, proportions.FisherTest, 60, 60, single.option()); err != nil {
		t.Fatal(err)
	}
	single.check(t, "ExactPower (Fisher)", 10)
	var window progressLog
	if _, err := ExactPower(ctx, d, proportions.BoschlooTest, 30, 30, window.option()); err != nil {
		t.Fatal(err)
	}
	window.check(t, "ExactPower (Boschloo)", 1)

	// Without the option nothing is reported and nothing breaks.
	if _, err := ExactPowerByTrials(ctx, d, proportions.FisherTest, 1, 5); err != nil {
		t.Fatal(err)
	}
}

// A call that fails never reports the whole work done.
func TestExactPlanningProgressOnFailure(t *testing.T) {
	var l progressLog
	eq := NewPlan(Equality, 0.5, 0.7)
	_, err := ExactSampleSize(context.Background(), eq, waldDifference, Search{MaxN1: 65}, l.option())
	if !errors.Is(err, proportions.ErrUnreachable) {
		t.Fatalf("cap below the answer: %v", err)
	}
	if len(l.done) == 0 {
		t.Fatal("no progress reported while scanning 65 sizes")
	}
	for _, d := range l.done {
		if d >= ProgressTotal {
			t.Errorf("a failed search reported %d of %d", d, ProgressTotal)
		}
	}
}
