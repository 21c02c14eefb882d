package schema_test

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"regexp"
	"runtime"
	"slices"
	"sort"
	"strings"
	"sync"
	"testing"

	"github.com/santhosh-tekuri/jsonschema/v6"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/bayes"
	"github.com/propscope/propscope/proportions/clusters"
	"github.com/propscope/propscope/proportions/clusters/simulate"
	"github.com/propscope/propscope/proportions/operating"
	"github.com/propscope/propscope/proportions/planning"
	"github.com/propscope/propscope/proportions/schema"
	"github.com/propscope/propscope/proportions/segments"
	"github.com/propscope/propscope/proportions/strata"
)

// The schemas are written by hand from the documented meaning of each
// field; these tests hold the library's JSON to them with an independent
// validator (santhosh-tekuri/jsonschema, which passes the JSON Schema test
// suite for draft 2020-12). A mismatch means either the JSON changed
// without its documentation or the documentation is wrong: both must be
// fixed together.

// base is where the test registers the schema files: a reserved domain
// (RFC 2606), so nothing is ever fetched; the schemas' relative references
// resolve against it.
const base = "https://schema.propscope.invalid/"

// allNames lists the package's constants, so that a schema file without a
// constant (or a constant without a file) fails TestNames.
var allNames = []string{
	schema.Common, schema.Analysis, schema.Interval, schema.TestResult, schema.NumberNeeded,
	schema.SampleSize, schema.Power, schema.Detectable, schema.PowerCurve, schema.ExactPower,
	schema.ExactSampleSize, schema.CoveragePoint, schema.CoverageSurface, schema.CoverageSlice,
	schema.TypeIError, schema.Recommendation, schema.RejectionRegion, schema.Method, schema.Bayes, schema.Breakdown, schema.Clusters,
	schema.Simulation, schema.SimulationCurve,
	schema.Segments, schema.SegmentsSummary, schema.Segment, schema.AdjustedSegment,
	schema.ClusteredSampleSize, schema.ClusteredPower, schema.Stratified,
}

// optionalFields are the only fields the library may leave out of an
// object (they carry omitempty in Go): every other documented field must
// be required.
var optionalFields = map[string]bool{"df": true, "critical_value": true, "nuisance": true, "p_value_bound": true, "nntb": true, "nnth": true,
	"trial_limit": true, "symmetric": true, "continuity_corrected": true}

func compileAll(t *testing.T) map[string]*jsonschema.Schema {
	t.Helper()
	c := jsonschema.NewCompiler()
	for _, name := range schema.Names() {
		b, err := schema.Get(name)
		if err != nil {
			t.Fatal(err)
		}
		doc, err := jsonschema.UnmarshalJSON(bytes.NewReader(b))
		if err != nil {
			t.Fatalf("%s: %v", schema.FileName(name), err)
		}
		if err := c.AddResource(base+schema.FileName(name), doc); err != nil {
			t.Fatalf("%s: %v", schema.FileName(name), err)
		}
	}
	out := map[string]*jsonschema.Schema{}
	for _, name := range schema.Names() {
		s, err := c.Compile(base + schema.FileName(name))
		if err != nil {
			t.Fatalf("%s does not compile: %v", schema.FileName(name), err)
		}
		out[name] = s
	}
	return out
}

func TestNames(t *testing.T) {
	want := slices.Clone(allNames)
	slices.Sort(want)
	if got := schema.Names(); !slices.Equal(got, want) {
		t.Errorf("Names() = %v, want the constants %v", got, want)
	}
	if _, err := schema.Get("no-such-result"); !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("Get of an unknown name: %v, want an error wrapping fs.ErrNotExist", err)
	}
	for _, name := range allNames {
		b, err := schema.Get(name)
		if err != nil {
			t.Fatal(err)
		}
		fromFS, err := fs.ReadFile(schema.FS(), schema.FileName(name))
		if err != nil || !bytes.Equal(b, fromFS) {
			t.Errorf("%s: FS and Get disagree (%v)", name, err)
		}
	}
}

var snakeCase = regexp.MustCompile(`^[a-z][a-z0-9]*(_[a-z0-9]+)*$`)

// TestSchemaRules checks the conventions every schema keeps (see the
// package documentation) on the schema files themselves.
func TestSchemaRules(t *testing.T) {
	docs := map[string]any{}
	for _, name := range schema.Names() {
		b, _ := schema.Get(name)
		var doc any
		if err := json.Unmarshal(b, &doc); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		docs[schema.FileName(name)] = doc
	}
	for file, doc := range docs {
		root := doc.(map[string]any)
		if root["$schema"] != "https://json-schema.org/draft/2020-12/schema" {
			t.Errorf("%s: $schema %v, want draft 2020-12", file, root["$schema"])
		}
		for _, k := range []string{"title", "description"} {
			if s, _ := root[k].(string); s == "" {
				t.Errorf("%s: no %s", file, k)
			}
		}
		if _, ok := root["$id"]; ok {
			t.Errorf("%s: has an $id; the references are relative to where the files are loaded", file)
		}
		walkSchema(t, docs, file, "", root)
	}
}

