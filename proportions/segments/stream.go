package segments

import (
	"context"
	"encoding/json"
	"fmt"
	"io"
	"iter"
	"runtime"
	"sync"

	"github.com/propscope/propscope/proportions"
)

// Source is where Stream reads a breakdown: the column's name, the labels
// and the rows. Rows opens the rows afresh on each call (a file opened
// again, a query run again, a breakdown's rows ranged again); Stream calls
// it twice and checks that both passes read the same rows.
type Source struct {
	By     string
	Labels proportions.Labels
	Rows   func() iter.Seq2[proportions.BreakdownRow, error]
}

// BreakdownSource returns a Source over the rows of a breakdown in memory.
func BreakdownSource(b proportions.Breakdown) Source {
	return Source{By: b.By, Labels: b.Labels(), Rows: func() iter.Seq2[proportions.BreakdownRow, error] {
		return func(yield func(proportions.BreakdownRow, error) bool) {
			for _, r := range b.Rows {
				if !yield(r, nil) {
					return
				}
			}
		}
	}}
}

// Outputs are where Stream writes; a nil writer is skipped. The segment
// outputs are written during the first pass, the adjusted outputs during
// the second. The CSV outputs start with a header record.
type Outputs struct {
	// SegmentsJSON gets one JSON object per line per segment (JSON Lines),
	// as segment.schema.json describes.
	SegmentsJSON io.Writer
	// SegmentsCSV gets one CSV record per segment.
	SegmentsCSV io.Writer
	// AdjustedJSON gets one JSON object per line per segment, as
	// adjusted-segment.schema.json describes.
	AdjustedJSON io.Writer
	// AdjustedCSV gets one CSV record per segment.
	AdjustedCSV io.Writer
	// SummaryJSON gets the summary as one JSON object at the end, as
	// segments-summary.schema.json describes: the labels, the number of
	// segments, m, the adjustment and the notes.
	SummaryJSON io.Writer
}

// Stream analyses the segments of src and writes the results as they are
// computed. It returns the summary, which states the number of segments,
// m and the adjustment, and writes it to Outputs.SummaryJSON; every
// adjusted record carries m and the adjustment too (the per-segment
// records of the first pass are written before m is known).
//
// Design. The first pass reads the rows once, in batches of a few
// thousand that every core analyses while the next batch is read, and
// writes each segment's headline result in the order read. Only a
// bounded number of batches is ever in flight, so this pass takes the same
// memory at a thousand segments as at a million, except for what the
// adjustment cannot do without: every tested segment's p-value and
// position, 16 bytes each (16 MB at 10⁶ segments). Between the passes the
// p-values are sorted once and adjusted (O(m log m)), and the adjusted
// values are spread back by position into 8 bytes per segment, after which
// the 16 bytes are freed (24 bytes per segment at that moment). The second
// pass reads the rows again, computes each segment's simultaneous
// interval (whose Bonferroni level needs m, known only now) and writes
// the adjusted values, again in order with bounded batches. The passes
// check that they read the same rows (their number and a hash of every
// value and count); if not, the error wraps proportions.ErrRowsChanged.
//
// A row that fails proportions.BreakdownRow.Validate stops the stream
// with an error naming it; the outputs then hold the rows before it.
// Values are not checked for duplicates (that would need memory in the
// number of segments): a reader that aggregates records gives each value
// once. It stops with ctx's error when ctx ends.
func Stream(ctx context.Context, src Source, out Outputs, opts ...Option) (Summary, error) {
	s, err := newSettings(opts)
	if err != nil {
		return Summary{}, err
	}
	a, err := newAnalyzer(s)
	if err != nil {
		return Summary{}, err
	}
	if src.Rows == nil {
		return Summary{}, fmt.Errorf("segment source: %w; give a Rows function", proportions.ErrEmptyInput)
	}
	sum := a.summary(src.By, src.Labels, s)
	var t tally
	var pairs []pValue
	first := pass{json: out.SegmentsJSON, csv: out.SegmentsCSV, columns: segmentColumns,
		process: func(b *batch) { a.firstPass(b) },
		collect: func(b *batch) {
			pairs = append(pairs, b.pvals...)
			t.merge(b.tally)
		}}
	count, hash, err := first.run(ctx, src.Rows())
	if err != nil {
		return Summary{}, err
	}
	if count == 0 {
		return Summary{}, fmt.Errorf("segment source: %w; it gave no rows", proportions.ErrEmptyInput)
	}
	adjusted, conf, err := sum.finish(t, pairs, count, a.alpha)
	pairs = nil // free the 16 bytes per segment before the second pass
	if err != nil {
		return Summary{}, err
	}
	second := pass{json: out.AdjustedJSON, csv: out.AdjustedCSV, columns: adjustedColumns,
		process: func(b *batch) { a.secondPass(b, adjusted, conf, sum) }}
	count2, hash2, err := second.run(ctx, src.Rows())
	if err != nil {
		return Summary{}, err
	}
	if count2 != count || hash2 != hash {
		return Summary{}, fmt.Errorf("segment source: %w; the first pass read %d rows, the second %d, and their values or counts differ; "+
			"give a source that reads the same rows each time", proportions.ErrRowsChanged, count, count2)
	}
	if out.SummaryJSON != nil {
		b, err := json.Marshal(sum)
		if err != nil {
			return Summary{}, err
		}
		if _, err := out.SummaryJSON.Write(append(b, '\n')); err != nil {
			return Summary{}, fmt.Errorf("writing the summary: %w", err)
		}
	}
	return sum, nil
}

