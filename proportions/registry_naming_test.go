package proportions_test

import (
	"encoding/json"
	"go/ast"
	"go/parser"
	"go/token"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/operating"
	"github.com/propscope/propscope/proportions/planning"
)

// The registry's naming scheme (see GLOSSARY.md, "method key"): a key is
// lower-case words joined by hyphens, spelled out (no abbreviations such as
// "mn" or "fm"), and ends with its scale and kind: nothing for an interval
// on the difference scale, "-ratio", "-odds-ratio" or "-rate" for an
// interval on those scales, and the same followed by "-test" for a test.
var keyWord = regexp.MustCompile(`^[a-z0-9]+(-[a-z0-9.]+)*$`)

// abbreviations that a key must spell out; "cc" (continuity correction),
// "mid-p" and "bb" (Berger–Boos, with its γ) are the published short forms.
var abbreviations = map[string]bool{"mn": true, "fm": true, "g": true, "midp": true, "ac": true, "nc": true, "cp": true}

func scaleSuffix(s proportions.Scale) string {
	switch s {
	case proportions.Ratio:
		return "-ratio"
	case proportions.OddsRatio:
		return "-odds-ratio"
	case proportions.SingleRate:
		return "-rate"
	}
	return ""
}

// checkKey reports what is wrong with a key for its scale and kind.
func checkKey(t *testing.T, key string, s proportions.Scale, test bool) {
	t.Helper()
	if !keyWord.MatchString(key) {
		t.Errorf("key %q: not lower-case words joined by hyphens", key)
		return
	}
	for _, w := range strings.Split(key, "-") {
		if abbreviations[w] {
			t.Errorf("key %q: abbreviation %q; spell it out", key, w)
		}
	}
	want := scaleSuffix(s)
	if test {
		want += "-test"
	}
	base, ok := strings.CutSuffix(key, want)
	if !ok || base == "" {
		t.Errorf("key %q (%s scale, test %v): must end in %q", key, s, test, want)
		return
	}
	for _, other := range []string{"-ratio", "-odds-ratio", "-rate", "-test"} {
		if strings.HasSuffix(base, other) {
			t.Errorf("key %q: a %s-scale method carries the suffix %q", key, s, other)
		}
	}
}

// Every registered method's key follows the scheme, and no two methods
// share a key or a display name.
func TestRegistryKeysAndNames(t *testing.T) {
	keys, names := map[string]string{}, map[string]string{}
	claim := func(key, name string) {
		if prev, ok := keys[key]; ok {
			t.Errorf("key %q used by %q and %q", key, prev, name)
		}
		keys[key] = name
		if prev, ok := names[name]; ok {
			t.Errorf("display name %q used by keys %q and %q", name, prev, key)
		}
		names[name] = key
	}
	for _, m := range proportions.TwoGroupIntervalMethods(proportions.ScopeAll) {
		checkKey(t, m.Key, m.Scale, false)
		claim(m.Key, m.Name)
	}
	for _, m := range proportions.RateMethods() {
		checkKey(t, m.Key, proportions.SingleRate, false)
		claim(m.Key, m.Name)
	}
	for _, m := range proportions.Tests() {
		checkKey(t, m.Key, m.Scale, true)
		claim(m.Key, m.Name)
	}
	// Variants built on request follow the same scheme.
	for _, v := range []proportions.UnconditionalVariant{
		{Statistic: proportions.UnpooledWald, TwoSided: proportions.TwoSidedDoubled, BergerBoosGamma: 0.001},
		{Statistic: proportions.FisherPValue, BergerBoosGamma: 0.01},
	} {
		m, err := proportions.NewUnconditionalTest(v)
		if err != nil {
			t.Fatal(err)
		}
		checkKey(t, m.Key, m.Scale, true)
	}
	if len(keys) < 30 {
		t.Errorf("only %d registered methods: the registry lists were not all read", len(keys))
	}
}

// The scheme check fails on the keys the scheme replaced (a test that
// cannot fail proves nothing).
func TestKeySchemeRejectsOldKeys(t *testing.T) {
	bad := []struct {
		key   string
		scale proportions.Scale
		test  bool
	}{
		{"mn-ratio", proportions.Ratio, false},
		{"g-test", proportions.Difference, true},
		{"score", proportions.Difference, true},
		{"fm-ratio-test", proportions.Ratio, true},
		{"wilson", proportions.SingleRate, false},
		{"Woolf", proportions.OddsRatio, false},
		{"cornfield-midp-odds-ratio", proportions.OddsRatio, false},
	}
	for _, b := range bad {
		probe := &testing.T{}
		checkKey(probe, b.key, b.scale, b.test)
		if !probe.Failed() {
			t.Errorf("scheme accepts %q", b.key)
		}
	}
}