func walkSchema(t *testing.T, docs map[string]any, file, at string, node any) {
	switch n := node.(type) {
	case []any:
		for i, v := range n {
			walkSchema(t, docs, file, fmt.Sprintf("%s/%d", at, i), v)
		}
		return
	case map[string]any:
		where := file + "#" + at
		if ref, ok := n["$ref"].(string); ok && !resolves(docs, file, ref) {
			t.Errorf("%s: $ref %q does not resolve", where, ref)
		}
		if defs, ok := n["$defs"].(map[string]any); ok {
			for k, d := range defs {
				if s, _ := d.(map[string]any)["description"].(string); s == "" {
					t.Errorf("%s: definition %s has no description", where, k)
				}
			}
		}
		// The conditions of if/then/else restate fields described beside
		// them; every other list of properties is a description of fields.
		conditional := strings.HasSuffix(at, "/if") || strings.HasSuffix(at, "/then") || strings.HasSuffix(at, "/else")
		if props, ok := n["properties"].(map[string]any); ok && !conditional {
			for k, p := range props {
				if !snakeCase.MatchString(k) {
					t.Errorf("%s: property %q is not snake_case", where, k)
				}
				if s, _ := p.(map[string]any)["description"].(string); s == "" {
					t.Errorf("%s: property %q has no description", where, k)
				}
			}
		}
		switch n["type"] {
		case "object":
			props, _ := n["properties"].(map[string]any)
			if n["additionalProperties"] != false || props == nil {
				t.Errorf("%s: an object needs its properties and additionalProperties false", where)
			}
			required := map[string]bool{}
			req, _ := n["required"].([]any)
			for _, r := range req {
				required[r.(string)] = true
				if _, ok := props[r.(string)]; !ok {
					t.Errorf("%s: required %q is not a property", where, r)
				}
			}
			for k := range props {
				if !required[k] && !optionalFields[k] {
					t.Errorf("%s: property %q is not required; the library always writes it", where, k)
				}
			}
		case "array":
			if _, ok := n["items"]; !ok {
				t.Errorf("%s: an array needs items", where)
			}
		}
		for k, v := range n {
			walkSchema(t, docs, file, at+"/"+k, v)
		}
	}
}

// resolves follows a reference of the forms the schemas use:
// "#/$defs/NAME" and "FILE#/$defs/NAME".
func resolves(docs map[string]any, file, ref string) bool {
	target, pointer, _ := strings.Cut(ref, "#")
	if target == "" {
		target = file
	}
	node, ok := docs[target]
	for _, part := range strings.Split(strings.TrimPrefix(pointer, "/"), "/") {
		if !ok || part == "" {
			break
		}
		node, ok = node.(map[string]any)[part]
	}
	return ok
}

// corpus validates documents and records what they contain, so that the
// test can tell whether every documented field and enumerated value was
// met.
type corpus struct {
	t       *testing.T
	schemas map[string]*jsonschema.Schema
	count   map[string]int
	keys    map[string]bool
	strs    map[string]bool
	failed  int
}

func (c *corpus) check(name string, result any) {
	c.t.Helper()
	b, err := json.Marshal(result)
	if err != nil {
		c.t.Fatalf("%s: marshal: %v", name, err)
	}
	doc, err := jsonschema.UnmarshalJSON(bytes.NewReader(b))
	if err != nil {
		c.t.Fatalf("%s: %v", name, err)
	}
	if err := c.schemas[name].Validate(doc); err != nil {
		c.failed++
		if c.failed <= 5 {
			if len(b) > 3000 {
				b = append(b[:3000], "..."...)
			}
			c.t.Errorf("%s: the library's JSON fails its schema: %v\n%s", name, err, b)
		}
		return
	}
	c.count[name]++
	c.record(doc)
}

func (c *corpus) record(v any) {
	switch v := v.(type) {
	case map[string]any:
		for k, x := range v {
			c.keys[k] = true
			c.record(x)
		}
	case []any:
		for _, x := range v {
			c.record(x)
		}
	case string:
		c.strs[v] = true
	}
}

// parallelMap computes f over the inputs on every core, in order: the
// exact methods of the analyses dominate the test's time.
func parallelMap[In, Out any](in []In, f func(In) Out) []Out {
	out := make([]Out, len(in))
	var wg sync.WaitGroup
	next := make(chan int)
	for range runtime.GOMAXPROCS(0) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				out[i] = f(in[i])
			}
		}()
	}
	for i := range in {
		next <- i
	}
	close(next)
	wg.Wait()
	return out
}

type analysisCase struct {
	comparison proportions.Comparison
	opts       []proportions.Option
}

type analysisOut struct {
	a   proportions.Analysis
	err error
}

func analysisCases(t *testing.T) []analysisCase {
	all := []proportions.Option{proportions.WithScope(proportions.ScopeAll)}
	var cases []analysisCase
	// Every table with up to 6 trials per group, where the exact methods
	// matter most.
	for n1 := int64(1); n1 <= 6; n1++ {
		for n2 := int64(1); n2 <= 6; n2++ {
			for x1 := int64(0); x1 <= n1; x1++ {
				for x2 := int64(0); x2 <= n2; x2++ {
					cases = append(cases, analysisCase{comparison(t, [4]int64{x1, n1, x2, n2}), all})
				}
			}
		}
	}
	// Zero cells, extremes and large groups under every setting.
	tables := [][4]int64{
		{0, 1, 0, 1}, {1, 1, 1, 1}, {0, 1, 1, 1}, {0, 12, 0, 9}, {12, 12, 9, 9}, {3, 20, 15, 20},
		{7, 30, 2, 25}, {0, 500, 3, 500}, {40, 60, 1, 60}, {0, 1_000_000, 0, 1_000_000},
		{1_000_000, 1_000_000, 0, 1_000_000}, {1, 1_000_000, 3, 1_000_000}, {500_000, 1_000_000, 499_000, 1_000_000},
		{1 << 40, proportions.MaxTrials, 1 << 41, proportions.MaxTrials},
	}
	scopes := []proportions.MethodScope{proportions.ScopeQuick, proportions.ScopeLargeSample, proportions.ScopeAll}
	alts := []proportions.Alternative{proportions.TwoSided, proportions.Greater, proportions.Less}
	for _, tb := range tables {
		total := tb[1] + tb[3]
		for _, level := range []float64{0.9, 0.95, 0.99} {
			for _, null := range []float64{0, 0.1, -0.25} {
				for i, alt := range alts {
					for j, scope := range scopes {
						// The exact methods cost up to a second per
						// analysis at a hundred trials, microseconds
						// elsewhere: every scope runs at every setting
						// where they are cheap (small tables) or skipped
						// (beyond their trial limits), once elsewhere.
						cheap := total <= 25 || total >= 2_000_000 || (level == 0.95 && null == 0)
						if scope == proportions.ScopeAll && (i != 0 || !cheap) {
							continue
						}
						cases = append(cases, analysisCase{comparison(t, tb), []proportions.Option{proportions.WithLevel(level), proportions.WithNull(null),
							proportions.WithAlternative(alt), proportions.WithScope(scope), proportions.WithYatesTest((i+j)%2 == 0)}})
					}
				}
			}
		}
	}
	return cases
}

