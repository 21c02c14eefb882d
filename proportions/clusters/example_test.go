package clusters_test

import (
	"fmt"
	"log"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/clusters"
)

// An invented seed trial: trays of 20 seeds, four per treatment. Analyze
// gives how clustered the seeds are and the answers that account for it;
// the registry's methods can also be called one by one on a Summary, as a
// simulation does.
func Example() {
	d, err := clusters.New("tray", proportions.Labels{First: "primed", Second: "unprimed", Event: "germinated"},
		[]clusters.Cluster{{Value: "P1", Events: 19, Trials: 20}, {Value: "P2", Events: 12, Trials: 20}, {Value: "P3", Events: 18, Trials: 20}, {Value: "P4", Events: 15, Trials: 20}},
		[]clusters.Cluster{{Value: "U1", Events: 10, Trials: 20}, {Value: "U2", Events: 16, Trials: 20}, {Value: "U3", Events: 8, Trials: 20}, {Value: "U4", Events: 12, Trials: 20}})
	if err != nil {
		log.Fatal(err)
	}
	a, err := clusters.Analyze(d)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println(a.Conclusion)

	s := clusters.Summarize(d)
	conf, _ := proportions.NewConfidence(0.95)
	for _, m := range clusters.IntervalMethods() {
		fmt.Println(m.IntervalAt(s, conf))
	}
}