// batch is a run of rows analysed by one worker, with what it produced.
type batch struct {
	seq, first int // order of the batch; number of its first row
	rows       []proportions.BreakdownRow
	json, csv  []byte
	wantJSON   bool
	wantCSV    bool
	texts      numberTexts // scratch for one record's numbers
	pvals      []pValue
	tally      tally
	hash       uint64
	err        error
}

func (b *batch) reset(seq, first int) {
	b.seq, b.first, b.rows, b.json, b.csv, b.pvals = seq, first, b.rows[:0], b.json[:0], b.csv[:0], b.pvals[:0]
	b.tally, b.hash, b.err = tally{}, 0, nil
}

// firstPass analyses a batch: the segments' lines, the tested p-values,
// the counts for the notes and the hash of the rows.
func (a *analyzer) firstPass(b *batch) {
	for i, r := range b.rows {
		n := b.first + i
		if b.err = checkRow(n, r); b.err != nil {
			return
		}
		b.hash += rowHash(n, r)
		s := a.segment(n, r)
		b.tally.add(s)
		if !s.Empty {
			b.pvals = append(b.pvals, pValue{s.PValue, n - 1})
		}
		if b.wantJSON || b.wantCSV {
			s.numbers(&b.texts)
		}
		if b.wantJSON {
			b.json = append(s.appendJSON(b.json, &b.texts), '\n')
		}
		if b.wantCSV {
			b.csv = s.appendCSV(b.csv, &b.texts)
		}
	}
}

// secondPass writes a batch's adjusted records.
func (a *analyzer) secondPass(b *batch, adjusted []float64, conf proportions.Confidence, sum Summary) {
	for i, r := range b.rows {
		n := b.first + i
		if b.err = checkRow(n, r); b.err != nil {
			return
		}
		if n > len(adjusted) {
			b.err = fmt.Errorf("segment %d: %w; the first pass read only %d rows", n, proportions.ErrRowsChanged, len(adjusted))
			return
		}
		b.hash += rowHash(n, r)
		ad := a.adjusted(n, r, adjusted[n-1], conf, sum)
		if b.wantJSON || b.wantCSV {
			ad.numbers(&b.texts)
		}
		if b.wantJSON {
			b.json = append(ad.appendJSON(b.json, &b.texts), '\n')
		}
		if b.wantCSV {
			b.csv = ad.appendCSV(b.csv, &b.texts)
		}
	}
}

// rowHash is FNV-1a over the row's position, value and counts; the passes
// add them up (the batches finish in any order).
func rowHash(n int, r proportions.BreakdownRow) uint64 {
	const prime = 1099511628211
	h := uint64(14695981039346656037)
	for _, v := range [...]int64{int64(n), r.Counts.X1, r.Counts.N1, r.Counts.X2, r.Counts.N2} {
		for k := 0; k < 64; k += 8 {
			h = (h ^ uint64(byte(v>>k))) * prime
		}
	}
	for i := 0; i < len(r.Value); i++ {
		h = (h ^ uint64(r.Value[i])) * prime
	}
	return h
}