func comparison(t *testing.T, tb [4]int64) proportions.Comparison {
	c, err := proportions.NewComparison(tb[0], tb[1], tb[2], tb[3], proportions.Labels{First: "coated", Second: "plain", Event: "germinated"})
	if err != nil {
		t.Fatal(err)
	}
	return c
}

func checkAnalyses(t *testing.T, c *corpus) {
	cases := analysisCases(t)
	outs := parallelMap(cases, func(k analysisCase) analysisOut {
		a, err := proportions.Analyze(k.comparison, k.opts...)
		return analysisOut{a, err}
	})
	for i, o := range outs {
		if o.err != nil {
			t.Fatalf("Analyze %v: %v", cases[i].comparison, o.err)
		}
		c.check(schema.Analysis, o.a)
		// The number needed to treat from the headline interval, both ways
		// round, and the headline pair on their own.
		for _, better := range []proportions.Better{proportions.HigherIsBetter, proportions.LowerIsBetter} {
			nn, err := proportions.NumberNeededFromInterval(o.a.Interval, proportions.Labels{}, better)
			if err != nil {
				t.Fatal(err)
			}
			c.check(schema.NumberNeeded, nn)
		}
		c.check(schema.Interval, o.a.Interval)
		c.check(schema.TestResult, o.a.Test)
	}
	// The undercoverage check adds its warnings to small analyses.
	ctx := context.Background()
	for _, tb := range [][4]int64{{1, 8, 6, 9}, {0, 10, 2, 12}, {5, 15, 9, 14}} {
		a, err := proportions.Analyze(comparison(t, tb))
		if err != nil {
			t.Fatal(err)
		}
		if err := operating.CheckAnalysis(ctx, &a); err != nil {
			t.Fatal(err)
		}
		c.check(schema.Analysis, a)
	}
}

// checkMethods runs every registered interval method and test on its own,
// the ratio and odds-ratio tests (which the analysis leaves out) among
// them.
func checkMethods(t *testing.T, c *corpus) {
	var intervals []proportions.IntervalMethod
	for _, s := range []proportions.Scale{proportions.Difference, proportions.Ratio, proportions.OddsRatio} {
		intervals = append(intervals, proportions.IntervalMethods(s, proportions.ScopeAll)...)
	}
	tables := []proportions.Counts{{X1: 0, N1: 4, X2: 0, N2: 5}, {X1: 4, N1: 4, X2: 5, N2: 5}, {X1: 0, N1: 7, X2: 7, N2: 7},
		{X1: 3, N1: 9, X2: 6, N2: 8}, {X1: 30, N1: 90, X2: 45, N2: 80}}
	for _, k := range tables {
		for _, m := range intervals {
			for _, level := range []float64{0.9, 0.99} {
				iv, err := m.Interval(k, level)
				if err != nil {
					t.Fatalf("%s: %v", m.Key, err)
				}
				c.check(schema.Interval, iv)
			}
		}
		for _, m := range proportions.RateMethods() {
			iv, err := m.Interval(k.X1, k.N1, 0.95)
			if err != nil {
				t.Fatal(err)
			}
			c.check(schema.Interval, iv)
		}
		for _, m := range proportions.Tests() {
			nulls := []float64{m.Scale.NoEffect()}
			if m.Margins {
				if m.Scale == proportions.Difference {
					nulls = append(nulls, -0.2, 0.3)
				} else {
					nulls = append(nulls, 0.5, 2)
				}
			}
			for _, null := range nulls {
				for _, alt := range []proportions.Alternative{proportions.TwoSided, proportions.Greater, proportions.Less} {
					r, err := m.Test(k, proportions.WithNull(null), proportions.WithAlternative(alt))
					if err != nil {
						t.Fatalf("%s null %v: %v", m.Key, null, err)
					}
					c.check(schema.TestResult, r)
				}
			}
		}
	}
}

