package clusters

import (
	"errors"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
)

func TestNewChecksClusters(t *testing.T) {
	d, err := New("tray", proportions.Labels{First: "coated", Second: "plain"},
		[]Cluster{{"t1", 3, 10}, {"t2", 5, 10}}, []Cluster{{"t3", 1, 10}})
	if err != nil {
		t.Fatal(err)
	}
	if got := d.Totals(); got != (proportions.Counts{X1: 8, N1: 20, X2: 1, N2: 10}) {
		t.Errorf("Totals = %+v", got)
	}
	for _, tc := range []struct {
		g1, g2 []Cluster
		want   error
		says   string
	}{
		{nil, []Cluster{{"a", 1, 2}}, proportions.ErrEmptyInput, "at least one"},
		{[]Cluster{{"a", 1, 2}}, []Cluster{{"a", 1, 2}}, proportions.ErrDuplicateValue, "both groups"},
		{[]Cluster{{"a", 1, 2}, {"a", 0, 2}}, []Cluster{{"b", 1, 2}}, proportions.ErrDuplicateValue, "twice"},
		{[]Cluster{{"a", 1, 0}}, []Cluster{{"b", 1, 2}}, proportions.ErrNoTrials, `"a"`},
		{[]Cluster{{"a", 3, 2}}, []Cluster{{"b", 1, 2}}, proportions.ErrEventsExceedTrials, `"a"`},
	} {
		_, err := New("tray", proportions.Labels{}, tc.g1, tc.g2)
		if !errors.Is(err, tc.want) || !strings.Contains(err.Error(), tc.says) {
			t.Errorf("New(%v, %v) = %v; want %v saying %q", tc.g1, tc.g2, err, tc.want, tc.says)
		}
	}
}

func TestFromBreakdownNamesMixedCluster(t *testing.T) {
	b, err := proportions.NewBreakdown("tray", proportions.Labels{}, []proportions.BreakdownRow{
		{Value: "t1", Counts: proportions.Counts{X1: 2, N1: 5}},
		{Value: "t2", Counts: proportions.Counts{X1: 1, N1: 4, X2: 1, N2: 3}},
	})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := FromBreakdown(b); !errors.Is(err, proportions.ErrDuplicateValue) || !strings.Contains(err.Error(), `"t2"`) {
		t.Errorf("FromBreakdown with a mixed tray: %v", err)
	}
}

// TestDataFilledInDirectlyIsChecked checks that Analyze, Interval and Test
// check data that did not come from New: a cluster of no units made every
// result NaN (and the analysis unmarshallable), negative events gave wrong
// numbers silently.
func TestDataFilledInDirectlyIsChecked(t *testing.T) {
	for _, tc := range []struct {
		name string
		bad  Cluster
		want error
	}{
		{"no units", Cluster{Value: "a", Events: 1, Trials: 0}, proportions.ErrNoTrials},
		{"negative events", Cluster{Value: "a", Events: -1, Trials: 2}, proportions.ErrNegativeCount},
		{"events above units", Cluster{Value: "a", Events: 3, Trials: 2}, proportions.ErrEventsExceedTrials},
	} {
		d := Data{Group1: []Cluster{tc.bad, {Value: "b", Events: 3, Trials: 5}},
			Group2: []Cluster{{Value: "c", Events: 1, Trials: 2}, {Value: "d", Events: 3, Trials: 5}}}
		if _, err := Analyze(d); !errors.Is(err, tc.want) {
			t.Errorf("%s: Analyze error %v, want one wrapping %v", tc.name, err, tc.want)
		}
		if _, err := ZouDonner.Interval(d, 0.95); !errors.Is(err, tc.want) {
			t.Errorf("%s: Interval error %v, want one wrapping %v", tc.name, err, tc.want)
		}
		if _, err := DonnerTest.Test(d); !errors.Is(err, tc.want) {
			t.Errorf("%s: Test error %v, want one wrapping %v", tc.name, err, tc.want)
		}
	}
}

// TestClusterErrorsNameTheCluster checks that a bad cluster of the second
// group is not reported as the "first group" of a comparison, as it was
// when New checked clusters as one-group comparisons.
func TestClusterErrorsNameTheCluster(t *testing.T) {
	_, err := New("tray", proportions.Labels{First: "coated", Second: "bare"},
		[]Cluster{{Value: "t1", Events: 1, Trials: 2}}, []Cluster{{Value: "t2", Events: 5, Trials: 3}})
	if !errors.Is(err, proportions.ErrEventsExceedTrials) {
		t.Fatalf("error %v, want one wrapping ErrEventsExceedTrials", err)
	}
	msg := err.Error()
	if strings.Contains(msg, "first group") || !strings.Contains(msg, `"bare"`) || !strings.Contains(msg, `"t2"`) {
		t.Errorf("message %q should name group \"bare\" and tray \"t2\", not a first group", msg)
	}
	_, err = New("tray", proportions.Labels{}, []Cluster{{Value: "t1", Events: 0, Trials: 0}}, []Cluster{{Value: "t2", Events: 1, Trials: 3}})
	if !errors.Is(err, proportions.ErrNoTrials) || strings.Contains(err.Error(), "first group") {
		t.Errorf("a cluster of no units: %v", err)
	}
}
