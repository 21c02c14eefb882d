package schema_test

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/schema"
	"github.com/propscope/propscope/proportions/segments"
)

// segmentRows invents the per-plant germination counts of a seed
// treatment: full rows, a sparse one, one with an empty group, and
// hostile values.
func segmentRows() []proportions.BreakdownRow {
	return []proportions.BreakdownRow{
		{Value: "plant A", Counts: proportions.Counts{X1: 80, N1: 100, X2: 60, N2: 100}},
		{Value: "plant B", Counts: proportions.Counts{X1: 2, N1: 6, X2: 1, N2: 7}},
		{Value: "plant C", Counts: proportions.Counts{X1: 5, N1: 9}},
		{Value: `<script>alert(1)</script>`, Counts: proportions.Counts{X1: 0, N1: 20, X2: 20, N2: 20}},
		{Value: "=1+1", Counts: proportions.Counts{X1: 30, N1: 40, X2: 29, N2: 40}},
	}
}

// checkSegments validates per-segment analyses under every adjustment and
// alternative, the summaries and every line of the streams.
func checkSegments(t *testing.T, c *corpus) {
	b, err := proportions.NewBreakdown("plant", proportions.Labels{First: "treated", Second: "untreated", Event: "germinated"}, segmentRows())
	if err != nil {
		t.Fatal(err)
	}
	for i, adj := range segments.Adjustments() {
		alt := []proportions.Alternative{proportions.TwoSided, proportions.Greater, proportions.Less}[i%3]
		opts := []segments.Option{segments.WithAdjustment(adj), segments.WithAnalysis(proportions.WithAlternative(alt))}
		res, err := segments.Analyze(b, opts...)
		if err != nil {
			t.Fatal(err)
		}
		c.check(schema.Segments, res)
		var segLines, adjLines bytes.Buffer
		sum, err := segments.Stream(context.Background(), segments.BreakdownSource(b),
			segments.Outputs{SegmentsJSON: &segLines, AdjustedJSON: &adjLines}, opts...)
		if err != nil {
			t.Fatal(err)
		}
		c.check(schema.SegmentsSummary, sum)
		for name, buf := range map[string]*bytes.Buffer{schema.Segment: &segLines, schema.AdjustedSegment: &adjLines} {
			sc := bufio.NewScanner(buf)
			for sc.Scan() {
				c.check(name, json.RawMessage(sc.Bytes()))
			}
		}
	}
	// No tested segment: the simultaneous level is null.
	empty, err := proportions.NewBreakdown("plant", proportions.Labels{}, segmentRows()[2:3])
	if err != nil {
		t.Fatal(err)
	}
	res, err := segments.Analyze(empty)
	if err != nil {
		t.Fatal(err)
	}
	c.check(schema.Segments, res)
	c.check(schema.SegmentsSummary, res.Summary)
}

func brokenSegments(t *testing.T) []struct {
	name   string
	result any
	schema string
	breaks func(doc map[string]any)
} {
	b, err := proportions.NewBreakdown("plant", proportions.Labels{}, segmentRows())
	if err != nil {
		t.Fatal(err)
	}
	res, err := segments.Analyze(b)
	if err != nil {
		t.Fatal(err)
	}
	type obj = map[string]any
	seg := func(d obj, i int) obj { return d["segments"].([]any)[i].(obj) }
	return []struct {
		name   string
		result any
		schema string
		breaks func(doc map[string]any)
	}{
		{"an unknown adjustment", res, schema.Segments, func(d obj) { d["adjustment"] = "bh" }},
		{"no m", res, schema.Segments, func(d obj) { delete(d, "tested") }},
		{"null segments", res, schema.Segments, func(d obj) { d["segments"] = nil }},
		{"null notes", res, schema.Segments, func(d obj) { d["notes"] = nil }},
		{"a tested segment without its p-value", res, schema.Segments, func(d obj) { seg(d, 0)["p_value"] = nil }},
		{"an empty segment with a p-value", res, schema.Segments, func(d obj) { seg(d, 2)["p_value"] = 0.5 }},
		{"an adjusted p-value above 1", res, schema.Segments, func(d obj) { d["adjusted"].([]any)[0].(obj)["adjusted_p_value"] = 1.2 }},
		{"a summary without its adjustment", res.Summary, schema.SegmentsSummary, func(d obj) { delete(d, "adjustment") }},
		{"a segment line with negative trials", res.Segments[0], schema.Segment, func(d obj) { d["counts"].(obj)["n1"] = -3 }},
		{"an adjusted line with an undocumented field", res.Adjusted[0], schema.AdjustedSegment, func(d obj) { d["rank"] = 1 }},
	}
}