// plans returns valid plans of every goal, on both scales, for both
// directions of benefit, with and without drop-out, unequal groups, the
// unpooled variance and the continuity correction.
func plans(t *testing.T) []planning.Plan {
	type shape struct {
		goal           planning.Goal
		scale          proportions.Scale
		better         proportions.Better
		rate1, rate2   float64
		margin         float64
		continuityOK   bool
		continuityOnly bool
	}
	hi, lo := proportions.HigherIsBetter, proportions.LowerIsBetter
	diff, ratio := proportions.Difference, proportions.Ratio
	shapes := []shape{
		{planning.Equality, diff, hi, 0.6, 0.4, 0, true, false},
		{planning.Equality, ratio, lo, 0.3, 0.5, 0, true, false},
		{planning.Superiority, diff, hi, 0.7, 0.4, 0, true, false},
		{planning.Superiority, diff, hi, 0.7, 0.4, 0.05, false, false},
		{planning.Superiority, diff, lo, 0.3, 0.6, -0.05, false, false},
		{planning.Superiority, ratio, hi, 0.7, 0.4, 1.1, false, false},
		{planning.Superiority, ratio, lo, 0.3, 0.6, 0.9, false, false},
		{planning.NonInferiority, diff, hi, 0.8, 0.8, -0.1, false, false},
		{planning.NonInferiority, diff, lo, 0.2, 0.2, 0.1, false, false},
		{planning.NonInferiority, ratio, hi, 0.8, 0.8, 0.9, false, false},
		{planning.NonInferiority, ratio, lo, 0.2, 0.2, 1.25, false, false},
		{planning.Equivalence, diff, hi, 0.5, 0.5, 0.15, false, false},
		{planning.Equivalence, diff, lo, 0.5, 0.52, 0.15, false, false},
		{planning.Equivalence, ratio, hi, 0.5, 0.5, 1.25, false, false},
		{planning.Equivalence, ratio, lo, 0.5, 0.5, 0.8, false, false},
	}
	var out []planning.Plan
	for _, s := range shapes {
		for _, dropout := range []float64{0, 0.15} {
			for _, alloc := range []float64{0, 1.5} {
				for _, variance := range []planning.VarianceRule{planning.Pooled, planning.Unpooled} {
					for _, cc := range []bool{false, true} {
						if cc && !s.continuityOK {
							continue
						}
						p := planning.NewPlan(s.goal, s.rate1, s.rate2)
						p.Scale, p.Better, p.Margin = s.scale, s.better, s.margin
						p.Dropout, p.Allocation, p.Variance, p.ContinuityCorrection = dropout, alloc, variance, cc
						if err := p.Validate(); err != nil {
							t.Fatalf("plan %v: %v", p, err)
						}
						out = append(out, p)
					}
				}
			}
		}
	}
	return out
}

func checkPlanning(t *testing.T, c *corpus) {
	for i, p := range plans(t) {
		ss, err := planning.SampleSize(p)
		if err != nil {
			t.Fatalf("SampleSize %v: %v", p, err)
		}
		c.check(schema.SampleSize, ss)
		for _, n := range [][2]int64{{3, 4}, {50, 50}, {400, 300}} {
			pw, err := planning.Power(p, n[0], n[1])
			if err != nil {
				t.Fatalf("Power %v: %v", p, err)
			}
			c.check(schema.Power, pw)
			dt, err := planning.DetectableDifference(p, n[0], n[1])
			if err == nil || errors.Is(err, proportions.ErrUnreachable) {
				c.check(schema.Detectable, dt)
			} else {
				t.Fatalf("DetectableDifference %v: %v", p, err)
			}
		}
		ranges := [][2]int64{{10, 14}}
		if i%16 == 0 {
			// A range longer than MaxCurvePoints, walked in steps.
			ranges = append(ranges, [2]int64{1, 50_000})
		}
		for _, r := range ranges {
			curve, err := planning.PowerByTrials(p, r[0], r[1])
			if err != nil {
				t.Fatal(err)
			}
			c.check(schema.PowerCurve, curve)
		}
		curve, err := planning.PowerByDifference(p, 60, 70, 0.05, 0.95, 19)
		if err != nil {
			t.Fatal(err)
		}
		c.check(schema.PowerCurve, curve)
	}
}

// checkExactPlanning plans with large effects so that the exact searches
// stay at small group sizes.
func checkExactPlanning(t *testing.T, c *corpus) {
	ctx := context.Background()
	type exactCase struct {
		goal         planning.Goal
		scale        proportions.Scale
		better       proportions.Better
		rate1, rate2 float64
		margin       float64
		tests        []proportions.TestMethod
	}
	hi, lo := proportions.HigherIsBetter, proportions.LowerIsBetter
	diffTests := []proportions.TestMethod{proportions.FarringtonManningTest}
	cases := []exactCase{
		{planning.Equality, proportions.Difference, hi, 0.85, 0.25, 0, []proportions.TestMethod{proportions.FisherTest, proportions.PearsonChiSquareTest}},
		{planning.Superiority, proportions.Difference, hi, 0.85, 0.25, 0, []proportions.TestMethod{proportions.FisherTest}},
		{planning.Superiority, proportions.Ratio, lo, 0.2, 0.8, 0.8, []proportions.TestMethod{proportions.FarringtonManningRatioTest}},
		{planning.NonInferiority, proportions.Difference, hi, 0.9, 0.6, -0.1, diffTests},
		{planning.NonInferiority, proportions.Difference, lo, 0.1, 0.4, 0.1, diffTests},
		{planning.NonInferiority, proportions.Ratio, hi, 0.9, 0.5, 0.9, []proportions.TestMethod{proportions.MiettinenNurminenRatioTest}},
		{planning.Equivalence, proportions.Difference, hi, 0.5, 0.5, 0.35, diffTests},
		{planning.Equivalence, proportions.Ratio, hi, 0.5, 0.5, 2, []proportions.TestMethod{proportions.FarringtonManningRatioTest}},
	}
	for _, k := range cases {
		for _, dropout := range []float64{0, 0.2} {
			p := planning.NewPlan(k.goal, k.rate1, k.rate2)
			p.Scale, p.Better, p.Margin, p.Dropout = k.scale, k.better, k.margin, dropout
			for _, m := range k.tests {
				ep, err := planning.ExactPower(ctx, p, m, 12, 15)
				if err != nil {
					t.Fatalf("ExactPower %v %s: %v", p, m.Key, err)
				}
				c.check(schema.ExactPower, ep)
				for _, search := range []planning.Search{{}, {From: 3}, {MaxN1: 80, Horizon: 0}} {
					es, err := planning.ExactSampleSize(ctx, p, m, search)
					if err != nil {
						t.Fatalf("ExactSampleSize %v %s: %v", p, m.Key, err)
					}
					c.check(schema.ExactSampleSize, es)
					// A horizon just past the first size often lands in a
					// dip of the saw-tooth: then no size is stable.
					es, err = planning.ExactSampleSize(ctx, p, m, planning.Search{Horizon: es.First.N1 + 1})
					if err != nil {
						t.Fatalf("ExactSampleSize %v %s: %v", p, m.Key, err)
					}
					c.check(schema.ExactSampleSize, es)
				}
				curve, err := planning.ExactPowerByTrials(ctx, p, m, 4, 12)
				if err != nil {
					t.Fatal(err)
				}
				c.check(schema.PowerCurve, curve)
				curve, err = planning.ExactPowerByDifference(ctx, p, m, 14, 12, 0.05, 0.95, 7)
				if err != nil {
					t.Fatal(err)
				}
				c.check(schema.PowerCurve, curve)
			}
		}
	}
}

