package schema

import (
	"embed"
	"fmt"
	"io/fs"
	"slices"
	"strings"
)

// The files are embedded so that the schemas travel with the library
// version whose JSON they describe.
//
//go:embed *.schema.json
var files embed.FS

// Names of the schemas, one per result (and Common for the shared
// definitions). Pass them to [Get] or [FileName].
const (
	// Common holds the shared definitions ($defs) that the other schemas
	// reference; it describes no result by itself.
	Common = "common"
	// Analysis describes proportions.Analysis, from Analyze.
	Analysis = "analysis"
	// Interval describes one proportions.Interval, from an interval
	// method's Interval.
	Interval = "interval"
	// TestResult describes one proportions.TestResult, from a test's Test.
	TestResult = "test-result"
	// NumberNeeded describes proportions.NumberNeeded, from
	// NumberNeededToTreat and NumberNeededFromInterval.
	NumberNeeded = "number-needed"
	// SampleSize describes planning.SampleSizeResult, from SampleSize.
	SampleSize = "sample-size"
	// Power describes planning.PowerResult, from Power.
	Power = "power"
	// Detectable describes planning.DetectableResult, from
	// DetectableDifference.
	Detectable = "detectable"
	// PowerCurve describes planning.PowerCurve, from PowerByTrials,
	// PowerByDifference, ExactPowerByTrials and ExactPowerByDifference.
	PowerCurve = "power-curve"
	// ExactPower describes planning.ExactPowerResult, from ExactPower.
	ExactPower = "exact-power"
	// ExactSampleSize describes planning.ExactSampleSizeResult, from
	// ExactSampleSize.
	ExactSampleSize = "exact-sample-size"
	// CoveragePoint describes operating.Point, from Coverage and
	// OutcomeLimits.At.
	CoveragePoint = "coverage-point"
	// CoverageSurface describes operating.Surface, from
	// OutcomeLimits.Surface.
	CoverageSurface = "coverage-surface"
	// CoverageSlice describes operating.Slice, from OutcomeLimits.AlongEffect
	// and OutcomeLimits.AlongFirst.
	CoverageSlice = "coverage-slice"
	// TypeIError describes operating.TypeIErrorCurve, from TypeIError and
	// Decision.Size.
	TypeIError = "type-i-error"
	// Recommendation describes operating.Recommendation, from Recommend.
	Recommendation = "recommendation"
	// RejectionRegion describes operating.RejectionRegion, from
	// NewRejectionRegion: the decision and the design it was built for.
	RejectionRegion = "rejection-region"
	// Bayes describes bayes.Analysis, from bayes.Analyze: the Bayesian
	// view of a comparison.
	Bayes = "bayes"
	// Breakdown describes proportions.Breakdown, from NewBreakdown: a
	// comparison broken down by the values of one column.
	Breakdown = "breakdown"
	// Simulation describes simulate.Result, from simulate.Run: simulated
	// coverage and rejection rates of clustered studies.
	Simulation = "simulation"
	// SimulationCurve describes simulate.Curve, from simulate.Sweep: a
	// simulation at several values of the intracluster correlation.
	SimulationCurve = "simulation-curve"
	// Clusters describes clusters.Analysis, from clusters.Analyze: a
	// clustered comparison with its unit-level analysis beside it.
	Clusters = "clusters"
	// ClusteredSampleSize describes planning.ClusteredSizeResult, from
	// ClusteredSampleSize.
	ClusteredSampleSize = "clustered-sample-size"
	// ClusteredPower describes planning.ClusteredPowerGrid, from
	// ClusteredPowerByClusters.
	ClusteredPower = "clustered-power"
	// Stratified describes strata.Analysis, from strata.Analyze: the
	// stratified analysis of a breakdown.
	Stratified = "stratified"
	// Method describes one entry of the method registry:
	// proportions.IntervalMethod, RateMethod or TestMethod.
	Method = "method"
)

const suffix = ".schema.json"

// FileName returns the file name of a schema, name + ".schema.json": the
// name under which the others reference it (Common is referenced by every schema, Analysis by Clusters).
func FileName(name string) string { return name + suffix }

// Names returns the names of every schema, Common included, sorted.
func Names() []string {
	entries, err := fs.ReadDir(files, ".")
	if err != nil { // cannot happen: the directory is embedded
		panic(err)
	}
	names := make([]string, 0, len(entries))
	for _, e := range entries {
		names = append(names, strings.TrimSuffix(e.Name(), suffix))
	}
	slices.Sort(names)
	return names
}

// Get returns the schema with the given name (one of the constants, see
// [Names]) as JSON. The bytes are a fresh copy the caller may change. An
// unknown name is an error wrapping fs.ErrNotExist.
func Get(name string) ([]byte, error) {
	b, err := files.ReadFile(FileName(name))
	if err != nil {
		return nil, fmt.Errorf("schema %q: %w; use one of %s", name, fs.ErrNotExist, strings.Join(Names(), ", "))
	}
	return b, nil
}

// FS returns the schema files, read-only, each under its [FileName], for
// tools that load the schemas from a directory (write them out with
// os.CopyFS) or from an fs.FS.
func FS() fs.FS { return files }