// A registered value's Go name says what it is: every TestMethod value
// ends in "Test", and no interval or rate method's name does.
func TestRegistryGoNames(t *testing.T) {
	fset := token.NewFileSet()
	files, err := filepath.Glob("*.go")
	if err != nil {
		t.Fatal(err)
	}
	tests := 0
	for _, f := range files {
		if strings.HasSuffix(f, "_test.go") {
			continue
		}
		af, err := parser.ParseFile(fset, f, nil, 0)
		if err != nil {
			t.Fatal(err)
		}
		for _, d := range af.Decls {
			gd, ok := d.(*ast.GenDecl)
			if !ok || gd.Tok != token.VAR {
				continue
			}
			for _, sp := range gd.Specs {
				vs := sp.(*ast.ValueSpec)
				for i, name := range vs.Names {
					if !name.IsExported() || i >= len(vs.Values) {
						continue
					}
					lit, ok := vs.Values[i].(*ast.CompositeLit)
					if !ok {
						continue
					}
					typ, ok := lit.Type.(*ast.Ident)
					if !ok {
						continue
					}
					switch typ.Name {
					case "TestMethod":
						tests++
						if !strings.HasSuffix(name.Name, "Test") {
							t.Errorf("%s: test value %s must end in Test", f, name.Name)
						}
					case "IntervalMethod", "RateMethod":
						if strings.HasSuffix(name.Name, "Test") {
							t.Errorf("%s: interval value %s ends in Test", f, name.Name)
						}
					}
				}
			}
		}
	}
	if tests != len(proportions.Tests()) {
		t.Errorf("%d TestMethod values in the source, %d registered tests: every registered test must be a named value", tests, len(proportions.Tests()))
	}
}

// Every JSON field named "method" holds a registry key, in every result the
// library marshals: analyses, plans and the engine's results.
func TestJSONMethodIsRegistryKey(t *testing.T) {
	var docs [][]byte
	add := func(v any, err error) {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
		b, err := json.Marshal(v)
		if err != nil {
			t.Fatal(err)
		}
		docs = append(docs, b)
	}
	for _, c := range [][4]int64{{0, 5, 3, 5}, {12, 20, 4, 20}, {41, 50, 33, 50}, {5, 5, 0, 7}} {
		cmp, err := proportions.NewComparison(c[0], c[1], c[2], c[3], proportions.Labels{})
		if err != nil {
			t.Fatal(err)
		}
		add(proportions.Analyze(cmp, proportions.WithScope(proportions.ScopeAll), proportions.WithYatesTest(true)))
		add(proportions.NumberNeededToTreat(cmp, proportions.Newcombe, proportions.HigherIsBetter))
	}
	plan := planning.NewPlan(planning.Equality, 0.6, 0.4)
	add(planning.ExactPower(t.Context(), plan, proportions.FisherTest, 20, 20))
	add(planning.ExactPowerByTrials(t.Context(), plan, proportions.FarringtonManningTest, 10, 14))
	d, err := operating.NewDesign(10, 12, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	add(operating.Coverage(proportions.Wald, d, 0.3, 0.4))
	rec, err := operating.Recommend(t.Context(), proportions.Difference, d, operating.WithGrid([]float64{0.2, 0.5}, []float64{0.2, 0.5}))
	add(rec, err)
	h, err := proportions.FisherTest.Hypothesis(proportions.Settings{Level: 0.95})
	if err != nil {
		t.Fatal(err)
	}
	add(operating.TypeIError(t.Context(), proportions.FisherTest, 8, 8, h))

	seen := 0
	var walk func(path string, v any)
	walk = func(path string, v any) {
		switch x := v.(type) {
		case map[string]any:
			for k, e := range x {
				if k == "method" {
					s, ok := e.(string)
					if !ok {
						t.Errorf("%s.method is %T, not a key", path, e)
						continue
					}
					seen++
					_, e1 := proportions.LookupInterval(s)
					_, e2 := proportions.LookupRate(s)
					_, e3 := proportions.LookupTest(s)
					if e1 != nil && e2 != nil && e3 != nil {
						t.Errorf("%s.method = %q is not a registry key", path, s)
					}
				}
				walk(path+"."+k, e)
			}
		case []any:
			for _, e := range x {
				walk(path+"[]", e)
			}
		}
	}
	for _, b := range docs {
		var v any
		if err := json.Unmarshal(b, &v); err != nil {
			t.Fatal(err)
		}
		walk("$", v)
	}
	if seen < 100 {
		t.Errorf("only %d method fields seen", seen)
	}
}