func checkOperating(t *testing.T, c *corpus) {
	ctx := context.Background()
	for _, scale := range []proportions.Scale{proportions.Difference, proportions.Ratio, proportions.OddsRatio} {
		for _, d := range []operating.Design{{N1: 6, N2: 6, Level: 0.95}, {N1: 5, N2: 8, Level: 0.9}} {
			for _, m := range proportions.EnumerableIntervalMethods(scale) {
				for _, pt := range [][2]float64{{0, 0}, {0.3, 0}, {0, 0.4}, {0.2, 0.7}, {0.5, 0.5}, {1, 1}, {1, 0.6}} {
					p, err := operating.Coverage(m, d, pt[0], pt[1])
					if err != nil {
						t.Fatalf("Coverage %s: %v", m.Key, err)
					}
					c.check(schema.CoveragePoint, p)
				}
				tab, err := operating.NewOutcomeLimits(ctx, m, d)
				if err != nil {
					t.Fatal(err)
				}
				p, err := tab.At(0.25, 0.65)
				if err != nil {
					t.Fatal(err)
				}
				c.check(schema.CoveragePoint, p)
				grid := []float64{0, 0.35, 1}
				for _, g := range [][2][]float64{{grid, grid}, {{0.5}, {0, 0.2, 0.9}}} {
					s, err := tab.Surface(ctx, operating.WithGrid(g[0], g[1]))
					if err != nil {
						t.Fatal(err)
					}
					c.check(schema.CoverageSurface, s)
				}
				theta := map[proportions.Scale]float64{proportions.Difference: 0.2, proportions.Ratio: 2, proportions.OddsRatio: 0.5}[scale]
				sl, err := tab.AlongEffect(ctx, theta, operating.WithSteps(5))
				if err != nil {
					t.Fatal(err)
				}
				c.check(schema.CoverageSlice, sl)
				sl, err = tab.AlongFirst(ctx, 0.4, operating.WithSteps(4))
				if err != nil {
					t.Fatal(err)
				}
				c.check(schema.CoverageSlice, sl)
			}
			rec, err := operating.Recommend(ctx, scale, d, operating.WithGrid([]float64{0.1, 0.5, 0.9}, []float64{0.2, 0.6}))
			if err != nil {
				t.Fatal(err)
			}
			c.check(schema.Recommendation, rec)
		}
	}
	// Beyond the exact intervals' trial limit the recommendation names them
	// as skipped.
	rec, err := operating.Recommend(ctx, proportions.Difference, operating.Design{N1: 201, N2: 200, Level: 0.95},
		operating.WithGrid([]float64{0.3}, []float64{0.5}))
	if err != nil {
		t.Fatal(err)
	}
	c.check(schema.Recommendation, rec)

	for _, m := range proportions.Tests() {
		if m.TrialLimit > 0 && !strings.HasPrefix(m.Key, "barnard-test") {
			continue // the unconditional tests cost too much here; Barnard's stands for them
		}
		nulls := []float64{m.Scale.NoEffect()}
		if m.Margins {
			nulls = append(nulls, map[proportions.Scale]float64{proportions.Difference: -0.1, proportions.Ratio: 1.2, proportions.OddsRatio: 0.7}[m.Scale])
		}
		for _, null := range nulls {
			for _, alt := range []proportions.Alternative{proportions.TwoSided, proportions.Greater, proportions.Less} {
				h, err := hypothesis(m, null, alt)
				if err != nil {
					t.Fatalf("%s: %v", m.Key, err)
				}
				curve, err := operating.TypeIError(ctx, m, 7, 9, h, operating.WithSteps(6))
				if err != nil {
					t.Fatalf("TypeIError %s: %v", m.Key, err)
				}
				c.check(schema.TypeIError, curve)
			}
		}
	}
	// Rejection regions, of tests with a trial limit and with a continuity
	// correction among them.
	for _, m := range []proportions.TestMethod{proportions.FisherTest, proportions.BarnardTest, proportions.YatesTest} {
		h, err := hypothesis(m, m.Scale.NoEffect(), proportions.TwoSided)
		if err != nil {
			t.Fatal(err)
		}
		r, err := operating.NewRejectionRegion(ctx, operating.Decision{Test: m, Hypotheses: []proportions.Hypothesis{h}}, 6, 5)
		if err != nil {
			t.Fatal(err)
		}
		c.check(schema.RejectionRegion, r)
	}
	// An equivalence decision, two one-sided hypotheses.
	lower, err := hypothesis(proportions.FarringtonManningTest, -0.2, proportions.Greater)
	if err != nil {
		t.Fatal(err)
	}
	upper, err := hypothesis(proportions.FarringtonManningTest, 0.2, proportions.Less)
	if err != nil {
		t.Fatal(err)
	}
	curve, err := operating.Decision{Test: proportions.FarringtonManningTest, Hypotheses: []proportions.Hypothesis{lower, upper}}.Size(ctx, 10, 10, operating.WithSteps(5))
	if err != nil {
		t.Fatal(err)
	}
	c.check(schema.TypeIError, curve)
	region, err := operating.NewRejectionRegion(ctx, operating.Decision{Test: proportions.FarringtonManningTest, Hypotheses: []proportions.Hypothesis{lower, upper}}, 10, 10)
	if err != nil {
		t.Fatal(err)
	}
	c.check(schema.RejectionRegion, region)
}

