// Command benchexact times propscope's exact tests and the exact
// unconditional interval on the tables of the SciPy side-by-side
// comparison (scripts/bench-exact.sh), and the exact planning of issue 15
// (sample size and power curve with Barnard's and Boschloo's tests), and
// prints one JSON object per case: the method, the table, the p-value,
// limits or planning answer, and the time per call.
//
// Times are CPU time of this process per call (getrusage), which is less
// disturbed than wall time on a shared machine, plus the wall time; each
// case runs for at least -mintime.
//
//	go run ./cmd/benchexact [-mintime 1s] [-case fisher-10000]
package main

import (
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"os"
	"syscall"
	"time"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/planning"
)

// benchCase is one timed call.
type benchCase struct {
	Name   string `json:"case"`
	Method string `json:"method"`
	N      int64  `json:"n_per_group"`
	run    func(c proportions.Counts) (string, error)
}

func cpuNow() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

func testCase(name string, m proportions.TestMethod, n int64) benchCase {
	return benchCase{Name: name, Method: m.Key, N: n, run: func(c proportions.Counts) (string, error) {
		r, err := m.Test(c, proportions.WithAlternative(proportions.TwoSided))
		return fmt.Sprintf("%.10g", r.PValue), err
	}}
}

func intervalCase(name string, m proportions.IntervalMethod, n int64) benchCase {
	return benchCase{Name: name, Method: m.Key, N: n, run: func(c proportions.Counts) (string, error) {
		iv, err := m.Interval(c, 0.95)
		return fmt.Sprintf("[%.8f, %.8f]", iv.Lower, iv.Upper), err
	}}
}

// planCase times one exact planning call of issue 15's design (0.60 vs
// 0.75, two-sided 5%, 80% power); its table fields are unused.
func planCase(name string, m proportions.TestMethod, curve bool) benchCase {
	d := planning.NewPlan(planning.Equality, 0.60, 0.75)
	return benchCase{Name: name, Method: m.Key, run: func(proportions.Counts) (string, error) {
		if curve {
			c, err := planning.ExactPowerByTrials(context.Background(), d, m, 20, 200)
			if err != nil {
				return "", err
			}
			return fmt.Sprintf("power %.4f at n1 = 200", c.Points[len(c.Points)-1].Power), nil
		}
		r, err := planning.ExactSampleSize(context.Background(), d, m, planning.Search{})
		return fmt.Sprintf("n1 = %d (power %.4f)", r.First.N1, r.First.Power), err
	}}
}

func main() {
	minTime := flag.Duration("mintime", time.Second, "minimum CPU time per case")
	only := flag.String("case", "", "run only this case")
	flag.Parse()
	cases := []benchCase{
		testCase("fisher-10000", proportions.FisherTest, 10000),
		testCase("barnard-800", proportions.BarnardTest, 800),
		testCase("boschloo-doubled-400", proportions.BoschlooDoubledTest, 400),
		testCase("boschloo-400", proportions.BoschlooTest, 400),
		intervalCase("chan-zhang-100", proportions.ChanZhang, 100),
		intervalCase("agresti-min-100", proportions.AgrestiMin, 100),
		intervalCase("chan-zhang-500", proportions.ChanZhang, 500),
		intervalCase("chan-zhang-1000", proportions.ChanZhang, 1000),
		planCase("barnard-sample-size", proportions.BarnardTest, false),
		planCase("boschloo-sample-size", proportions.BoschlooTest, false),
		planCase("barnard-power-curve", proportions.BarnardTest, true),
		planCase("boschloo-power-curve", proportions.BoschlooTest, true),
	}
	enc := json.NewEncoder(os.Stdout)
	for _, bc := range cases {
		if *only != "" && bc.Name != *only {
			continue
		}
		// The tables of the SciPy anchors: x1 = ⌊0.3n+½⌋, x2 = ⌊0.45n+½⌋.
		c := proportions.Counts{X1: (3*bc.N + 5) / 10, N1: bc.N, X2: (45*bc.N + 50) / 100, N2: bc.N}
		res, err := bc.run(c) // warm-up
		if err != nil {
			fmt.Fprintln(os.Stderr, bc.Name, err)
			os.Exit(1)
		}
		calls := 0
		c0, w0 := cpuNow(), time.Now()
		for cpuNow()-c0 < *minTime || calls < 3 {
			if _, err := bc.run(c); err != nil {
				fmt.Fprintln(os.Stderr, bc.Name, err)
				os.Exit(1)
			}
			calls++
		}
		cpu, wall := cpuNow()-c0, time.Since(w0)
		_ = enc.Encode(map[string]any{
			"case": bc.Name, "method": bc.Method, "n_per_group": bc.N,
			"x1": c.X1, "x2": c.X2, "result": res, "calls": calls,
			"cpu_seconds_per_call":  cpu.Seconds() / float64(calls),
			"wall_seconds_per_call": wall.Seconds() / float64(calls),
		})
	}
}
