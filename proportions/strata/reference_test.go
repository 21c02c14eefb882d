package strata

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"testing"

	"github.com/propscope/propscope/internal/special"
	"github.com/propscope/propscope/proportions"
)

// scipyChecks are the values of testdata/reference/strata-scipy.json,
// computed by strata_scipy.py with SciPy 1.10.1's general functions
// (nchypergeom_fisher, chi2, norm, brentq, minimize_scalar) in an
// implementation independent of this package's.
type scipyChecks struct {
	Source string `json:"source"`
	Checks []struct {
		Name  string     `json:"breakdown"`
		Rows  [][4]int64 `json:"rows"`
		Level float64    `json:"level"`
		CMH   struct {
			Statistic          float64 `json:"statistic"`
			P                  float64 `json:"p"`
			CorrectedStatistic float64 `json:"corrected_statistic"`
			CorrectedP         float64 `json:"corrected_p"`
			PGreater           float64 `json:"p_greater"`
			PLess              float64 `json:"p_less"`
			CorrectedPGreater  float64 `json:"corrected_p_greater"`
			CorrectedPLess     float64 `json:"corrected_p_less"`
		} `json:"cmh"`
		Exact struct {
			Sum      int64   `json:"sum"`
			PTwo     float64 `json:"p_two_sided"`
			PGreater float64 `json:"p_greater"`
			PLess    float64 `json:"p_less"`
			Lower    float64 `json:"lower"`
			Upper    float64 `json:"upper"`
			Estimate float64 `json:"estimate"`
		} `json:"exact"`
		BDT   chiCheck                                 `json:"breslow_day_tarone"`
		Q     chiCheck                                 `json:"cochran_q"`
		Score struct{ Estimate, Lower, Upper float64 } `json:"stratified_score"`
	} `json:"checks"`
	Tails []struct {
		X    float64 `json:"x"`
		DF   int     `json:"df"`
		P    float64 `json:"p"`
		LogP float64 `json:"log_p"`
	} `json:"chi2_tails"`
}

type chiCheck struct {
	Statistic float64 `json:"statistic"`
	DF        int     `json:"df"`
	P         float64 `json:"p"`
}

func loadSciPy(t *testing.T) scipyChecks {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "reference", "strata-scipy.json"))
	if err != nil {
		t.Fatal(err)
	}
	var doc scipyChecks
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Checks) < 4 || len(doc.Tails) < 8 {
		t.Fatalf("strata-scipy.json holds %d breakdowns and %d tails", len(doc.Checks), len(doc.Tails))
	}
	return doc
}