// checkRegistry writes every registered method as the registry describes it.
func checkRegistry(t *testing.T, c *corpus) {
	for _, s := range []proportions.Scale{proportions.Difference, proportions.Ratio, proportions.OddsRatio} {
		for _, m := range proportions.IntervalMethods(s, proportions.ScopeAll) {
			c.check(schema.Method, m)
		}
	}
	for _, m := range proportions.RateMethods() {
		c.check(schema.Method, m)
	}
	for _, m := range proportions.Tests() {
		c.check(schema.Method, m)
	}
}

func hypothesis(m proportions.TestMethod, null float64, alt proportions.Alternative) (proportions.Hypothesis, error) {
	s, err := proportions.NewSettings(proportions.WithNull(null), proportions.WithAlternative(alt))
	if err != nil {
		return proportions.Hypothesis{}, err
	}
	return m.Hypothesis(s)
}

func TestResultsMatchSchemas(t *testing.T) {
	c := &corpus{t: t, schemas: compileAll(t), count: map[string]int{}, keys: map[string]bool{}, strs: map[string]bool{}}
	checkAnalyses(t, c)
	checkMethods(t, c)
	checkPlanning(t, c)
	checkExactPlanning(t, c)
	checkOperating(t, c)
	checkRegistry(t, c)
	checkBayes(t, c)
	checkBreakdowns(t, c)
	checkSegments(t, c)
	checkSimulations(t, c)
	checkClusters(t, c)
	checkStratified(t, c)
	if c.failed > 0 {
		t.Fatalf("%d documents fail their schema", c.failed)
	}
	total := 0
	var counts []string
	for _, name := range schema.Names() {
		if name == schema.Common {
			continue
		}
		if c.count[name] == 0 {
			t.Errorf("no %s document was validated", name)
		}
		total += c.count[name]
		counts = append(counts, fmt.Sprintf("%s %d", name, c.count[name]))
	}
	t.Logf("%d documents valid: %s", total, strings.Join(counts, ", "))

	// Every documented field and enumerated value must turn up in some
	// valid document, so that the schemas describe what the library writes
	// rather than what it might, and the corpus reaches every corner.
	fields, values := documented(t)
	for _, f := range fields {
		if !c.keys[f] {
			t.Errorf("field %q is documented but no result wrote it", f)
		}
	}
	for _, v := range values {
		if !c.strs[v] {
			t.Errorf("value %q is documented but no result wrote it", v)
		}
	}
}

// documented returns every property name and every enumerated or constant
// string of the schemas.
func documented(t *testing.T) (fields, values []string) {
	fs, vs := map[string]bool{}, map[string]bool{}
	var walk func(v any)
	walk = func(v any) {
		switch v := v.(type) {
		case map[string]any:
			if props, ok := v["properties"].(map[string]any); ok {
				for k := range props {
					fs[k] = true
				}
			}
			if e, ok := v["enum"].([]any); ok {
				for _, x := range e {
					if s, ok := x.(string); ok {
						vs[s] = true
					}
				}
			}
			if s, ok := v["const"].(string); ok {
				vs[s] = true
			}
			for _, x := range v {
				walk(x)
			}
		case []any:
			for _, x := range v {
				walk(x)
			}
		}
	}
	for _, name := range schema.Names() {
		b, _ := schema.Get(name)
		var doc any
		if err := json.Unmarshal(b, &doc); err != nil {
			t.Fatal(err)
		}
		walk(doc)
	}
	for k := range fs {
		fields = append(fields, k)
	}
	for k := range vs {
		values = append(values, k)
	}
	sort.Strings(fields)
	sort.Strings(values)
	return fields, values
}

