package planning

import "github.com/propscope/propscope/proportions/operating"

// ProgressTotal is the total the exact planning functions report progress
// against (operating.WithProgress): they count thousandths of their
// estimated work, so a progress bar moves with the time a call takes, not
// with the number of sizes visited (the last sizes of a scan cost the
// most). done increases; a call that succeeds ends with (ProgressTotal,
// ProgressTotal).
const ProgressTotal = 1000

// progress turns work done, in estimated steps (proportions.Cost.Steps),
// into thousandths of the estimated total for an operating.Progress.
type progress struct {
	f           operating.Progress
	done, total float64
	reported    int
}

// newProgress reads operating.WithProgress among opts; the result is a
// no-op without it. total is the estimated work of the call.
func newProgress(opts []operating.RunOption, total float64) *progress {
	return &progress{f: operating.ProgressOf(opts...), total: total}
}

// add counts steps of work done; short of finish, the report stays below
// ProgressTotal even when the work exceeds the estimate.
func (p *progress) add(steps float64) {
	p.done += steps
	p.report()
}

// revise sets the estimated total to the work done plus rest, the
// estimate of what remains (a scan whose end is now known).
func (p *progress) revise(rest float64) {
	p.total = p.done + rest
	p.report()
}

func (p *progress) report() {
	if p.f == nil || p.total <= 0 {
		return
	}
	k := min(int(ProgressTotal*(p.done/p.total)), ProgressTotal-1)
	if k > p.reported {
		p.reported = k
		p.f(k, ProgressTotal)
	}
}

// finish reports the whole work done.
func (p *progress) finish() {
	if p.f != nil && p.reported < ProgressTotal {
		p.reported = ProgressTotal
		p.f(ProgressTotal, ProgressTotal)
	}
}