// merge adds a batch's tally, keeping the first numbers in row order.
func (t *tally) merge(o tally) {
	t.total += o.total
	t.empty += o.empty
	t.sparse += o.sparse
	for _, n := range o.emptyNums {
		if len(t.emptyNums) < notedNumbers {
			t.emptyNums = append(t.emptyNums, n)
		}
	}
	for _, n := range o.sparseNums {
		if len(t.sparseNums) < notedNumbers {
			t.sparseNums = append(t.sparseNums, n)
		}
	}
}

// pass is one read of the rows: workers process batches on every core, a
// writer writes them in the order read and hands each to collect.
type pass struct {
	json, csv io.Writer
	columns   []string
	process   func(*batch)
	collect   func(*batch)
}

// inFlight bounds the batches alive at once per worker: enough that the
// reader, the workers and the writer do not wait for each other.
const inFlight = 3

// run reads rows to the end, or to the first error (of the rows, a row,
// a writer or ctx), and returns how many rows it read and their hash.
func (p pass) run(ctx context.Context, rows iter.Seq2[proportions.BreakdownRow, error]) (int, uint64, error) {
	ctx, cancel := context.WithCancelCause(ctx)
	defer cancel(nil)
	if err := p.writeHeaders(); err != nil {
		return 0, 0, err
	}
	workers := runtime.GOMAXPROCS(0)
	free := make(chan *batch, inFlight*workers+1)
	for range cap(free) {
		free <- &batch{wantJSON: p.json != nil, wantCSV: p.csv != nil}
	}
	work, done := make(chan *batch, cap(free)), make(chan *batch, cap(free))
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for b := range work {
				if ctx.Err() == nil {
					p.process(b)
				}
				done <- b
			}
		}()
	}
	var count int
	var hash uint64
	writer := make(chan struct{})
	go func() { // the writer: batches in the order read
		defer close(writer)
		pending, next := map[int]*batch{}, 0
		for b := range done {
			pending[b.seq] = b
			for b, ok := pending[next]; ok; b, ok = pending[next] {
				delete(pending, next)
				next++
				if context.Cause(ctx) == nil {
					if err := p.write(b); err != nil {
						cancel(err)
					} else {
						count += len(b.rows)
						hash += b.hash
					}
				}
				free <- b
			}
		}
	}()
	readErr := p.feed(ctx, rows, free, work)
	close(work)
	wg.Wait()
	close(done)
	<-writer
	if err := context.Cause(ctx); err != nil {
		return 0, 0, err
	}
	return count, hash, readErr
}

// feed reads the rows into batches and hands them to the workers; it stops
// at the end of the rows, at the source's error or when ctx ends.
func (p pass) feed(ctx context.Context, rows iter.Seq2[proportions.BreakdownRow, error], free, work chan *batch) error {
	seq, read := 0, 0
	var b *batch
	take := func() bool {
		if ctx.Err() != nil { // select below picks at random when both are ready
			return false
		}
		select {
		case b = <-free:
			b.reset(seq, read+1)
			seq++
			return true
		case <-ctx.Done():
			return false
		}
	}
	if !take() {
		return nil
	}
	var readErr error
	for r, err := range rows {
		if err != nil {
			readErr = fmt.Errorf("reading segment %d: %w", read+1, err)
			break
		}
		b.rows = append(b.rows, r)
		read++
		if len(b.rows) == chunk {
			work <- b
			if !take() {
				return nil
			}
		}
	}
	work <- b // the last, possibly empty, batch
	return readErr
}

// write writes a processed batch, or returns its row's error.
func (p pass) write(b *batch) error {
	if b.err != nil {
		return b.err
	}
	if p.collect != nil {
		p.collect(b)
	}
	if p.json != nil {
		if _, err := p.json.Write(b.json); err != nil {
			return fmt.Errorf("writing the JSON lines: %w", err)
		}
	}
	if p.csv != nil {
		if _, err := p.csv.Write(b.csv); err != nil {
			return fmt.Errorf("writing the CSV: %w", err)
		}
	}
	return nil
}

func (p pass) writeHeaders() error {
	if p.csv == nil {
		return nil
	}
	if _, err := p.csv.Write(appendCSVHeader(nil, p.columns)); err != nil {
		return fmt.Errorf("writing the CSV header: %w", err)
	}
	return nil
}
