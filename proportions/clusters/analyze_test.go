package clusters

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// trayTrial is an invented seed trial: 8 trays of 20 seeds per treatment,
// trays differing a lot.
func trayTrial(t *testing.T) Data {
	var g1, g2 []Cluster
	for i, x := range []int64{19, 12, 18, 20, 11, 17, 19, 14} {
		g1 = append(g1, Cluster{Value: fmt.Sprintf("c%d", i+1), Events: x, Trials: 20})
	}
	for i, x := range []int64{10, 16, 8, 14, 17, 9, 12, 15} {
		g2 = append(g2, Cluster{Value: fmt.Sprintf("p%d", i+1), Events: x, Trials: 20})
	}
	return mustData(t, g1, g2)
}

func TestAnalyzeSideBySide(t *testing.T) {
	d := trayTrial(t)
	a, err := Analyze(d)
	if err != nil {
		t.Fatal(err)
	}
	// The naive answers are proportions.Analyze on the pooled counts.
	c, _ := proportions.NewComparison(a.Naive.Comparison.First.Events, 160, a.Naive.Comparison.Second.Events, 160, proportions.Labels{})
	plain, _ := proportions.Analyze(c)
	if a.Naive.Interval.Lower != plain.Interval.Lower || a.Naive.Test.PValue != plain.Test.PValue {
		t.Errorf("naive analysis differs from proportions.Analyze on the totals")
	}
	if !hasCode(a.Naive.Warnings, WarnClustersIgnored) {
		t.Errorf("naive analysis lacks the %s warning: %v", WarnClustersIgnored, a.Naive.Warnings)
	}
	if a.DesignEffects[0].Value <= ClusteredThreshold || !hasCode(a.Warnings, WarnClustered) {
		t.Fatalf("design effects %v, warnings %v", a.DesignEffects, a.Warnings)
	}
	// Equal sizes: D = 1 + (20 − 1)ρ (Donner, Birkett & Buck 1981), and
	// the effective size is 160/D.
	rho := a.Correlation.Estimate
	if want := 1 + 19*rho; math.Abs(a.DesignEffects[0].Value-want) > 1e-12 || math.Abs(a.DesignEffects[0].EffectiveSize-160/want) > 1e-9 {
		t.Errorf("design effect %v, want %v", a.DesignEffects[0], want)
	}
	want := fmt.Sprintf("320 units from 16 trays behave like about %.0f independent units", math.Round(320/(1+19*rho)))
	if !strings.Contains(a.String(), want) {
		t.Errorf("text lacks %q:\n%s", want, a)
	}
	if a.Interval.Width() <= a.Naive.Interval.Width() {
		t.Errorf("clustered interval %v not wider than the naive %v", a.Interval, a.Naive.Interval)
	}
	b, err := json.Marshal(a)
	if err != nil {
		t.Fatal(err)
	}
	var back map[string]any
	if err := json.Unmarshal(b, &back); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"correlation", "design_effects", "intervals", "tests", "naive", "cluster_level", "warnings", "caution"} {
		if _, ok := back[k]; !ok {
			t.Errorf("JSON lacks %q", k)
		}
	}
}

func TestAnalyzeRefusesBadInput(t *testing.T) {
	d := mustData(t, []Cluster{{"a", 3, 10}}, []Cluster{{"b", 1, 10}, {"c", 2, 10}})
	if _, err := Analyze(d); !errors.Is(err, proportions.ErrTooFewClusters) {
		t.Errorf("one cluster in a group: %v", err)
	}
	if _, err := Analyze(trayTrial(t), proportions.WithNull(0.1)); !errors.Is(err, proportions.ErrUnsupported) {
		t.Errorf("null 0.1: %v", err)
	}
	if _, err := Analyze(trayTrial(t), proportions.WithLevel(1.5)); !errors.Is(err, proportions.ErrLevel) {
		t.Errorf("level 1.5: %v", err)
	}
}

