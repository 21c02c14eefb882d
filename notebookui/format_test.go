package notebookui

import (
	"html"
	"math"
	"math/rand/v2"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/bayes"
)

// parseShown reads a number back as a reader would: the typographic minus
// is a minus, a leading plus is a plus.
func parseShown(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(strings.Replace(strings.TrimPrefix(s, "+"), minus, "-", 1), 64)
	if err != nil {
		t.Fatalf("%q does not read as a number: %v", s, err)
	}
	return v
}

// decimalsOf counts the digits after the point.
func decimalsOf(s string) int {
	_, frac, ok := strings.Cut(s, ".")
	if !ok {
		return 0
	}
	return len(strings.TrimRight(frac, "%"))
}

// TestNumberStyle checks the number style of format.go over many values:
// every sign is the typographic minus or an explicit plus on a
// difference, each kind keeps its decimals (trailing zeros included), the
// shown number is the value rounded half a last digit at most, and small
// p-values read "< 0.0001".
func TestNumberStyle(t *testing.T) {
	rng := rand.New(rand.NewPCG(19, 7))
	values := []float64{0, math.Copysign(0, -1), 1e-9, -1e-9, 0.00049, -0.00049, 0.0005, 0.1, -0.1, 0.15, -0.999, 1, -1}
	for range 20_000 {
		values = append(values, 2*rng.Float64()-1, (2*rng.Float64()-1)*math.Pow(10, -6*rng.Float64()))
	}
	for _, d := range values {
		for _, dec := range []int{1, 2} {
			s := points(d, dec)
			if strings.Contains(s, "-") {
				t.Fatalf("points(%v) = %q carries a hyphen", d, s)
			}
			if decimalsOf(s) != dec {
				t.Fatalf("points(%v, %d) = %q: wrong number of decimals", d, dec, s)
			}
			half := 0.5 * math.Pow(10, -float64(dec))
			if got := parseShown(t, s); math.Abs(got-100*d) > half+1e-9 {
				t.Fatalf("points(%v) = %q reads %v", d, s, got)
			}
			zero := strings.Trim(s, "0.") == ""
			switch {
			case zero && (strings.HasPrefix(s, "+") || strings.HasPrefix(s, minus)):
				t.Fatalf("points(%v) = %q: a signed zero", d, s)
			case !zero && d > 0 && !strings.HasPrefix(s, "+"):
				t.Fatalf("points(%v) = %q: a positive difference without its plus", d, s)
			case !zero && d < 0 && !strings.HasPrefix(s, minus):
				t.Fatalf("points(%v) = %q: a negative difference without the minus sign", d, s)
			}
		}
		if r := ratio(math.Abs(d) * 10); decimalsOf(r) != 3 || strings.Contains(r, "-") {
			t.Fatalf("ratio(%v) = %q", math.Abs(d)*10, r)
		}
		p := math.Abs(d)
		ps := pValue(p)
		switch {
		case p < 0.00005:
			if ps != "< 0.0001" {
				t.Fatalf("pValue(%v) = %q, want the floor", p, ps)
			}
		case decimalsOf(ps) != 4 || strings.ContainsAny(ps, "e-"):
			t.Fatalf("pValue(%v) = %q: want four decimals and no exponent", p, ps)
		case math.Abs(parseShown(t, ps)-p) > 0.00005+1e-12:
			t.Fatalf("pValue(%v) = %q", p, ps)
		}
		st := statistic(proportions.TestResult{StatisticName: "z", Statistic: 10 * d})
		if v := strings.TrimPrefix(st, "z = "); decimalsOf(v) != statDecimals || strings.Contains(v, "-") {
			t.Fatalf("statistic(%v) = %q", 10*d, st)
		}
	}
	for _, c := range []struct {
		v    float64
		want string
	}{{1.907e-6, "1.907 × 10⁻⁶"}, {1.083e-5, "1.083 × 10⁻⁵"}, {0.07368, "0.07368"}, {-2.5e7, minus + "2.500 × 10⁷"}} {
		if got := sci(c.v, 4); got != c.want {
			t.Errorf("sci(%v) = %q, want %q", c.v, got, c.want)
		}
	}
}

var (
	hyphenNumber = regexp.MustCompile(`(^|[\s(=:])-\d`)
	exponent     = regexp.MustCompile(`\d[eE][-+−]?\d`)
	conclusionCI = regexp.MustCompile(`confidence interval (\S+) to (\S+)\)`)
)

