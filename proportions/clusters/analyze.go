package clusters

import (
	"encoding/json"
	"fmt"
	"math"
	"strings"

	"github.com/propscope/propscope/internal/jsonlist"
	"github.com/propscope/propscope/proportions"
)

// Warning codes of a clustered analysis (stable; proportions.Warning holds
// them with a plain message).
const (
	// WarnClustered: a group's design effect exceeds ClusteredThreshold, so
	// the units are worth clearly fewer independent ones and the
	// unit-level answers are too sure of themselves.
	WarnClustered = "clustered-units"
	// WarnClustersIgnored: an analysis of the pooled units of clustered
	// data treats them as independent (added to the unit-level analysis by
	// FlagIgnoredClusters, and to Analysis.Naive).
	WarnClustersIgnored = "clusters-ignored"
	// WarnCorrelationNotEstimable: the data cannot estimate the
	// intracluster correlation (every cluster of one unit, or no unit
	// differing from another in its group); the design effect is taken as 1.
	WarnCorrelationNotEstimable = "correlation-not-estimable"
	// WarnNegativeCorrelation: the ANOVA estimate is below 0; the design
	// effect takes it as 0.
	WarnNegativeCorrelation = "negative-correlation"
	// WarnFewClusters: a group has fewer than FewClusters clusters, so the
	// large-sample clustered methods (which estimate the variation between
	// clusters) are themselves uncertain; the cluster-level t test is the
	// safer guide.
	WarnFewClusters = "few-clusters"
	// WarnDesignEffectBelowOne: a group's Rao–Scott design effect is below
	// 1 (its clusters' counts vary less than independent units' would), so
	// the Rao–Scott interval and test count its units as worth more than
	// independent ones and are narrower than the unit-level answers. With
	// few clusters this is mostly chance; the design-effect methods (which
	// take a negative correlation as 0) and the cluster-level t do not do
	// it.
	WarnDesignEffectBelowOne = "design-effect-below-one"
)

// ClusteredThreshold is the design effect above which an analysis warns
// that the units are clustered. At a design effect D the unit-level
// standard error is √D times too small, so a unit-level 95% interval
// covers about 2Φ(1.96/√D) − 1: 93.8% at D = 1.1, more than a point below
// what it claims; below 1.1 the loss is under a point.
const ClusteredThreshold = 1.1

// FewClusters is the number of clusters per group below which an analysis
// warns that the large-sample clustered methods rest on few clusters (our
// rule of thumb: with fewer, the between-cluster variance, and with it every
// design effect, is estimated from a handful of values).
const FewClusters = 10

// Analysis is the analysis of clustered data: how clustered they are, the
// answers that account for it beside the unit-level answers that do not,
// and warnings. Its JSON field names are stable.
type Analysis struct {
	Data        Data                    `json:"data"`
	Level       float64                 `json:"level"`
	Alternative proportions.Alternative `json:"alternative"`
	// Correlation is the pooled ANOVA estimate of the intracluster
	// correlation with its interval: the one the design effects use.
	Correlation Correlation `json:"correlation"`
	// OtherCorrelations are the other published estimates (Fleiss–Cuzick),
	// shown for comparison.
	OtherCorrelations []Correlation `json:"other_correlations"`
	// DesignEffects are the two groups' design effects and effective sizes.
	DesignEffects [2]DesignEffect `json:"design_effects"`
	// Interval and Test are the headline clustered answers: the Zou–Donner
	// interval and Donner's adjusted chi-square (both from the pooled ρ).
	Interval proportions.Interval   `json:"interval"`
	Test     proportions.TestResult `json:"test"`
	// Intervals and Tests are every registered clustered method.
	Intervals []proportions.Interval   `json:"intervals"`
	Tests     []proportions.TestResult `json:"tests"`
	// ClusterLevel and ClusterLevelTest are the cluster-level check: the
	// clusters' own rates compared by a two-sample t.
	ClusterLevel     proportions.Interval   `json:"cluster_level"`
	ClusterLevelTest proportions.TestResult `json:"cluster_level_test"`
	// Naive is the unit-level analysis of the pooled counts, as if every
	// unit were independent (proportions.Analyze on Data.Totals), with a
	// warning that it ignores the clusters.
	Naive      proportions.Analysis  `json:"naive"`
	Conclusion string                `json:"conclusion"`
	Warnings   []proportions.Warning `json:"warnings"`
	Caution    string                `json:"caution"`
}