func hasCode(ws []proportions.Warning, code string) bool {
	for _, w := range ws {
		if w.Code == code {
			return true
		}
	}
	return false
}

// The ignored-clusters warning gives the worth of the units only when the
// correlation can be estimated: trays of one seed give none.
func TestFlagIgnoredClustersWithoutEstimate(t *testing.T) {
	d := mustData(t, unitClusters("a", 3, 5), unitClusters("b", 1, 4))
	c, _ := proportions.NewComparison(3, 5, 1, 4, proportions.Labels{})
	a, _ := proportions.Analyze(c)
	f := FlagIgnoredClusters(a, d)
	w := f.Warnings[len(f.Warnings)-1]
	if w.Code != WarnClustersIgnored || strings.Contains(w.Message, "behave like") || len(a.Warnings)+1 != len(f.Warnings) {
		t.Errorf("warning %+v; original warnings %d, flagged %d", w, len(a.Warnings), len(f.Warnings))
	}
}

// Clusters whose counts vary less than independent units' would (every
// tray within one seed of its group's rate: binomial chance alone would
// spread 10-seed trays by about ±1.6) get a Rao–Scott design effect below
// 1; the Rao–Scott interval is then narrower than the unit-level Newcombe
// interval on the same counts, and the analysis says so, naming the group.
// The trays of trayTrial vary more than chance and get no such warning.
func TestDesignEffectBelowOneWarned(t *testing.T) {
	var g1, g2 []Cluster
	for i, x := range []int64{5, 6, 5, 6, 5, 6, 5, 6} {
		g1 = append(g1, Cluster{Value: fmt.Sprintf("a%d", i+1), Events: x, Trials: 10})
	}
	for i, x := range []int64{3, 4, 3, 4, 3, 4, 3, 4} {
		g2 = append(g2, Cluster{Value: fmt.Sprintf("b%d", i+1), Events: x, Trials: 10})
	}
	d, err := New("tray", proportions.Labels{First: "primed", Second: "bare", Event: "germinated"}, g1, g2)
	if err != nil {
		t.Fatal(err)
	}
	a, err := Analyze(d)
	if err != nil {
		t.Fatal(err)
	}
	s := Summarize(d)
	if d1 := raoScottDesignEffect(s.Group1); !(d1 < 1) {
		t.Fatalf("Rao–Scott design effect of the even trays %v, want below 1", d1)
	}
	var rs proportions.Interval
	for _, iv := range a.Intervals {
		if iv.Method == RaoScottNewcombe.Key {
			rs = iv
		}
	}
	if rs.Method == "" {
		t.Fatal("no Rao–Scott Newcombe interval")
	}
	unit, err := proportions.Newcombe.Interval(d.Totals(), 0.95)
	if err != nil {
		t.Fatal(err)
	}
	if !(rs.Upper-rs.Lower < unit.Upper-unit.Lower) {
		t.Errorf("Rao–Scott Newcombe %v is not narrower than unit-level Newcombe %v", rs, unit)
	}
	var msg string
	for _, w := range a.Warnings {
		if w.Code == WarnDesignEffectBelowOne {
			msg = w.Message
		}
	}
	if msg == "" {
		t.Fatalf("no %s warning: %v", WarnDesignEffectBelowOne, a.Warnings)
	}
	for _, want := range []string{"in primed", "in bare", "80 units counted as about", "trays' counts vary less"} {
		if !strings.Contains(msg, want) {
			t.Errorf("warning %q lacks %q", msg, want)
		}
	}
	b, err := json.Marshal(a)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(b), `"design-effect-below-one"`) {
		t.Error("the warning's code is not in the JSON form")
	}
	over, err := Analyze(trayTrial(t))
	if err != nil {
		t.Fatal(err)
	}
	if hasCode(over.Warnings, WarnDesignEffectBelowOne) {
		t.Errorf("trays that vary more than chance warned as below one: %v", over.Warnings)
	}
}