// TestCardsSpeakOneNumberStyle renders the card of many analyses in every
// form and checks what a reader sees: no hyphen as a minus, no exponent,
// the conclusion's interval the same as the card's headline interval, and
// every p-value in the tests table in the one p-value format.
func TestCardsSpeakOneNumberStyle(t *testing.T) {
	rng := rand.New(rand.NewPCG(4, 19))
	pCell := regexp.MustCompile(`^(< 0\.0001|[01]\.\d{4})$`)
	for i := range 60 {
		n1, n2 := 1+rng.IntN(60), 1+rng.IntN(60)
		x1, x2 := rng.IntN(n1+1), rng.IntN(n2+1)
		c, err := proportions.NewComparison(int64(x1), int64(n1), int64(x2), int64(n2),
			proportions.Labels{First: "coated", Second: "bare", Event: "germinated"})
		if err != nil {
			t.Fatal(err)
		}
		opts := []proportions.Option{}
		if i%3 == 0 {
			opts = append(opts, proportions.WithNull(-0.1), proportions.WithAlternative(proportions.Greater))
		}
		if i%10 == 0 {
			opts = append(opts, proportions.WithScope(proportions.ScopeAll))
		}
		a, err := proportions.Analyze(c, opts...)
		if err != nil {
			t.Fatal(err)
		}
		card := NewResultCard(a)
		v := card.view()
		for form, s := range map[string]string{"text": card.Text(), "markdown": strings.ReplaceAll(card.Markdown(), `\`, ""),
			"html": html.UnescapeString(card.HTML())} {
			if m := hyphenNumber.FindString(s); m != "" {
				t.Errorf("%d/%d vs %d/%d, %s: a hyphen as a minus sign (%q)", x1, n1, x2, n2, form, m)
			}
			if m := exponent.FindString(s); m != "" {
				t.Errorf("%d/%d vs %d/%d, %s: an exponent (%q)", x1, n1, x2, n2, form, m)
			}
		}
		if m := conclusionCI.FindStringSubmatch(a.Conclusion); m == nil || m[1] != v.Lower || m[2] != v.Upper {
			t.Errorf("%d/%d vs %d/%d: the conclusion gives the interval as %q, the card as %s to %s", x1, n1, x2, n2, m, v.Lower, v.Upper)
		}
		if !strings.Contains(a.Conclusion, a.Test.MethodName) {
			t.Errorf("the conclusion does not name the headline test %q: %s", a.Test.MethodName, a.Conclusion)
		}
		for _, r := range v.Tests {
			if !pCell.MatchString(r.P) {
				t.Errorf("%s: p-value cell %q", r.Name, r.P)
			}
		}
	}
}

// TestBayesCardSpeaksTheNumberStyle: the Bayesian card of several
// analyses shows no hyphen as a minus and no exponent in any form.
func TestBayesCardSpeaksTheNumberStyle(t *testing.T) {
	for _, c := range [][4]int64{{41, 50, 33, 50}, {0, 12, 9, 12}, {3, 40, 30, 41}} {
		cmp, err := proportions.NewComparison(c[0], c[1], c[2], c[3], proportions.Labels{First: "whip", Second: "cleft", Event: "took"})
		if err != nil {
			t.Fatal(err)
		}
		a, err := bayes.Analyze(cmp, bayes.WithEquivalence(-0.05, 0.05))
		if err != nil {
			t.Fatal(err)
		}
		card := NewBayesCard(a)
		for form, s := range map[string]string{"text": card.Text(), "markdown": strings.ReplaceAll(card.Markdown(), `\`, ""),
			"html": html.UnescapeString(card.HTML())} {
			if m := hyphenNumber.FindString(s); m != "" {
				t.Errorf("%v, %s: a hyphen as a minus sign (%q)", c, form, m)
			}
			if m := exponent.FindString(s); m != "" {
				t.Errorf("%v, %s: an exponent (%q)", c, form, m)
			}
		}
	}
}

// TestViewsSpeakTheNumberStyle: the text and Markdown forms of every view
// that shows labels (cards, charts' notes and tables, explorer frames) use
// no hyphen as a minus and no exponent.
func TestViewsSpeakTheNumberStyle(t *testing.T) {
	names, ds := labelViews(t, "coated", "bare", "germinated")
	for i, d := range ds {
		for form, s := range map[string]string{"text": d.Text(), "markdown": strings.ReplaceAll(d.Markdown(), `\`, "")} {
			if m := hyphenNumber.FindString(s); m != "" {
				t.Errorf("%s, %s: a hyphen as a minus sign (%q)", names[i], form, m)
			}
			if m := exponent.FindString(s); m != "" {
				t.Errorf("%s, %s: an exponent (%q)", names[i], form, m)
			}
		}
	}
}

// TestStatisticColumnSaysWhatItIs: on a zero-cell table with every method,
// Fisher's rows show no statistic (never the probability of the observed
// table beside the p-value), the unpooled Barnard statistic is not printed
// as an infinity, and a note says why in words.
func TestStatisticColumnSaysWhatItIs(t *testing.T) {
	c, err := proportions.NewComparison(0, 20, 20, 20, proportions.Labels{First: "coated", Second: "bare", Event: "germinated"})
	if err != nil {
		t.Fatal(err)
	}
	a, err := proportions.Analyze(c, proportions.WithScope(proportions.ScopeAll))
	if err != nil {
		t.Fatal(err)
	}
	card := NewResultCard(a)
	text := card.Text()
	if strings.Contains(text, "P(observed table)") {
		t.Errorf("the card shows the probability of the observed table:\n%s", text)
	}
	for _, r := range card.view().Tests {
		if strings.Contains(r.Statistic, "∞") {
			t.Errorf("%s: statistic %q", r.Name, r.Statistic)
		}
		if strings.HasPrefix(r.Name, "Fisher") && r.Statistic != "—" {
			t.Errorf("%s: statistic %q, want —", r.Name, r.Statistic)
		}
	}
	for _, want := range []string{"no test statistic (—)", "has no finite value at these counts", "Fisher's p-value, used only to order"} {
		if !strings.Contains(strings.Join(strings.Fields(text), " "), want) {
			t.Errorf("the card does not say %q", want)
		}
	}
}