// Analyze analyses clustered data. It reads the settings Level,
// Alternative (intervals at 1 − 2α for a one-sided test, as in
// proportions.Analyze) and Scope (for the unit-level analysis); the null
// must be 0, the only null the clustered tests are defined for. Errors
// wrap proportions.ErrTooFewClusters (fewer than two clusters in a group),
// ErrUnsupported (another null), the settings' sentinels, or those of New
// for data filled in directly (a cluster of no units, negative counts).
func Analyze(d Data, opts ...proportions.Option) (Analysis, error) {
	st, err := proportions.NewSettings(opts...)
	if err != nil {
		return Analysis{}, err
	}
	h, err := DonnerTest.Hypothesis(opts...)
	if err != nil {
		return Analysis{}, err
	}
	if err := d.validate(); err != nil {
		return Analysis{}, err
	}
	s := Summarize(d)
	if err := s.Check(); err != nil {
		return Analysis{}, fmt.Errorf("%s: %w", d, err)
	}
	ivLevel := st.Level
	if st.Alternative != proportions.TwoSided {
		ivLevel = 1 - 2*(1-st.Level)
	}
	ivConf, err := proportions.NewConfidence(ivLevel)
	if err != nil {
		return Analysis{}, fmt.Errorf("level %v with a one-sided alternative: %w", st.Level, err)
	}
	c, err := proportions.NewComparison(s.Group1.Events, s.Group1.Trials, s.Group2.Events, s.Group2.Trials,
		proportions.Labels{First: d.First, Second: d.Second, Event: d.Event})
	if err != nil {
		return Analysis{}, err
	}
	naive, err := proportions.Analyze(c, opts...)
	if err != nil {
		return Analysis{}, err
	}
	a := Analysis{Data: d, Level: st.Level, Alternative: st.Alternative, Caution: proportions.Caution,
		Correlation:       ANOVACorrelation(s, ivLevel),
		OtherCorrelations: []Correlation{FleissCuzickCorrelation(s)},
	}
	rho := usableRho(a.Correlation.Estimate)
	a.DesignEffects = [2]DesignEffect{GroupDesignEffect(s.Group1, rho), GroupDesignEffect(s.Group2, rho)}
	for _, m := range intervalMethods {
		a.Intervals = append(a.Intervals, m.IntervalAt(s, ivConf))
	}
	for _, m := range testMethods {
		a.Tests = append(a.Tests, m.Run(s, h))
	}
	a.Interval, a.Test = ZouDonner.IntervalAt(s, ivConf), DonnerTest.Run(s, h)
	a.ClusterLevel, a.ClusterLevelTest = ClusterLevelT.IntervalAt(s, ivConf), ClusterLevelTTest.Run(s, h)
	a.Naive = FlagIgnoredClusters(naive, d)
	a.Warnings = a.warnings(s)
	a.Conclusion = a.conclusion()
	return a, nil
}

// EffectiveTotal returns the number of independent units the data are
// worth, summed over the groups: Σ N_i / D_i.
func (a Analysis) EffectiveTotal() float64 {
	return a.DesignEffects[0].EffectiveSize + a.DesignEffects[1].EffectiveSize
}

// EffectiveSentence says in plain words what the clustering costs:
// "160 units from 8 trays behave like about 97 independent units".
func EffectiveSentence(d Data, effective float64) string {
	t := d.Totals()
	return fmt.Sprintf("%d units from %d %s behave like about %s independent units",
		t.N1+t.N2, len(d.Group1)+len(d.Group2), plural(d.By, len(d.Group1)+len(d.Group2)), roundCount(effective))
}

// roundCount prints an effective size as a whole number ("97"), or with
// one decimal below 10.
func roundCount(v float64) string {
	if v < 10 {
		return fmt.Sprintf("%.1f", v)
	}
	return fmt.Sprintf("%.0f", math.Round(v))
}

// plural adds an "s" to a cluster column's name for more than one
// cluster, unless it already ends in one.
func plural(word string, n int) string {
	if n == 1 || len(word) == 0 || word[len(word)-1] == 's' {
		return word
	}
	return word + "s"
}

func (a Analysis) warnings(s Summary) []proportions.Warning {
	var w []proportions.Warning
	d1, d2 := a.DesignEffects[0].Value, a.DesignEffects[1].Value
	if max(d1, d2) > ClusteredThreshold {
		w = append(w, proportions.Warning{Code: WarnClustered, Message: fmt.Sprintf(
			"%s (design effect %.2f in %s, %.2f in %s): the unit-level answers count every unit as independent and are too sure of themselves; read the clustered answers.",
			EffectiveSentence(a.Data, a.EffectiveTotal()), d1, a.Data.First, d2, a.Data.Second)})
	}
	switch {
	case !a.Correlation.Defined:
		w = append(w, proportions.Warning{Code: WarnCorrelationNotEstimable, Message: fmt.Sprintf(
			"The data cannot estimate how alike units of one %s are (every %s has one unit, or no unit differs from another in its group); the design effect is taken as 1, and the Rao–Scott and %s-level answers are the guide.",
			a.Data.By, a.Data.By, a.Data.By)})
	case a.Correlation.Estimate < 0:
		w = append(w, proportions.Warning{Code: WarnNegativeCorrelation, Message: fmt.Sprintf(
			"The intracluster correlation estimate is negative (%.3f): units of one %s differ more than chance would make them; the design effect takes it as 0.",
			a.Correlation.Estimate, a.Data.By)})
	}
	if below := raoScottBelowOne(a.Data, s); below != "" {
		w = append(w, proportions.Warning{Code: WarnDesignEffectBelowOne, Message: below})
	}
	if m := min(len(a.Data.Group1), len(a.Data.Group2)); m < FewClusters {
		w = append(w, proportions.Warning{Code: WarnFewClusters, Message: fmt.Sprintf(
			"A group has only %d %s: the clustered intervals and tests estimate the variation between %s from few values; the %s-level t test is the safer guide.",
			m, plural(a.Data.By, m), plural(a.Data.By, 2), a.Data.By)})
	}
	return w
}