func breakdownOf(t *testing.T, rows [][4]int64) proportions.Breakdown {
	t.Helper()
	var rs []proportions.BreakdownRow
	for i, r := range rows {
		rs = append(rs, proportions.BreakdownRow{Value: fmt.Sprintf("s%d", i+1), Counts: proportions.Counts{X1: r[0], N1: r[1], X2: r[2], N2: r[3]}})
	}
	b, err := proportions.NewBreakdown("stratum", proportions.Labels{First: "A", Second: "B", Event: "event"}, rs)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func near(t *testing.T, what string, got, want, rel float64) {
	t.Helper()
	if math.IsInf(want, 0) && got == want {
		return
	}
	if !(math.Abs(got-want) <= rel*math.Max(math.Abs(want), 1e-300)) {
		t.Errorf("%s = %.15g, want %.15g (SciPy), relative error %.2g > %.0g", what, got, want, math.Abs(got-want)/math.Abs(want), rel)
	}
}

func findTest(t *testing.T, ts []Test, key string) Test {
	t.Helper()
	for _, x := range ts {
		if x.Key == key {
			return x
		}
	}
	t.Fatalf("no test %q", key)
	return Test{}
}

func findEstimate(t *testing.T, es []Estimate, key string) Estimate {
	t.Helper()
	for _, e := range es {
		if e.Key == key {
			return e
		}
	}
	t.Fatalf("no estimate %q", key)
	return Estimate{}
}

// The tests and intervals against SciPy 1.10.1 (strata-scipy.json).
func TestAgainstSciPy(t *testing.T) {
	doc := loadSciPy(t)
	for _, c := range doc.Checks {
		b := breakdownOf(t, c.Rows)
		for _, alt := range []proportions.Alternative{proportions.TwoSided, proportions.Greater, proportions.Less} {
			level := c.Level
			if alt != proportions.TwoSided {
				level = (1 + c.Level) / 2 // intervals at 1 − 2α = c.Level
			}
			a, err := Analyze(b, proportions.WithLevel(level), proportions.WithAlternative(alt))
			if err != nil {
				t.Fatal(err)
			}
			cmh := findTest(t, a.Tests, CMHKey)
			cc := findTest(t, a.Tests, CMHCorrectedKey)
			ex := findTest(t, a.Tests, ExactTestKey)
			name := c.Name + " " + alt.String()
			switch alt {
			case proportions.TwoSided:
				near(t, name+" CMH X²", cmh.Statistic, c.CMH.Statistic, 1e-12)
				near(t, name+" CMH p", cmh.PValue, c.CMH.P, 1e-10)
				near(t, name+" corrected CMH X²", cc.Statistic, c.CMH.CorrectedStatistic, 1e-12)
				near(t, name+" corrected CMH p", cc.PValue, c.CMH.CorrectedP, 1e-10)
				near(t, name+" exact p", ex.PValue, c.Exact.PTwo, 1e-9)
			case proportions.Greater:
				near(t, name+" CMH p", cmh.PValue, c.CMH.PGreater, 1e-10)
				near(t, name+" corrected CMH p", cc.PValue, c.CMH.CorrectedPGreater, 1e-10)
				near(t, name+" exact p", ex.PValue, c.Exact.PGreater, 1e-9)
			case proportions.Less:
				near(t, name+" CMH p", cmh.PValue, c.CMH.PLess, 1e-10)
				near(t, name+" corrected CMH p", cc.PValue, c.CMH.CorrectedPLess, 1e-10)
				near(t, name+" exact p", ex.PValue, c.Exact.PLess, 1e-9)
			}
			if ex.Statistic != float64(c.Exact.Sum) {
				t.Errorf("%s: Σx1 = %v, want %d", name, ex.Statistic, c.Exact.Sum)
			}
			or := findEstimate(t, a.Estimates, ExactOddsRatioKey)
			near(t, name+" exact lower", or.Lower, c.Exact.Lower, 1e-8)
			near(t, name+" exact upper", or.Upper, c.Exact.Upper, 1e-8)
			near(t, name+" conditional MLE", or.Estimate, c.Exact.Estimate, 1e-8)
			s := findEstimate(t, a.Estimates, ScoreKey)
			near(t, name+" score estimate", s.Estimate, c.Score.Estimate, 1e-12)
			near(t, name+" score lower", s.Lower, c.Score.Lower, 1e-7)
			near(t, name+" score upper", s.Upper, c.Score.Upper, 1e-7)
			bdt := findTest(t, a.Homogeneity, BreslowDayTaroneKey)
			near(t, name+" Breslow–Day–Tarone", bdt.Statistic, c.BDT.Statistic, 1e-8)
			near(t, name+" Breslow–Day–Tarone p", bdt.PValue, c.BDT.P, 1e-7)
			q := findTest(t, a.Homogeneity, CochranQKey)
			near(t, name+" Cochran Q", q.Statistic, c.Q.Statistic, 1e-10)
			near(t, name+" Cochran Q p", q.PValue, c.Q.P, 1e-9)
			if bdt.DF != c.BDT.DF || q.DF != c.Q.DF {
				t.Errorf("%s: df %d and %d, want %d and %d", name, bdt.DF, q.DF, c.BDT.DF, c.Q.DF)
			}
		}
	}
}

// The chi-square tail for any df against scipy.stats.chi2.sf and logsf.
func TestChiSquareTailAgainstSciPy(t *testing.T) {
	for _, c := range loadSciPy(t).Tails {
		p, logp := special.ChiSquareUpperTail(c.X, c.DF)
		near(t, fmt.Sprintf("P(χ²(%d) ≥ %v)", c.DF, c.X), p, c.P, 1e-10)
		near(t, fmt.Sprintf("log P(χ²(%d) ≥ %v)", c.DF, c.X), logp, c.LogP, 1e-10)
	}
}
