package notebookui

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/clusters"
	"github.com/propscope/propscope/proportions/planning"
)

// trayData is an invented seed trial: 8 trays of 20 seeds per treatment.
func trayData(t testing.TB, labels proportions.Labels, by string) clusters.Data {
	t.Helper()
	var g1, g2 []clusters.Cluster
	for i, x := range []int64{19, 12, 18, 20, 11, 17, 19, 14} {
		g1 = append(g1, clusters.Cluster{Value: fmt.Sprintf("C%d", i+1), Events: x, Trials: 20})
	}
	for i, x := range []int64{10, 16, 8, 14, 17, 9, 12, 15} {
		g2 = append(g2, clusters.Cluster{Value: fmt.Sprintf("B%d", i+1), Events: x, Trials: 20})
	}
	d, err := clusters.New(by, labels, g1, g2)
	if err != nil {
		t.Fatal(err)
	}
	return d
}

func clusterFixture(t testing.TB, labels proportions.Labels) ClusterCard {
	t.Helper()
	a, err := clusters.Analyze(trayData(t, labels, "tray"))
	if err != nil {
		t.Fatal(err)
	}
	return NewClusterCard(a)
}

var trayLabels = proportions.Labels{First: "coated", Second: "bare", Event: "germinated"}

// TestClusterGolden compares the clustered card's three forms with
// reviewed files (go test ./notebookui -update rewrites them).
func TestClusterGolden(t *testing.T) {
	checkGolden(t, "trays", clusterFixture(t, trayLabels))
}

// The card words the clustering as the analysis holds it: the effective
// size worked out here from the design effect 1 + (20 − 1)ρ of equal trays
// (Donner, Birkett & Buck 1981), the clustered and unit-level answers, the
// tray-level check and the caution, in every form.
func TestClusterCardShowsTheAnalysis(t *testing.T) {
	c := clusterFixture(t, trayLabels)
	a := c.Analysis
	worth := math.Round(320 / (1 + 19*a.Correlation.Estimate))
	for form, s := range map[string]string{"HTML": c.HTML(), "Markdown": c.Markdown(), "text": c.Text()} {
		for _, want := range []string{fmt.Sprintf("320 units from 16 trays behave like about %.0f independent units", worth),
			"Zou–Donner", "As if every unit were independent", "Tray by tray", "Cluster-level t", "Donner adjusted chi-square",
			"Rao–Scott", "ANOVA estimator", "Fleiss–Cuzick", "only 8 trays", "qualified statistician", "Before acting on this"} {
			if !strings.Contains(s, want) {
				t.Errorf("%s lacks %q", form, want)
			}
		}
	}
	if strings.Contains(c.HTML(), "<script") {
		t.Error("the card carries a script")
	}
	// The README quotes this card's sentence.
	readme, err := os.ReadFile("../README.md")
	if err != nil {
		t.Fatal(err)
	}
	if quote := clusters.EffectiveSentence(a.Data, a.EffectiveTotal()); !strings.Contains(strings.Join(strings.Fields(string(readme)), " "), quote) {
		t.Errorf("README.md should quote %q", quote)
	}
	raw, err := c.JSON()
	if err != nil {
		t.Fatal(err)
	}
	var back struct {
		Kind     string `json:"kind"`
		Analysis struct {
			Correlation clusters.Correlation `json:"correlation"`
		} `json:"analysis"`
	}
	if err := json.Unmarshal(raw, &back); err != nil || back.Kind != "cluster-card" || back.Analysis.Correlation.Estimate != a.Correlation.Estimate {
		t.Errorf("JSON round trip: %v %s", err, raw[:120])
	}
	if _, err := Bundle(c); err != nil {
		t.Error(err)
	}
}

// A single-table result card of clustered data analysed as independent
// units carries the warning, saying what the units are worth.
func TestResultCardWarnsOfIgnoredClusters(t *testing.T) {
	d := trayData(t, trayLabels, "tray")
	tot := d.Totals()
	cmp, _ := proportions.NewComparison(tot.X1, tot.N1, tot.X2, tot.N2, trayLabels)
	a, err := proportions.Analyze(cmp)
	if err != nil {
		t.Fatal(err)
	}
	card := NewResultCard(clusters.FlagIgnoredClusters(a, d))
	for form, s := range map[string]string{"HTML": card.HTML(), "Markdown": card.Markdown(), "text": card.Text()} {
		if !strings.Contains(s, "These units come in 16 trays and are analysed here as if independent") || !strings.Contains(s, "behave like about") {
			t.Errorf("%s lacks the ignored-clusters warning", form)
		}
	}
}

func TestClusterCardEscapesHostileLabels(t *testing.T) {
	labels := proportions.Labels{First: hostile.First.Label, Second: hostile.Second.Label, Event: hostile.Event}
	a, err := clusters.Analyze(trayData(t, labels, `<b onmouseover=x>tray`))
	if err != nil {
		t.Fatal(err)
	}
	c := NewClusterCard(a)
	h := c.HTML()
	for _, raw := range []string{"<script>window", "<img", "<svg onload", "onerror=\"", "<b onmouseover"} {
		if strings.Contains(h, raw) {
			t.Errorf("HTML contains the raw user string %q", raw)
		}
	}
	md := c.Markdown()
	for _, raw := range []string{"<script", "<img", "<svg", "<b "} {
		if strings.Contains(md, raw) {
			t.Errorf("Markdown contains the raw user string %q", raw)
		}
	}
	if !strings.Contains(c.Text(), hostile.First.Label) {
		t.Error("text form does not show the label literally")
	}
}

// The chart draws one line per cluster size with the grid's numbers, and
// its table names the fewest clusters reaching the target, found here by
// scanning the grid.
func TestClusteredPowerChart(t *testing.T) {
	p := planning.NewPlan(planning.Equality, 0.8, 0.65)
	g, err := planning.ClusteredPowerByClusters(p, 0.05, 0, []float64{5, 20, 80}, []int64{4, 8, 12, 16, 24, 32, 48})
	if err != nil {
		t.Fatal(err)
	}
	ch, err := ClusteredPowerChart(g)
	if err != nil {
		t.Fatal(err)
	}
	if ch.Name() != "clustered-power" {
		t.Errorf("name %q", ch.Name())
	}
	opt := optionOfChart(t, ch)
	series := opt["series"].([]any)
	if len(series) != 3 {
		t.Fatalf("%d series, want one per cluster size", len(series))
	}
	text := ch.Text()
	for _, l := range g.Lines {
		fewest := "not reached"
		for _, pt := range l.Points {
			if pt.Power >= p.Power {
				fewest = fmt.Sprint(pt.Clusters)
				break
			}
		}
		if !strings.Contains(text, fewest) {
			t.Errorf("size %v: table lacks %s", l.ClusterSize, fewest)
		}
	}
	if _, err := ClusteredPowerChart(planning.ClusteredPowerGrid{}); err == nil {
		t.Error("an empty grid draws")
	}
}