// raoScottBelowOne says which groups have a Rao–Scott design effect below
// 1 and what that does, or "" when none has.
func raoScottBelowOne(d Data, s Summary) string {
	var parts []string
	for i, g := range []GroupSummary{s.Group1, s.Group2} {
		if rs := raoScottDesignEffect(g); rs < 1 {
			parts = append(parts, fmt.Sprintf("%.2f in %s (%d units counted as about %s)",
				rs, []string{d.First, d.Second}[i], g.Trials, roundCount(float64(g.Trials)/rs)))
		}
	}
	if len(parts) == 0 {
		return ""
	}
	return fmt.Sprintf("The Rao–Scott design effect is below 1, %s: the %s' counts vary less than independent units' would, so the Rao–Scott interval and test count the units as worth more than independent ones and are narrower than the unit-level answers. With few %s this is most likely chance; the design-effect methods (which take a negative correlation as 0) and the %s-level t do not narrow this way.",
		strings.Join(parts, " and "), plural(d.By, 2), plural(d.By, 2), d.By)
}

// FlagIgnoredClusters returns a unit-level analysis of the pooled counts
// of clustered data with a warning (code WarnClustersIgnored) that it
// treats the units as independent, saying what they are worth: the path
// by which a single-table result card tells its reader that the data carry
// a cluster column. The analysis is otherwise unchanged. Data without at
// least two clusters per group, or whose intracluster correlation cannot
// be estimated, get the warning without the estimate of their worth.
func FlagIgnoredClusters(a proportions.Analysis, d Data) proportions.Analysis {
	msg := fmt.Sprintf("These units come in %d %s and are analysed here as if independent; ", len(d.Group1)+len(d.Group2), plural(d.By, 2))
	s := Summarize(d)
	if s.Check() == nil {
		if r := ANOVACorrelation(s, 0.95); r.Defined {
			rho := usableRho(r.Estimate)
			e := GroupDesignEffect(s.Group1, rho).EffectiveSize + GroupDesignEffect(s.Group2, rho).EffectiveSize
			msg += EffectiveSentence(d, e) + ". "
		}
	}
	msg += "Use the clustered analysis (clusters.Analyze) for intervals and tests that account for them."
	a.Warnings = append(append([]proportions.Warning(nil), a.Warnings...), proportions.Warning{Code: WarnClustersIgnored, Message: msg})
	return a
}

// conclusion reads the headline clustered answers in plain words; a
// non-rejection is never read as equality.
func (a Analysis) conclusion() string {
	iv, t := a.Interval, a.Test
	verdict := "the data do not show a difference"
	if t.Reject {
		verdict = "the rates differ"
	}
	// Numbers as the cards print them (proportions/reader_numbers.go):
	// signed percentage points, the typographic minus, p at four decimals.
	return fmt.Sprintf("Accounting for the %s, %s minus %s in the rate of %s is %s percentage points (%s%% interval %s to %s, %s); %s %s: %s at the %s%% level.",
		plural(a.Data.By, 2), a.Data.First, a.Data.Second, a.Data.Event,
		proportions.FormatPoints(iv.Estimate, 1), percent(iv.Level), proportions.FormatPoints(iv.Lower, 1), proportions.FormatPoints(iv.Upper, 1), iv.MethodName,
		t.MethodName, proportions.PValueClause(t.PValue), verdict, percent(1-a.Level))
}

func percent(v float64) string { return fmt.Sprintf("%g", math.Round(1000*v)/10) }

// MarshalJSON writes the analysis with every list present ([] never null).
func (a Analysis) MarshalJSON() ([]byte, error) {
	type plain Analysis // without this method
	p := plain(a)
	p.Data.Group1 = jsonlist.NonNil(p.Data.Group1)
	p.Data.Group2 = jsonlist.NonNil(p.Data.Group2)
	p.OtherCorrelations = jsonlist.NonNil(p.OtherCorrelations)
	p.Intervals = jsonlist.NonNil(p.Intervals)
	p.Tests = jsonlist.NonNil(p.Tests)
	p.Warnings = jsonlist.NonNil(p.Warnings)
	return json.Marshal(p)
}