// TestBrokenDocumentsRejected makes sure the schemas can fail: real results
// with one defect each (an undocumented field, a null list, a missing
// field, a misspelt infinity or enumerated value, a figure that
// contradicts its flag) must be rejected.
func TestBrokenDocumentsRejected(t *testing.T) {
	schemas := compileAll(t)
	ctx := context.Background()
	a, err := proportions.Analyze(comparison(t, [4]int64{0, 5, 3, 4}), proportions.WithScope(proportions.ScopeAll))
	if err != nil {
		t.Fatal(err)
	}
	d := operating.Design{N1: 5, N2: 4, Level: 0.95}
	tab, err := operating.NewOutcomeLimits(ctx, proportions.Katz, d)
	if err != nil {
		t.Fatal(err)
	}
	surface, err := tab.Surface(ctx, operating.WithGrid([]float64{0, 0.5}, []float64{0, 0.3}))
	if err != nil {
		t.Fatal(err)
	}
	point, err := operating.Coverage(proportions.Katz, d, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	rec, err := operating.Recommend(ctx, proportions.Ratio, d, operating.WithGrid([]float64{0.5}, []float64{0.3}))
	if err != nil {
		t.Fatal(err)
	}
	h, err := hypothesis(proportions.FisherTest, 0, proportions.TwoSided)
	if err != nil {
		t.Fatal(err)
	}
	region, err := operating.NewRejectionRegion(ctx, operating.Decision{Test: proportions.FisherTest, Hypotheses: []proportions.Hypothesis{h}}, 4, 3)
	if err != nil {
		t.Fatal(err)
	}
	plan := planning.NewPlan(planning.Equality, 0.6, 0.3)
	ss, err := planning.SampleSize(plan)
	if err != nil {
		t.Fatal(err)
	}
	ba, err := bayes.Analyze(comparison(t, [4]int64{41, 50, 33, 50}), bayes.WithPrior(bayes.Jeffreys()), bayes.WithEquivalence(-0.05, 0.05))
	if err != nil {
		t.Fatal(err)
	}
	type obj = map[string]any
	first := func(v any) obj { return v.([]any)[0].(obj) }
	cases := []struct {
		name   string
		result any
		schema string
		breaks func(doc obj)
	}{
		{"an undocumented field", a, schema.Analysis, func(d obj) { d["extra"] = true }},
		{"an undocumented nested field", a, schema.Analysis, func(d obj) { first(d["groups"])["group"].(obj)["extra"] = 1 }},
		{"null warnings", a, schema.Analysis, func(d obj) { d["warnings"] = nil }},
		{"null omitted", a, schema.Analysis, func(d obj) { d["omitted"] = nil }},
		{"no omitted", a, schema.Analysis, func(d obj) { delete(d, "omitted") }},
		{"null ratio intervals", a, schema.Analysis, func(d obj) { d["ratio_intervals"] = nil }},
		{"one group", a, schema.Analysis, func(d obj) { d["groups"] = d["groups"].([]any)[:1] }},
		{"a misspelt infinity", a, schema.Analysis, func(d obj) { first(d["ratio_intervals"])["upper"] = "inf" }},
		{"a ratio among the differences", a, schema.Analysis, func(d obj) { first(d["difference_intervals"])["scale"] = "ratio" }},
		{"an unknown alternative", a, schema.Analysis, func(d obj) { first(d["tests"])["alternative"] = "two sided" }},
		{"an unknown scope", a, schema.Analysis, func(d obj) { d["scope"] = "everything" }},
		{"an unknown warning code", a, schema.Analysis, func(d obj) { first(d["warnings"])["code"] = "note" }},
		{"a defined estimate written as null", a, schema.Analysis, func(d obj) { d["interval"].(obj)["estimate"] = nil }},
		{"an infinite p-value", a, schema.Analysis, func(d obj) { d["test"].(obj)["p_value"] = "Infinity" }},
		{"a p-value above 1", a, schema.Analysis, func(d obj) { d["test"].(obj)["p_value"] = 1.5 }},
		{"a level of 1", a, schema.Analysis, func(d obj) { d["level"] = 1 }},
		{"fractional events", a, schema.Analysis, func(d obj) { d["comparison"].(obj)["first"].(obj)["events"] = 0.5 }},
		{"null notes", ss, schema.SampleSize, func(d obj) { d["notes"] = nil }},
		{"an unknown goal", ss, schema.SampleSize, func(d obj) { d["plan"].(obj)["goal"] = "difference" }},
		{"null skipped", rec, schema.Recommendation, func(d obj) { d["skipped"] = nil }},
		{"no skipped", rec, schema.Recommendation, func(d obj) { delete(d, "skipped") }},
		{"a NaN written as a string", surface, schema.CoverageSurface, func(d obj) { d["coverage"].([]any)[0].([]any)[0] = "NaN" }},
		{"a flat map", surface, schema.CoverageSurface, func(d obj) { d["defined"] = []any{true, true, false, true} }},
		{"a figure where the truth is undefined", point, schema.CoveragePoint, func(d obj) { d["coverage"] = 1 }},
		{"null hypotheses", region, schema.RejectionRegion, func(d obj) { d["decision"].(obj)["hypotheses"] = nil }},
		{"a test with an interval's field", proportions.BarnardTest, schema.Method, func(d obj) { d["symmetric"] = true }},
		{"an interval method without its scale", proportions.Mee, schema.Method, func(d obj) { delete(d, "scale") }},
		{"a posterior probability above 1", ba, schema.Bayes, func(d obj) { d["probability_first_higher"] = 1.2 }},
		{"null effects", ba, schema.Bayes, func(d obj) { d["effects"] = nil }},
		{"two effects", ba, schema.Bayes, func(d obj) { d["effects"] = d["effects"].([]any)[:2] }},
		{"null sensitivity", ba, schema.Bayes, func(d obj) { d["sensitivity"] = nil }},
		{"an unknown prior name", ba, schema.Bayes, func(d obj) { first(d["groups"])["prior"].(obj)["name"] = "flat" }},
		{"a posterior shape of 0", ba, schema.Bayes, func(d obj) { first(d["groups"])["posterior"].(obj)["event_shape"] = 0 }},
		{"an undocumented field in a posterior", ba, schema.Bayes, func(d obj) { first(d["groups"])["posterior"].(obj)["mode"] = 0.8 }},
		{"a probability inside the region written as a string", ba, schema.Bayes, func(d obj) { d["probability_equivalent"] = "0.3" }},
		{"no caution", ba, schema.Bayes, func(d obj) { delete(d, "caution") }},
		{"a simulated coverage above 1", mustSimulation(t), schema.Simulation, func(d obj) { first(d["intervals"])["coverage"] = 1.2 }},
		{"null simulated tests", mustSimulation(t), schema.Simulation, func(d obj) { d["tests"] = nil }},
		{"a coverage where no study gave an interval", mustSimulation(t), schema.Simulation, func(d obj) { first(d["intervals"])["studies"] = 0 }},
		{"a simulation with one cluster", mustSimulation(t), schema.Simulation, func(d obj) { d["plan"].(obj)["design"].(obj)["clusters1"] = 1 }},
		{"a curve without its correlations", mustCurve(t), schema.SimulationCurve, func(d obj) { delete(d, "correlations") }},
		{"a cluster with no units", mustClustered(t), schema.Clusters, func(d obj) {
			d["data"].(obj)["group1"].([]any)[0].(obj)["trials"] = 0
		}},
		{"one cluster per group", mustClusteredPlan(t), schema.ClusteredSampleSize, func(d obj) { d["clusters1"] = 1 }},
		{"null power lines", mustClusteredGrid(t), schema.ClusteredPower, func(d obj) { d["lines"] = nil }},
		{"null other correlations", mustClustered(t), schema.Clusters, func(d obj) { d["other_correlations"] = nil }},
		{"a design effect below 1", mustClustered(t), schema.Clusters, func(d obj) { d["design_effects"].([]any)[0].(obj)["value"] = 0.5 }},
		{"a breakdown row with negative trials", mustBreakdown(t), schema.Breakdown, func(d obj) {
			d["rows"].([]any)[0].(obj)["counts"].(obj)["n2"] = -1
		}},
		{"a breakdown with negative skipped rows", mustBreakdown(t), schema.Breakdown, func(d obj) { d["skipped_rows"] = -3 }},
		{"null homogeneity", mustStratified(t), schema.Stratified, func(d obj) { d["homogeneity"] = nil }},
		{"an unknown stratified warning", mustStratified(t), schema.Stratified, func(d obj) { first(d["warnings"])["code"] = "simpson" }},
		{"a stratum weight above 1", mustStratified(t), schema.Stratified, func(d obj) { first(d["strata"])["weight"] = 1.5 }},
		{"an estimate without its key", mustStratified(t), schema.Stratified, func(d obj) { delete(d["interval"].(obj), "key") }},
	}
	cases = append(cases, brokenSegments(t)...)
	for _, k := range cases {
		b, err := json.Marshal(k.result)
		if err != nil {
			t.Fatal(err)
		}
		doc, err := jsonschema.UnmarshalJSON(bytes.NewReader(b))
		if err != nil {
			t.Fatal(err)
		}
		if err := schemas[k.schema].Validate(doc); err != nil {
			t.Fatalf("%s: the unbroken document is rejected: %v", k.schema, err)
		}
		k.breaks(doc.(obj))
		if err := schemas[k.schema].Validate(doc); err == nil {
			t.Errorf("%s with %s: accepted, want rejected", k.schema, k.name)
		}
	}
}

// TestEmptyListsAreArrays marshals results built by hand with no lists at
// all: no result may write null for a list (the only nulls the schemas
// allow stand for undefined numbers, which a zero value does not hold).
func TestEmptyListsAreArrays(t *testing.T) {
	for _, r := range []any{
		proportions.Analysis{}, proportions.NumberNeeded{}, proportions.Interval{}, proportions.TestResult{},
		planning.SampleSizeResult{}, planning.PowerResult{}, planning.DetectableResult{}, planning.PowerCurve{},
		planning.ExactPowerResult{}, planning.ExactSampleSizeResult{},
		operating.Point{}, &operating.Surface{}, operating.Slice{}, &operating.Slice{},
		operating.TypeIErrorCurve{}, &operating.TypeIErrorCurve{}, operating.Recommendation{}, &operating.Recommendation{},
		segments.Result{}, segments.Summary{}, segments.Segment{}, segments.Adjusted{},
		operating.Decision{}, &operating.RejectionRegion{}, proportions.Breakdown{}, clusters.Analysis{},
		simulate.Result{}, &simulate.Result{}, simulate.Curve{}, &simulate.Curve{},
		planning.ClusteredSizeResult{}, planning.ClusteredPowerGrid{}, strata.Analysis{},
	} {
		b, err := json.Marshal(r)
		if err != nil {
			t.Fatalf("%T: %v", r, err)
		}
		var doc any
		if err := json.Unmarshal(b, &doc); err != nil {
			t.Fatal(err)
		}
		if path := findNull(doc, ""); path != "" {
			t.Errorf("%T writes null at %s: %s", r, path, b)
		}
	}
}

func findNull(v any, at string) string {
	switch v := v.(type) {
	case nil:
		return at + " "
	case map[string]any:
		for k, x := range v {
			if p := findNull(x, at+"/"+k); p != "" {
				return p
			}
		}
	case []any:
		for i, x := range v {
			if p := findNull(x, fmt.Sprintf("%s/%d", at, i)); p != "" {
				return p
			}
		}
	}
	return ""
}
