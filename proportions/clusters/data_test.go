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
